package logs_test

import (
	"errors"
	"fmt"
	"math"
	"math/rand/v2"
	"strings"
	"testing"

	"liftfuse/methods/logs"
)

// sample is one row of a test day: seconds from the first sample, speed,
// a ride height and the configuration id.
type sample struct {
	t, v, h float64
	cfg     string
}

var dayCols = []logs.Column{{Name: "t", Time: true}, {Name: "v_kmh"}, {Name: "h_mm"}, {Name: "cfg", Text: true}}

// cleanCSV writes samples as the plain format 1 log: comma, point,
// seconds, one header row.
func cleanCSV(ss []sample) string {
	var b strings.Builder
	b.WriteString("t,v_kmh,h_mm,cfg\n")
	for _, s := range ss {
		fmt.Fprintf(&b, "%.2f,%.9f,%.3f,%s\n", s.t, s.v, s.h, s.cfg)
	}
	return b.String()
}

// clock writes ms milliseconds after midnight as hh:mm:ss.fff (wrapping
// at 24 h).
func clock(ms int) string {
	ms %= 86_400_000
	return fmt.Sprintf("%02d:%02d:%02d.%03d", ms/3_600_000, ms/60_000%60, ms/1000%60, ms%1000)
}

// testDay is 400 samples at 100 Hz (seeded), speed stepping every tenth
// sample so that holding the last value of a 10 Hz channel is exact.
func testDay() []sample {
	rng := rand.New(rand.NewPCG(13, 15))
	var ss []sample
	v := 100.0
	for i := range 400 {
		if i%10 == 0 {
			v = math.Round((100+5*rng.NormFloat64())*100) / 100
		}
		cfg := "base"
		if i >= 200 {
			cfg = "wing+2"
		}
		ss = append(ss, sample{t: float64(i) / 100, v: v, h: math.Round((118+rng.NormFloat64())*1000) / 1000, cfg: cfg})
	}
	return ss
}

// europeanCSV writes the day as a logger might: BOM, a two-line preamble,
// ';' cells, a units row, decimal commas and clock time that passes
// midnight.
func europeanCSV(ss []sample) string {
	var b strings.Builder
	b.WriteString("\xEF\xBB\xBFLogger export;unit 7\r\nSession: night test\r\n")
	b.WriteString("t;v_kmh;extra;h_mm;cfg\r\ns;km/h;-;mm;\r\n")
	start := 86_400_000 - 1_500 // 23:59:58.500
	for i, s := range ss {
		row := fmt.Sprintf("%s;%.9f;x;%.3f;%s\r\n", clock(start+10*i), s.v, s.h, s.cfg)
		b.WriteString(strings.ReplaceAll(row, ".", ","))
	}
	return b.String()
}

// mixedRate writes the day with the speed logged at 10 Hz and the height
// at 50 Hz in a 100 Hz file: the other cells are empty; the speed channel
// starts at the fourth row, so the first three rows have nothing to hold.
func mixedRate(ss []sample) string {
	var b strings.Builder
	b.WriteString("t,v_kmh,h_mm,cfg\n")
	for i, s := range ss {
		v, h, cfg := "", "", s.cfg
		if i >= 3 && (i-3)%10 == 0 {
			v = fmt.Sprintf("%.9f", s.v)
		}
		if i%2 == 0 {
			h = fmt.Sprintf("%.3f", s.h)
		}
		if i%3 != 0 && i > 0 {
			cfg = ""
		}
		fmt.Fprintf(&b, "%.2f,%s,%s,%s\n", s.t, v, h, cfg)
	}
	return b.String()
}

// heldDay is what holding the last value makes of mixedRate's day.
func heldDay(ss []sample) []sample {
	var out []sample
	var v, h float64
	cfg := ""
	for i, s := range ss {
		if i >= 3 && (i-3)%10 == 0 {
			v = s.v
		}
		if i%2 == 0 {
			h = s.h
		}
		if i%3 == 0 || i == 0 {
			cfg = s.cfg
		}
		if i >= 3 {
			out = append(out, sample{t: s.t, v: v, h: h, cfg: cfg})
		}
	}
	return out
}

