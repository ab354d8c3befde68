package report

import (
	"strings"
	"testing"

	"liftfuse/fuse"
)

// delta is a change whose front, rear and total C_L·A have the given means
// and a standard deviation of 0.005 m², 90 % bounds at ±1.645 sd (normal
// quantile, any statistics table).
func delta(front, rear, total float64) fuse.DeltaResult {
	e := func(m float64) fuse.AxleResult {
		return fuse.AxleResult{CLA: fuse.Estimate{Mean: m, SD: 0.005, Lo: m - 1.645*0.005, Hi: m + 1.645*0.005}}
	}
	return fuse.DeltaResult{Config: "ducktail", Versus: "baseline", Front: e(front), Rear: e(rear), Total: e(total)}
}

// TestHeadlineText: what page 1 says of a flagged entry and of a robust
// headline, for a result that does not say which fusion it is (format 1),
// a plain headline and a robust one (result-format.md, headline). The
// axle named is the one the down-weighting moved most in robust standard
// deviations (common practice, no source): the rear, moved 0.003/0.005 =
// 0.6 sd against the front's 0.2 and the total's 0.4.
func TestHeadlineText(t *testing.T) {
	robust := delta(0.017, -0.150, -0.133)
	plain := delta(0.016, -0.147, -0.131)
	tests := []struct {
		name   string
		h      headline
		effect string
		note   []string // fragments of the robust note; nil: no note
	}{
		{"format 1 result", headline{}, "the fused figures down-weight it", nil},
		{"plain headline", headline{known: true}, "keep it at its stated errors", nil},
		{"robust, another entry down-weighted", headline{known: true, robust: true, downWeighted: []string{"body-taps"}}, "keep it at its stated errors", []string{"the errors of body-taps were widened"}},
		{"robust headline", headline{known: true, robust: true, downWeighted: []string{"rear-laser"}, plainDeltas: []fuse.DeltaResult{plain}},
			"from the robust fusion, which widens its errors",
			[]string{"the errors of rear-laser were widened because it disagreed with the others", "ducktail's rear change against baseline would be -0.147 (-0.155 to -0.139) m² of " + symCLA + " instead of -0.150 (-0.158 to -0.142)"}},
		{"robust, two entries, no plain figures", headline{known: true, robust: true, downWeighted: []string{"body-taps", "rear-laser"}},
			"from the robust fusion, which widens its errors",
			[]string{"the errors of body-taps and rear-laser were widened because they disagreed with the others."}},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			if got := tt.h.flaggedEffect("rear-laser"); !strings.Contains(got, tt.effect) {
				t.Errorf("flaggedEffect = %q, want %q in it", got, tt.effect)
			}
			note := tt.h.robustNote([]fuse.DeltaResult{robust})
			if tt.note == nil && note != "" {
				t.Errorf("a note for a headline that is not robust: %q", note)
			}
			for _, f := range tt.note {
				if !strings.Contains(note, f) {
					t.Errorf("note %q lacks %q", note, f)
				}
			}
		})
	}
}

// TestCheckSentence: a tripped model check in one sentence, its name in
// words and its p-value to two significant figures (the warning format
// of fuse.Check.Line, result-format.md "checks").
func TestCheckSentence(t *testing.T) {
	tests := []struct {
		name string
		c    modelCheck
		want string
	}{
		{"everything", modelCheck{fuse.Check{Check: "height-not-linear", Entry: "rear-pot", Config: "wing-mid", Where: "windows above 140 km/h", PValue: 0.00041, Cause: "bump-stop contact or progressive springs", Action: "set max_speed_kmh: 140 on rear-pot"}},
			"rear-pot, wing-mid, windows above 140 km/h: height not linear (p = 0.00041); likely bump-stop contact or progressive springs; set max_speed_kmh: 140 on rear-pot."},
		{"entry only", modelCheck{fuse.Check{Check: "negative-gain", Entry: "front-pot", PValue: 0.01}},
			"front-pot: negative gain (p = 0.01)."},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			if got := tt.c.sentence(); got != tt.want {
				t.Errorf("sentence() =\n%q, want\n%q", got, tt.want)
			}
		})
	}
}
