package height

import (
	"math"
	"math/rand/v2"
	"testing"
)

// TestSlopeErrorCalibrated: the stated error of a window's acceleration
// matches the scatter of the slopes over many windows, for white speed
// noise and for AR(1) noise of φ = 0.9 a 0.1 s sample (adjacent 1 s
// batch means correlate about 0.5 there; the error read as if they were
// independent was 0.6 of the scatter). 400 windows a case, in logs whose
// batch noise is pooled as finder.finish pools it (20 windows a log, or
// 5: a short log reads its correlation from few batches); the speed's
// true slope is 0. 4 s windows give 4 batches, the fewest that read a
// correlation; 3 s windows give 3, which cannot (the fallback).
//
// Two checks, as a scale can be right on average and wrong window by
// window: the sd of the slopes over the mean stated SE, and the RMS of
// z = a/SE. Band for both: the sd of 400 independent slopes is known to
// 1/√(2·399) = 3.5 % (χ² with 399 degrees of freedom), so [0.8, 1.25] is
// over 5 sd of that noise on either side, leaving the rest for σ_b and
// the correlation read from a few short windows. The fallback case asks
// only that the error not be too small (ratio and RMS z ≤ 1.25): the
// fallback is meant to be conservative. The white case of 5 windows a
// log reads φ from 10 residual degrees of freedom, and its noisy, never
// negative φ states the mean SE too large: sd / mean SE measured 0.74 to
// 0.76 over 2000 windows at seeds 11 to 13, while RMS z was 0.94 to 0.95
// and |z| < 1.645 held for 91 to 92 % of windows (a scratch run). So its
// ratio is held only above 0.65 (a known over-statement, not hidden), its
// RMS z to the full band.
func TestSlopeErrorCalibrated(t *testing.T) {
	cases := []struct {
		name    string
		phi     float64 // AR(1) coefficient a 0.1 s row
		secs    int     // window length, s
		perLog  int     // windows a log
		ratioLo float64 // least sd / mean SE
		zLo     float64 // least RMS z
	}{
		{"white, 5 s windows", 0, 5, 20, 0.8, 0.8},
		{"white, 12 s windows", 0, 12, 20, 0.8, 0.8},
		{"AR(1) φ = 0.9, 5 s windows", 0.9, 5, 20, 0.8, 0.8},
		{"AR(1) φ = 0.9, 12 s windows", 0.9, 12, 20, 0.8, 0.8},
		{"white, 4 s windows, 5 a log", 0, 4, 5, 0.65, 0.8},
		{"AR(1) φ = 0.9, 3 s windows only (fallback)", 0.9, 3, 20, 0, 0},
	}
	for _, tc := range cases {
		t.Run(tc.name, func(t *testing.T) {
			rng := rand.New(rand.NewPCG(7, uint64(100*tc.phi)+uint64(tc.secs)+uint64(1000*tc.perLog)))
			const N = 400
			var sumA2, sumSE, sumZ2 float64
			for range N / tc.perLog {
				es := make([]ends, tc.perLog)
				for k := range es {
					var s speedEnds
					x := rng.NormFloat64()
					for i := range 10 * tc.secs {
						x = tc.phi*x + math.Sqrt(1-tc.phi*tc.phi)*rng.NormFloat64()
						s.add(0.1*float64(i), 120+0.3*x)
					}
					es[k] = s.accel()
					es[k].atSpeed = true
				}
				n := pooledBatchNoise(es)
				for _, e := range es {
					se := e.errorOf(n)
					sumA2 += e.a * e.a
					sumSE += se
					sumZ2 += e.a * e.a / (se * se)
				}
			}
			ratio := math.Sqrt(sumA2/N) / (sumSE / N)
			rmsZ := math.Sqrt(sumZ2 / N)
			t.Logf("slope sd / mean stated SE = %.3f, RMS z = %.3f", ratio, rmsZ)
			if ratio < tc.ratioLo || ratio > 1.25 {
				t.Errorf("slope sd / mean stated SE = %.3f, want within [%.2f, 1.25]", ratio, tc.ratioLo)
			}
			if rmsZ < tc.zLo || rmsZ > 1.25 {
				t.Errorf("RMS z = %.3f, want within [%.2f, 1.25]", rmsZ, tc.zLo)
			}
		})
	}
}

// TestQuantisedSpeedNotExact: a held speed of 1 km/h steps, rising one
// step each second in step with the batches, puts its batch means exactly
// on a line, so every window's residuals are 0. Its acceleration (1 km/h/s)
// must not be stated exact: the slope's variance is floored at q²/12 a
// sample over the 10 samples a batch (uniform rounding error) over Sxx,
// so with 5 batches (Sxx = 10 s²), SE = √(1/12/10/10) = 0.029 km/h/s
// (arithmetic).
func TestQuantisedSpeedNotExact(t *testing.T) {
	es := make([]ends, 3)
	for k := range es {
		var s speedEnds
		for i := range 50 {
			tt := 0.1 * float64(i)
			s.add(tt, 100+math.Floor(tt+1e-9))
		}
		es[k] = s.accel()
		es[k].atSpeed = true
	}
	n := pooledBatchNoise(es)
	se := es[0].errorOf(n)
	want := math.Sqrt(1.0 / 12 / 10 / 10)
	if math.Abs(es[0].a-1) > 1e-9 || math.Abs(se-want) > 1e-9 {
		t.Errorf("a = %g, SE = %g km/h/s, want 1 and %g", es[0].a, se, want)
	}
}
