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
// independent was 0.6 of the scatter). 400 windows of each length, in
// logs of 20 whose batch noise is pooled as finder.finish pools it; the
// speed's true slope is 0. Band: the sd of 400 independent slopes is
// known to 1/√(2·399) = 3.5 % (χ² with 399 degrees of freedom), so
// [0.8, 1.25] is over 5 sd of that noise on either side, leaving the rest
// for the pooled σ_b and ρ read from 20 short windows.
func TestSlopeErrorCalibrated(t *testing.T) {
	cases := []struct {
		name string
		phi  float64 // AR(1) coefficient a 0.1 s row
		secs int     // window length, s
	}{
		{"white, 5 s windows", 0, 5},
		{"white, 12 s windows", 0, 12},
		{"AR(1) φ = 0.9, 5 s windows", 0.9, 5},
		{"AR(1) φ = 0.9, 12 s windows", 0.9, 12},
	}
	for _, tc := range cases {
		t.Run(tc.name, func(t *testing.T) {
			rng := rand.New(rand.NewPCG(7, uint64(100*tc.phi)+uint64(tc.secs)))
			const logs, perLog = 20, 20
			var sumA2, sumSE float64
			for range logs {
				es := make([]ends, perLog)
				for k := range es {
					var s speedEnds
					x := rng.NormFloat64()
					for i := range 10 * tc.secs {
						x = tc.phi*x + math.Sqrt(1-tc.phi*tc.phi)*rng.NormFloat64()
						s.add(0.1*float64(i), 120+0.3*x)
					}
					_, es[k] = s.accel()
					es[k].atSpeed = true
				}
				n := pooledBatchNoise(es)
				for _, e := range es {
					sumA2 += e.a * e.a
					sumSE += e.errorOf(n)
				}
			}
			const N = logs * perLog
			ratio := math.Sqrt(sumA2/N) / (sumSE / N)
			t.Logf("slope sd / mean stated SE = %.3f", ratio)
			if ratio < 0.8 || ratio > 1.25 {
				t.Errorf("slope sd / mean stated SE = %.3f, want within [0.8, 1.25]", ratio)
			}
		})
	}
}
