package report_test

import (
	"fmt"
	"math"
	"regexp"
	"slices"
	"strings"
	"testing"

	"liftfuse/methods"
	"liftfuse/methods/campaign"
	"liftfuse/methods/height"
	"liftfuse/report"
)

// fastestWindow is the index of the fastest window of a height result,
// the one whose trace the report draws.
func fastestWindow(h *height.Result) int {
	best := 0
	for i, w := range h.Windows {
		if w.SpeedKmh > h.Windows[best].SpeedKmh {
			best = i
		}
	}
	return best
}

// poke sets one value of the first ride-height entry's reduction: a cell
// of the drawn trace inside the fastest window, or a window's mean.
func poke(in report.Input, v float64, trace bool) {
	h := methods.Details[*height.Result](in.Reduced)[0]
	w := h.Windows[fastestWindow(h)]
	if !trace {
		h.Windows[fastestWindow(h)].HeightMM = v
		return
	}
	tr := h.Traces[w.Log]
	for i := range tr {
		if tr[i].T >= w.From && tr[i].T <= w.To {
			tr[i].Raw, tr[i].LowPass, tr[i].MovingAverage = v, v, v
			return
		}
	}
}

// nonFinite is how Go's fmt writes a non-finite number into a drawing
// operator.
var nonFinite = regexp.MustCompile(`(^|[ \[(])[+-]?(NaN|Inf)[ \])\n]`)

// TestReportSurvivesBadValues (issue 16): values no finite chart can show
// — one cell of 1e308 inside a window (it made the trace chart dereference
// nil), its overflow to ±Inf after scaling, NaN, and a window mean of
// 1e308 — give a report, never a panic: the chart skips the point or is
// replaced by a note. 1e308 is near the largest float64 (IEEE 754 binary64,
// max ≈ 1.7977e308).
func TestReportSurvivesBadValues(t *testing.T) {
	tests := []struct {
		name  string
		v     float64
		trace bool
	}{
		{"1e308 cell in the trace", 1e308, true},
		{"-1e308 cell in the trace", -1e308, true},
		{"+Inf cell in the trace", math.Inf(1), true},
		{"NaN cell in the trace", math.NaN(), true},
		{"1e308 window mean", 1e308, false},
		{"-Inf window mean", math.Inf(-1), false},
		{"NaN window mean", math.NaN(), false},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			in := demoInput(t, nil)
			poke(in, tt.v, tt.trace)
			pdf, err := report.PDFUncompressed(in)
			if err != nil {
				t.Fatal(err)
			}
			if i := nonFinite.FindIndex(pdf); i != nil {
				t.Errorf("the PDF holds a non-finite number: %q", pdf[max(0, i[0]-60):i[1]])
			}
		})
	}
}

// TestReportBoundedInput (issue 16): the longest title the campaign takes
// (2000 characters, with and without spaces) and 50 report speeds lay out:
// the cover keeps the title to three lines (the full title goes under
// Provenance), the footer to one, and page 1's sentences speak of three
// of the 50 speeds while its table lists them all.
func TestReportBoundedInput(t *testing.T) {
	long := strings.Repeat("Ducktail trial on a customer fastback, ", 60)[:2000]
	var speeds []float64
	for v := range 50 {
		speeds = append(speeds, float64(20+4*v))
	}
	tests := []struct {
		name   string
		mutate func(*campaign.Campaign)
		check  func(t *testing.T, in report.Input, text string)
	}{
		{"2000-character title", func(c *campaign.Campaign) { c.Campaign.Title = long }, checkTitle},
		{"2000-character title without spaces", func(c *campaign.Campaign) { c.Campaign.Title = strings.Repeat("x", 2000) }, checkTitle},
		{"50 report speeds", func(c *campaign.Campaign) { c.Report.SpeedsKmh = speeds }, func(t *testing.T, in report.Input, text string) {
			sentences, err := report.Findings(in)
			if err != nil {
				t.Fatal(err)
			}
			if n := strings.Count(sentences[0], "km/h"); n != 3 {
				t.Errorf("the reference's sentence speaks of %d speeds, want 3 (lowest, median, highest)", n)
			}
			if !strings.Contains(sentences[0], "3 of the 50 report speeds") {
				t.Errorf("the sentence does not say it leaves speeds out: %q", sentences[0])
			}
			page1 := text[:strings.Index(text, "\f")]
			if !regexp.MustCompile(`baseline\s+216\s`).MatchString(text) || !strings.Contains(page1, "baseline") {
				t.Error("the speed table does not list the last report speed")
			}
		}},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			in := demoInput(t, tt.mutate)
			text := pdfText(t, mustPDF(t, in))
			if i := strings.Index(text, "What we found"); i < 0 || i > strings.Index(text, "\f") {
				t.Errorf("page 1's findings are not on page 1 (at %d)", i)
			}
			tt.check(t, in, text)
		})
	}
}

