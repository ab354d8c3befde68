package height

import (
	"math"

	"gonum.org/v1/gonum/stat"
)

// EndSpanS is the span of the batches whose mean speeds give a window's
// mean acceleration, s: longer than the hold of a speed logged at
// 2 Hz or more into a faster file, and about the correlation time of a
// GPS speed's noise (common practice, no source).
const EndSpanS = 1.0

// speedEnds accumulates what a window's mean acceleration needs.
//
// The height responds to the acceleration at each instant, so a window's
// mean height carries the mean of a(t) over it. Two single samples read
// that badly: a speed logged at a lower rate and held puts a window's
// first and last rows anywhere on a step, and a speed with correlated
// noise (a GPS speed) makes two samples far noisier than their successive
// differences say. So the window's samples are cut into batches of
// EndSpanS from its start, and the acceleration is the least-squares
// slope of the batch means against their mean times,
//
//	a = Σ(t̄_b − t̄)(v̄_b − v̄)/Σ(t̄_b − t̄)²,  SE = σ_b/√Σ(t̄_b − t̄)²
//
// for uncorrelated batch means (with their AR(1) correlation R,
// √(σ_b²·w'Rw/Sxx), floored at the speed's quantum: batchnoise.go)
// exact for a straight line (a hold, a creep), with σ_b the sd of a batch
// mean, read from the scatter of the window's batch means about their
// line (the batch-means method: Law & Kelton, Simulation Modeling and
// Analysis, ch. 9 — from memory; least squares: Draper & Smith, Applied
// Regression Analysis, ch. 1 — from memory) and pooled over a log's
// windows at speed (see finder.finish), as a short window has few
// batches. A clean window's speed is a line, whose slope is the mean of
// a(t); a ramp left inside a window (gentler than the edges leave out,
// edge.go) is under-read, as the slope weights the middle of the window.
//
// Adjacent batch means of a correlated speed (a GPS speed, AR(1)) still
// correlate, so the slope's error allows for it (batchnoise.go).
//
// A window shorter than two batches falls back to its first and last
// speed updates (a sample whose speed differs from the one before: a held
// value is the speed where it first appears); its error is built from the
// pooled batch variance (batchNoise.errorOf).
type speedEnds struct {
	bt0, bt1, bst, bsv float64 // the batch being filled: first and last time, Σt, Σv
	bn                 int

	bx, bv             []float64 // complete batches' mean times (s), speeds (km/h)
	inBatches          int       // samples in complete batches
	n, m               int       // samples; updates after the first sample
	last               float64   // last speed, km/h
	ut0, uv0, ut1, uv1 float64   // first and last update
	sumStep, sumStep2  float64   // Σ Δv, Σ (Δv)² over the steps between updates
	t0, minStep        float64   // first time (s); least |Δv| of an update (km/h)
}

func (s *speedEnds) add(t, v float64) {
	if s.bn > 0 && t-s.bt0 >= EndSpanS-timeSlack {
		s.batch()
	}
	if s.bn == 0 {
		s.bt0 = t
	}
	if s.n == 0 {
		s.t0 = t
	}
	s.bt1 = t
	s.bn++
	s.bst += t
	s.bsv += v
	if s.n > 0 && v != s.last {
		if s.m == 0 {
			s.ut0, s.uv0 = t, v
		} else {
			d := v - s.last
			if s.minStep == 0 || math.Abs(d) < s.minStep {
				s.minStep = math.Abs(d)
			}
			s.sumStep += d
			s.sumStep2 += d * d
		}
		s.ut1, s.uv1 = t, v
		s.m++
	}
	s.last = v
	s.n++
}

// batch closes the batch being filled.
func (s *speedEnds) batch() {
	s.bx = append(s.bx, s.bst/float64(s.bn))
	s.bv = append(s.bv, s.bsv/float64(s.bn))
	s.inBatches += s.bn
	s.bn, s.bst, s.bsv = 0, 0, 0
}

// ends is what a closed window keeps of its speed for its acceleration's
// error: its batch means' times about their mean (s; nil when it had
// fewer than two), Σ(t̄_b − t̄)², the residual sum of squares of its
// batch means about their line and the sum of products of adjacent
// residuals ((km/h)²) and its samples a batch (its degrees of freedom
// are len(xc) − 2); for the fallback, the span and count of its speed
// updates and their step variance ((km/h)², NaN when unknown); its least
// speed step (the speed's quantum q, km/h; 0 when it never changed); and
// its acceleration (km/h/s).
type ends struct {
	xc           []float64
	sxx, rss, c1 float64
	perBatch     float64
	upT          float64
	upM          int
	stepVar, a   float64
	q            float64
	atSpeed      bool
}

// accel returns the window's mean acceleration in km/h per s (e.a) and
// what its error needs. The batch still being filled counts when it spans at
// least EndSpanS less one sample period (the window's mean), so that a
// complete last batch (10 samples at 10 Hz span 0.9 s) is not dropped.
func (s *speedEnds) accel() (e ends) {
	e.stepVar = math.NaN()
	e.q = s.minStep
	bx, bv, inBatches := s.bx, s.bv, s.inBatches
	if s.n > 1 && s.bn > 0 {
		dt := (s.bt1 - s.t0) / float64(s.n-1)
		if s.bt1-s.bt0 >= EndSpanS-dt-timeSlack {
			bx = append(bx[:len(bx):len(bx)], s.bst/float64(s.bn))
			bv = append(bv[:len(bv):len(bv)], s.bsv/float64(s.bn))
			inBatches += s.bn
		}
	}
	if s.m >= 2 && s.ut1 > s.ut0 {
		e.upT, e.upM = s.ut1-s.ut0, s.m-1
		e.a = (s.uv1 - s.uv0) / e.upT
		if k := float64(s.m - 1); k >= 2 {
			e.stepVar = max(0, s.sumStep2-s.sumStep*s.sumStep/k) / (2 * (k - 1))
		}
	}
	if b := len(bx); b >= 2 && bx[b-1] > bx[0] {
		xm, vm := stat.Mean(bx, nil), stat.Mean(bv, nil)
		e.xc = make([]float64, b)
		sxv := 0.0
		for i, x := range bx {
			e.xc[i] = x - xm
			e.sxx += e.xc[i] * e.xc[i]
			sxv += e.xc[i] * (bv[i] - vm)
		}
		e.a = sxv / e.sxx
		prev := 0.0
		for i, v := range bv {
			r := v - vm - e.a*e.xc[i]
			e.rss += r * r
			if i > 0 {
				e.c1 += prev * r
			}
			prev = r
		}
		e.perBatch = float64(inBatches) / float64(b)
	}
	return e
}
