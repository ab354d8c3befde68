package fuse_test

import (
	"strings"
	"testing"

	"liftfuse/fuse"
)

// TestCheckLine: a model check as one warning line; a rule-based check
// (p-value 0) prints no p.
func TestCheckLine(t *testing.T) {
	tests := []struct {
		name      string
		c         fuse.Check
		want, not string
	}{
		{"with p", fuse.Check{Check: "height-not-linear", Entry: "rear-pot", Config: "wing", PValue: 0.0004, Cause: "bump-stop contact"},
			"rear-pot, wing: height-not-linear (p = 0.0004) — likely bump-stop contact", ""},
		{"rule without p", fuse.Check{Check: "gain-negative", Entry: "rpot", Action: "check the sign of mm_per_unit"},
			"rpot: gain-negative; check the sign of mm_per_unit", "p ="},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			got := tt.c.Line()
			if !strings.HasPrefix(got, tt.want) || tt.not != "" && strings.Contains(got, tt.not) {
				t.Errorf("Line() = %q, want it to start %q without %q", got, tt.want, tt.not)
			}
		})
	}
}
