package logs

import (
	"bytes"
	"math"
	"slices"
	"strconv"
	"strings"
	"testing"
)

// fastOne runs fastCells over a row whose first cell is cell (a
// one-column plan), with tail after the row in its buffer, as a reused
// block has. ok: the fast path read the cell. It then reads the row again
// by the shape the first reading learnt (shapedCells); x2 and ok2 are
// what that second reading gave.
func fastOne(cell, rest, tail string, delim, dec byte, kind uint8) (x float64, ok bool, x2 float64, ok2 bool) {
	r := &Reader{plan: []int{0}, kind: []uint8{kind}, delim: delim, dec: dec}
	row := inBuffer(cell+rest, tail)
	sh := []shape{{k: 0, text: kind == kindText}}
	out := []float64{math.NaN()}
	j, _ := r.fastCells(sh, out, row, 0, 0, 0)
	x, ok = out[0], j == 1
	out[0] = math.NaN()
	j, _ = r.shapedCells(sh, out, row, 0, 0, 0)
	return x, ok, out[0], j == 1
}

// inBuffer returns row in a buffer that holds tail after it and ends
// there (its capacity), as a block's buffer holds the next line's bytes.
func inBuffer(row, tail string) []byte {
	buf := make([]byte, len(row)+len(tail))
	copy(buf[copy(buf, row):], tail)
	return buf[:len(row)]
}

// pad follows a row in a block's buffer: the next line, here empty.
const pad = "\n\x00\x00\x00\x00\x00\x00\x00\x00\x00\x00"

// checkFast: a cell that the word-at-a-time path reads must be one that
// strconv.ParseFloat reads (after the decimal comma becomes a point), to
// the same bits, whatever bytes follow the row in the buffer.
func checkFast(t *testing.T, cell string, dec byte) {
	t.Helper()
	delim := byte(',')
	if dec == ',' {
		delim = ';'
	}
	for _, after := range []struct{ rest, tail string }{{"", "9999999999"}, {string(delim) + "1", pad}, {"", ""}} {
		x, ok, x2, ok2 := fastOne(cell, after.rest, after.tail, delim, dec, kindNum)
		// by its shape when its eight bytes are in the buffer: the bits the byte loop read
		if ok2 && (!ok || math.Float64bits(x2) != math.Float64bits(x)) || ok && len(cell) <= 8 && len(after.tail) >= 8 && !ok2 {
			t.Fatalf("cell %q read as %v (%v), by its shape as %v (%v)", cell, x, ok, x2, ok2)
		}
		if !ok {
			continue
		}
		num := cell
		if dec == ',' {
			num = strings.Replace(num, ",", ".", 1)
		}
		want, err := strconv.ParseFloat(num, 64)
		if err != nil || math.Float64bits(x) != math.Float64bits(want) {
			t.Fatalf("cell %q read as %v, strconv.ParseFloat(%q) = %v (%v)", cell, x, num, want, err)
		}
	}
}

func TestFastCells(t *testing.T) {
	tests := []struct {
		name string
		cell string
		dec  byte
		want float64 // NaN: left to the general path
	}{
		{"integer", "118", '.', 118},
		{"fraction", "57.176", '.', 57.176},
		{"negative", "-1.72", '.', -1.72},
		{"negative zero", "-0.0", '.', math.Copysign(0, -1)},
		{"plus sign", "+3.25", '.', 3.25},
		{"mark first", ".5", '.', 0.5},
		{"mark last", "5.", '.', 5},
		{"seven digits and a sign", "-1799.999", '.', -1799.999},
		{"eight digits", "1799.9991", '.', 1799.9991},
		{"nineteen digits", "1234567.890123456789", '.', math.NaN()}, // beyond 2^53
		{"2^53", "9007199254740992", '.', 9007199254740992},
		{"2^53 + 1", "9007199254740993", '.', math.NaN()},
		{"twenty digits", "0.00000000000000000001", '.', math.NaN()},
		{"decimal comma", "12,5", ',', 12.5},
		{"a point under the decimal comma", "12.5", ',', math.NaN()},
		{"no digit", "-.", '.', math.NaN()},
		{"sign alone", "-", '.', math.NaN()},
		{"empty", "", '.', math.NaN()},
		{"leading zeros", "0001.50", '.', 1.5},
		{"exponent", "1e5", '.', math.NaN()},
		{"space", " 1", '.', math.NaN()},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			delim := byte(',')
			if tt.dec == ',' {
				delim = ';'
			}
			x, ok, _, _ := fastOne(tt.cell, string(delim)+"2", pad, delim, tt.dec, kindNum)
			switch {
			case math.IsNaN(tt.want) && ok:
				t.Fatalf("read %v, want the general path", x)
			case !math.IsNaN(tt.want) && (!ok || math.Float64bits(x) != math.Float64bits(tt.want)):
				t.Fatalf("= %v (read %v), want %v", x, ok, tt.want)
			}
			checkFast(t, tt.cell, tt.dec)
		})
	}
}

// FuzzFastCells: whatever the word-at-a-time path reads, strconv reads
// the same.
func FuzzFastCells(f *testing.F) {
	for _, s := range []string{"57.176", "-0.5", "1799.999", "12,5", ".5", "9999999.", "1234567"} {
		f.Add(s, false)
	}
	f.Fuzz(func(t *testing.T, s string, comma bool) {
		dec := byte('.')
		if comma {
			dec = ','
		}
		if strings.ContainsAny(s, ";\n") || dec == '.' && strings.Contains(s, ",") {
			return // not one cell
		}
		checkFast(t, s, dec)
	})
}

// TestFastText: a text cell is kept as a span when its ends are plain,
// else left to the general path, which trims it.
func TestFastText(t *testing.T) {
	for _, tt := range []struct {
		cell string
		ok   bool
	}{{"base", true}, {"wing 2", true}, {" base", false}, {"\"base\"", false}, {"", false}, {"bäse", true}, {"é", false}} {
		if _, ok, _, _ := fastOne(tt.cell, ",1", pad, ',', '.', kindText); ok != tt.ok {
			t.Errorf("cell %q: read %v, want %v", tt.cell, ok, tt.ok)
		}
	}
}

// TestParseStaleTail: a last line without a newline stops at the data's
// end, though the buffer runs on with digits (a reused block's bytes).
func TestParseStaleTail(t *testing.T) {
	r, err := NewReader(bytes.NewReader([]byte("t,v\n0,0\n")), "s.csv", []Column{{Name: "t"}, {Name: "v"}})
	if err != nil {
		t.Fatal(err)
	}
	buf := []byte("1.5,2\n3.25,4" + "99999999999999999")
	b := r.parse(getBlock(0), buf[:len("1.5,2\n3.25,4")])
	if b.err != nil || b.rows != 2 {
		t.Fatalf("%d rows, err %v", b.rows, b.err)
	}
	if want := []float64{1.5, 2, 3.25, 4}; !slices.Equal(b.vals, want) {
		t.Errorf("cells %v, want %v", b.vals, want)
	}
}
