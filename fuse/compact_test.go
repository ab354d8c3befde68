package fuse

import (
	"testing"
)

// TestCompactKeepsWhatItServes: a compacted posterior (standalone and
// others' fits are compacted once their agreement is computed) serves the
// columns it kept from its own draws, and any other column from its refit,
// exactly as before compaction (same seed, same draws); its joint moments,
// taken before compaction, survive it.
func TestCompactKeepsWhatItServes(t *testing.T) {
	m := offsetModel(t, 7, false)
	fit := func() (*Posterior, error) { return m.fit() }
	P, err := fit()
	if err != nil {
		t.Fatal(err)
	}
	lift, nuis := -1, -1
	for i, lp := range m.lin {
		switch {
		case lp.kind == kindNuisance && nuis < 0:
			nuis = i
		case lp.kind != kindNuisance:
			lift = i
		}
	}
	if lift < 0 || nuis < 0 {
		t.Fatalf("model has no lift (%d) or no nuisance column (%d)", lift, nuis)
	}
	cols := map[string]int{"last lift column": lift, "a nuisance column, not kept": nuis}
	before := map[string][][]float64{}
	for name, c := range cols {
		before[name] = P.seriesOf([]entryRef{{c, 1}})
	}
	mean, C := P.joint()
	P.compact(fit, nil)
	if !P.compacted {
		t.Fatal("not compacted")
	}
	for name, c := range cols {
		after := P.seriesOf([]entryRef{{c, 1}})
		for ch := range before[name] {
			for i := range before[name][ch] {
				if after[ch][i] != before[name][ch][i] {
					t.Fatalf("%s (θ %d), chain %d draw %d: %g after compaction, %g before", name, c, ch, i, after[ch][i], before[name][ch][i])
				}
			}
		}
	}
	m2, C2 := P.joint()
	if C2 != C || m2[nuis] != mean[nuis] {
		t.Errorf("joint moments recomputed after compaction")
	}
}
