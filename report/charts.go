package report

import (
	"image/color"

	"gonum.org/v1/plot"
	"gonum.org/v1/plot/plotter"
	"gonum.org/v1/plot/vg"
	"gonum.org/v1/plot/vg/draw"
)

// Configurations are told apart by shade and marker shape, which survive a
// mono printer.
var (
	shades = []color.Color{color.Gray{0}, color.Gray{120}, color.Gray{70}, color.Gray{160}}
	shapes = []draw.GlyphDrawer{draw.RingGlyph{}, draw.TriangleGlyph{}, draw.SquareGlyph{}, draw.CrossGlyph{}}
)

func styleOf(i int) (color.Color, draw.GlyphDrawer) {
	return shades[i%len(shades)], shapes[i%len(shapes)]
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

// filled returns the solid version of a marker where there is one.
func filled(g draw.GlyphDrawer) draw.GlyphDrawer {
	switch g.(type) {
	case draw.RingGlyph:
		return draw.CircleGlyph{}
	case draw.TriangleGlyph:
		return draw.PyramidGlyph{}
	case draw.SquareGlyph:
		return draw.BoxGlyph{}
	}
	return g
}
