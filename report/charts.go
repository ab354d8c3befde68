package report

import (
	"fmt"
	"image/color"
	"math"

	"gonum.org/v1/plot"
	"gonum.org/v1/plot/plotter"
	"gonum.org/v1/plot/vg"
	"gonum.org/v1/plot/vg/draw"
)

// Configurations are told apart by colour and by marker shape, the same
// configuration the same way in every chart. The colours are the
// colour-blind-safe set of Okabe & Ito, "Color Universal Design (CUD): how
// to make figures and presentations that are friendly to colorblind
// people" (2008), in an order that keeps the first few far apart in
// lightness too; the marker shapes keep them apart on a mono printer.
var (
	okabeIto = []color.Color{
		color.RGBA{0x00, 0x72, 0xB2, 0xFF}, // blue
		color.RGBA{0xD5, 0x5E, 0x00, 0xFF}, // vermillion
		color.RGBA{0x00, 0x9E, 0x73, 0xFF}, // bluish green
		color.RGBA{0xCC, 0x79, 0xA7, 0xFF}, // reddish purple
		color.RGBA{0xE6, 0x9F, 0x00, 0xFF}, // orange
		color.RGBA{0x56, 0xB4, 0xE9, 0xFF}, // sky blue
		color.RGBA{0x00, 0x00, 0x00, 0xFF}, // black
	}
	shapes = []draw.GlyphDrawer{draw.CircleGlyph{}, draw.PyramidGlyph{}, draw.BoxGlyph{}, draw.CrossGlyph{}, draw.PlusGlyph{}}
)

// styleOf is the colour and marker of the i-th configuration (campaign
// order).
func styleOf(i int) (color.Color, draw.GlyphDrawer) {
	return okabeIto[i%len(okabeIto)], shapes[i%len(shapes)]
}

// tint is col with the given opacity (0..1), for credible bands.
func tint(col color.Color, alpha float64) color.Color {
	r, g, b, _ := col.RGBA()
	a := alpha * 255
	return color.NRGBA{uint8(r >> 8), uint8(g >> 8), uint8(b >> 8), uint8(a)}
}

// newPlot starts a chart in the report's style: Go fonts at small sizes, a
// light grid, the legend top left.
func newPlot(title, x, y string) *plot.Plot {
	p := plot.New()
	setChartFonts(p)
	p.Title.Text = title
	p.Title.TextStyle.Font.Size = 9
	p.X.Label.Text = x
	p.Y.Label.Text = y
	for _, a := range []*plot.Axis{&p.X, &p.Y} {
		a.Label.TextStyle.Font.Size = 8
		a.Tick.Label.Font.Size = 7
	}
	p.Legend.TextStyle.Font.Size = 7
	p.Legend.Top = true
	p.Legend.Left = true
	p.Legend.Padding = vg.Points(2)
	g := plotter.NewGrid()
	g.Vertical = draw.LineStyle{Color: color.Gray{225}, Width: vg.Points(0.4)}
	g.Horizontal = g.Vertical
	p.Add(g)
	return p
}

// pad widens the axes of a finished plot so that no marker sits on the
// frame: 4 % of the span each side, and the share legend of the height
// above the data (or below it, for a legend at the bottom) left free for
// the legend.
func pad(p *plot.Plot, legend float64) {
	if !drawable(p) || math.IsInf(p.X.Min, 0) || math.IsInf(p.Y.Min, 0) {
		return // nothing to pad, or a chart page.chart leaves out
	}
	dx := 0.04 * (p.X.Max - p.X.Min)
	if dx == 0 {
		dx = 1
	}
	p.X.Min, p.X.Max = p.X.Min-dx, p.X.Max+dx
	span := p.Y.Max - p.Y.Min
	if span == 0 {
		span = 1
	}
	lo, hi := 0.05*span, 0.05*span
	if p.Legend.Top {
		hi += legend * span / (1 - legend)
	} else {
		lo += legend * span / (1 - legend)
	}
	p.Y.Min, p.Y.Max = p.Y.Min-lo, p.Y.Max+hi
}

// hollow returns the outline version of a marker where there is one.
func hollow(g draw.GlyphDrawer) draw.GlyphDrawer {
	switch g.(type) {
	case draw.CircleGlyph:
		return draw.RingGlyph{}
	case draw.PyramidGlyph:
		return draw.TriangleGlyph{}
	case draw.BoxGlyph:
		return draw.SquareGlyph{}
	}
	return g
}

// grayOf is a grey of the given level (0 black, 255 white).
func grayOf(l uint8) color.Color { return color.Gray{l} }

// maxCharted is how many configurations a chart shows: more would make
// its curves and legend unreadable, and every configuration is in the
// tables. Each chart shows the first ones, in campaign order, and says so.
const maxCharted = 8

// charted is how many of n configurations a chart shows.
func charted(n int) int { return min(n, maxCharted) }

// chartedNote says in a chart's legend that it shows only the first
// configurations, when it does.
func chartedNote(p *plot.Plot, n int) {
	if n > maxCharted {
		p.Legend.Add(fmt.Sprintf("the first %d of %d configurations; all are in the tables", maxCharted, n))
	}
}

// moreLine is the legend line chartedNote adds for n configurations: one
// or none.
func moreLine(n int) int {
	if n > maxCharted {
		return 1
	}
	return 0
}

// legendShare is the share of a chart's height kept free for a legend of
// n lines whose legend takes base with up to four lines.
func legendShare(n int, base float64) float64 {
	if n <= 4 {
		return base
	}
	return math.Min(0.6, base*float64(n)/4)
}
