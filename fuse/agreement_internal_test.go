package fuse

import "testing"

// TestJudge: the result document's flag follows result-format.md ("flag is
// true when p_value < 0.05 or p_off > 0.5"); the tool names a suspect at
// the stricter p < 0.01 (model.md: ≤ 1 % false alarms per entry on a clean
// day) or the same P(off).
func TestJudge(t *testing.T) {
	cases := []struct {
		name          string
		p, pOff       float64
		flag, suspect bool
	}{
		{"agrees", 0.42, 0.03, false, false},
		{"p between the levels", 0.03, 0.10, true, false},
		{"p at 0.05 is not below it", 0.05, 0.10, false, false},
		{"p below 0.01", 0.004, 0.20, true, true},
		{"P(off) above one half alone", 0.30, 0.60, true, true},
	}
	for _, tc := range cases {
		t.Run(tc.name, func(t *testing.T) {
			ag := &Agreement{PValue: tc.p, POff: tc.pOff}
			ag.judge()
			if ag.Flag != tc.flag || ag.Suspect != tc.suspect {
				t.Errorf("p %g, P(off) %g: flag %v suspect %v, want %v %v", tc.p, tc.pOff, ag.Flag, ag.Suspect, tc.flag, tc.suspect)
			}
		})
	}
}
