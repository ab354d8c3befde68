package fuse

import (
	"math"
	"strings"
	"testing"

	"liftfuse/methods/evidence"
)

// TestExplanationBounds: a single error explains a claim only within its
// physical bounds (model.md): at most 4 prior sd, a wind of at most 15 m/s,
// a scale factor in [0.5, 2], a Cp in [−3, 1.05]. The rejected values are
// those issue 12 found printed ("1.16e+04 m/s", "×9.35e+04", "×2.65e-65").
func TestExplanationBounds(t *testing.T) {
	wind := errorTerm{label: "along-road wind", unit: "m/s", sd: 1, wind: true}
	springs := errorTerm{label: "front spring rate", sd: 0.2, logScale: true}
	growth := errorTerm{label: "rear tyre growth", unit: "mm at 100 km/h", mean: 0.5, sd: 0.5}
	cp := errorTerm{label: "taps uncovered lower patch at x = 3.00 m", unit: evidence.UnitCp, mean: -0.1, sd: 0.4}
	drag := errorTerm{label: "pitch of drag C_D·A·h/L", unit: "m²", sd: 0.2, logScale: true, median: 0.124}
	cases := []struct {
		name          string
		et            errorTerm
		shift, target float64
		want          bool
	}{
		{"wind 3 m/s at 3 sd", wind, 3, 3, true},
		{"wind 1.16e4 m/s", wind, 1.16e4, 1.16e4, false},
		{"gale of 16 m/s within 4 sd of a wide prior", errorTerm{label: "wind", sd: 4.5, wind: true}, 3.6, 16, false},
		{"springs ×1.8 at 2.9 sd", springs, 2.94, math.Log(1.8), true},
		{"springs ×0.45", springs, -3.99, math.Log(0.45), false},
		{"springs ×9.35e4", springs, 57, math.Log(9.35e4), false},
		{"springs ×2.65e-65", springs, -746, math.Log(2.65e-65), false},
		{"tyre growth at 3.9 sd", growth, 3.9, 2.45, true},
		{"tyre growth at 4.5 sd", growth, 4.5, 2.75, false},
		{"Cp −0.5", cp, -1, -0.5, true},
		{"Cp 1.2 (beyond stagnation)", cp, 3.25, 1.2, false},
		{"drag pitch ×1.8 at 2.9 sd", drag, 2.94, math.Log(1.8), true},
		{"drag pitch ×2.2 at 3.9 sd", drag, 3.94, math.Log(2.2), false},
	}
	for _, tc := range cases {
		t.Run(tc.name, func(t *testing.T) {
			if got := tc.et.within(tc.shift, tc.target); got != tc.want {
				t.Errorf("within(%v, %v) = %v, want %v", tc.shift, tc.target, got, tc.want)
			}
		})
	}
}

// TestLogNormalExplanation: a log-normal nuisance's explanation is in its
// own unit — the stated median times the factor, 0.124 m² × e^0.5878 =
// 0.2232 m² (hand-worked) — with its shift in prior sd and the factor.
func TestLogNormalExplanation(t *testing.T) {
	drag := errorTerm{label: "pitch of drag C_D·A·h/L", unit: "m²", sd: 0.2, logScale: true, median: 0.124}
	ex := drag.explanation("taps", 2.94, 0.5878)
	if math.Abs(ex.Value-0.2232) > 1e-4 || ex.Unit != "m²" || ex.ShiftSD != 2.94 || ex.Plausible {
		t.Errorf("explanation %+v, want 0.2232 m² at 2.94 sd, not plausible (beyond 2 sd)", ex)
	}
	for _, want := range []string{"0.223 m²", "0.124 m²", "×1.8", "±20 %"} {
		if !strings.Contains(ex.Note, want) {
			t.Errorf("note %q does not say %q", ex.Note, want)
		}
	}
}

// TestTradeChecksByKind: the trade's checks match the kinds of entry
// involved — no fuel-load or tyre-pressure advice for a pressure entry,
// no tap advice for a ride-height one; the common checks always.
func TestTradeChecksByKind(t *testing.T) {
	cases := []struct {
		name      string
		kinds     []evidence.Kind
		want, not []string
	}{
		{"pressure", []evidence.Kind{evidence.KindPressure}, []string{"tap tube", "reference port", "speeds not matched"}, []string{"fuel", "tyre pressure", "bracket"}},
		{"ride height", []evidence.Kind{evidence.KindRideHeight, evidence.KindRideHeight}, []string{"fuel", "tyre pressure", "speeds not matched"}, []string{"tap", "tuft"}},
		{"vortex", []evidence.Kind{evidence.KindVortex}, []string{"tuft", "configuration change"}, []string{"fuel", "tap"}},
	}
	for _, tc := range cases {
		t.Run(tc.name, func(t *testing.T) {
			got := strings.Join((&model{data: &data{kinds: tc.kinds}}).tradeChecks(), "\n")
			for _, w := range tc.want {
				if !strings.Contains(got, w) {
					t.Errorf("checks lack %q:\n%s", w, got)
				}
			}
			for _, n := range tc.not {
				if strings.Contains(got, n) {
					t.Errorf("checks mention %q:\n%s", n, got)
				}
			}
		})
	}
}
