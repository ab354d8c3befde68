package report

import (
	"regexp"
	"strings"
	"sync"
)

// The report's symbols, with their subscripts marked "_{…}" for the rich
// text writer (SAE J1594 writes them C_L, C_LF, C_LR, C_D with the letters
// after C as subscripts).
const (
	symCLA = "C_{L}·A"
	symCLF = "C_{LF}"
	symCLR = "C_{LR}"
	symCL  = "C_{L}"
	symCDA = "C_{D}·A"
)

// nbsp is the no-break space that keeps a number with its unit.
const nbsp = "\u00a0"

// Subscripts are set at 70 % of the type size and lowered by 25 % of it
// (common practice, no source).
const (
	subScale = 0.7
	subDrop  = 0.25
)

// span is a run of text set either on the baseline or as a subscript.
type span struct {
	text string
	sub  bool
}

// spans splits marked-up text into runs: "C_{LF}" is "C" then "LF" as a
// subscript. An unclosed "_{" is text.
func spans(s string) []span {
	var out []span
	for {
		i := strings.Index(s, "_{")
		if i < 0 {
			break
		}
		j := strings.Index(s[i:], "}")
		if j < 0 {
			break
		}
		if i > 0 {
			out = append(out, span{text: s[:i]})
		}
		out = append(out, span{text: s[i+2 : i+j], sub: true})
		s = s[i+j+1:]
	}
	if s != "" {
		out = append(out, span{text: s})
	}
	return out
}

// plain is marked-up text as characters only ("C_{LF}" → "CLF"), for
// places that cannot set subscripts.
func plain(s string) string {
	var b strings.Builder
	for _, sp := range spans(s) {
		b.WriteString(sp.text)
	}
	return b.String()
}

// unitAfter matches a space between a number (or "±") and a unit or a
// percent sign that follows it, so that the two are never broken apart.
// Compiled when first needed: every command starts the process, only
// report writes rich text.
var unitAfter = sync.OnceValue(func() *regexp.Regexp {
	return regexp.MustCompile(`([0-9±≤≥<>~]) (%|‰|mm|m²|m|km/h|N/mm|N|kgf|lbf|kg|Pa|hPa|h|s|sd|°C|ppm|kg/m³)([^\p{L}]|$)`)
})

// plainSymbol matches a symbol written with an underscore by text from
// other packages ("C_D·A", "C_LF"), not yet marked up (compiled as
// unitAfter).
var plainSymbol = sync.OnceValue(func() *regexp.Regexp { return regexp.MustCompile(`C_(LF|LR|L|D)([^{]|$)`) })

// bind marks up plainly written symbols, joins numbers to their units with
// no-break spaces ("6.5 %", "150 km/h"), and "±" to the number after it.
func bind(s string) string {
	s = plainSymbol().ReplaceAllString(s, "C_{$1}$2")
	s = strings.ReplaceAll(s, "± ", "±"+nbsp)
	for range 2 { // overlapping matches ("1 h 2 s") need a second pass
		s = unitAfter().ReplaceAllStringFunc(s, func(m string) string {
			return strings.Replace(m, " ", nbsp, 1)
		})
	}
	return s
}

// spanWidth is the width in mm of runs of text at a size, in the current
// font style.
func (p *page) spanWidth(ss []span, size float64) float64 {
	w := 0.0
	for _, sp := range ss {
		sz := size
		if sp.sub {
			sz = size * subScale
		}
		p.pdf.SetFontSize(sz)
		w += p.pdf.GetStringWidth(sp.text)
	}
	p.pdf.SetFontSize(size)
	return w
}

// wrap breaks marked-up text into lines no wider than w mm at a size,
// breaking at ordinary spaces only (never at a no-break space). A word
// wider than the line is broken between its characters (hardBreak); one
// with subscripts, which cannot be, gets a line of its own.
func (p *page) wrap(text string, w, size float64) []string {
	var lines []string
	space := p.spanWidth([]span{{text: " "}}, size)
	for _, para := range strings.Split(text, "\n") {
		line, lineW := "", 0.0
		for _, word := range strings.Split(para, " ") {
			ww := p.spanWidth(spans(word), size)
			if ww > w && !strings.Contains(word, "_{") {
				pieces := p.hardBreak(word, w, size)
				if line != "" {
					lines = append(lines, line)
				}
				lines = append(lines, pieces[:len(pieces)-1]...)
				word = pieces[len(pieces)-1]
				line, lineW = word, p.spanWidth([]span{{text: word}}, size)
				continue
			}
			switch {
			case line == "":
				line, lineW = word, ww
			case lineW+space+ww <= w:
				line, lineW = line+" "+word, lineW+space+ww
			default:
				lines = append(lines, line)
				line, lineW = word, ww
			}
		}
		lines = append(lines, line)
	}
	return lines
}

// hardBreak cuts a word into pieces no wider than w mm (at least one
// character each), measuring each character once.
func (p *page) hardBreak(word string, w, size float64) []string {
	p.pdf.SetFontSize(size)
	var pieces []string
	start, width := 0, 0.0
	for i, r := range word {
		cw := p.pdf.GetStringWidth(string(r))
		if width+cw > w && i > start {
			pieces = append(pieces, word[start:i])
			start, width = i, 0
		}
		width += cw
	}
	return append(pieces, word[start:])
}

// ellipsis marks text that was shortened.
const ellipsis = "…"

// clamp wraps text to w mm at a size and keeps at most n lines; when it
// had more, the last kept line is shortened to end in an ellipsis. The
// work is linear in the text's length.
func (p *page) clamp(text string, w, size float64, n int) (lines []string, cut bool) {
	lines = p.wrap(text, w, size)
	if len(lines) <= n {
		return lines, false
	}
	lines = lines[:n]
	last := []rune(strings.TrimRight(lines[n-1], " "))
	for len(last) > 0 && p.spanWidth(spans(string(last)+ellipsis), size) > w {
		last = last[:len(last)-1]
	}
	lines[n-1] = strings.TrimRight(string(last), " ,;:") + ellipsis
	return lines, true
}

// drawLine sets one line of marked-up text with its baseline at y, from x.
func (p *page) drawLine(x, y float64, line string, size float64) {
	for _, sp := range spans(line) {
		sz, dy := size, 0.0
		if sp.sub {
			sz, dy = size*subScale, size*subDrop*mmPerPt
		}
		p.pdf.SetFontSize(sz)
		p.pdf.Text(x, y+dy, sp.text)
		x += p.pdf.GetStringWidth(sp.text)
	}
	p.pdf.SetFontSize(size)
}

// baseline is where text of a size sits in a line of height lh starting at
// y (as fpdf's cells place it).
func baseline(y, lh, size float64) float64 { return y + 0.5*lh + 0.3*size*mmPerPt }

// flow sets a block of marked-up text from the current position across
// width w, lh mm a line, starting a new page where the page is full.
func (p *page) flow(text, style string, size, lh, x, w float64) {
	p.font(style, size)
	p.setLines(p.wrap(bind(text), w, size), size, lh, x)
}

// setLines sets lines of marked-up text, already wrapped, in the current
// font style, lh mm a line from x.
func (p *page) setLines(lines []string, size, lh, x float64) {
	for _, line := range lines {
		p.room(lh)
		y := p.pdf.GetY()
		p.drawLine(x, baseline(y, lh, size), line, size)
		p.pdf.SetY(y + lh)
	}
}
