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
	"gonum.org/v1/plot/plotter"
)

// The report's type is Go's own (golang.org/x/image/font/gofont, BSD
// licence), embedded in the PDF and used by the charts too: no system font,
// no network.
const (
	sans = "go"
	mono = "gomono"
)

// registerFonts registers each style once with the document.
func registerFonts(pdf *fpdf.Fpdf) {
	pdf.AddUTF8FontFromBytes(sans, "", goregular.TTF)
	pdf.AddUTF8FontFromBytes(sans, "B", gobold.TTF)
	pdf.AddUTF8FontFromBytes(sans, "I", goitalic.TTF)
	pdf.AddUTF8FontFromBytes(mono, "", gomono.TTF)
}

var chartFontsOnce sync.Once

// chartFonts makes gonum/plot draw with the same Go fonts.
func chartFonts() {
	chartFontsOnce.Do(func() {
		faces := font.Collection{}
		for _, f := range []struct {
			ttf    []byte
			weight font.Font
		}{
			{goregular.TTF, font.Font{Typeface: "Go"}},
			{gobold.TTF, font.Font{Typeface: "Go", Weight: 700}},
			{goitalic.TTF, font.Font{Typeface: "Go", Style: 1}},
		} {
			ttf, err := opentype.Parse(f.ttf)
			if err != nil {
				panic("report: Go font does not parse: " + err.Error()) // a broken dependency, not input
			}
			faces = append(faces, font.Face{Font: f.weight, Face: ttf})
		}
		font.DefaultCache.Add(faces)
		plot.DefaultFont = font.Font{Typeface: "Go"}
		plotter.DefaultFont = plot.DefaultFont
	})
}
