package report

import (
	"strings"
	"unicode/utf8"

	"codeberg.org/go-pdf/fpdf"
	"gonum.org/v1/plot"
	"gonum.org/v1/plot/vg"
	"gonum.org/v1/plot/vg/draw"
)

// Page geometry and type sizes, mm and points.
const (
	margin     = 18.0
	bodySize   = 9.5
	smallSize  = 8.0
	lineHeight = 4.6
	rowHeight  = 5.2
	grey       = 110
	ruleGrey   = 170
)

// page wraps the PDF with the report's few typographic devices.
type page struct {
	pdf *fpdf.Fpdf
	w   float64 // text width, mm
}

func (p *page) font(style string, size float64) { p.pdf.SetFont(sans, style, size) }

// h1 starts a major section on a new page.
func (p *page) h1(title string) {
	p.pdf.AddPage()
	p.font("B", 15)
	p.pdf.MultiCell(p.w, 7, title, "", "L", false)
	y := p.pdf.GetY() + 1
	p.pdf.SetDrawColor(ruleGrey, ruleGrey, ruleGrey)
	p.pdf.SetLineWidth(0.4)
	p.pdf.Line(margin, y, margin+p.w, y)
	p.pdf.SetY(y + 4)
}

// h2 is a sub-heading, kept with at least need mm of what follows.
func (p *page) h2(title string, need float64) {
	p.room(need + 9)
	p.pdf.Ln(2)
	p.font("B", 11.5)
	p.pdf.MultiCell(p.w, 6, title, "", "L", false)
	p.pdf.Ln(1)
}

// para writes a paragraph.
func (p *page) para(text string) {
	p.font("", bodySize)
	p.pdf.MultiCell(p.w, lineHeight, text, "", "L", false)
	p.pdf.Ln(1.5)
}

// note writes small grey text.
func (p *page) note(text string) {
	p.font("I", smallSize)
	p.pdf.SetTextColor(grey, grey, grey)
	p.pdf.MultiCell(p.w, 3.8, text, "", "L", false)
	p.pdf.SetTextColor(0, 0, 0)
	p.pdf.Ln(1)
}

// bullets writes a list.
func (p *page) bullets(items []string) {
	p.font("", bodySize)
	for _, it := range items {
		x := p.pdf.GetX()
		p.pdf.CellFormat(5, lineHeight, "–", "", 0, "L", false, 0, "")
		p.pdf.MultiCell(p.w-5, lineHeight, it, "", "L", false)
		p.pdf.SetX(x)
	}
	p.pdf.Ln(1.5)
}

// room starts a new page unless need mm are left.
func (p *page) room(need float64) {
	_, h := p.pdf.GetPageSize()
	if p.pdf.GetY()+need > h-margin-6 {
		p.pdf.AddPage()
	}
}

// column of a table: its header, width share and alignment.
type column struct {
	head  string
	width float64 // share of the text width
	align string  // "L", "R", "C"
}

// table writes rows under a header; a table that runs past the page
// continues on the next one with its header repeated.
func (p *page) table(cols []column, rows [][]string) {
	var total float64
	for _, c := range cols {
		total += c.width
	}
	widths := make([]float64, len(cols))
	for i, c := range cols {
		widths[i] = p.w * c.width / total
	}
	header := func() {
		p.font("B", smallSize)
		p.pdf.SetFillColor(235, 235, 235)
		for i, c := range cols {
			p.pdf.CellFormat(widths[i], rowHeight, c.head, "", 0, c.align, true, 0, "")
		}
		p.pdf.Ln(rowHeight)
	}
	p.room(3 * rowHeight)
	header()
	p.font("", smallSize)
	for ri, r := range rows {
		_, h := p.pdf.GetPageSize()
		if p.pdf.GetY()+rowHeight > h-margin-6 {
			p.pdf.AddPage()
			header()
			p.font("", smallSize)
		}
		fill := ri%2 == 1
		p.pdf.SetFillColor(247, 247, 247)
		for i, c := range cols {
			text := ""
			if i < len(r) {
				text = r[i]
			}
			text = fit(text, widths[i]-1.5, p.pdf.GetStringWidth)
			p.pdf.CellFormat(widths[i], rowHeight, text, "", 0, c.align, fill, 0, "")
		}
		p.pdf.Ln(rowHeight)
	}
	p.pdf.SetDrawColor(ruleGrey, ruleGrey, ruleGrey)
	p.pdf.SetLineWidth(0.2)
	y := p.pdf.GetY()
	p.pdf.Line(margin, y, margin+p.w, y)
	p.pdf.Ln(3)
}

// fit shortens text, by whole characters and with an ellipsis, until it is
// at most width wide by measure: long cells are cut, never overflow.
func fit(text string, width float64, measure func(string) float64) string {
	for measure(text) > width && utf8.RuneCountInString(text) > 4 {
		r := []rune(strings.TrimSuffix(text, "…"))
		text = strings.TrimRight(string(r[:len(r)-1]), " ") + "…"
	}
	return text
}

// chart draws a gonum plot of the given height (mm) across the text width.
func (p *page) chart(pl *plot.Plot, height float64) {
	p.room(height + 2)
	x, y := margin, p.pdf.GetY()
	w := vg.Length(p.w / mmPerPt)
	h := vg.Length(height / mmPerPt)
	c := newPDFCanvas(p.pdf, x, y, w, h)
	pl.Draw(draw.New(c))
	p.pdf.SetDashPattern(nil, 0)
	p.pdf.SetLineWidth(0.2)
	p.pdf.SetY(y + height + 2)
}