// readDay reads a log with dayCols (less the speed when speed comes from
// another file) into samples.
func readDay(t *testing.T, src string, f logs.Format, speed *speedFile) ([]sample, *logs.Reader) {
	t.Helper()
	cols := dayCols
	if speed != nil {
		cols = []logs.Column{dayCols[0], dayCols[2], dayCols[3]}
	}
	r, err := logs.NewReaderFormat(strings.NewReader(src), "day.csv", cols, f)
	if err != nil {
		t.Fatal(err)
	}
	defer r.Close()
	var ip *logs.Interp
	if speed != nil {
		g, err := logs.NewReaderFormat(strings.NewReader(speed.src), "gps.csv", []logs.Column{{Name: "time", Time: true}, {Name: "kmh"}}, logs.Format{})
		if err != nil {
			t.Fatal(err)
		}
		ip = logs.NewInterp(r, 0, g, 0, 1, speed.offset)
		defer ip.Close()
	}
	var out []sample
	for r.Next() {
		s := sample{t: r.Float(0), cfg: string(r.Text(len(cols) - 1))}
		if ip != nil {
			v, err := ip.Value()
			if err != nil {
				t.Fatal(err)
			}
			s.v, s.h = v, r.Float(1)
		} else {
			s.v, s.h = r.Float(1), r.Float(2)
		}
		out = append(out, s)
	}
	if err := r.Err(); err != nil {
		t.Fatal(err)
	}
	return out, r
}

// speedFile is speed logged by another device.
type speedFile struct {
	src    string
	offset float64
}

// gpsDay is a day whose speed is linear between 10 Hz samples (so that
// linear interpolation is exact), with the 10 Hz samples written by a GPS
// whose clock runs 2.5 s ahead of the logger's; the GPS starts 1 s before
// the logger and stops 1 s after it.
func gpsDay() (day []sample, main string, gps speedFile) {
	rng := rand.New(rand.NewPCG(21, 22))
	knots := make([]float64, 44)
	for i := range knots {
		knots[i] = math.Round((90+4*rng.NormFloat64())*10) / 10
	}
	// knot j is at logger time −1 s + j/10 s; logger samples i at i/100 s.
	var b strings.Builder
	b.WriteString("t,h_mm,cfg\n")
	start := 10 * 3_600_000 // 10:00:00.000 on the logger's clock
	for i := range 300 {
		x := float64(i)/10 + 10 // position in knots
		j := min(int(x), len(knots)-2)
		v := knots[j] + (knots[j+1]-knots[j])*(x-float64(j))
		h := math.Round((118+rng.NormFloat64())*1000) / 1000
		day = append(day, sample{t: float64(i) / 100, v: v, h: h, cfg: "base"})
		fmt.Fprintf(&b, "%s,%.3f,base\n", clock(start+10*i), h)
	}
	var g strings.Builder
	g.WriteString("time,kmh\n")
	for j, v := range knots {
		fmt.Fprintf(&g, "%s,%.1f\n", clock(start-1000+100*j+2500), v)
	}
	return day, b.String(), speedFile{src: g.String(), offset: -2.5}
}

