package fuse

import (
	"fmt"
	"sync"
	"testing"

	"liftfuse/methods/evidence"
)

// looCase is a campaign of n configurations reduced and fitted once per
// process, with the leave-one-out fits of its entries, for the benchmarks
// and exactness tests of the agreement's parts.
type looCase struct {
	full *model
	evs  []evidence.Evidence
	lo   *looFits
}

var (
	looCasesMu sync.Mutex
	looCases   = map[int]*looCase{}
)

// scaleLoo returns the looCase of n configurations (see looCase).
func scaleLoo(tb testing.TB, n int) *looCase {
	tb.Helper()
	looCasesMu.Lock()
	defer looCasesMu.Unlock()
	if c, ok := looCases[n]; ok {
		return c
	}
	evs, ids := scaleEvidence(tb, n)
	set := Settings{Configs: ids, Seed: 1, Credible: 0.9}.withDefaults()
	set.reference = "baseline"
	c := newLooCase(tb, evs, set)
	looCases[n] = c
	return c
}

// newLooCase fits the campaign of evs and its leave-one-out fits.
func newLooCase(tb testing.TB, evs []evidence.Evidence, set Settings) *looCase {
	tb.Helper()
	full, err := newModel(evs, set)
	if err != nil {
		tb.Fatal(err)
	}
	P, err := full.fit()
	if err != nil {
		tb.Fatal(err)
	}
	lo, err := leaveOneOut(full, P, evs)
	if err != nil {
		tb.Fatal(err)
	}
	return &looCase{full: full, evs: evs, lo: lo}
}

// BenchmarkAgreementParts times the agreement of each entry of the
// 24-configuration campaign with its others' posterior (already fitted).
func BenchmarkAgreementParts(b *testing.B) {
	c := scaleLoo(b, 24)
	for ei, ev := range c.evs {
		c.lo.others[ei].mu.Lock()
		O := c.lo.others[ei].wholeLocked()
		c.lo.others[ei].mu.Unlock()
		if len(ev.Blocks) > 0 {
			b.Run(fmt.Sprintf("entry=%d/predictive", ei), func(b *testing.B) {
				for b.Loop() {
					looPredictive(c.full, ei, O)
				}
			})
		}
		b.Run(fmt.Sprintf("entry=%d/agreement", ei), func(b *testing.B) {
			for b.Loop() {
				agreement(c.full, ei, ev, O)
			}
		})
	}
}
