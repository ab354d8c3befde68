package report

import (
	"bytes"
	"errors"
	"fmt"
	"slices"
	"time"

	"codeberg.org/go-pdf/fpdf"

	"liftfuse/fuse"
	"liftfuse/methods"
	"liftfuse/methods/campaign"
)

// Input is everything the report lays out.
type Input struct {
	Campaign *campaign.Campaign
	Reduced  *methods.Reduced
	Fused    *fuse.Fused
	Plan     *fuse.Plan
	// Explain holds, for each flagged entry, the cross-check of the other
	// entries' estimate of its worst quantity against its own posterior:
	// which of its errors would have to move to agree.
	Explain map[string]*fuse.Crosscheck
	Version string
	Paper   string // "A4" (default) or "Letter"
}

// Papers returns the page sizes --paper accepts.
func Papers() []string { return []string{"A4", "Letter"} }

// PDF renders the development report. The same input gives the same bytes:
// the creation date is the campaign date, the catalogue is sorted, and
// nothing else varies.
func PDF(in Input) ([]byte, error) {
	paper := in.Paper
	if paper == "" {
		paper = "A4"
	}
	if !slices.Contains(Papers(), paper) {
		return nil, fmt.Errorf("unknown paper %q (want A4 or Letter)", paper)
	}
	r, err := newReporter(in)
	if err != nil {
		return nil, err
	}
	c := in.Campaign
	date, err := time.Parse("2006-01-02", c.Campaign.Date)
	if err != nil {
		return nil, err
	}
	pg := newDocument(paper, date, c.Campaign.Title, in.Version)
	r.pg = pg
	r.cover()
	r.overview()
	r.details()
	r.methods()
	r.agreement()
	r.plan()
	r.notes()
	r.runLog()
	r.provenance()
	if err := pg.pdf.Error(); err != nil {
		return nil, fmt.Errorf("rendering the report: %w", err)
	}
	var b bytes.Buffer
	if err := pg.pdf.Output(&b); err != nil {
		return nil, fmt.Errorf("rendering the report: %w", err)
	}
	return b.Bytes(), nil
}

// compress turns on the compression of the PDF's streams; the tests turn
// it off to read the page content.
var compress = true

// newDocument sets up the PDF: dated by the test, not the clock, with the
// Go fonts embedded and a footer of title and page number on every page.
func newDocument(paper string, date time.Time, title, version string) *page {
	pdf := fpdf.New("P", "mm", paper, "")
	pdf.SetCreationDate(date)
	pdf.SetModificationDate(date)
	pdf.SetCatalogSort(true)
	pdf.SetCompression(compress)
	pdf.SetProducer("liftfuse "+version, true)
	pdf.SetCreator("liftfuse "+version, true)
	pdf.SetTitle(title, true)
	pdf.SetMargins(margin, margin, margin)
	pdf.SetAutoPageBreak(true, margin+4)
	registerFonts(pdf)
	pdf.AliasNbPages("{nb}")
	w, _ := pdf.GetPageSize()
	pg := &page{pdf: pdf, w: w - 2*margin}
	pg.font("", 7.5)
	short, _ := pg.clamp(title, pg.w/2-2, 7.5, 1)
	footer := plain(short[0])
	pdf.SetFooterFunc(func() {
		_, h := pdf.GetPageSize()
		pdf.SetY(h - margin + 4)
		pg.font("", 7.5)
		pdf.SetTextColor(grey, grey, grey)
		pdf.CellFormat(pg.w/2, 4, footer, "", 0, "L", false, 0, "")
		pdf.CellFormat(pg.w/2, 4, fmt.Sprintf("page %d of {nb}", pdf.PageNo()), "", 0, "R", false, 0, "")
		pdf.SetTextColor(0, 0, 0)
	})
	return pg
}

// newReporter starts a reporter of the input, with no document yet.
func newReporter(in Input) (*reporter, error) {
	if in.Campaign == nil || in.Reduced == nil || in.Fused == nil || in.Fused.Result == nil || in.Fused.Posterior == nil {
		return nil, errors.New("report: the input lacks the campaign, its reduction or its fusion")
	}
	r := &reporter{in: in, res: in.Fused.Result}
	var err error
	if r.unit, err = newForceUnit(in.Campaign.Report.ForceUnit); err != nil {
		return nil, err
	}
	return r, nil
}

// reporter writes the report's sections, one method each, in the order
// PDF calls them.
type reporter struct {
	in   Input
	pg   *page
	res  *fuse.Result
	unit forceUnit // the display unit of force
	// titleCut is set when page 1 shortened the title; Provenance then
	// gives it in full.
	titleCut bool
	// deltas caches deltaAt.
	deltas map[deltaKey]changeAt
}

func (r *reporter) configs() []string {
	ids := make([]string, len(r.in.Campaign.Configurations))
	for i, c := range r.in.Campaign.Configurations {
		ids[i] = c.ID
	}
	return ids
}

// force formats an estimate in newtons in the display unit.
func (r *reporter) force(e fuse.Estimate) string { return interval(r.unit.est(e), 1) }

// loadBoth writes a load in newtons and, when the display unit is another,
// in it too: "12 N (1.2 kgf)".
func (r *reporter) loadBoth(n float64) string {
	if r.unit.newtons == 1 {
		return fmt.Sprintf("%.0f N", n)
	}
	return fmt.Sprintf("%.0f N (%.1f %s)", n, r.unit.of(n), r.unit.name)
}

// cla formats a C_L·A estimate, m².
func cla(e fuse.Estimate) string { return interval(e, 3) }

// level is the credible level of the intervals, as a percentage.
func (r *reporter) level() string { return percent(r.res.Credible) }
