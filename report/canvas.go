package report

import (
	"image"
	"image/color"
	"math"

	"codeberg.org/go-pdf/fpdf"
	"gonum.org/v1/plot/font"
	"gonum.org/v1/plot/vg"
)

// pdfCanvas is a gonum/plot vg.Canvas that draws straight into the PDF page
// as vector paths and text, so charts stay sharp at any zoom and share the
// document's fonts. Coordinates in vg are points with y up; the page is in
// mm with y down.
type pdfCanvas struct {
	pdf        *fpdf.Fpdf
	x0, y0     float64 // page position of the chart's top-left corner, mm
	w, h       vg.Length
	state      canvasState
	stack      []canvasState
	fontFamily string
}

type canvasState struct {
	m     [6]float64 // affine map vg → vg: (a, b, c, d, e, f)
	width vg.Length
	dash  []vg.Length
	off   vg.Length
	color color.Color
}

const mmPerPt = 25.4 / 72

func newPDFCanvas(pdf *fpdf.Fpdf, x, y float64, w, h vg.Length) *pdfCanvas {
	c := &pdfCanvas{pdf: pdf, x0: x, y0: y, w: w, h: h, fontFamily: sans}
	c.state = canvasState{m: [6]float64{1, 0, 0, 1, 0, 0}, width: 1, color: color.Black}
	return c
}

// Size implements vg.CanvasSizer.
func (c *pdfCanvas) Size() (vg.Length, vg.Length) { return c.w, c.h }

// page maps a point in the current vg frame to page mm.
func (c *pdfCanvas) page(p vg.Point) (float64, float64) {
	m := c.state.m
	x := m[0]*float64(p.X) + m[2]*float64(p.Y) + m[4]
	y := m[1]*float64(p.X) + m[3]*float64(p.Y) + m[5]
	return c.x0 + x*mmPerPt, c.y0 + (float64(c.h)-y)*mmPerPt
}

// scale is the current frame's length scale (uniform scaling assumed).
func (c *pdfCanvas) scale() float64 {
	m := c.state.m
	return math.Sqrt(math.Abs(m[0]*m[3] - m[1]*m[2]))
}

func (c *pdfCanvas) SetLineWidth(w vg.Length) { c.state.width = w }
func (c *pdfCanvas) SetLineDash(p []vg.Length, off vg.Length) {
	c.state.dash, c.state.off = append([]vg.Length(nil), p...), off
}
func (c *pdfCanvas) SetColor(col color.Color) {
	if col == nil {
		col = color.Black
	}
	c.state.color = col
}

func (c *pdfCanvas) Rotate(rad float64) {
	s, k := math.Sin(rad), math.Cos(rad)
	c.mul([6]float64{k, s, -s, k, 0, 0})
}
func (c *pdfCanvas) Translate(p vg.Point) { c.mul([6]float64{1, 0, 0, 1, float64(p.X), float64(p.Y)}) }
func (c *pdfCanvas) Scale(x, y float64)   { c.mul([6]float64{x, 0, 0, y, 0, 0}) }

// mul composes the current map with t applied first.
func (c *pdfCanvas) mul(t [6]float64) {
	m := c.state.m
	c.state.m = [6]float64{
		m[0]*t[0] + m[2]*t[1], m[1]*t[0] + m[3]*t[1],
		m[0]*t[2] + m[2]*t[3], m[1]*t[2] + m[3]*t[3],
		m[0]*t[4] + m[2]*t[5] + m[4], m[1]*t[4] + m[3]*t[5] + m[5],
	}
}

func (c *pdfCanvas) Push() {
	s := c.state
	s.dash = append([]vg.Length(nil), s.dash...)
	c.stack = append(c.stack, s)
}

func (c *pdfCanvas) Pop() {
	if n := len(c.stack); n > 0 {
		c.state = c.stack[n-1]
		c.stack = c.stack[:n-1]
	}
}

// withAlpha sets the PDF's opacity to that of the current colour for the
// length of one drawing call, and restores it after.
func (c *pdfCanvas) withAlpha(draw func()) {
	_, _, _, a := c.state.color.RGBA()
	if a == 0xffff {
		draw()
		return
	}
	c.pdf.SetAlpha(float64(a)/0xffff, "Normal")
	draw()
	c.pdf.SetAlpha(1, "Normal")
}

// rgb is a colour's 8-bit components, un-premultiplied.
func rgb(col color.Color) (int, int, int) {
	n := color.NRGBAModel.Convert(col).(color.NRGBA)
	return int(n.R), int(n.G), int(n.B)
}

