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
