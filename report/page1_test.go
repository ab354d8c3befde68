package report_test

import (
	"fmt"
	"math"
	"regexp"
	"slices"
	"strings"
	"testing"

	"liftfuse/fuse"
	"liftfuse/methods/air"
	"liftfuse/methods/campaign"
	"liftfuse/report"
)

// number is a figure as the prose prints it: signed decimals, with the
// typographic minus read as a minus.
var number = regexp.MustCompile(`[+\-−]?[0-9]+(\.[0-9]+)?`)

// printed lists how the report may print an estimate in a unit: mean,
// bounds and magnitude, with and without a sign, to one decimal.
func printed(e fuse.Estimate, k float64) []string {
	var out []string
	for _, x := range []float64{e.Mean / k, e.Lo / k, e.Hi / k, math.Abs(e.Mean / k)} {
		out = append(out, fmt.Sprintf("%.1f", x), fmt.Sprintf("%+.1f", x))
	}
	return out
}

// percentNumbers is the number inside a percentage as the report prints
// it ("<1 %" → "1", "42 %" → "42").
func percentNumbers(p float64) string {
	switch {
	case p < 0.005:
		return "1"
	case p > 0.995:
		return "99"
	}
	return fmt.Sprintf("%.0f", 100*p)
}

// allowedAtSpeeds is every figure the result document gives at the
// report speeds, as the prose prints it, with the speeds and the level.
func allowedAtSpeeds(in report.Input, k float64) map[string]bool {
	res := in.Fused.Result
	ok := map[string]bool{percentNumbers(res.Credible): true}
	for _, v := range in.Campaign.Report.SpeedsKmh {
		ok[fmt.Sprintf("%g", v)] = true
	}
	for _, c := range res.Configs {
		for _, s := range c.AtSpeeds {
			for _, e := range []fuse.Estimate{s.FrontN, s.RearN, s.TotalN} {
				for _, p := range printed(e, k) {
					ok[p] = true
				}
			}
		}
	}
	return ok
}

// TestPage1Figures: every number in page 1's "What we found" is one the
// result document gives — the forces at each report speed from at_speeds
// (result-format.md), the changes from the deltas' C_L·A times q at that
// speed (exact for the constant speed model, the demo's), and the
// probabilities from the deltas' p_downforce. Parsed back from the text.
func TestPage1Figures(t *testing.T) {
	in := demoInput(t, nil)
	res := in.Fused.Result
	k := air.StandardGravity // the demo's unit is kgf
	ok := allowedAtSpeeds(in, k)
	for _, d := range res.Deltas {
		for _, v := range in.Campaign.Report.SpeedsKmh {
			q := air.DynamicPressure(res.Air.DensityKgM3, air.KmhToMs(v))
			for _, a := range []fuse.AxleResult{d.Front, d.Rear, d.Total} {
				for _, p := range printed(a.CLA.Scale(q), k) {
					ok[p] = true
				}
				ok[percentNumbers(a.PDownforce)] = true
			}
		}
	}
	sentences, err := report.Findings(in)
	if err != nil {
		t.Fatal(err)
	}
	if len(sentences) != 1+len(res.Deltas) {
		t.Fatalf("%d findings, want the reference and one per change", len(sentences))
	}
	n := 0
	for _, s := range sentences {
		for _, tok := range number.FindAllString(s, -1) {
			n++
			if !ok[strings.ReplaceAll(tok, "−", "-")] {
				t.Errorf("%q in %q is not a figure of the result document", tok, s)
			}
		}
	}
	if n < 10 {
		t.Errorf("only %d numbers parsed back; the findings lost their figures", n)
	}
	// Every report speed is spoken of.
	for _, v := range in.Campaign.Report.SpeedsKmh {
		if !strings.Contains(sentences[0], fmt.Sprintf("%g km/h", v)) {
			t.Errorf("the findings do not speak of %g km/h: %q", v, sentences[0])
		}
	}
}

