package height

import (
	"math"
	"sort"
)

// Window edges. A hold's first and last samples still belong to the ramps
// on either side: the band of ±tol admits the speed while the car
// accelerates towards it or brakes away from it, and the pitch that a
// ramp's acceleration gives is several millimetres at the axle (8 mm at
// 1.5 m/s² on the reality simulator's default car), far more than the
// aerodynamic change. The mean height itself is not biased (the window's
// mean acceleration carries it, speedEnds), but a few such samples
// inflate the window's batch variance several-fold, so a correct window
// would be weighted as a poor one. Discarding the transients at the ends
// of a steady-state segment is common practice (no source).
//
// How long a ramp stays inside the band is read from the speed itself. A
// ramp of rate r (km/h per s) crosses at most tol km/h inside the band
// before the hold's level (a window's samples lie within tol of its mean
// speed, steady.Band), so it lasts at most tol/r s there. The rate is the
// speed's change over the RateSpanS just before the window's first sample
// (the approach) and just after its last one (the departure), so each end
// gets its own edge:
//
//	edge = min(EdgeS(tol), MinEdgeS + tol/r)
//
// MinEdgeS keeps a margin for a ramp's corner, which a 1 s look reads
// slower than its steepest part. At ±1.5 km/h a step (a near-instant
// change of speed) gives 0.30–0.34 s, a ramp of 1.5 m/s² (5.4 km/h/s)
// 0.58 s, one of 0.7 m/s² or GentleRampMs2 or gentler, or a rate that
// cannot be read (the log's start or end), EdgeS(tol) = 0.83 s. A window
// closed by a gap in the log is settled by the first sample across it:
// its departure rate is |Δv| over the gap's span (over 1 s), so a gap
// with little change of speed reads gentle and gives EdgeS(tol). The rule
// bounds a ramp of constant rate; one that eases in (jerk-limited) is
// kept until its speed has moved about tol, not for a fixed time: in a
// scratch run of smoothstep ramps of 40 km/h peaking at 0.5–3 m/s², logged
// at 10 Hz, the window kept 3.0–0.15 s of the ramp's start, up to where
// its acceleration reached about 0.35 m/s²; with the speed held at 2 Hz,
// 3.4–0.48 s, up to 0.9 m/s² at the steepest. The window's slope
// (speedEnds) carries that mean acceleration; it is ramp kept, not data
// lost.

// GentleRampMs2 is the gentlest ramp whose samples the edge leaves out,
// m/s²: a gentle, steady run-up on a test track (common practice, no
// source).
const GentleRampMs2 = 0.5

// MinEdgeS is the least edge, s: a few samples of a fast log, for a
// step's last sample and a held speed's lag.
const MinEdgeS = 0.3

// RateSpanS is the span over which the approach and departure rates are
// read, s: two updates of a speed logged at 2 Hz (as EndSpanS).
const RateSpanS = EndSpanS

// EdgeS returns the longest edge of a steady window of speed tolerance
// tol (km/h), s: the edge for a ramp of GentleRampMs2.
func EdgeS(tol float64) float64 { return max(MinEdgeS, tol/(3.6*GentleRampMs2)) }

// EdgeFor returns the edge left out at a window's end of speed tolerance
// tol (km/h) when the speed approaches or leaves it at rate km/h per s;
// a rate that is not positive (unknown) gives EdgeS(tol).
func EdgeFor(tol, rate float64) float64 {
	if !(rate > 0) {
		return EdgeS(tol)
	}
	return min(EdgeS(tol), MinEdgeS+tol/rate)
}

// rateOver returns |v1 − v0|/(t1 − t0), km/h per s, or 0 (unknown) when
// the two are less than half RateSpanS apart.
func rateOver(t0, v0, t1, v1 float64) float64 {
	if t1-t0 < RateSpanS/2-timeSlack {
		return 0
	}
	return math.Abs(v1-v0) / (t1 - t0)
}

// timeSlack absorbs the rounding of sample times (s), so that a log's
// sample period may divide the edge.
const timeSlack = 1e-9

// delay holds a window's samples until they are the longest edge older
// than the newest one, so that the samples of a window's last edge seconds
// — perhaps the start of the ramp that closes it — wait until the
// departure rate is known (finder.settle). Its queue is a ring whose
// size, a power of two, doubles when it is full: O(1) per sample and
// nothing copied once it has grown to one edge of samples, its memory.
type delay struct {
	edge    float64  // s
	buf     []sample // len 0 or a power of two
	head, n int      // the oldest sample's index in buf, samples queued
}

// reset empties the queue, keeping its buffer.
func (d *delay) reset() { d.head, d.n = 0, 0 }

// full reports whether the ring has no room for push; grow makes some.
func (d *delay) full() bool { return d.n == len(d.buf) }

// push queues s; the ring must not be full. Without the call to grow it
// inlines into the caller, which grows the ring on its rare path.
func (d *delay) push(s sample) {
	// field by field: a whole sample would be copied from where the
	// caller spilled it in two 16-byte loads over four 8-byte stores,
	// which the processor cannot forward (a stall on every sample)
	q := &d.buf[(d.head+d.n)&(len(d.buf)-1)]
	q.t, q.v, q.h, q.qa = s.t, s.v, s.h, s.qa
	d.n++
}

// grow doubles the ring (to at least 64), its samples first in order.
func (d *delay) grow() {
	buf := make([]sample, max(64, 2*len(d.buf)))
	for i := range d.n {
		buf[i] = d.buf[(d.head+i)&(len(d.buf)-1)]
	}
	d.buf, d.head = buf, 0
}

