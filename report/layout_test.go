package report

import (
	"bytes"
	"fmt"
	"os"
	"os/exec"
	"path/filepath"
	"strings"
	"testing"

	"codeberg.org/go-pdf/fpdf"
)

// TestTableBreaksAcrossPages: a table longer than a page continues on the
// next page with its header repeated, and every row is written once.
func TestTableBreaksAcrossPages(t *testing.T) {
	pdf := fpdf.New("P", "mm", "A4", "")
	pdf.SetMargins(margin, margin, margin)
	pdf.SetAutoPageBreak(true, margin+4)
	registerFonts(pdf)
	w, _ := pdf.GetPageSize()
	pg := &page{pdf: pdf, w: w - 2*margin}
	pdf.AddPage()
	var rows [][]string
	for i := range 120 {
		rows = append(rows, []string{fmt.Sprintf("row-%03d", i), "x"})
	}
	pg.table([]column{{"HeaderA", 1, "L"}, {"HeaderB", 1, "L"}}, rows)
	if pdf.PageNo() < 3 {
		t.Fatalf("120 rows fit on %d page(s)?", pdf.PageNo())
	}
	var b bytes.Buffer
	if err := pdf.Output(&b); err != nil {
		t.Fatal(err)
	}
	tool, err := exec.LookPath("pdftotext")
	if err != nil {
		if os.Getenv("CI") != "" {
			t.Fatal("pdftotext is missing; .ci/run installs poppler-utils")
		}
		t.Skip("pdftotext not installed")
	}
	name := filepath.Join(t.TempDir(), "t.pdf")
	os.WriteFile(name, b.Bytes(), 0o644)
	out, err := exec.Command(tool, name, "-").Output()
	if err != nil {
		t.Fatal(err)
	}
	text := string(out)
	if n := strings.Count(text, "HeaderA"); n != pdf.PageNo() {
		t.Errorf("header printed %d times on %d pages", n, pdf.PageNo())
	}
	for _, r := range rows {
		if strings.Count(text, r[0]) != 1 {
			t.Fatalf("%s printed %d times", r[0], strings.Count(text, r[0]))
		}
	}
}

// TestSpans: "_{…}" marks a subscript, as SAE J1594 sets C_L, C_LF, C_LR
// (the letters after C subscript); an unclosed mark is text.
func TestSpans(t *testing.T) {
	tests := []struct {
		name, in string
		want     []span
	}{
		{"lift coefficient times area", symCLA, []span{{"C", false}, {"L", true}, {"·A", false}}},
		{"front coefficient", "C_{LF} = 0.06", []span{{"C", false}, {"LF", true}, {" = 0.06", false}}},
		{"unclosed", "a_{b", []span{{"a_{b", false}}},
		{"plain", "km/h", []span{{"km/h", false}}},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			got := spans(tt.in)
			if len(got) != len(tt.want) {
				t.Fatalf("spans(%q) = %v, want %v", tt.in, got, tt.want)
			}
			for i := range got {
				if got[i] != tt.want[i] {
					t.Errorf("spans(%q)[%d] = %v, want %v", tt.in, i, got[i], tt.want[i])
				}
			}
		})
	}
}

// TestBind: a number keeps its unit on its line (SI Brochure, 9th ed.,
// 5.4.3: a space separates number and unit, and the two are one
// quantity), and plainly written symbols are marked up.
func TestBind(t *testing.T) {
	tests := []struct{ name, in, want string }{
		{"percent", "± 6.5 %", "±\u00a06.5\u00a0%"},
		{"speed", "at 150 km/h.", "at 150\u00a0km/h."},
		{"force unit", "12.8 kgf of lift", "12.8\u00a0kgf of lift"},
		{"not a unit", "3 measurement methods", "3 measurement methods"},
		{"word starting like a unit", "2 mmHg", "2 mmHg"},
		{"symbol from another package", "C_D·A·h/L and C_LF", "C_{D}·A·h/L and C_{LF}"},
		{"already marked up", symCLF, symCLF},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			if got := bind(tt.in); got != tt.want {
				t.Errorf("bind(%q) = %q, want %q", tt.in, got, tt.want)
			}
		})
	}
}

// TestWrap: lines break at ordinary spaces only, never between a number
// and its unit, and no line is wider than asked unless one word is.
func TestWrap(t *testing.T) {
	pdf := fpdf.New("P", "mm", "A4", "")
	registerFonts(pdf)
	pdf.AddPage()
	pg := &page{pdf: pdf, w: 100}
	pg.font("", bodySize)
	text := bind(strings.Repeat("the rear changes by 6.5 % at 150 km/h and ", 8))
	for _, w := range []float64{30, 55, 90} {
		lines := pg.wrap(text, w, bodySize)
		if len(lines) < 2 {
			t.Fatalf("width %g: %d line(s)", w, len(lines))
		}
		for _, l := range lines {
			if pg.spanWidth(spans(l), bodySize) > w && strings.Contains(l, " ") {
				t.Errorf("width %g: line %q too wide", w, l)
			}
			if strings.HasSuffix(l, "6.5") || strings.HasPrefix(l, "%") || strings.HasPrefix(l, "km/h") {
				t.Errorf("width %g: a number left its unit: %q", w, l)
			}
		}
	}
}

// TestWrapLongWord: a word wider than the line (a 2000-character title
// without spaces, as issue 16 tried) is broken between characters into
// lines no wider than asked, losing nothing; clamp keeps n lines and ends
// the last in an ellipsis (common practice, no source).
func TestWrapLongWord(t *testing.T) {
	pdf := fpdf.New("P", "mm", "A4", "")
	registerFonts(pdf)
	pdf.AddPage()
	pg := &page{pdf: pdf, w: 100}
	pg.font("B", 20)
	tests := []struct {
		name string
		text string
	}{
		{"one long word", strings.Repeat("x", 2000)},
		{"words then a long one", "Ducktail trial " + strings.Repeat("ü", 500) + " end"},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			lines := pg.wrap(tt.text, 100, 20)
			for _, l := range lines {
				if w := pg.spanWidth(spans(l), 20); w > 100 {
					t.Errorf("line %q is %.1f mm wide", l, w)
				}
			}
			if got := strings.ReplaceAll(strings.Join(lines, ""), " ", ""); got != strings.ReplaceAll(tt.text, " ", "") {
				t.Error("characters lost or added")
			}
			short, cut := pg.clamp(tt.text, 100, 20, 3)
			if !cut || len(short) != 3 || !strings.HasSuffix(short[2], "…") {
				t.Errorf("clamp: %d lines, cut %v, last %q", len(short), cut, short[len(short)-1])
			}
			if w := pg.spanWidth(spans(short[2]), 20); w > 100 {
				t.Errorf("the shortened line is %.1f mm wide", w)
			}
		})
	}
}
