package height

import (
	"fmt"
	"math"

	"gonum.org/v1/gonum/stat"

	"liftfuse/methods/campaign"
)

// Calibration maps a sensor signal to mm of body height: mm = Offset + Gain·signal.
// RelSD is the relative standard uncertainty of the gain, which becomes a
// scale factor on the lift term.
type Calibration struct {
	Offset, Gain float64
	RelSD        float64
}

// MM converts a signal to mm.
func (c Calibration) MM(signal float64) float64 { return c.Offset + c.Gain*signal }

// NewCalibration builds the calibration of an entry: a linear gain (the
// offset is then free and taken as 0), or the least-squares line through the
// calibration points, whose slope's standard error adds (in quadrature) to
// the stated sd_pct.
func NewCalibration(c campaign.Calibration) (Calibration, error) {
	rel := c.SDPct / 100
	if len(c.Points) == 0 {
		if c.MmPerUnit == 0 {
			return Calibration{}, fmt.Errorf("calibration gain is zero")
		}
		return Calibration{Gain: c.MmPerUnit, RelSD: rel}, nil
	}
	xs := make([]float64, len(c.Points))
	ys := make([]float64, len(c.Points))
	for i, p := range c.Points {
		xs[i], ys[i] = p.A, p.B
	}
	a, b, seB, err := LineFit(xs, ys)
	if err != nil {
		return Calibration{}, fmt.Errorf("calibration points: %w", err)
	}
	if b == 0 {
		return Calibration{}, fmt.Errorf("calibration points give a zero gain")
	}
	return Calibration{Offset: a, Gain: b, RelSD: math.Hypot(rel, seB/math.Abs(b))}, nil
}

// LineFit fits y = a + b·x by least squares and returns the slope's standard
// error s_b = s/√Σ(x − x̄)², s² = Σ residual²/(n − 2) (0 for n = 2, where the
// line passes through both points).
func LineFit(xs, ys []float64) (a, b, seB float64, err error) {
	n := len(xs)
	if n < 2 {
		return 0, 0, 0, fmt.Errorf("need at least 2 points, have %d", n)
	}
	a, b = stat.LinearRegression(xs, ys, nil, false)
	mx := stat.Mean(xs, nil)
	var sxx, rss float64
	for i := range xs {
		sxx += (xs[i] - mx) * (xs[i] - mx)
		r := ys[i] - a - b*xs[i]
		rss += r * r
	}
	if sxx == 0 {
		return 0, 0, 0, fmt.Errorf("all points have the same x")
	}
	if n > 2 {
		seB = math.Sqrt(rss / float64(n-2) / sxx)
	}
	return a, b, seB, nil
}
