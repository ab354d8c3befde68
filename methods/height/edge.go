package height

// EdgeS is how much of each end of a steady window is left out of its
// statistics, s. A hold's first and last samples still belong to the
// ramps on either side: the speed is inside the band while the car
// accelerates towards it or brakes away from it, and at the 1.5 m/s² of
// a brisk ramp the pitch that acceleration gives is several millimetres
// at the axle, far more than the aerodynamic change. The mean height
// itself is not biased (the window's mean acceleration carries it, see
// speedTrend.accel), but a few such samples inflate the window's batch
// variance several-fold, so a correct window would be weighted as a poor
// one. Discarding transients at the ends of a steady-state segment is
// common practice (no source); 0.3 s covers a ramp's entry into a band of
// ±1.5 km/h at 1.5 m/s² or more (1.5/5.4 s). Times are compared with a
// nanosecond's slack, so that a log's sample period divides it.
const EdgeS = 0.3

// timeSlack absorbs the rounding of sample times (s).
const timeSlack = 1e-9

// delay holds a window's samples until they are EdgeS older than the
// newest one, so that the samples of a window's last EdgeS seconds — the
// start of the ramp that closes it — are never used. Amortised O(1) per
// sample; its memory is EdgeS of samples.
type delay struct {
	buf  []sample
	head int
}

// push queues s.
func (d *delay) push(s sample) { d.buf = append(d.buf, s) }

// pop returns the oldest queued sample if it is at least EdgeS older than
// now.
func (d *delay) pop(now float64) (sample, bool) {
	if d.head == len(d.buf) || now-d.buf[d.head].t < EdgeS-timeSlack {
		return sample{}, false
	}
	s := d.buf[d.head]
	d.head++
	if d.head >= 1024 && 2*d.head >= len(d.buf) {
		d.buf = d.buf[:copy(d.buf, d.buf[d.head:])]
		d.head = 0
	}
	return s, true
}

// reset drops every queued sample.
func (d *delay) reset() { d.buf, d.head = d.buf[:0], 0 }
