package height

import "math"

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
// A window shorter than two batches falls back to its first and last
// speed updates (a sample whose speed differs from the one before: a held
// value is the speed where it first appears), with the white-noise error
// of two samples from the steps between updates (von Neumann, Ann. Math.
// Stat. 12, 1941 — from memory).
type speedEnds struct {
	bt0, bst, bsv float64 // the batch being filled: start time, Σt, Σv
	bn            int

	b                  int     // complete batches
	t0, v0, t1, v1     float64 // first and last batch means: time (s), speed (km/h)
	st, sv, stt, stv   float64 // Σx, Σv, Σx², Σxv over batch means, x = t̄ − t0
	svv                float64 // Σv² over batch means
	n, m               int     // samples; updates after the first sample
	last               float64 // last speed, km/h
	ut0, uv0, ut1, uv1 float64 // first and last update
	sumStep, sumStep2  float64 // Σ Δv, Σ (Δv)² over the steps between updates
}

func (s *speedEnds) add(t, v float64) {
	if s.bn > 0 && t-s.bt0 >= EndSpanS-timeSlack {
		s.batch()
	}
	if s.bn == 0 {
		s.bt0 = t
	}
	s.bn++
	s.bst += t
	s.bsv += v
	if s.n > 0 && v != s.last {
		if s.m == 0 {
			s.ut0, s.uv0 = t, v
		} else {
			d := v - s.last
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
	tm, vm := s.bst/float64(s.bn), s.bsv/float64(s.bn)
	s.bn, s.bst, s.bsv = 0, 0, 0
	if s.b == 0 {
		s.t0, s.v0 = tm, vm
	}
	x := tm - s.t0
	s.st += x
	s.sv += vm
	s.stt += x * x
	s.stv += x * vm
	s.svv += vm * vm
	s.t1, s.v1 = tm, vm
	s.b++
}

// ends is what a closed window keeps of its speed for its acceleration's
// error: Σ(t̄_b − t̄)² of its batch means (s²; 0 when it had fewer than
// two), the residual sum of squares of its batch means about their line
// ((km/h)²) and its degrees of freedom, and the fallback's error (km/h/s).
type ends struct {
	sxx, rss   float64
	dof        int
	fallbackSE float64
	atSpeed    bool
}

// accel returns the window's mean acceleration in km/h per s and what its
// error needs.
func (s *speedEnds) accel() (a float64, e ends) {
	if s.m >= 2 && s.ut1 > s.ut0 {
		T := s.ut1 - s.ut0
		a = (s.uv1 - s.uv0) / T
		if k := float64(s.m - 1); k >= 2 {
			sv2 := max(0, s.sumStep2-s.sumStep*s.sumStep/k) / (2 * (k - 1))
			e.fallbackSE = math.Sqrt(2*sv2) / T
		}
	}
	if s.b >= 2 && s.t1 > s.t0 {
		b := float64(s.b)
		e.sxx = s.stt - s.st*s.st/b
		sxv := s.stv - s.st*s.sv/b
		a = sxv / e.sxx
		e.rss = max(0, s.svv-s.sv*s.sv/b-sxv*sxv/e.sxx)
		e.dof = s.b - 2
	}
	return a, e
}

// pooledBatchVar returns the variance of a batch mean pooled over the
// windows at speed, (km/h)², and whether any window could tell it.
func pooledBatchVar(es []ends) (float64, bool) {
	rss, dof := 0.0, 0
	for _, e := range es {
		if e.atSpeed && e.dof > 0 {
			rss += e.rss
			dof += e.dof
		}
	}
	if dof == 0 {
		return 0, false
	}
	return rss / float64(dof), true
}

// errorOf returns a window's acceleration error (km/h/s) given the pooled
// batch variance v (ok: there is one).
func (e ends) errorOf(v float64, ok bool) float64 {
	if e.sxx > 0 && ok {
		return math.Sqrt(v / e.sxx)
	}
	return e.fallbackSE
}
