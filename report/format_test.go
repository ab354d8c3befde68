package report

import (
	"math"
	"testing"

	"liftfuse/methods/evidence"
)

// TestPercent: probabilities as whole percentages with a space before the
// sign, SI Brochure 9th ed. (BIPM 2019) 5.4.7 ("x = 0.25 = 25 %"); the
// clamping at 1 % and 99 % is common practice (no source) for sampled
// probabilities.
func TestPercent(t *testing.T) {
	tests := []struct {
		name string
		p    float64
		want string
	}{
		{"SI Brochure example 0.25", 0.25, "25 %"},
		{"credible level 0.9", 0.9, "90 %"},
		{"59.4 % rounds to 59 %", 0.594, "59 %"},
		{"zero is not certain", 0, "<1 %"},
		{"0.51 % rounds to 1 %", 0.0051, "1 %"},
		{"one is not certain", 1, ">99 %"},
		{"99.4 % stays 99 %", 0.994, "99 %"},
		{"nothing to say", math.NaN(), "–"},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			if got := percent(tt.p); got != tt.want {
				t.Errorf("percent(%g) = %q, want %q", tt.p, got, tt.want)
			}
		})
	}
}

// TestMethodReports: every method kind of the campaign format
// (design/campaign-format.md, "evidence": ride_height, pressure, vortex) has exactly one
// complete methodReport, and only the vortex sense is sign-only
// (design/model.md, vortex: "its answer is a sign").
func TestMethodReports(t *testing.T) {
	tests := []struct {
		kind     evidence.Kind
		signOnly bool
	}{
		{evidence.KindRideHeight, false},
		{evidence.KindPressure, false},
		{evidence.KindVortex, true},
	}
	if n := len(methodReports()); n != len(tests) {
		t.Errorf("%d method reports, want one per kind (%d)", n, len(tests))
	}
	for _, tt := range tests {
		t.Run(string(tt.kind), func(t *testing.T) {
			m, ok := reportOf(string(tt.kind))
			if !ok {
				t.Fatalf("no report for %s", tt.kind)
			}
			if m.sections == nil || m.reduced == nil || m.limits == nil {
				t.Errorf("incomplete report for %s: %+v", tt.kind, m)
			}
			if m.signOnly != tt.signOnly {
				t.Errorf("signOnly = %v, want %v", m.signOnly, tt.signOnly)
			}
		})
	}
	if _, ok := reportOf("smoke"); ok {
		t.Error("an unknown kind has a report")
	}
}

// TestIsPercent: a probability after its symbol takes "=" unless it is
// written as a bound (common practice, no source).
func TestIsPercent(t *testing.T) {
	tests := []struct {
		name string
		p    float64
		want string
	}{
		{"ordinary", 0.42, "= 42 %"},
		{"near one", 0.9999, ">99 %"},
		{"near zero", 0.001, "<1 %"},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			if got := isPercent(tt.p); got != tt.want {
				t.Errorf("isPercent(%g) = %q, want %q", tt.p, got, tt.want)
			}
		})
	}
}
