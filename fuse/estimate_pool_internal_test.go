package fuse

import (
	"sync"
	"testing"

	"liftfuse/methods/evidence"
)

// TestEstimateBuffers: estimates made with recycled draw buffers
// (scratch.draws), on two goroutines as the configurations' results are
// made, equal those from fresh buffers — every axle of every configuration
// of a 3-configuration campaign, the wider totals between narrower ones so
// that a buffer is reused both longer and shorter. It holds a buffer's
// stale contents (a combine that does not clear it fails it); whether a
// buffer is handed back while still read is not something two goroutines
// reliably show, and estimate returns values only.
func TestEstimateBuffers(t *testing.T) {
	evs, ids := scaleEvidence(t, 3)
	P, err := Fit(evs, Settings{Configs: ids, Seed: 2, MinESS: 400})
	if err != nil {
		t.Fatal(err)
	}
	if P.p.gaussian {
		t.Fatal("a closed-form posterior: the test would not exercise the draws")
	}
	var ws [][]entryRef
	for _, c := range ids {
		for _, ax := range []string{evidence.AxleFront, evidence.AxleTotal, evidence.AxleRear} {
			ws = append(ws, P.weights([]evidence.Term{{Config: c, Axle: ax, W: 1}}))
		}
	}
	want := make([]Estimate, len(ws))
	wantNeg := make([]float64, len(ws))
	for i, w := range ws {
		want[i], wantNeg[i] = summarizeOwned(flatten(P.p.series(w)), P.level)
	}
	var wg sync.WaitGroup
	for g := range 2 {
		wg.Add(1)
		go func() {
			defer wg.Done()
			for range 3 {
				for i := g; i < len(ws); i += 2 {
					if got, neg := P.estimate(ws[i]); got != want[i] || neg != wantNeg[i] {
						t.Errorf("quantity %d: %+v, %v; from a fresh buffer %+v, %v", i, got, neg, want[i], wantNeg[i])
					}
				}
			}
		}()
	}
	wg.Wait()
}