// ready reports whether the oldest queued sample is at least edge older
// than now.
func (d *delay) ready(now, edge float64) bool {
	return d.n > 0 && !(now-d.buf[d.head].t < edge-timeSlack)
}

// shift removes the oldest queued sample (the queue not empty) and
// returns it.
func (d *delay) shift() sample {
	s := d.buf[d.head]
	d.head = (d.head + 1) & (len(d.buf) - 1)
	d.n--
	return s
}

// recent keeps the speeds of at least the last RateSpanS of samples, for
// the rate at which the speed approaches a window (read only when one
// opens). push only appends: the samples more than RateSpanS older than
// the newest are dropped together once they fill the buffer, which
// doubles when they are fewer than half of it. Amortised O(1) per sample.
type recent struct{ s [][2]float64 } // (t, v), t increasing

// full reports whether the buffer has no room for push; prune makes
// some.
func (r *recent) full() bool { return len(r.s) == cap(r.s) }

// push adds a sample; the buffer must not be full (as delay.push).
func (r *recent) push(t, v float64) {
	n := len(r.s)
	r.s = r.s[:n+1]
	r.s[n][0], r.s[n][1] = t, v // apart, as in delay.push
}

// prune drops the samples more than RateSpanS older than the newest one
// (none of them counts for a later time) and makes room for as many again
// as are kept.
func (r *recent) prune() {
	if len(r.s) > 0 {
		n := copy(r.s, r.s[r.first(r.s[len(r.s)-1][0]):])
		r.s = r.s[:n]
	}
	if 2*len(r.s) >= cap(r.s) {
		r.s = append(make([][2]float64, 0, max(1024, 2*cap(r.s))), r.s...)
	}
}

// first returns the index of the oldest kept sample no more than
// RateSpanS before t (len when there is none): t − tᵢ falls as i grows.
func (r *recent) first(t float64) int {
	return sort.Search(len(r.s), func(i int) bool { return t-r.s[i][0] <= RateSpanS+timeSlack })
}

// approach returns the rate (km/h per s) from the oldest kept sample no
// more than RateSpanS before t to a speed v at t; 0 when unknown.
func (r *recent) approach(t, v float64) float64 {
	if i := r.first(t); i < len(r.s) {
		return rateOver(r.s[i][0], r.s[i][1], t, v)
	}
	return 0
}

// holdLag measures how long a logged speed is held between updates: a
// speed logged at a lower rate than the file (a 2 Hz GPS speed in a 10 Hz
// file, its cells held) shows a hold's level for up to one update interval
// after the car has left it, so a window's last admitted sample may be
// that far into the ramp. The lag is the shortest interval between
// changes of the speed no longer than RateSpanS, less the shortest sample
// step: 0 for a speed that changes every sample (noise, a ramp), 0.1 s at
// 5 Hz and 0.4 s at 2 Hz in a 10 Hz file. Until the speed has changed
// twice within RateSpanS it is 0. MinEdgeS already covers a lag up to
// itself, so the departure edge is max(MinEdgeS, lag) + tol/r (capped as
// EdgeFor, plus the excess): TestWindowEdges over 7 phases used a ramp
// sample at 2 Hz without it (1 of 7 phases, 0.03 s in). Adding the whole
// lag to MinEdgeS was tried: the 2 Hz day of
// TestLoggerFormatsGiveTheSameDay then moved 0.272 sd (bar 0.25), against
// 0.158 sd so.
type holdLag struct {
	t, v, upd          float64 // the last sample and the last change, s and km/h
	seen               bool    // t and v are set
	changed            bool    // upd is set
	sampleDT, updateDT float64 // shortest step, shortest interval between changes (s; 0 unknown)
	minIv              float64 // updateDT, or +Inf while unknown; set with sampleDT (setLag)
	lagS               float64 // lag's value, set when either changes
}

// quick observes the common sample, once the step is known, and reports
// whether it did: a step no shorter than the shortest, and the speed held
// or changed no sooner than the shortest interval known (a change then
// moves only upd); observe takes any other. quick is small enough to
// inline into the finder's loop, which observe, called on every sample,
// is not.
func (h *holdLag) quick(t, v float64) bool {
	if h.sampleDT != 0 && t-h.t >= h.sampleDT && (v == h.v || t-h.upd >= h.minIv) {
		if v != h.v {
			h.upd = t
		}
		h.t, h.v = t, v
		return true
	}
	return false
}

// observe takes a sample's time t (s) and speed v (km/h).
func (h *holdLag) observe(t, v float64) {
	if h.seen {
		if dt := t - h.t; dt > 0 && (h.sampleDT == 0 || dt < h.sampleDT) {
			h.sampleDT = dt
			h.setLag()
		}
		if v != h.v {
			if iv := t - h.upd; h.changed && iv <= RateSpanS+timeSlack && (h.updateDT == 0 || iv < h.updateDT) {
				h.updateDT = iv
				h.setLag()
			}
			h.upd, h.changed = t, true
		}
	}
	h.t, h.v = t, v
	h.seen = true
}

// lag returns the hold's lag, s.
func (h *holdLag) lag() float64 { return h.lagS }

// setLag sets the lag from the shortest step and update interval, and
// quick's bound on the interval.
func (h *holdLag) setLag() {
	h.lagS, h.minIv = 0, math.Inf(1)
	if h.updateDT != 0 {
		h.lagS, h.minIv = max(0, h.updateDT-h.sampleDT), h.updateDT
	}
}
