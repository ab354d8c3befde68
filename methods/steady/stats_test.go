package steady_test

import (
	"math"
	"testing"

	"liftfuse/methods/steady"
)

func TestEffectiveN(t *testing.T) {
	// Bayley & Hammersley 1946; Wilks, Statistical Methods in the Atmospheric
	// Sciences, 3rd ed., eq. 5.12 (from memory): n(1 − r)/(1 + r).
	tests := []struct {
		name string
		n    int
		r    float64
		want float64
	}{
		{"moderate correlation", 1000, 0.5, 333.3333},
		{"strong correlation", 1000, 0.9, 52.6316},
		{"independent", 1000, 0, 1000},
		{"negative correlation is clamped to n", 1000, -0.3, 1000},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			if got := steady.EffectiveN(tt.n, tt.r); math.Abs(got-tt.want) > 1e-4 {
				t.Errorf("EffectiveN(%d, %g) = %.4f, want %.4f", tt.n, tt.r, got, tt.want)
			}
		})
	}
}

func TestBatchMeansVar(t *testing.T) {
	// Worked by hand: x = 1…8 in batches of 2 gives batch means 1.5, 3.5,
	// 5.5, 7.5; their sample variance is 6.6667, and over 4 batches
	// Var(x̄) = 6.6667/4 = 1.6667.
	sums := []float64{1 + 2, 3 + 4, 5 + 6, 7 + 8}
	got, ok := steady.BatchMeansVar(sums, 2)
	if !ok || math.Abs(got-1.666667) > 1e-6 {
		t.Errorf("BatchMeansVar = %v (%v), want 1.6667", got, ok)
	}
	if _, ok := steady.BatchMeansVar(sums[:1], 2); ok {
		t.Error("one batch cannot estimate a variance")
	}
}