// TestFormatsGiveTheCleanDay: the same day written as real loggers write
// it reads as the clean CSV does. Reference: the clean CSV, read by the
// format 1 rules (campaign-format.md, "Log CSV files"); interpolation by
// the linear formula, exact here since the speed is linear between the
// GPS samples.
func TestFormatsGiveTheCleanDay(t *testing.T) {
	day := testDay()
	gday, gmain, gps := gpsDay()
	tests := []struct {
		name    string
		clean   []sample // what the clean CSV of the same day reads as
		src     string
		format  logs.Format
		speed   *speedFile
		tol     float64
		explain string // the detected format, as validate prints it
	}{
		{"BOM, preamble, units row, semicolon, decimal comma, clock time", day, europeanCSV(day), logs.Format{}, nil, 0,
			`delimiter ";", decimal ",", header on line 3, 1 units row skipped, clock time`},
		{"the same with every key given", day, europeanCSV(day),
			logs.Format{Delimiter: ';', Decimal: ',', HeaderLine: 3, SkipLines: 1, Time: logs.TimeClock}, nil, 0,
			`delimiter ";", decimal ",", header on line 3, 1 units row skipped, clock time`},
		{"tab-separated with decimal comma", day, strings.ReplaceAll(europeanCSV(day), ";", "\t"), logs.Format{}, nil, 0,
			`delimiter "\t", decimal ",", header on line 3, 1 units row skipped, clock time`},
		{"mixed rate, empty cells held", heldDay(day), mixedRate(day), logs.Format{Empty: logs.EmptyHold}, nil, 0,
			`delimiter ",", decimal ".", header on line 1, seconds time, empty cells: hold`},
		{"speed from a 10 Hz GPS file with a clock offset", gday, gmain, logs.Format{}, &gps, 1e-9,
			`delimiter ",", decimal ".", header on line 1, clock time`},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			want, _ := readDay(t, cleanCSV(tt.clean), logs.Format{}, nil)
			got, r := readDay(t, tt.src, tt.format, tt.speed)
			if len(got) != len(want) {
				t.Fatalf("read %d rows, the clean CSV %d", len(got), len(want))
			}
			for i := range want {
				g, w := got[i], want[i]
				if g.t != w.t || g.h != w.h || g.cfg != w.cfg || math.Abs(g.v-w.v) > tt.tol {
					t.Fatalf("row %d = %+v, the clean CSV gives %+v", i, g, w)
				}
			}
			if s := r.Detected().String(); s != tt.explain {
				t.Errorf("detected %s, want %s", s, tt.explain)
			}
		})
	}
}

// TestMissingColumns: every missing column is reported at once, with the
// header's columns and the closest name, at the header's line.
func TestMissingColumns(t *testing.T) {
	src := "# rig 2\nTime;Pot_FL;Pot_FR;Speed\n0;1;2;3\n"
	cols := []logs.Column{{Name: "Time", Time: true}, {Name: "pot_fl"}, {Name: "Speed"}, {Name: "gps_kmh"}}
	_, err := logs.NewReaderFormat(strings.NewReader(src), "d.csv", cols, logs.Format{})
	if !errors.Is(err, logs.ErrNoColumn) {
		t.Fatalf("err = %v, want missing columns", err)
	}
	pes := logs.ParseErrors(err)
	if len(pes) != 2 {
		t.Fatalf("%d errors, want one per missing column: %v", len(pes), err)
	}
	want := []struct {
		field string
		line  int
		col   int
		msg   string
	}{
		{"pot_fl", 2, 6, `d.csv:2:6: column "pot_fl": not in the header (columns: Time, Pot_FL, Pot_FR, Speed); did you mean "Pot_FL"?`},
		{"gps_kmh", 2, 1, `d.csv:2:1: column "gps_kmh": not in the header (columns: Time, Pot_FL, Pot_FR, Speed)`},
	}
	for i, w := range want {
		pe := pes[i]
		if pe.Field != w.field || pe.Line != w.line || pe.Column != w.col || pe.Error() != w.msg {
			t.Errorf("error %d = %q at %d:%d, want %q", i, pe, pe.Line, pe.Column, w.msg)
		}
	}
}

func TestClosestName(t *testing.T) {
	names := []string{"t_s", "Pot_FL", "Pot_FR", "rear_laser_mm", "gps_kmh"}
	tests := []struct {
		name, want, got string
		ok              bool
	}{
		{"case only", "pot_fl", "Pot_FL", true},
		{"one letter off", "rear_lazer_mm", "rear_laser_mm", true},
		{"transposed letters", "gsp_kmh", "gps_kmh", true},
		{"nothing near", "coolant", "", false},
		{"short name, one edit", "t", "", false}, // "t_s" is 2 edits away
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			got, ok := logs.ClosestName(tt.want, names)
			if ok != tt.ok || (ok && got != tt.got) {
				t.Errorf("ClosestName(%q) = %q, %v; want %q, %v", tt.want, got, ok, tt.got, tt.ok)
			}
		})
	}
}

