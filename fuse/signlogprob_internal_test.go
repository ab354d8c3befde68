package fuse

import (
	"math"
	"testing"
)

// TestSignLogProb: a component's Σ log P(sign | θ) equals the sum of the
// logarithms of its signs' probabilities (to 1e-12: it takes one
// logarithm of their product), and is 0 for a component without signs,
// on a 2-configuration campaign with the tufts' signs and a random θ.
func TestSignLogProb(t *testing.T) {
	m := scaleModel(t, 2, false)
	if len(m.signs) == 0 {
		t.Fatal("no signs: the test would not exercise the sum")
	}
	rng := newRand(4, 1)
	theta := make([]float64, len(m.lin))
	for i := range theta {
		theta[i] = 0.3 * rng.NormFloat64()
	}
	if got := m.signLogProb(nil, theta); got != 0 {
		t.Errorf("no signs: %v, want 0", got)
	}
	for k, signs := range m.compSigns {
		var want float64
		for _, si := range signs {
			s := &m.signs[si]
			want += math.Log(m.signProb(s, s.value(theta)))
		}
		if got := m.signLogProb(signs, theta); math.Abs(got-want) > 1e-12*math.Max(1, math.Abs(want)) {
			t.Errorf("component %d (%d signs): %v, want %v", k, len(signs), got, want)
		}
	}
}
