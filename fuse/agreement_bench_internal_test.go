package fuse

import (
	"fmt"
	"strings"
	"sync"
	"testing"

	"liftfuse/methods"
	"liftfuse/methods/evidence"
	"liftfuse/methods/sim"
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
	cp, _, err := sim.Build(strings.NewReader(scaleSpec(tb, n)), "scale.yaml", tb.TempDir())
	if err != nil {
		tb.Fatal(err)
	}
	r, err := methods.Reduce(cp, methods.Options{})
	if err != nil {
		tb.Fatal(err)
	}
	var ids []string
	for _, cf := range cp.Configurations {
		ids = append(ids, cf.ID)
	}
	set := Settings{Configs: ids, Seed: 1, Credible: 0.9}.withDefaults()
	set.reference = "baseline"
	evs := r.Evidence()
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
	c := &looCase{full: full, evs: evs, lo: lo}
	looCases[n] = c
	return c
}

// BenchmarkAgreementParts times the agreement of each entry of the
// 24-configuration campaign with its others' posterior (already fitted).
func BenchmarkAgreementParts(b *testing.B) {
	c := scaleLoo(b, 24)
	for ei, ev := range c.evs {
		O := c.lo.others[ei].wholeLocked()
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