// checkTitle: the cover sets at most three lines of the title, ending in
// an ellipsis, and Provenance gives all of it.
func checkTitle(t *testing.T, in report.Input, text string) {
	t.Helper()
	page1 := text[:strings.Index(text, "\f")]
	head := page1[:strings.Index(page1, "Car:")]
	lines := 0
	for _, l := range strings.Split(head, "\n") {
		if strings.TrimSpace(l) != "" {
			lines++
		}
	}
	if lines > 1+3 { // the running head and three title lines
		t.Errorf("the cover's title takes %d lines:\n%s", lines-1, head)
	}
	if !strings.Contains(head, "…") {
		t.Error("the shortened title does not end in an ellipsis")
	}
	flat := strings.Join(strings.Fields(text), "")
	if !strings.Contains(flat, strings.Join(strings.Fields(in.Campaign.Campaign.Title), "")) {
		t.Error("the full title is nowhere in the report")
	}
}

// manyConfigs widens the demo's result to n configurations for layout
// tests: the demo's two and n−2 variants, each a copy of one of them under
// a new name (in the result, its deltas and every entry's standalone
// figures). Fusing 200 configurations takes minutes; laying them out must
// not. The fused posterior knows only the demo's two, so the variants'
// curves read zero.
func manyConfigs(in report.Input, n int) report.Input {
	c, res := in.Campaign, in.Fused.Result
	base := slices.Clone(res.Configs)
	delta := res.Deltas[0]
	for i := len(c.Configurations); i < n; i++ {
		id := fmt.Sprintf("variant-%03d", i)
		c.Configurations = append(c.Configurations, campaign.Configuration{ID: id, Note: "a variant of " + base[i%2].ID})
		cr := base[i%2]
		cr.ID = id
		res.Configs = append(res.Configs, cr)
		d := delta
		d.Config = id
		res.Deltas = append(res.Deltas, d)
		for m := range res.Methods {
			for _, s := range slices.Clone(res.Methods[m].Standalone) {
				if s.Config == base[i%2].ID {
					s.Config = id
					res.Methods[m].Standalone = append(res.Methods[m].Standalone, s)
				}
			}
		}
	}
	return in
}

// TestReportManyConfigurations (issue 16): 200 configurations (the most the
// campaign takes) lay out: each chart shows the first eight and says so,
// page 1 says the first six changes in words and counts the rest, and
// every configuration is in the speed table. The time it takes is
// BenchmarkReportManyConfigurations's, not asserted here.
func TestReportManyConfigurations(t *testing.T) {
	if testing.Short() {
		t.Skip("lays out about 100 pages")
	}
	in := manyConfigs(demoInput(t, nil), 200)
	text := pdfText(t, mustPDF(t, in))
	flat := strings.Join(strings.Fields(text), " ")
	for _, want := range []string{"the first 8 of 200 configurations; all are in the tables", "The changes of the other 193 configurations are in the table below.",
		"The chart shows the first 8 of the 200 configurations.", "variant-199"} {
		if !strings.Contains(flat, want) {
			t.Errorf("no %q", want)
		}
	}
	if n := strings.Count(flat, "variant-150 "); n < 3 {
		t.Errorf("variant-150 appears %d times; want it in the configurations, speed and change tables", n)
	}
}

// BenchmarkReportManyConfigurations: the PDF of 200 configurations (the
// fusion is done once, outside the timer).
func BenchmarkReportManyConfigurations(b *testing.B) {
	in := manyConfigs(demoInput(b, nil), 200)
	for b.Loop() {
		if _, err := report.PDF(in); err != nil {
			b.Fatal(err)
		}
	}
}

// TestReportIncompleteInput: an input without its campaign, reduction or
// fusion is an error, not a nil dereference.
func TestReportIncompleteInput(t *testing.T) {
	tests := []struct {
		name string
		in   report.Input
	}{
		{"empty", report.Input{}},
		{"no fusion", report.Input{Campaign: &campaign.Campaign{}, Reduced: &methods.Reduced{}}},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			if _, err := report.PDF(tt.in); err == nil {
				t.Error("no error")
			}
		})
	}
}