// finite reports whether every point of a path lands at a finite place on
// the page: a path that does not is left out, never written as "NaN" into
// the PDF.
func (c *pdfCanvas) finite(p vg.Path) bool {
	ok := func(pt vg.Point) bool {
		x, y := c.page(pt)
		return !math.IsNaN(x) && !math.IsNaN(y) && !math.IsInf(x, 0) && !math.IsInf(y, 0)
	}
	for _, comp := range p {
		if !ok(comp.Pos) || math.IsNaN(float64(comp.Radius)) || math.IsInf(float64(comp.Radius), 0) ||
			math.IsNaN(comp.Start) || math.IsNaN(comp.Angle) || math.IsInf(comp.Angle, 0) {
			return false
		}
		for _, ctl := range comp.Control {
			if !ok(ctl) {
				return false
			}
		}
	}
	return true
}

// trace emits a path; arcs become short line segments.
func (c *pdfCanvas) trace(p vg.Path) bool {
	drawn := false
	for _, comp := range p {
		switch comp.Type {
		case vg.MoveComp:
			c.pdf.MoveTo(c.page(comp.Pos))
		case vg.LineComp:
			c.pdf.LineTo(c.page(comp.Pos))
			drawn = true
		case vg.CurveComp:
			x, y := c.page(comp.Pos)
			if len(comp.Control) == 2 {
				ax, ay := c.page(comp.Control[0])
				bx, by := c.page(comp.Control[1])
				c.pdf.CurveBezierCubicTo(ax, ay, bx, by, x, y)
			} else if len(comp.Control) == 1 {
				ax, ay := c.page(comp.Control[0])
				c.pdf.CurveTo(ax, ay, x, y)
			}
			drawn = true
		case vg.ArcComp:
			n := max(8, int(math.Ceil(math.Abs(comp.Angle)/(math.Pi/16))))
			for i := 0; i <= n; i++ {
				a := comp.Start + comp.Angle*float64(i)/float64(n)
				pt := vg.Point{X: comp.Pos.X + comp.Radius*vg.Length(math.Cos(a)), Y: comp.Pos.Y + comp.Radius*vg.Length(math.Sin(a))}
				if i == 0 && len(p) == 1 {
					c.pdf.MoveTo(c.page(pt))
					continue
				}
				c.pdf.LineTo(c.page(pt))
			}
			drawn = true
		case vg.CloseComp:
			c.pdf.ClosePath()
		}
	}
	return drawn
}

func (c *pdfCanvas) Stroke(p vg.Path) {
	if c.state.width <= 0 || len(p) == 0 || !c.finite(p) {
		return
	}
	c.pdf.SetDrawColor(rgb(c.state.color))
	c.pdf.SetLineWidth(float64(c.state.width) * c.scale() * mmPerPt)
	if len(c.state.dash) > 0 {
		d := make([]float64, len(c.state.dash))
		for i, l := range c.state.dash {
			d[i] = float64(l) * c.scale() * mmPerPt
		}
		c.pdf.SetDashPattern(d, float64(c.state.off)*c.scale()*mmPerPt)
	} else {
		c.pdf.SetDashPattern(nil, 0)
	}
	c.withAlpha(func() {
		if c.trace(p) {
			c.pdf.DrawPath("D")
		}
	})
	c.pdf.SetDashPattern(nil, 0)
}

func (c *pdfCanvas) Fill(p vg.Path) {
	if len(p) == 0 || !c.finite(p) {
		return
	}
	c.pdf.SetFillColor(rgb(c.state.color))
	c.withAlpha(func() {
		if c.trace(p) {
			c.pdf.DrawPath("F")
		}
	})
}

func (c *pdfCanvas) FillString(f font.Face, pt vg.Point, text string) {
	if f.Font.Size == 0 || text == "" || !c.finite(vg.Path{{Type: vg.MoveComp, Pos: pt}}) {
		return
	}
	style := ""
	if f.Font.Weight >= 600 {
		style = "B"
	} else if f.Font.Style != 0 {
		style = "I"
	}
	c.pdf.SetFont(c.fontFamily, style, float64(f.Font.Size)*c.scale())
	c.pdf.SetTextColor(rgb(c.state.color))
	x, y := c.page(pt)
	m := c.state.m
	angle := math.Atan2(m[1], m[0]) * 180 / math.Pi
	if math.Abs(angle) > 1e-9 {
		c.pdf.TransformBegin()
		c.pdf.TransformRotate(angle, x, y)
		c.pdf.Text(x, y, text)
		c.pdf.TransformEnd()
	} else {
		c.pdf.Text(x, y, text)
	}
	c.pdf.SetTextColor(0, 0, 0)
}

// DrawImage is not used by the report's charts.
func (c *pdfCanvas) DrawImage(vg.Rectangle, image.Image) {}