// TestPage1LinearSpeedModel: with speed_model linear, β depends on speed,
// so the reference's figures at each speed must be the result document's
// at that speed — not β at 100 km/h times q (issue 11). Every number of
// the reference's sentence is one of at_speeds.
func TestPage1LinearSpeedModel(t *testing.T) {
	in := demoInput(t, func(c *campaign.Campaign) { c.Prior.SpeedModel = campaign.SpeedLinear })
	ok := allowedAtSpeeds(in, air.StandardGravity)
	sentences, err := report.Findings(in)
	if err != nil {
		t.Fatal(err)
	}
	for _, tok := range number.FindAllString(sentences[0], -1) {
		if !ok[strings.ReplaceAll(tok, "−", "-")] {
			t.Errorf("%q in %q is not a figure of at_speeds", tok, sentences[0])
		}
	}
}

// TestReportSections: the report has page 1's answers, the charts and the
// run log, in that order.
func TestReportSections(t *testing.T) {
	text := pdfText(t, mustPDF(t, demoInput(t, nil)))
	want := []string{"What we found", "Lift at the report speeds", "Change against baseline", "Checks", "What to do next",
		"Lift against speed", "Where the sensors were", "Detailed results", "balance, front − rear", "Run log", "Provenance"}
	last := -1
	for _, w := range want {
		i := strings.Index(text, w)
		if i < 0 {
			t.Errorf("no %q", w)
			continue
		}
		if i < last {
			t.Errorf("%q out of order", w)
		}
		last = i
	}
	if strings.Contains(text, "…") {
		t.Error("a cell was cut with an ellipsis")
	}
}

func mustPDF(t *testing.T, in report.Input) []byte {
	t.Helper()
	b, err := report.PDF(in)
	if err != nil {
		t.Fatal(err)
	}
	return b
}

// TestReportSpeaksOfThisCampaign: a campaign of potentiometers only, run
// on a track: the notes name no laser, taps or vortex, the safety text no
// runway, and the methods are counted as methods (one kind, two entries).
func TestReportSpeaksOfThisCampaign(t *testing.T) {
	in := demoInput(t, func(c *campaign.Campaign) {
		c.Campaign.Site = "a closed test track"
		c.Evidence.Pressure, c.Evidence.Vortex = nil, nil
		c.Evidence.RideHeight = slices.DeleteFunc(c.Evidence.RideHeight, func(e campaign.RideHeightEntry) bool { return e.Sensor == campaign.SensorLaser })
	})
	flat := strings.Join(strings.Fields(pdfText(t, mustPDF(t, in))), " ")
	for _, bad := range []string{"runway", "Ride height (laser)", "Pressure taps: see only", "Vortex sense: a sign", "Dashed beams"} {
		if strings.Contains(flat, bad) {
			t.Errorf("the pots-only report speaks of %q", bad)
		}
	}
	for _, good := range []string{"1 measurement method (2 entries)", "Ride height (potentiometers)", "a closed test track", "Springs: suspension potentiometers"} {
		if !strings.Contains(flat, good) {
			t.Errorf("the pots-only report lacks %q", good)
		}
	}
}

// TestPage1RobustHeadline: a laser whose gain is stated 60 % too high
// (mm_per_unit 1.6 where the demo's truth is 1) disagrees with the pots
// and the taps; the result's headline is then the robust fusion
// (result-format.md, headline), and page 1 says so once, in its own words,
// with the plain fusion's figure beside the headline one.
func TestPage1RobustHeadline(t *testing.T) {
	in := demoInput(t, func(c *campaign.Campaign) {
		for i := range c.Evidence.RideHeight {
			if c.Evidence.RideHeight[i].ID == "rear-laser" {
				c.Evidence.RideHeight[i].Calibration.MmPerUnit = 1.6
			}
		}
	})
	if h := in.Fused.Result.Headline; h != fuse.HeadlineRobust {
		t.Fatalf("the fusion kept a %q headline for a laser 60 %% off", h)
	}
	checks, err := report.Checks(in)
	if err != nil {
		t.Fatal(err)
	}
	all := strings.Join(checks, "\n")
	for _, want := range []string{"rear-laser (ride_height) disagrees", "from the robust fusion, which widens its errors",
		"the errors of rear-laser were widened", "With every entry at its stated errors (the plain fusion), ducktail's"} {
		if !strings.Contains(all, want) {
			t.Errorf("page 1's checks lack %q:\n%s", want, all)
		}
	}
	if n := strings.Count(all, "robust fusion"); n != 2 {
		t.Errorf("the robust fusion is spoken of %d times, want 2 (the flagged entry and the note):\n%s", n, all)
	}
}
