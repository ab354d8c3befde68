package logs_test

import (
	"errors"
	"io"
	"math"
	"math/rand/v2"
	"strconv"
	"strings"
	"testing"
	"testing/iotest"

	"liftfuse/methods/logs"
)

var cols = []logs.Column{{Name: "t"}, {Name: "v"}, {Name: "cfg", Text: true}}

func TestReaderRows(t *testing.T) {
	src := "t,extra,v,cfg\r\n0,x,1.5,base\r\n0.1,y,-2e3,\"wing\"\r\n\r\n\n"
	r, err := logs.NewReader(iotest.OneByteReader(strings.NewReader(src)), "a.csv", cols)
	if err != nil {
		t.Fatal(err)
	}
	r.Increasing = 0
	var got []string
	for r.Next() {
		got = append(got, strconv.FormatFloat(r.Float(0), 'g', -1, 64)+"|"+strconv.FormatFloat(r.Float(1), 'g', -1, 64)+"|"+string(r.Text(2)))
	}
	if err := r.Err(); err != nil {
		t.Fatal(err)
	}
	if want := "0|1.5|base 0.1|-2000|wing"; strings.Join(got, " ") != want {
		t.Errorf("rows = %q, want %q", strings.Join(got, " "), want)
	}
}

func TestReaderErrors(t *testing.T) {
	tests := []struct {
		name        string
		src         string
		line, col   int
		field       string
		wantErr     error
		atNewReader bool
	}{
		{"empty file", "", 1, 0, "", logs.ErrEmpty, true},
		{"header only blank", "\n\n", 1, 0, "", logs.ErrEmpty, true},
		{"missing column", "t,v\n0,1\n", 1, 1, "cfg", logs.ErrNoColumn, true},
		{"non-numeric cell", "t,v,cfg\n0,1,a\n1,x1,a\n", 3, 3, "v", logs.ErrNotNumber, false},
		{"missing cell", "t,v,cfg\n0,1,a\n1,,a\n", 3, 3, "v", logs.ErrMissingCell, false},
		{"short row", "t,v,cfg\n0,1,a\n1,2\n", 3, 4, "cfg", logs.ErrMissingCell, false},
		{"not finite", "t,v,cfg\n0,NaN,a\n", 2, 3, "v", logs.ErrNotFinite, false},
		{"time goes back", "t,v,cfg\n0,1,a\n2,1,a\n1.5,1,a\n", 4, 1, "t", logs.ErrNotIncreasing, false},
		{"time repeats", "t,v,cfg\n0,1,a\n0,1,a\n", 3, 1, "t", logs.ErrNotIncreasing, false},
		{"blank line inside data", "t,v,cfg\n0,1,a\n\n1,1,a\n", 3, 0, "", logs.ErrBlankLine, false},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			r, err := logs.NewReader(strings.NewReader(tt.src), "day.csv", cols)
			if err == nil {
				if tt.atNewReader {
					t.Fatal("NewReader accepted the header")
				}
				r.Increasing = 0
				for r.Next() {
				}
				err = r.Err()
			}
			var pe *logs.ParseError
			if !errors.As(err, &pe) || !errors.Is(err, tt.wantErr) {
				t.Fatalf("err = %v, want a ParseError wrapping %v", err, tt.wantErr)
			}
			if pe.File != "day.csv" || pe.Line != tt.line || pe.Column != tt.col || pe.Field != tt.field {
				t.Errorf("at %s:%d:%d field %q, want day.csv:%d:%d field %q", pe.File, pe.Line, pe.Column, pe.Field, tt.line, tt.col, tt.field)
			}
			if !strings.HasPrefix(err.Error(), "day.csv:"+strconv.Itoa(tt.line)) {
				t.Errorf("message %q does not start with file:line", err)
			}
		})
	}
}

func TestReaderReadError(t *testing.T) {
	r, err := logs.NewReader(io.MultiReader(strings.NewReader("t,v,cfg\n0,1,a\n"), iotest.ErrReader(errors.New("disk gone"))), "d.csv", cols)
	if err != nil {
		t.Fatal(err)
	}
	for r.Next() {
	}
	if r.Err() == nil || !strings.Contains(r.Err().Error(), "disk gone") {
		t.Errorf("read error lost: %v", r.Err())
	}
}