// TestDetection: what the reader settles on for small files, and what it
// must not take for a units row or a decimal comma.
func TestDetection(t *testing.T) {
	cols := []logs.Column{{Name: "t", Time: true}, {Name: "v"}}
	tests := []struct {
		name, src string
		want      string
		first     [2]float64
	}{
		{"plain CSV", "t,v\n0.5,1.25\n", `delimiter ",", decimal ".", header on line 1, seconds time`, [2]float64{0.5, 1.25}},
		{"semicolon, decimal point", "t;v\n0.5;1.25\n", `delimiter ";", decimal ".", header on line 1, seconds time`, [2]float64{0.5, 1.25}},
		{"semicolon, integers only", "t;v\n0;1\n1;2\n", `delimiter ";", decimal ".", header on line 1, seconds time`, [2]float64{0, 1}},
		{"data right under the header is not units", "t\tv\n-\t1,5\n", "", [2]float64{}},
		{"units row in quotes", "\"t\";\"v\"\n\"[s]\";\"[V]\"\n1,5;2,25\n", `delimiter ";", decimal ",", header on line 1, 1 units row skipped, seconds time`, [2]float64{1.5, 2.25}},
		{"ISO time", "t,v\n2026-05-01T12:00:00.250+02:00,1\n2026-05-01T12:00:01Z,2\n", `delimiter ",", decimal ".", header on line 1, iso time`, [2]float64{0, 1}},
		{"header after a preamble naming one column", "v only here\nt,v\n3,4\n", `delimiter ",", decimal ".", header on line 2, seconds time`, [2]float64{3, 4}},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			r, err := logs.NewReaderFormat(strings.NewReader(tt.src), "d.csv", cols, logs.Format{})
			if err == nil && r.Next() {
				got := [2]float64{r.Float(0), r.Float(1)}
				if tt.want == "" {
					t.Fatalf("read %v, want an error", got)
				}
				if got != tt.first {
					t.Errorf("first row %v, want %v", got, tt.first)
				}
			} else if err == nil {
				err = r.Err()
			}
			if tt.want == "" {
				if err == nil && r.Err() == nil {
					t.Fatal("no error")
				}
				return
			}
			if err != nil {
				t.Fatal(err)
			}
			if s := r.Detected().String(); s != tt.want {
				t.Errorf("detected %s, want %s", s, tt.want)
			}
		})
	}
}

// TestEmptyPolicies: an empty cell is an error, a held value or a dropped
// row, as the format says; an empty time cell is never held.
func TestEmptyPolicies(t *testing.T) {
	src := "t,v\n0,1\n1,\n2,3\n3\n,5\n"
	cols := []logs.Column{{Name: "t", Time: true}, {Name: "v"}}
	tests := []struct {
		name   string
		policy logs.EmptyPolicy
		rows   string
		line   int // of the error, or 0
	}{
		{"error", logs.EmptyError, "0:1", 3},
		{"hold", logs.EmptyHold, "0:1 1:1 2:3 3:3", 6},
		{"skip", logs.EmptySkip, "0:1 2:3", 0},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			r, err := logs.NewReaderFormat(strings.NewReader(src), "e.csv", cols, logs.Format{Empty: tt.policy})
			if err != nil {
				t.Fatal(err)
			}
			var rows []string
			for r.Next() {
				rows = append(rows, fmt.Sprintf("%g:%g", r.Float(0), r.Float(1)))
			}
			if got := strings.Join(rows, " "); got != tt.rows {
				t.Errorf("rows %q, want %q", got, tt.rows)
			}
			var pe *logs.ParseError
			switch {
			case tt.line == 0 && r.Err() != nil:
				t.Errorf("err = %v", r.Err())
			case tt.line != 0 && (!errors.As(r.Err(), &pe) || pe.Line != tt.line || !errors.Is(pe, logs.ErrMissingCell)):
				t.Errorf("err = %v, want a missing value on line %d", r.Err(), tt.line)
			}
		})
	}
}

