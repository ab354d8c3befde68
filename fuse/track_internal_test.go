package fuse

import (
	"fmt"
	"reflect"
	"testing"

	"liftfuse/methods"
	"liftfuse/methods/campaign"
	"liftfuse/methods/evidence"
)

// TestOthersTrackLeftOut: the fit of every entry but e tracks e's
// quantities (Settings.track) — the ones e's agreement compares — and no
// other entry's; on the demo the entries inform different axles, so
// tracking a neighbour's would differ.
func TestOthersTrackLeftOut(t *testing.T) {
	c, err := campaign.Load("../examples/ducktail-fastback/campaign.yaml", campaign.Options{})
	if err != nil {
		t.Fatal(err)
	}
	r, err := methods.Reduce(c, methods.Options{})
	if err != nil {
		t.Fatal(err)
	}
	evs := r.Evidence()
	set := Settings{Configs: []string{"baseline", "ducktail"}, Seed: 1, Credible: 0.9}.withDefaults()
	lo := &looFits{setOthers: set}
	distinct := map[string]bool{}
	for ei, ev := range evs {
		om, err := lo.othersModel(evs, ei)
		if err != nil {
			t.Fatal(err)
		}
		var want [][]entryRef
		seen := map[evidence.Quantity]bool{}
		for _, q := range ev.Informs {
			if om.informed[q.Config] && !seen[q] {
				seen[q] = true
				want = append(want, om.quantity(q))
			}
		}
		got := om.trackedColumns()
		if len(want) == 0 || !reflect.DeepEqual(got, want) {
			t.Errorf("every entry but %s tracks %v, want %v (its quantities %v)", ev.Entry, got, want, ev.Informs)
		}
		distinct[fmt.Sprint(ev.Informs)] = true
	}
	if len(distinct) < 2 {
		t.Fatalf("the demo's entries all inform the same quantities: the test cannot tell them apart")
	}
}
