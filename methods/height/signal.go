package height

import "math"

// LowPass is a first-order low-pass filter, the software twin of an RC
// smoothing circuit: for a sample x after a step Δt,
//
//	y ← y + α·(x − y),   α = 1 − exp(−Δt/τ)
//
// the exact discretisation of dy/dt = (x − y)/τ for an input held constant
// over the step (zero-order hold; Franklin, Powell & Workman, Digital Control
// of Dynamic Systems — from memory). Its −3 dB cutoff is 1/(2πτ).
type LowPass struct {
	Tau   float64 // time constant, s
	y     float64
	t     float64
	begun bool
	dt, a float64 // the last step and its α, reused while the rate holds
}

// Alpha returns the smoothing factor for a step dt with time constant tau.
func Alpha(dt, tau float64) float64 { return -math.Expm1(-dt / tau) }

// Cutoff returns the −3 dB frequency in Hz of a first-order low-pass.
func Cutoff(tau float64) float64 { return 1 / (2 * math.Pi * tau) }

// Step feeds the sample x taken at time t and returns the filtered value.
// The first sample initialises the output.
func (f *LowPass) Step(t, x float64) float64 {
	if y, ok := f.quick(t, x); ok {
		return y
	}
	if !f.begun {
		f.y, f.t, f.begun = x, t, true
		return x
	}
	f.dt = t - f.t // a new step (quick takes the last one again)
	f.a = Alpha(f.dt, f.Tau)
	f.y += f.a * (x - f.y)
	f.t = t
	return f.y
}

// quick is Step for a sample after a step within 1e-9 of the last one,
// the common sample: logged times carry rounding, so such a step reuses
// the last α (the difference is far below any filter's concern). It is
// small enough to inline into a caller's loop, which Step is not, and
// returns the filtered value and true, or false for Step to take the
// sample.
func (f *LowPass) quick(t, x float64) (float64, bool) {
	if dt := t - f.t; !f.begun || math.Abs(dt-f.dt) > 1e-9*f.dt {
		return 0, false
	}
	f.y += f.a * (x - f.y)
	f.t = t
	return f.y, true
}

// MovingAverage is the mean of the last N samples.
type MovingAverage struct {
	buf  []float64
	next int
	full bool
	sum  float64
}

// NewMovingAverage returns a moving average over n ≥ 1 samples.
func NewMovingAverage(n int) *MovingAverage {
	return &MovingAverage{buf: make([]float64, max(n, 1))}
}

// Step adds x and returns the mean of the samples held.
func (m *MovingAverage) Step(x float64) float64 {
	m.Add(x)
	return m.Mean()
}

// Add adds x; Mean then reads what Step would have returned. Until the
// buffer is full the sample it drops is a +0 that has never been added,
// and s − (+0) is s (a −0 and a NaN included), so it drops one whatever.
func (m *MovingAverage) Add(x float64) {
	m.sum -= m.buf[m.next]
	m.buf[m.next] = x
	m.sum += x
	m.next++
	if m.next == len(m.buf) {
		m.next, m.full = 0, true
	}
}

// Mean returns the mean of the samples held (NaN before the first).
func (m *MovingAverage) Mean() float64 {
	if m.full {
		return m.sum / float64(len(m.buf))
	}
	return m.sum / float64(m.next)
}