// TestDecimalCommaCells: with the decimal comma a cell reads as its
// point-written twin (strconv.ParseFloat, the reference), and a point in
// it is an error.
func TestDecimalCommaCells(t *testing.T) {
	tests := []struct {
		name, cell string
		want       float64
		ok         bool
	}{
		{"fast path", "-12,345", -12.345, true},
		{"exponent takes the general path", "1,5e3", 1500, true},
		{"no fraction", "7", 7, true},
		{"point refused", "1.5", 0, false},
		{"two commas refused", "1,2,3", 0, false},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			r, err := logs.NewReaderFormat(strings.NewReader("x;y\n"+tt.cell+";0\n"), "c.csv", []logs.Column{{Name: "x"}}, logs.Format{Decimal: ','})
			if err != nil {
				t.Fatal(err)
			}
			ok := r.Next()
			if ok != tt.ok || (ok && r.Float(0) != tt.want) {
				t.Errorf("cell %q: ok %v err %v", tt.cell, ok, r.Err())
			}
			if !ok && !errors.Is(r.Err(), logs.ErrNotNumber) {
				t.Errorf("err = %v, want not a number", r.Err())
			}
		})
	}
}

// TestInterpOutside: a time outside the other log's span is an error at
// the main log's row.
func TestInterpOutside(t *testing.T) {
	gps := "time,kmh\n1,10\n2,20\n3,30\n"
	tests := []struct {
		name, main string
		offset     float64
		want       string // values, or the error's place
	}{
		{"inside", "t\n1\n1.5\n3\n", 0, "10 15 30"},
		{"offset moves the span", "t\n0\n1\n", -1, "10 20"},
		{"before the first sample", "t\n0.5\n1\n", 0, "m.csv:2:1"},
		{"after the last sample", "t\n2\n3.25\n", 0, "m.csv:3:1"},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			m, _ := logs.NewReader(strings.NewReader(tt.main), "m.csv", []logs.Column{{Name: "t", Time: true}})
			g, _ := logs.NewReader(strings.NewReader(gps), "g.csv", []logs.Column{{Name: "time", Time: true}, {Name: "kmh"}})
			ip := logs.NewInterp(m, 0, g, 0, 1, tt.offset)
			defer ip.Close()
			var got []string
			for m.Next() {
				v, err := ip.Value()
				if err != nil {
					if !errors.Is(err, logs.ErrOutsideSpan) || !strings.HasPrefix(err.Error(), tt.want+":") {
						t.Errorf("err = %v, want outside the span at %s", err, tt.want)
					}
					return
				}
				got = append(got, fmt.Sprint(v))
			}
			if s := strings.Join(got, " "); s != tt.want {
				t.Errorf("values %q, want %q", s, tt.want)
			}
		})
	}
}

func TestFormatKeys(t *testing.T) {
	tests := []struct {
		name string
		f    logs.Format
		ok   bool
	}{
		{"zero detects all", logs.Format{}, true},
		{"decimal comma with semicolon", logs.Format{Delimiter: ';', Decimal: ','}, true},
		{"decimal comma with comma cells", logs.Format{Delimiter: ',', Decimal: ','}, false},
		{"pipe delimiter", logs.Format{Delimiter: '|'}, false},
		{"negative header line", logs.Format{HeaderLine: -1}, false},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			err := tt.f.Check()
			if (err == nil) != tt.ok || (err != nil && !errors.Is(err, logs.ErrBadFormat)) {
				t.Errorf("Check = %v, want ok %v", err, tt.ok)
			}
		})
	}
	parsed := []struct {
		name string
		fn   func() (any, error)
		want any
	}{
		{"delimiter tab", func() (any, error) { return logs.ParseDelimiter(`\t`) }, byte('\t')},
		{"delimiter semicolon", func() (any, error) { return logs.ParseDelimiter(";") }, byte(';')},
		{"decimal comma", func() (any, error) { return logs.ParseDecimal(",") }, byte(',')},
		{"time clock, any case", func() (any, error) { return logs.ParseTimeFormat("Clock") }, logs.TimeClock},
		{"empty hold", func() (any, error) { return logs.ParseEmptyPolicy("HOLD") }, logs.EmptyHold},
		{"bad time", func() (any, error) { return logs.ParseTimeFormat("ms") }, nil},
		{"bad delimiter", func() (any, error) { return logs.ParseDelimiter("|") }, nil},
	}
	for _, tt := range parsed {
		t.Run(tt.name, func(t *testing.T) {
			got, err := tt.fn()
			if tt.want == nil {
				if !errors.Is(err, logs.ErrBadFormat) {
					t.Errorf("err = %v, want a bad format", err)
				}
				return
			}
			if err != nil || got != tt.want {
				t.Errorf("got %v, %v; want %v", got, err, tt.want)
			}
		})
	}
}

