package report

import (
	"fmt"
	"testing"
)

// TestBarGroups: agreement charts of at most n bars, each configuration
// and axle's group (a fused bar, then its entries) kept whole, every bar
// once and in order (common practice, no source).
func TestBarGroups(t *testing.T) {
	group := func(entries int) []bar {
		g := []bar{{fused: true}}
		for range entries {
			g = append(g, bar{})
		}
		return g
	}
	tests := []struct {
		name   string
		groups []int // entries per group
		n      int
		want   []int // bars per chart
	}{
		{"fits in one", []int{2, 3}, 40, []int{7}},
		{"cut between groups", []int{3, 3, 3}, 9, []int{8, 4}},
		{"exact fit", []int{3, 3}, 4, []int{4, 4}},
		{"a group longer than a chart", []int{9}, 4, []int{4, 4, 2}},
		{"none", nil, 4, nil},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			var bars []bar
			for i, e := range tt.groups {
				g := group(e)
				for k := range g {
					g[k].label = fmt.Sprintf("%d/%d", i, k)
				}
				bars = append(bars, g...)
			}
			parts := barGroups(bars, tt.n)
			var got []int
			var all []bar
			for _, p := range parts {
				got = append(got, len(p))
				all = append(all, p...)
			}
			if fmt.Sprint(got) != fmt.Sprint(tt.want) {
				t.Errorf("charts of %v bars, want %v", got, tt.want)
			}
			for i := range all {
				if all[i].label != bars[i].label {
					t.Fatalf("bar %d is %q, want %q", i, all[i].label, bars[i].label)
				}
			}
		})
	}
}