// TestParseFloatExact: the fast parser must give strconv's bits exactly.
func TestParseFloatExact(t *testing.T) {
	cases := []string{"0", "-0", "1", "-1.5", "0.1", "0.3", "123.456", "1e22", "1e23", "9007199254740993",
		"123456789012345", "1234567890123456", "0.000001", "1.7976931348623157e308", "4.9e-324", "2.2250738585072014e-308",
		"1.", ".5", "+3.25", "1E5", "1e-22", "12.345678901234567", "0x1p-2", "1_0", "", ".", "-", "e5", "1e", "inf", "nan", "1e400",
		"3.14159265358979", "100.00", "0.0001234"}
	for _, s := range cases {
		checkParse(t, s)
	}
}

func checkParse(t *testing.T, s string) {
	t.Helper()
	want, werr := strconv.ParseFloat(s, 64)
	got, gerr := logs.ParseFloat([]byte(s))
	if (werr == nil) != (gerr == nil) {
		t.Fatalf("ParseFloat(%q): err %v, strconv err %v", s, gerr, werr)
	}
	if werr == nil && math.Float64bits(got) != math.Float64bits(want) {
		t.Fatalf("ParseFloat(%q) = %v (%#x), strconv gives %v (%#x)", s, got, math.Float64bits(got), want, math.Float64bits(want))
	}
}

func FuzzParseFloat(f *testing.F) {
	for _, s := range []string{"0", "-1.25", "1e22", "123456789012345", "0.1", "1e-5"} {
		f.Add(s)
	}
	f.Fuzz(func(t *testing.T, s string) { checkParse(t, s) })
}

// FuzzReader: no log text may panic the reader, and every failure is a
// ParseError with a line.
func FuzzReader(f *testing.F) {
	f.Add("t,v,cfg\n0,1,a\n0.1,2,b\n")
	f.Add("t,v,cfg\n0,1\n")
	f.Add("t,,v,cfg\r\n1,2,3,4\n\n")
	f.Fuzz(func(t *testing.T, src string) {
		r, err := logs.NewReader(strings.NewReader(src), "f.csv", cols)
		if err == nil {
			r.Increasing = 0
			for r.Next() {
				_ = r.Float(0) + r.Float(1)
				_ = r.Text(2)
			}
			err = r.Err()
		}
		var pe *logs.ParseError
		if err != nil && (!errors.As(err, &pe) || pe.Line < 1) {
			t.Fatalf("error %v is not a positioned ParseError", err)
		}
	})
}

// readOne parses s as the single cell of a one-column log.
func readOne(s string) (float64, error) {
	r, err := logs.NewReaderFormat(strings.NewReader("x\n"+s+"\n"), "one.csv", []logs.Column{{Name: "x"}}, logs.Format{SkipLines: logs.NoSkip})
	if err != nil {
		return 0, err
	}
	defer r.Close()
	if !r.Next() {
		return 0, r.Err()
	}
	return r.Float(0), nil
}

// checkCell: a cell read through the log reader's fast path must give
// strconv.ParseFloat's bits exactly, and fail where strconv fails or the
// value is not finite.
func checkCell(t *testing.T, s string) {
	t.Helper()
	if strings.ContainsAny(s, ",\n\r\"") || strings.TrimSpace(s) == "" {
		return // not a single cell
	}
	want, werr := strconv.ParseFloat(strings.TrimSpace(s), 64)
	got, gerr := readOne(s)
	if werr != nil || math.IsInf(want, 0) || math.IsNaN(want) {
		if gerr == nil {
			t.Fatalf("cell %q read as %v, strconv: %v", s, got, werr)
		}
		return
	}
	if gerr != nil || math.Float64bits(got) != math.Float64bits(want) {
		t.Fatalf("cell %q read as %v (%v), strconv gives %v", s, got, gerr, want)
	}
}

func TestCellsExact(t *testing.T) {
	rng := rand.New(rand.NewPCG(5, 5))
	for _, s := range []string{"0", "-0", "0.1", "-12.345", "123456789012345", "1234567890123456", "0.00000000000000000001234",
		"1.", ".5", "-.5", "+7", "1e3", " 4.25 ", "00012.5000", "9007199254740993", "3.141592653589793238"} {
		checkCell(t, s)
	}
	for range 3000 {
		s := strconv.FormatFloat((rng.Float64()-0.5)*math.Pow(10, float64(rng.IntN(12)-4)), 'f', rng.IntN(9), 64)
		checkCell(t, s)
	}
}

func FuzzCellExact(f *testing.F) {
	for _, s := range []string{"1.5", "-0.001", "123456.789", "7", "1e-3"} {
		f.Add(s)
	}
	f.Fuzz(func(t *testing.T, s string) { checkCell(t, s) })
}

