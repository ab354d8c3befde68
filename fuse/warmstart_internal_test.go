package fuse

import (
	"liftfuse/methods"
	"liftfuse/methods/campaign"
	"math"
	"testing"

	"gonum.org/v1/gonum/mat"

	"liftfuse/methods/evidence"
)

// TestWarmStart: the Laplace fits that leave an entry out, or widen its
// errors, searched from the joint fit's warm start in its whitened
// coordinates, land where a cold search from zero does — the same log
// p(y) to 2·10⁻³ (both stop where two iterations gain less than 10⁻⁵; the
// curvature is then taken at points that differ within that) and the same
// mode to a hundredth of its sd (common practice (no source): an
// optimiser's answer does not depend on where it starts on a concave
// problem).
func TestWarmStart(t *testing.T) {
	evs, set := demoEvidence(t)
	full, err := newModel(evs, set)
	if err != nil {
		t.Fatal(err)
	}
	P, err := full.fit()
	if err != nil {
		t.Fatal(err)
	}
	ws := newWarmStart(full, P.p)
	for ei, ev := range evs {
		rest := append(append([]evidence.Evidence(nil), evs[:ei]...), evs[ei+1:]...)
		others, err := newModel(rest, set)
		if err != nil {
			t.Fatal(err)
		}
		for _, tc := range []struct {
			name string
			m    *model
		}{
			{"every entry but " + ev.Entry, others},
			{ev.Entry + "'s errors widened", full.variant(map[int]bool{ei: true}, true, false)},
		} {
			tc.m.start = nil
			coldMode, cov, coldZ, err := tc.m.laplace()
			if err != nil {
				t.Fatal(err)
			}
			tc.m.start = ws
			warmMode, _, warmZ, err := tc.m.laplace()
			if err != nil {
				t.Fatal(err)
			}
			if math.Abs(warmZ-coldZ) > 2e-3 {
				t.Errorf("%s: log p(y) %.6f from the warm start, %.6f from zero", tc.name, warmZ, coldZ)
			}
			for i, p := range tc.m.phi {
				if d := math.Abs(warmMode[i]-coldMode[i]) / math.Sqrt(cov.At(i, i)); d > 0.01 {
					t.Errorf("%s: mode of %s %.6g from the warm start, %.6g from zero (%.3f sd)", tc.name, p.name, warmMode[i], coldMode[i], d)
				}
			}
		}
	}
}

// TestWhitener: T·Tᵀ is the warm start's covariance of the φ it knows, in
// the order asked, and the prior variance, uncorrelated, for one it does
// not.
func TestWhitener(t *testing.T) {
	cov := mat.NewSymDense(3, []float64{
		4, 1, 0.5,
		1, 2, 0.3,
		0.5, 0.3, 1,
	})
	ws := &warmStart{index: map[string]int{"a": 0, "b": 1, "c": 2}, mode: []float64{1, 2, 3}, cov: cov}
	phi := []phiParam{{name: "c"}, {name: "new"}, {name: "a"}}
	T := ws.whitener(phi, []float64{9, 0.5, 9})
	var S mat.Dense
	S.Mul(T, T.T())
	want := mat.NewDense(3, 3, []float64{
		1, 0, 0.5,
		0, 0.25, 0,
		0.5, 0, 4,
	})
	if !mat.EqualApprox(&S, want, 1e-12) {
		t.Errorf("T·Tᵀ =\n%v\nwant\n%v", mat.Formatted(&S), mat.Formatted(want))
	}
	if got := ws.point(phi); got[0] != 3 || got[1] != 0 || got[2] != 1 {
		t.Errorf("point = %v, want [3 0 1]", got)
	}
	var none *warmStart
	if none.whitener(phi, []float64{1, 1, 1}) != nil || none.point(phi)[2] != 0 {
		t.Error("no warm start: want no whitener and a start at zero")
	}
}

// demoEvidence returns the demo campaign's evidence, reduced, and the
// settings of its fusion, for the internal tests that build its models.
func demoEvidence(tb testing.TB) ([]evidence.Evidence, Settings) {
	tb.Helper()
	c, err := campaign.Load("../examples/ducktail-fastback/campaign.yaml", campaign.Options{})
	if err != nil {
		tb.Fatal(err)
	}
	r, err := methods.Reduce(c, methods.Options{})
	if err != nil {
		tb.Fatal(err)
	}
	return r.Evidence(), Settings{Configs: []string{"baseline", "ducktail"}, Seed: 1, Credible: 0.9}.withDefaults()
}
