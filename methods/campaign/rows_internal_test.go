package campaign

import (
	"strings"
	"testing"

	"liftfuse/methods/logs"
)

// TestRowsTimeSpan: the rows' time span is the first row's time to the
// last's, whichever path a row takes — the common row without a config
// column (Row alone) and with one (row) — for a log starting at 5 s (the
// span a segment's from_s and to_s are checked against).
func TestRowsTimeSpan(t *testing.T) {
	for _, tc := range []struct {
		name string
		text string
		cols []logs.Column
		dir  int
		cfg  int
	}{
		{"direction only", "t,d\n5,1\n6,-1\n7.5,1\n", []logs.Column{{Name: "t", Time: true}, {Name: "d"}}, 1, -1},
		{"no direction, no config", "t\n5\n6\n7.5\n", []logs.Column{{Name: "t", Time: true}}, -1, -1},
		{"config column", "t,c\n5,a\n6,a\n7.5,b\n", []logs.Column{{Name: "t", Time: true}, {Name: "c", Text: true}}, -1, 1},
	} {
		t.Run(tc.name, func(t *testing.T) {
			r, err := logs.NewReader(strings.NewReader(tc.text), "x.csv", tc.cols)
			if err != nil {
				t.Fatal(err)
			}
			defer r.Close()
			k := NewRows(nil, &LogSpec{}, 0, tc.dir, tc.cfg)
			for r.Next() {
				if _, _, err := k.Row(r); err != nil {
					t.Fatal(err)
				}
			}
			if err := r.Err(); err != nil {
				t.Fatal(err)
			}
			if res := k.result(); res.t0 != 5 || res.t1 != 7.5 {
				t.Errorf("span %g–%g s, want 5–7.5 s", res.t0, res.t1)
			}
		})
	}
}
