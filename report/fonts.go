package report

import (
	"sync"

	"codeberg.org/go-pdf/fpdf"
	"golang.org/x/image/font/gofont/gobold"
	"golang.org/x/image/font/gofont/goitalic"
	"golang.org/x/image/font/gofont/gomono"
	"golang.org/x/image/font/gofont/goregular"
	"golang.org/x/image/font/opentype"
	"gonum.org/v1/plot"
	"gonum.org/v1/plot/font"
	"gonum.org/v1/plot/text"
)

// The report's type is Go's own (golang.org/x/image/font/gofont, BSD
// licence), embedded in the PDF and used by the charts too: no system font,
// no network.
const (
	sans = "go"
	mono = "gomono"
	// chartTypeface is the name the charts' font cache knows Go's fonts by.
	chartTypeface = "Go"
)

// registerFonts registers each style once with the document.
func registerFonts(pdf *fpdf.Fpdf) {
	pdf.AddUTF8FontFromBytes(sans, "", goregular.TTF)
	pdf.AddUTF8FontFromBytes(sans, "B", gobold.TTF)
	pdf.AddUTF8FontFromBytes(sans, "I", goitalic.TTF)
	pdf.AddUTF8FontFromBytes(mono, "", gomono.TTF)
}

// chartFaces is the charts' own font cache, Go's fonts in three styles,
// parsed once and read-only after: charts measure their text with it, and
// gonum/plot's process-wide defaults are left alone.
var chartFaces = sync.OnceValue(func() *font.Cache {
	faces := font.Collection{}
	for _, f := range []struct {
		ttf    []byte
		weight font.Font
	}{
		{goregular.TTF, font.Font{Typeface: chartTypeface}},
		{gobold.TTF, font.Font{Typeface: chartTypeface, Weight: 700}},
		{goitalic.TTF, font.Font{Typeface: chartTypeface, Style: 1}},
	} {
		ttf, err := opentype.Parse(f.ttf)
		if err != nil {
			panic("report: Go font does not parse: " + err.Error()) // a broken dependency, not input
		}
		faces = append(faces, font.Face{Font: f.weight, Face: ttf})
	}
	return font.NewCache(faces)
})

// setChartFonts makes one plot draw with Go's fonts: every text style of it
// (title, axis labels, tick labels, legend) gets the regular Go face at its
// current size and a text handler reading the charts' font cache.
func setChartFonts(p *plot.Plot) {
	h := text.Plain{Fonts: chartFaces()}
	p.TextHandler = h
	for _, st := range []*text.Style{&p.Title.TextStyle, &p.X.Label.TextStyle, &p.Y.Label.TextStyle, &p.X.Tick.Label, &p.Y.Tick.Label, &p.Legend.TextStyle} {
		st.Font = font.Font{Typeface: chartTypeface, Size: st.Font.Size}
		st.Handler = h
	}
}
