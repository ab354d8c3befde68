package height_test

import (
	"math"
	"strings"
	"testing"

	"liftfuse/methods/campaign"
	"liftfuse/methods/height"
)

// TestTInflation: t_{0.95,ν}/z_{0.95} times z_{0.95} = 1.6449 gives the
// one-sided 95 % Student-t quantiles of a table (NIST/SEMATECH e-Handbook
// of Statistical Methods, §1.3.6.7.2, critical values of the t
// distribution): ν = 1: 6.314, 2: 2.920, 5: 2.015, 10: 1.812, 30: 1.697.
func TestTInflation(t *testing.T) {
	cases := []struct {
		name string
		n    int
		t    float64
	}{
		{"3 points", 3, 6.314}, {"4 points", 4, 2.920}, {"7 points", 7, 2.015}, {"12 points", 12, 1.812}, {"32 points", 32, 1.697},
	}
	for _, tc := range cases {
		t.Run(tc.name, func(t *testing.T) {
			if got := height.TInflation(tc.n, 0.95) * 1.644854; math.Abs(got-tc.t) > 0.0015 {
				t.Errorf("t quantile %.4f, want %.3f", got, tc.t)
			}
		})
	}
	if height.TInflation(2, 0.95) != 1 {
		t.Error("two points have no degrees of freedom: the factor must be 1")
	}
}

// TestBallastUncertainty: three ballast points give the slope's log sd
// times t_{0.95,1}/z_{0.95}; two points (or points on an exact line) give
// the stated 5 % and a warning.
func TestBallastUncertainty(t *testing.T) {
	cal := height.Calibration{Gain: 1}
	pts := func(sig ...float64) []campaign.BallastPoint {
		var out []campaign.BallastPoint
		for i, s := range sig {
			out = append(out, campaign.BallastPoint{AddedKg: 40 * float64(i), XM: 2.6, Signal: s})
		}
		return out
	}
	three, err := height.BallastStiffness("b", campaign.AxleRear, pts(10, 2, -5), 2.6, cal)
	if err != nil {
		t.Fatal(err)
	}
	xs := []float64{0, 40 * 9.80665, 80 * 9.80665}
	_, b, se, _ := height.LineFit(xs, []float64{10, 2, -5})
	if want := se / -b * 6.3138 / 1.644854; math.Abs(three.Groups[0].SD-want) > 1e-4*want || three.Warning != "" {
		t.Errorf("three points: sd %.5f (warning %q), want %.5f", three.Groups[0].SD, three.Warning, want)
	}
	for _, tc := range []struct {
		name string
		sig  []float64
	}{{"two points", []float64{10, 2}}, {"exact line", []float64{10, 2, -6}}} {
		t.Run(tc.name, func(t *testing.T) {
			s, err := height.BallastStiffness("b", campaign.AxleRear, pts(tc.sig...), 2.6, cal)
			if err != nil {
				t.Fatal(err)
			}
			if s.Groups[0].SD != height.DefaultBallastSDPct/100 || !strings.Contains(s.Warning, "no scatter") {
				t.Errorf("sd %v, warning %q", s.Groups[0].SD, s.Warning)
			}
		})
	}
}