// TestLongLines: a line longer than a block is read whole; one longer than
// 1 MiB is an error, not a hang.
func TestLongLines(t *testing.T) {
	long := strings.Repeat("9", 600<<10)
	r, err := logs.NewReader(strings.NewReader("t,v,cfg,note\n0,1,a,"+long+"\n1,2,b,x\n"), "l.csv", cols)
	if err != nil {
		t.Fatal(err)
	}
	n := 0
	for r.Next() {
		n++
	}
	if r.Err() != nil || n != 2 {
		t.Fatalf("read %d rows, err %v", n, r.Err())
	}
	huge := strings.Repeat("9", 1100<<10)
	r, err = logs.NewReader(strings.NewReader("t,v,cfg,note\n0,1,a,"+huge+"\n"), "l.csv", cols)
	if err != nil {
		t.Fatal(err)
	}
	for r.Next() {
	}
	if !errors.Is(r.Err(), logs.ErrLongLine) {
		t.Errorf("err = %v, want a line too long", r.Err())
	}
}

// FuzzReaderFormat: no log text under any format keys may panic the
// reader or the join, and every failure is positioned ParseErrors (all of
// them, when several columns are missing).
func FuzzReaderFormat(f *testing.F) {
	f.Add("\xEF\xBB\xBFpre\nt;v;cfg\ns;V;\n12:00:00,5;1,5;a\n12:00:01;;b\n", byte(0), byte(0), 0, 0, uint8(0), uint8(1))
	f.Add("t,v,cfg\n2026-05-01T12:00:00Z,1,a\n2026-05-01T12:00:00.1Z,2,\n", byte(','), byte('.'), 1, 0, uint8(3), uint8(2))
	f.Add("x\tt\tv\tcfg\n1\t2\t3,5\tq\n", byte('\t'), byte(','), 1, 1, uint8(1), uint8(0))
	f.Add("T,V\n0,1\n", byte(0), byte(0), 0, 0, uint8(0), uint8(0))
	f.Fuzz(func(t *testing.T, src string, delim, dec byte, header, skip int, tf, empty uint8) {
		fm := logs.Format{Delimiter: delim, Decimal: dec, HeaderLine: header % 8, SkipLines: skip%4 - 1, Time: logs.TimeFormat(tf % 5), Empty: logs.EmptyPolicy(empty % 4)}
		cols := []logs.Column{{Name: "t", Time: true}, {Name: "v"}, {Name: "cfg", Text: true}}
		r, err := logs.NewReaderFormat(strings.NewReader(src), "f.csv", cols, fm)
		if err == nil {
			_ = r.Detected().String()
			g, gerr := logs.NewReaderFormat(strings.NewReader(src), "g.csv", cols[:2], fm)
			var ip *logs.Interp
			if gerr == nil {
				ip = logs.NewInterp(r, 0, g, 0, 1, 0.5)
			}
			for r.Next() {
				_ = r.Float(0) + r.Float(1)
				_ = r.Text(2)
				_ = r.Column(1)
				if ip != nil {
					if _, err := ip.Value(); err != nil {
						ip.Close()
						ip = nil
					}
				}
			}
			if ip != nil {
				ip.Close()
			}
			err = r.Err()
			r.Close()
		}
		if err == nil {
			return
		}
		pes := logs.ParseErrors(err)
		if len(pes) == 0 {
			t.Fatalf("error %v is not a ParseError", err)
		}
		for _, pe := range pes {
			if pe.Line < 1 {
				t.Fatalf("error %v has no line", pe)
			}
		}
	})
}

// TestNextStopsAfterError: once a row fails (here a time that goes back),
// Next stays false: the rows after the error are not handed out.
func TestNextStopsAfterError(t *testing.T) {
	r, err := logs.NewReader(strings.NewReader("t,v\n0,1\n1,1\n0.5,1\n2,1\n3,1\n"), "x.csv", []logs.Column{{Name: "t", Time: true}, {Name: "v"}})
	if err != nil {
		t.Fatal(err)
	}
	n := 0
	for r.Next() {
		n++
	}
	if n != 2 || !errors.Is(r.Err(), logs.ErrNotIncreasing) {
		t.Fatalf("%d rows, error %v; want 2 rows, then a time that is not increasing", n, r.Err())
	}
	if r.Next() {
		t.Errorf("Next after the error steps on to t = %g", r.Float(0))
	}
}
