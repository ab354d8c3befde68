package fuse

import (
	"fmt"
	"reflect"
	"testing"

	"liftfuse/methods/evidence"
)

// TestOthersTrackLeftOut: the fit of every entry but e tracks e's
// quantities (Settings.track) — those e informs and the lift of every axle
// e's data read, the ones e's agreement compares — and no other entry's;
// on the demo the entries inform different axles, so tracking a
// neighbour's would differ.
func TestOthersTrackLeftOut(t *testing.T) {
	evs, set := demoEvidence(t)
	full, err := newModel(evs, set)
	if err != nil {
		t.Fatal(err)
	}
	lo := &looFits{setOthers: set, full: full}
	distinct := map[string]bool{}
	for ei, ev := range evs {
		om, err := lo.othersModel(evs, ei)
		if err != nil {
			t.Fatal(err)
		}
		qs := append([]evidence.Quantity{}, ev.Informs...)
		for bi := range full.blocks {
			if full.blocks[bi].entry != ei {
				continue
			}
			for _, ri := range full.blocks[bi].rows {
				for _, l := range full.rows[ri].lift {
					qs = append(qs, evidence.Quantity{Config: full.lin[l.col].config, Axle: full.lin[l.col].axle})
				}
			}
		}
		var want [][]entryRef
		seen := map[evidence.Quantity]bool{}
		for _, q := range qs {
			if om.informed[q.Config] && !seen[q] {
				seen[q] = true
				want = append(want, om.quantity(q))
			}
		}
		got := om.trackedColumns()
		if len(want) == 0 || !reflect.DeepEqual(got, want) {
			t.Errorf("every entry but %s tracks %v, want %v (its quantities %v)", ev.Entry, got, want, qs)
		}
		distinct[fmt.Sprint(qs)] = true
	}
	if len(distinct) < 2 {
		t.Fatalf("the demo's entries all speak of the same quantities: the test cannot tell them apart")
	}
}

// TestTrackBetweenAxles: a height read between the axles sees both axles'
// lift but informs its own; the fits made for it track both, since its
// agreement may name either as its worst disagreement.
func TestTrackBetweenAxles(t *testing.T) {
	obs := func(label string, w map[string]float64) evidence.Block {
		var o []evidence.Obs
		var sd []float64
		for _, q := range []float64{300, 600, 900} {
			var ts []evidence.Term
			for _, ax := range []string{evidence.AxleFront, evidence.AxleRear} {
				if w[ax] != 0 {
					ts = append(ts, evidence.Term{Config: "c", Axle: ax, W: w[ax]})
				}
			}
			o = append(o, evidence.Obs{Y: 0.1 * q, Terms: ts, Air: evidence.Airspeed{Q: q}, Label: label})
			sd = append(sd, 1)
		}
		b, err := evidence.Diagonal(o, sd)
		if err != nil {
			t.Fatal(err)
		}
		return b
	}
	front, rear := evidence.Quantity{Config: "c", Axle: evidence.AxleFront}, evidence.Quantity{Config: "c", Axle: evidence.AxleRear}
	evs := []evidence.Evidence{
		{Entry: "laser", Kind: evidence.KindRideHeight, Blocks: []evidence.Block{obs("laser", map[string]float64{evidence.AxleFront: 0.3, evidence.AxleRear: 0.7})}, Informs: []evidence.Quantity{rear}},
		{Entry: "pot", Kind: evidence.KindRideHeight, Blocks: []evidence.Block{obs("pot", map[string]float64{evidence.AxleFront: 1})}, Informs: []evidence.Quantity{front}},
	}
	set := Settings{Configs: []string{"c"}, Seed: 1, Credible: 0.9}.withDefaults()
	full, err := newModel(evs, set)
	if err != nil {
		t.Fatal(err)
	}
	lo := &looFits{setOthers: set, full: full}
	om, err := lo.othersModel(evs, 0)
	if err != nil {
		t.Fatal(err)
	}
	want := [][]entryRef{om.quantity(rear), om.quantity(front)}
	if got := om.trackedColumns(); !reflect.DeepEqual(got, want) {
		t.Errorf("every entry but the laser tracks %v, want its rear and front lift %v", got, want)
	}
}
