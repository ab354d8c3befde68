package logs

import (
	"bytes"
	"errors"
	"math"
	"strconv"
	"strings"
	"testing"
)

// shapeRead learns the shape of cell a (read by fastCells, a one-column
// plan) and then reads row b by that shape alone, the bytes of tail after
// it in its buffer: what shapedCells gives, and whether it read the cell.
func shapeRead(a, b, tail string, delim, dec byte) (float64, bool) {
	r := &Reader{plan: []int{0}, kind: []uint8{kindNum}, delim: delim, dec: dec}
	sh := []shape{{k: 0}}
	out := []float64{math.NaN()}
	r.fastCells(sh, out, []byte(a), 0, 0, 0)
	out[0] = math.NaN()
	j, _ := r.shapedCells(sh, out, inBuffer(b, tail), 0, 0, 0)
	return out[0], j == 1
}

// strconvCell is what strconv.ParseFloat reads in a cell written with the
// decimal mark dec, and whether it reads it.
func strconvCell(cell string, dec byte) (float64, bool) {
	if dec == ',' {
		if strings.Contains(cell, ".") {
			return 0, false
		}
		cell = strings.Replace(cell, ",", ".", 1)
	}
	x, err := strconv.ParseFloat(cell, 64)
	return x, err == nil
}

func TestShapes(t *testing.T) {
	tests := []struct {
		name, learnt, row string
		dec               byte
		ok                bool // read by the shape
	}{
		{"same layout", "57.176", "58.204,1", '.', true},
		{"row ends after it", "57.176", "58.204", '.', true},
		{"eight bytes", "1799.999", "1800.000,2", '.', true},
		{"negative", "-3.09", "-4.12", '.', true},
		{"negative zero", "-0.00", "-0.00", '.', true},
		{"plus sign", "+3.09", "+4.12", '.', true},
		{"integer", "118", "120", '.', true},
		{"mark last", "5.", "6.", '.', true},
		{"mark first", ".5", ".6", '.', true},
		{"decimal comma", "12,5", "13,7", ',', true},
		{"one more digit", "57.176", "57.1765", '.', false},
		{"one digit fewer", "57.176", "57.17", '.', false},
		{"mark moved", "57.176", "571.76", '.', false},
		{"sign appears", "3.09", "-3.09", '.', false},
		{"sign goes", "-3.09", "3.091", '.', false},
		{"other sign", "-3.09", "+3.09", '.', false},
		{"point under the decimal comma", "12,5", "12.5", ',', false},
		{"a letter", "57.176", "57.1x6", '.', false},
		{"a space", "57.176", "57.1 6", '.', false},
		{"an exponent", "1.5e3", "1.5e4", '.', false},
		{"a byte above 0x7f", "57.176", "57.1\xb66", '.', false},
		{"empty", "57.176", "", '.', false},
		{"nine bytes", "12345.678", "12345.679", '.', false},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			x, ok := shapeRead(tt.learnt, tt.row, "\n9999999", ',', tt.dec)
			if tt.dec == ',' {
				x, ok = shapeRead(tt.learnt, tt.row, "\n9999999", ';', tt.dec)
			}
			if ok != tt.ok {
				t.Fatalf("read %v by the shape of %q, want %v", ok, tt.learnt, tt.ok)
			}
			cell, _, _ := strings.Cut(tt.row, ",")
			if tt.dec == ',' {
				cell = tt.row
			}
			if want, _ := strconvCell(cell, tt.dec); ok && math.Float64bits(x) != math.Float64bits(want) {
				t.Errorf("= %v, strconv reads %v", x, want)
			}
		})
	}
}

// TestShapeAtBufferEnd: a cell whose eight bytes would run past its
// buffer is left to the byte loop, not read beyond.
func TestShapeAtBufferEnd(t *testing.T) {
	if _, ok := shapeRead("57.176", "58.204", "", ',', '.'); ok {
		t.Error("read by its shape with two bytes of buffer after it")
	}
	if _, ok := shapeRead("57.176", "58.204", "\n\x00", ',', '.'); !ok {
		t.Error("not read by its shape with eight bytes of buffer")
	}
}

// TestShapeStopsLearning: a column whose cells change layout row after
// row stops being learnt, and so tried, after maxMisses shapes.
func TestShapeStopsLearning(t *testing.T) {
	r := &Reader{plan: []int{0}, kind: []uint8{kindNum}, delim: ',', dec: '.'}
	sh := []shape{{k: 0}}
	out := make([]float64, 1)
	for i := range 2 * maxMisses {
		cell := []string{"-3.09", "0.22"}[i%2]
		if j, _ := r.shapedCells(sh, out, inBuffer(cell, "\n9999999"), 0, 0, 0); j == 1 {
			t.Fatalf("row %d: %q read by the shape of the row before", i, cell)
		}
		r.fastCells(sh, out, []byte(cell), 0, 0, 0)
	}
	if sh[0].n != 0 || sh[0].misses != maxMisses+1 {
		t.Errorf("after %d changes of layout: shape of %d bytes, %d misses; want none after %d", 2*maxMisses, sh[0].n, sh[0].misses, maxMisses+1)
	}
}

