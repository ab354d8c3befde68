package report_test

import (
	"bytes"
	"regexp"
	"strings"
	"testing"

	"liftfuse/fuse"
	"liftfuse/methods"
	"liftfuse/methods/height"
	"liftfuse/report"
)

// goList matches a Go slice printed with %v ("[stock extended]"), which no
// text may show.
var goList = regexp.MustCompile(`\[[a-z][a-z0-9_-]* [a-z][a-z0-9_ -]*\]`)

// terminalTexts runs every command's text writer on the demo, its force
// unit kgf (campaign.yaml report.force_unit).
func terminalTexts(t *testing.T) map[string]string {
	t.Helper()
	in := demoInput(t, nil)
	unit := in.Campaign.Report.ForceUnit
	out := map[string]string{}
	var b bytes.Buffer
	if err := report.FuseText(&b, in.Fused.Result, unit); err != nil {
		t.Fatal(err)
	}
	out["fuse"] = b.String()
	b.Reset()
	if err := report.ReduceText(&b, in.Reduced, in.Fused.Result, unit); err != nil {
		t.Fatal(err)
	}
	out["reduce"] = b.String()
	b.Reset()
	pl := *in.Plan // with the detectability rows as cmd/liftfuse's plan adds them
	for _, h := range methods.Details[*height.Result](in.Reduced) {
		pl.Detectability = append(pl.Detectability, fuse.Detectability{Entry: h.Entry.ID, Axle: h.Entry.Axle,
			ResolvableN100: h.Detect.ResolvableN, SpeedForTarget: h.Detect.SpeedFor(pl.Target.Now.Mean)})
	}
	if err := report.PlanText(&b, &pl, unit); err != nil {
		t.Fatal(err)
	}
	out["plan"] = b.String()
	for _, u := range []string{"m2", "kgf"} {
		cc, err := in.Fused.Crosscheck(fuse.Claim{Config: "ducktail", Axle: "rear", SpeedKmh: 150, Value: -0.1, SD: 0.01, Unit: u, NewtonsPerUnit: 9.80665}, in.Campaign.Density())
		if err != nil {
			t.Fatal(err)
		}
		b.Reset()
		report.CrosscheckText(&b, cc)
		out["crosscheck "+u] = b.String()
	}
	return out
}

// TestTerminalWords: every command prints units the same way (m², never
// "m2"; forces in the campaign's unit), counts with their plural in words
// and no Go-printed lists.
func TestTerminalWords(t *testing.T) {
	texts := terminalTexts(t)
	unitM2 := regexp.MustCompile(`\bm2\b`)
	for name, text := range texts {
		t.Run(name, func(t *testing.T) {
			if m := unitM2.FindString(text); m != "" {
				t.Errorf("prints the unit as %q", m)
			}
			if m := goList.FindString(text); m != "" {
				t.Errorf("prints a Go list %q", m)
			}
			if m := regexp.MustCompile(`\b1 [a-z]+s\b|[a-z]\(s\)`).FindString(text); m != "" {
				t.Errorf("a count without its plural in words: %q", m)
			}
			if m := regexp.MustCompile(`[0-9] N(\s|$)|\bN at 2 sd|front N\b`).FindString(text); m != "" {
				t.Errorf("a force in N where the campaign's unit is kgf: %q", m)
			}
		})
	}
	if !strings.Contains(texts["crosscheck m2"], "± 0.01 m² (C_L·A)") {
		t.Errorf("the claim's C_L·A is not written m²:\n%s", texts["crosscheck m2"])
	}
}

// TestDetectabilitySameInReduceAndPlan: the smallest load a ride-height
// entry resolves is the same figure, in the same unit, in reduce and in
// plan (both 2·σ·K, height.Detect).
func TestDetectabilitySameInReduceAndPlan(t *testing.T) {
	texts := terminalTexts(t)
	inReduce := regexp.MustCompile(`(?m)^([a-z-]+): .*\n(?:  .*\n)*?  detectability: .* smallest load ([0-9.]+) kgf at 2 sd`).FindAllStringSubmatch(texts["reduce"], -1)
	if len(inReduce) == 0 {
		t.Fatalf("no detectability in kgf in reduce:\n%s", texts["reduce"])
	}
	for _, m := range inReduce {
		row := regexp.MustCompile(`(?m)^` + regexp.QuoteMeta(m[1]) + `\s+\S+\s+([0-9.]+)\s`).FindStringSubmatch(texts["plan"])
		if row == nil {
			t.Errorf("%s: no detectability row in plan", m[1])
			continue
		}
		if row[1] != m[2] {
			t.Errorf("%s: reduce says %s kgf, plan %s kgf", m[1], m[2], row[1])
		}
	}
	if !strings.Contains(texts["plan"], "smallest load (kgf)") {
		t.Error("plan's detectability is not headed in kgf")
	}
}

// TestCrosscheckVerdicts: the cross-check's text follows its verdict
// (fuse.Crosscheck: consistent, explained, unexplained): no heading over
// an empty list, the explanations when there are some, the things to look
// at when no single error explains the claim. Wording: common practice
// (no source).
func TestCrosscheckVerdicts(t *testing.T) {
	claim := fuse.Claim{Config: "ducktail", Axle: "rear", SpeedKmh: 150, Value: -12, SD: 1, Unit: "kgf"}
	tests := []struct {
		name        string
		cc          fuse.Crosscheck
		want, avoid []string
	}{
		{"consistent", fuse.Crosscheck{Claim: claim, Verdict: fuse.VerdictConsistent, Summary: "consistent: the campaign agrees with the claim (p = 0.5)"},
			[]string{"verdict: consistent"}, []string{"what would have to be different", "look at"}},
		{"explained", fuse.Crosscheck{Claim: claim, Verdict: fuse.VerdictExplained, Summary: "explained",
			Explanations: []fuse.Explanation{{Entry: "rear-pot", ShiftSD: 2.5, Plausible: true, Note: "the rear spring rate would be ×0.9"}}},
			[]string{"what would have to be different", "+2.5 sd", "plausible", "the rear spring rate would be ×0.9"}, []string{"look at"}},
		{"unexplained", fuse.Crosscheck{Claim: claim, Verdict: fuse.VerdictUnexplained, Summary: "no single modelled error explains it", Checks: []string{"a tyre pressure change"}},
			[]string{"verdict: no single modelled error explains it", "look at:\n  - a tyre pressure change"}, []string{"what would have to be different", "explains it;"}},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			var b bytes.Buffer
			report.CrosscheckText(&b, &tt.cc)
			for _, w := range tt.want {
				if !strings.Contains(b.String(), w) {
					t.Errorf("no %q in:\n%s", w, b.String())
				}
			}
			for _, a := range tt.avoid {
				if strings.Contains(b.String(), a) {
					t.Errorf("%q in:\n%s", a, b.String())
				}
			}
		})
	}
}
