package report

import (
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

// h1 starts a major section: on a new page unless the page is still
// less than 40 % full, so that no page is left nearly empty and the
// section's first block (a chart or a table, up to 60 % of a page) fits
// under its heading.
func (p *page) h1(title string) {
	_, h := p.pdf.GetPageSize()
	if p.pdf.PageNo() == 0 || p.pdf.GetY() > margin+0.4*(h-2*margin) {
		p.pdf.AddPage()
	} else {
		p.pdf.Ln(6)
	}
	p.font("B", 15)
	p.flow(title, "B", 15, 7, margin, p.w)
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
	p.flow(title, "B", 11.5, 6, margin, p.w)
	p.pdf.Ln(1)
}

// para writes a paragraph.
func (p *page) para(text string) {
	p.flow(text, "", bodySize, lineHeight, margin, p.w)
	p.pdf.Ln(1.5)
}

// note writes small grey text.
func (p *page) note(text string) {
	p.pdf.SetTextColor(grey, grey, grey)
	p.flow(text, "I", smallSize, 3.8, margin, p.w)
	p.pdf.SetTextColor(0, 0, 0)
	p.pdf.Ln(1)
}

// bullets writes a list.
func (p *page) bullets(items []string) {
	for _, it := range items {
		p.room(lineHeight)
		p.font("", bodySize)
		p.pdf.Text(margin, baseline(p.pdf.GetY(), lineHeight, bodySize), "–")
		p.flow(it, "", bodySize, lineHeight, margin+5, p.w-5)
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

// cellLine is the height of one line of a wrapped table cell, mm.
const cellLine = 3.6

// table writes rows under a header; a cell too long for its column is
// wrapped onto more lines, never cut. A table that runs past the page
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
		p.row(cols, widths, headRow(cols), [3]int{235, 235, 235}, true)
	}
	p.room(3 * rowHeight)
	header()
	for ri, r := range rows {
		p.font("", smallSize)
		_, h := p.pdf.GetPageSize()
		if p.pdf.GetY()+p.rowHeight(widths, r) > h-margin-6 {
			p.pdf.AddPage()
			header()
			p.font("", smallSize)
		}
		p.row(cols, widths, r, [3]int{247, 247, 247}, ri%2 == 1)
	}
	p.pdf.SetDrawColor(ruleGrey, ruleGrey, ruleGrey)
	p.pdf.SetLineWidth(0.2)
	y := p.pdf.GetY()
	p.pdf.Line(margin, y, margin+p.w, y)
	p.pdf.Ln(3)
}

func headRow(cols []column) []string {
	r := make([]string, len(cols))
	for i, c := range cols {
		r[i] = c.head
	}
	return r
}

// cellPad is the space left and right of a cell's text, mm.
const cellPad = 1.0

// cellLines wraps each cell of a row to its column, in the current font.
func (p *page) cellLines(widths []float64, r []string) [][]string {
	out := make([][]string, len(widths))
	for i, w := range widths {
		text := ""
		if i < len(r) {
			text = bind(r[i])
		}
		out[i] = p.wrap(text, w-2*cellPad, smallSize)
	}
	return out
}

// rowHeight is the height of a row whose cells are wrapped, mm.
func (p *page) rowHeight(widths []float64, r []string) float64 {
	n := 1
	for _, ls := range p.cellLines(widths, r) {
		n = max(n, len(ls))
	}
	return rowHeight + float64(n-1)*cellLine
}

// row writes one table row, its cells wrapped and aligned, on a shaded
// background when fill is set.
func (p *page) row(cols []column, widths []float64, r []string, shade [3]int, fill bool) {
	lines := p.cellLines(widths, r)
	h := p.rowHeight(widths, r)
	y := p.pdf.GetY()
	if fill {
		p.pdf.SetFillColor(shade[0], shade[1], shade[2])
		p.pdf.Rect(margin, y, p.w, h, "F")
	}
	x := margin
	for i, c := range cols {
		for k, l := range lines[i] {
			lw := p.spanWidth(spans(l), smallSize)
			lx := x + cellPad
			switch c.align {
			case "R":
				lx = x + widths[i] - cellPad - lw
			case "C":
				lx = x + (widths[i]-lw)/2
			}
			p.drawLine(lx, baseline(y+float64(k)*cellLine, rowHeight, smallSize), l, smallSize)
		}
		x += widths[i]
	}
	p.pdf.SetXY(margin, y+h)
}

// chart draws a gonum plot of the given height (mm) across the text width,
// or a note in its place when its axes cannot be drawn (drawable).
func (p *page) chart(pl *plot.Plot, height float64) {
	if !drawable(pl) {
		p.note(chartLeftOut(pl))
		return
	}
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

// charts draws plots side by side across the text width, each height mm
// tall, with a small gap between them.
func (p *page) charts(pls []*plot.Plot, height float64) {
	if len(pls) == 0 {
		return
	}
	const gap = 4.0
	for _, pl := range pls {
		if !drawable(pl) {
			p.note(chartLeftOut(pl))
			return
		}
	}
	p.room(height + 2)
	y := p.pdf.GetY()
	w := (p.w - gap*float64(len(pls)-1)) / float64(len(pls))
	for i, pl := range pls {
		x := margin + float64(i)*(w+gap)
		c := newPDFCanvas(p.pdf, x, y, vg.Length(w/mmPerPt), vg.Length(height/mmPerPt))
		pl.Draw(draw.New(c))
	}
	p.pdf.SetDashPattern(nil, 0)
	p.pdf.SetLineWidth(0.2)
	p.pdf.SetY(y + height + 2)
}

// chartLeftOut is the note that stands for a chart that cannot be drawn.
func chartLeftOut(pl *plot.Plot) string {
	return "Chart \u201c" + pl.Title.Text + "\u201d left out: its values are too large or not numbers, so no axis can show them."
}