// FuzzShapes: a cell read by the shape learnt from another is one that
// strconv reads, to the same bits, and one the byte loop reads.
func FuzzShapes(f *testing.F) {
	for _, c := range [][2]string{{"57.176", "58.204"}, {"-0.5", "-1.5"}, {"1799.999", "1800.000"},
		{"12,5", "13,5"}, {".5", ".6"}, {"5.", "6."}, {"118", "1e2"}, {"+1.0", "+2.0"}} {
		f.Add(c[0], c[1], strings.Contains(c[0], ","))
	}
	f.Fuzz(func(t *testing.T, a, b string, comma bool) {
		dec, delim := byte('.'), byte(',')
		if comma {
			dec, delim = ',', ';'
		}
		if strings.ContainsAny(a+b, "\n") || strings.IndexByte(a, delim) >= 0 || strings.IndexByte(b, delim) >= 0 {
			return // not one cell each
		}
		x, ok := shapeRead(a, b, "\n\x00\x00\x00\x00\x00\x00\x00", delim, dec)
		if !ok {
			return
		}
		want, wok := strconvCell(b, dec)
		if !wok || math.Float64bits(x) != math.Float64bits(want) {
			t.Fatalf("%q by the shape of %q = %v; strconv: %v (%v)", b, a, x, want, wok)
		}
		if y, yok, _, _ := fastOne(b, "", "", delim, dec, kindNum); !yok || math.Float64bits(y) != math.Float64bits(x) {
			t.Fatalf("%q by the shape of %q = %v; the byte loop: %v (%v)", b, a, x, y, yok)
		}
	})
}

// FuzzShapedRows: a log read whole (each row's cells tried in the shapes
// of the row before) gives every row the values that the row gives read
// alone after the header (no shape to try: the byte loop), and the row
// whose cell is not a number or missing fails alone too.
func FuzzShapedRows(f *testing.F) {
	f.Add("t,v,w\n0.001,35.11,-3.09\n0.002,35.58,0.22\n0.003,35.60,-3.1\n", false)
	f.Add("t;v;w\n1,5;2;x\n1,6;2;y\n1,7;20;z\n", true)
	f.Add("t,v,w\n1.5,2,3\n1.6,2,3,4\n1.7,\n1.8,2\n", false)
	f.Add("t,v,w\n0.001,35.11,a\n0.0021,3.511,b\n-0.002,35.1x,c\n", false)
	f.Add("t,v,w\n-1.5,2.5,a\n+1.5,2,5,b\n1.5,25.,c\n", false)
	f.Fuzz(func(t *testing.T, src string, comma bool) {
		fm := Format{Delimiter: ',', Decimal: '.', HeaderLine: 1, SkipLines: NoSkip} // the header first, no units row
		if comma {
			fm.Delimiter, fm.Decimal = ';', ','
		}
		cols := []Column{{Name: "t"}, {Name: "v"}, {Name: "w", Text: true}}
		head, body, ok := strings.Cut(src, "\n")
		if !ok {
			return
		}
		r, err := NewReaderFormat(strings.NewReader(src), "w.csv", cols, fm)
		if err != nil {
			return
		}
		defer r.Close()
		lines := strings.Split(body, "\n")
		readAlone := func(line int) (*Reader, error) {
			a, err := NewReaderFormat(strings.NewReader(head+"\n"+lines[line-2]+"\n"), "a.csv", cols, fm)
			if err == nil && !a.Next() {
				err = a.Err()
			}
			return a, err
		}
		for r.Next() {
			a, err := readAlone(r.Line())
			if err != nil {
				t.Fatalf("line %d %q: read whole, but alone: %v", r.Line(), lines[r.Line()-2], err)
			}
			for k := range 2 {
				if math.Float64bits(r.Float(k)) != math.Float64bits(a.Float(k)) {
					t.Fatalf("line %d %q, column %d: %v whole, %v alone", r.Line(), lines[r.Line()-2], k, r.Float(k), a.Float(k))
				}
			}
			if !bytes.Equal(r.Text(2), a.Text(2)) {
				t.Fatalf("line %d %q: text %q whole, %q alone", r.Line(), lines[r.Line()-2], r.Text(2), a.Text(2))
			}
			a.Close()
		}
		var pe *ParseError
		if errors.As(r.Err(), &pe) && (errors.Is(pe, ErrNotNumber) || errors.Is(pe, ErrMissingCell)) {
			if _, err := readAlone(pe.Line); err == nil {
				t.Fatalf("line %d %q: %v whole, read alone", pe.Line, lines[pe.Line-2], r.Err())
			}
		}
	})
}