// TestNoSkip: with skip_lines given as 0 a units row is not skipped but is
// an error at its place.
func TestNoSkip(t *testing.T) {
	src := "t;v\ns;V\n0;1\n"
	tests := []struct {
		name string
		skip int
		line int // of the error, or 0
	}{
		{"detected", 0, 0},
		{"given", 1, 0},
		{"none", logs.NoSkip, 2},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			r, err := logs.NewReaderFormat(strings.NewReader(src), "u.csv", []logs.Column{{Name: "t", Time: true}, {Name: "v"}}, logs.Format{SkipLines: tt.skip})
			if err != nil {
				t.Fatal(err)
			}
			for r.Next() {
			}
			var pe *logs.ParseError
			if tt.line == 0 && r.Err() != nil || tt.line != 0 && (!errors.As(r.Err(), &pe) || pe.Line != tt.line) {
				t.Errorf("err = %v, want an error on line %d", r.Err(), tt.line)
			}
		})
	}
}

// TestFarErrorPlace: an error deep in a long log (many blocks) names its
// line and column, whether or not rows were dropped before it.
func TestFarErrorPlace(t *testing.T) {
	var b strings.Builder
	b.WriteString("t,x,v\n")
	const bad = 120_000
	for i := range 150_000 {
		switch {
		case i == bad:
			fmt.Fprintf(&b, "%d,1,oops\n", i)
		case i%7 == 3:
			fmt.Fprintf(&b, "%d,1,\n", i) // empty: dropped under EmptySkip
		default:
			fmt.Fprintf(&b, "%d,1,%d.5\n", i, i)
		}
	}
	src := b.String()
	tests := []struct {
		name   string
		policy logs.EmptyPolicy
		line   int
	}{
		{"hold", logs.EmptyHold, bad + 2},
		{"skip", logs.EmptySkip, bad + 2},
		{"error at the first empty cell", logs.EmptyError, 3 + 2},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			r, err := logs.NewReaderFormat(strings.NewReader(src), "far.csv", []logs.Column{{Name: "t", Time: true}, {Name: "v"}}, logs.Format{Empty: tt.policy})
			if err != nil {
				t.Fatal(err)
			}
			for r.Next() {
				if want := int(r.Float(0)) + 2; r.Line() != want {
					t.Fatalf("row t=%g on line %d, want %d", r.Float(0), r.Line(), want)
				}
			}
			var pe *logs.ParseError
			if !errors.As(r.Err(), &pe) || pe.Line != tt.line || pe.Column != len(fmt.Sprint(tt.line-2))+4 {
				t.Errorf("err = %v, want line %d column %d", r.Err(), tt.line, len(fmt.Sprint(tt.line-2))+4)
			}
		})
	}
}

// TestBadTimeCell: a time cell that does not read by the log's time
// format is an error at its place that says what was expected.
func TestBadTimeCell(t *testing.T) {
	tests := []struct {
		name, src, want string
	}{
		{"clock", "t,v\n12:00:00,1\n12:61:00,2\n", `b.csv:3:1: column "t": not a time: "12:61:00" (want clock time h:mm:ss[.fff])`},
		{"iso", "t,v\n2026-05-01T12:00:00Z,1\n2026-05-01 12:00,2\n", `b.csv:3:1: column "t": not a time: "2026-05-01 12:00" (want RFC 3339 time such as 2026-05-01T12:00:00.25+02:00)`},
		{"seconds", "t,v\n0,1\n0:01,2\n", `b.csv:3:1: column "t": not a number: "0:01"`},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			r, err := logs.NewReaderFormat(strings.NewReader(tt.src), "b.csv", []logs.Column{{Name: "t", Time: true}, {Name: "v"}}, logs.Format{})
			if err != nil {
				t.Fatal(err)
			}
			for r.Next() {
			}
			if r.Err() == nil || r.Err().Error() != tt.want {
				t.Errorf("err = %v, want %s", r.Err(), tt.want)
			}
		})
	}
}
