package campaign

import (
	"crypto/sha256"
	"encoding/csv"
	"encoding/hex"
	"errors"
	"fmt"
	"io"
	"math"
	"os"
	"slices"
	"strconv"
	"strings"

	"liftfuse/methods/air"
	"liftfuse/methods/logs"
)

// LogColumns returns the columns a log spec asks for, in a fixed order:
// time, speed (unless it comes from a speed_file), signal (ride height),
// measured airspeed, direction and config when named, then one column per
// tap (pressure logs). The indices are returned as a LogIndex.
func (l *LogSpec) LogColumns() ([]logs.Column, LogIndex) {
	cols, ix, _ := l.columns()
	return cols, ix
}

// columns is LogColumns with the campaign key that names each column (for
// messages), built in one pass so the two stay in step.
func (l *LogSpec) columns() ([]logs.Column, LogIndex, []string) {
	ix := LogIndex{Time: 0, Speed: -1, Signal: -1, Airspeed: -1, Direction: -1, Config: -1}
	cols := []logs.Column{{Name: l.Time, Time: true}}
	keys := []string{"time"}
	add := func(at *int, key string, c logs.Column) {
		if c.Name != "" {
			*at = len(cols)
			cols = append(cols, c)
			keys = append(keys, key)
		}
	}
	if l.SpeedFile == nil {
		add(&ix.Speed, map[bool]string{true: "speed_ms", false: "speed_kmh"}[l.SpeedMs != ""], logs.Column{Name: l.SpeedColumn()})
	}
	add(&ix.Signal, "signal", logs.Column{Name: l.Signal})
	add(&ix.Airspeed, l.airspeedKey(), logs.Column{Name: l.AirspeedColumn()})
	add(&ix.Direction, "direction", logs.Column{Name: l.Direction})
	add(&ix.Config, "config", logs.Column{Name: l.Config, Text: true})
	for _, t := range l.Taps {
		k := -1
		add(&k, "taps."+t.Key, logs.Column{Name: t.V})
		ix.Taps = append(ix.Taps, k)
	}
	return cols, ix, keys
}

// LogIndex places each named column among those LogColumns asks for; -1
// means not named. Taps follow the order of LogSpec.Taps.
type LogIndex struct {
	Time, Speed, Signal, Airspeed, Direction, Config int
	Taps                                             []int
}

// SpeedColumn is the name of the speed column, in km/h or m/s.
func (l *LogSpec) SpeedColumn() string {
	if l.SpeedMs != "" {
		return l.SpeedMs
	}
	return l.SpeedKmh
}

// SpeedToMs converts a value of the speed column to m/s.
func (l *LogSpec) SpeedToMs(x float64) float64 {
	if l.SpeedMs != "" {
		return x
	}
	return air.KmhToMs(x)
}

// AirspeedColumn is the name of the measured airspeed column (airspeed_kmh,
// airspeed_ms or the probe's q_pa), or "".
func (l *LogSpec) AirspeedColumn() string {
	switch {
	case l.AirspeedKmh != "":
		return l.AirspeedKmh
	case l.AirspeedMs != "":
		return l.AirspeedMs
	}
	return l.QPa
}

// ReaderFormat is how the log reader should read the file: the keys the
// campaign gives, everything else detected. An explicit skip_lines: 0
// skips nothing and detects no units row.
func (l *LogSpec) ReaderFormat() logs.Format { return readerFormat(l.Format) }

// ReaderFormat is how the log reader should read the speed file.
func (sf *SpeedFile) ReaderFormat() logs.Format { return readerFormat(sf.Format) }

// readerFormat converts the campaign's format keys; validation has already
// refused values the reader does not take.
func readerFormat(f *LogFormat) logs.Format {
	var out logs.Format
	if f == nil {
		return out
	}
	out.Delimiter, _ = logs.ParseDelimiter(f.Delimiter)
	out.Decimal, _ = logs.ParseDecimal(f.Decimal)
	out.HeaderLine = f.HeaderLine
	out.SkipLines = f.SkipLines
	if f.At.Has("skip_lines") && f.SkipLines == 0 {
		out.SkipLines = logs.NoSkip
	}
	out.Time, _ = logs.ParseTimeFormat(f.Time)
	out.Empty, _ = logs.ParseEmptyPolicy(f.Empty)
	return out
}

// SpeedFileColumns are the columns read from a speed file: time, speed.
func (sf *SpeedFile) SpeedFileColumns() []logs.Column {
	name := sf.SpeedKmh
	if sf.SpeedMs != "" {
		name = sf.SpeedMs
	}
	return []logs.Column{{Name: sf.Time, Time: true}, {Name: name}}
}

// SpeedToMs converts a value of the speed file's speed column to m/s.
func (sf *SpeedFile) SpeedToMs(x float64) float64 {
	if sf.SpeedMs != "" {
		return x
	}
	return air.KmhToMs(x)
}

func (l *LogSpec) airspeedKey() string {
	switch {
	case l.AirspeedKmh != "":
		return "airspeed_kmh"
	case l.AirspeedMs != "":
		return "airspeed_ms"
	}
	return "q_pa"
}

// maxTableBytes bounds a taps or readings table.
const maxTableBytes = 16 << 20

// logProblem turns a log reader error into a Problem at the log's position.
func logProblem(err error, at Where, path string) *Problem {
	var pe *logs.ParseError
	if !errors.As(err, &pe) {
		return &Problem{Where: at, Path: path, Err: wrapf(ErrFile, "%v", err)}
	}
	msg := pe.Err.Error()
	if pe.Field != "" {
		msg = fmt.Sprintf("column %q: %s", pe.Field, msg)
	}
	return &Problem{Where: Where{File: pe.File, Line: pe.Line, Column: pe.Column}, Path: path, Err: wrapf(ErrColumn, "%s", msg)}
}

// scanLog checks a log: the file opens, the named columns exist, every used
// cell is a finite number, time increases, direction is ±1, configuration
// ids are known and segments lie inside the log's span.
// A log named by several entries with the same columns is read once. What
// the reader detected of the file's format is kept for validate to show.
// With Options.Stream only the header is read here: the body is left to
// the adapters' read, and Finish checks what it found.
func (v *validator) scanLog(l *LogSpec, path string) {
	l.path = path
	if l.File == "" {
		v.errf(l.At.Of("file"), path+".file", ErrFile, "the log's file name is empty")
		return
	}
	if sf := l.SpeedFile; sf != nil {
		v.scanSpeedFile(sf, path+".speed_file")
	}
	name := v.c.Path(l.File)
	cols, ix := l.LogColumns()
	key := scanKey(name, cols, l.ReaderFormat())
	res, seen := v.scanned[key]
	if !seen {
		res = v.scanBody(l, path, name, cols, ix)
		if v.scanned == nil {
			v.scanned = map[string]*scanResult{}
		}
		v.scanned[key] = res
	}
	if res == nil {
		return
	}
	l.Detected = res.detected
	if s := v.c.stream; s != nil {
		s.pending = append(s.pending, pendingLog{l: l, path: path, key: key})
		return
	}
	v.useScan(l, path, res)
}

// scanResult is what a read of a log's body found: its time span, the
// configuration ids it holds and its detected format. nil: the log could
// not be read through.
type scanResult struct {
	t0, t1   float64
	configs  map[string]bool
	detected string
}

func scanKey(name string, cols []logs.Column, f logs.Format) string {
	var b strings.Builder
	fmt.Fprintf(&b, "%s\x00%+v", name, f)
	for _, c := range cols {
		fmt.Fprintf(&b, "\x00%s\x00%t", c.Name, c.Text)
	}
	return b.String()
}

// scanBody opens the log, checks its header and reads its body.
func (v *validator) scanBody(l *LogSpec, path, name string, cols []logs.Column, ix LogIndex) *scanResult {
	f, err := OpenRegular(name)
	if err != nil {
		v.errf(l.At.Of("file"), path+".file", ErrFile, "cannot read log %q: %v", l.File, err)
		return nil
	}
	defer f.Close()
	var src io.Reader = f
	if v.c.stream != nil {
		v.c.addFile(name) // hashed as the adapters read it (Campaign.Read)
	} else {
		var done func()
		src, done = v.c.track(name, f)
		defer done()
	}
	r, err := logs.NewReaderFormat(src, name, cols, l.ReaderFormat())
	if err != nil {
		v.headerProblems(err, l, path, cols)
		return nil
	}
	defer r.Close()
	if v.c.stream != nil {
		return &scanResult{detected: r.Detected().String()}
	}
	res := v.rows(r, l, path, ix)
	if res != nil {
		res.detected = r.Detected().String()
	}
	return res
}

// headerProblems turns the reader's header errors into problems: each
// missing column at the key that names it (with the header's columns and
// the closest name), anything else at the file.
func (v *validator) headerProblems(err error, l *LogSpec, path string, cols []logs.Column) {
	pes := logs.ParseErrors(err)
	if len(pes) == 0 {
		v.errs = append(v.errs, logProblem(err, l.At.Of("file"), path+".file"))
		return
	}
	_, _, keys := l.columns()
	for _, pe := range pes {
		k := slices.IndexFunc(cols, func(c logs.Column) bool { return c.Name == pe.Field })
		if !errors.Is(pe, logs.ErrNoColumn) || k < 0 {
			v.errs = append(v.errs, logProblem(pe, l.At.Of("file"), path+".file"))
			continue
		}
		at := l.At.Of(keys[k])
		if t, ok := strings.CutPrefix(keys[k], "taps."); ok {
			at = l.At.Of("taps")
			for _, n := range l.Taps {
				if n.Key == t {
					at = n.At
				}
			}
		}
		v.errf(at, path+"."+keys[k], ErrColumn, "column %q of %s: %v", pe.Field, l.File, pe.Err)
	}
}

// scanSpeedFile checks a speed file's header and cells, once per file and
// columns however many logs name it.
func (v *validator) scanSpeedFile(sf *SpeedFile, path string) {
	name := v.c.Path(sf.File)
	key := scanKey(name, sf.SpeedFileColumns(), sf.ReaderFormat())
	if v.speeds[key] {
		return // read once; its problems, if any, are reported at the first log naming it
	}
	if v.speeds == nil {
		v.speeds = map[string]bool{}
	}
	v.speeds[key] = true
	f, err := OpenRegular(name)
	if err != nil {
		v.errf(sf.At.Of("file"), path+".file", ErrFile, "cannot read speed file %q: %v", sf.File, err)
		return
	}
	defer f.Close()
	src, done := v.c.track(name, f)
	defer done()
	r, err := logs.NewReaderFormat(src, name, sf.SpeedFileColumns(), sf.ReaderFormat())
	if err != nil {
		pes := logs.ParseErrors(err)
		if len(pes) == 0 {
			v.errs = append(v.errs, logProblem(err, sf.At.Of("file"), path))
		}
		for _, pe := range pes {
			v.errs = append(v.errs, logProblem(pe, sf.At.Of("file"), path))
		}
		return
	}
	defer r.Close()
	for r.Next() {
	}
	if err := r.Err(); err != nil {
		v.errs = append(v.errs, logProblem(err, sf.At.Of("file"), path))
	}
}

// rows reads a log's body, each row checked by Rows.
func (v *validator) rows(r *logs.Reader, l *LogSpec, path string, ix LogIndex) *scanResult {
	k := NewRows(v.c, l, ix.Time, ix.Direction, ix.Config)
	for r.Next() {
		if _, _, err := k.Row(r); err != nil {
			v.errs = append(append(v.errs, k.probs...), err.(*Problem))
			return nil
		}
	}
	if err := r.Err(); err != nil {
		v.errs = append(append(v.errs, k.probs...), logProblem(err, l.At.Of("file"), path))
		return nil
	}
	if err := k.Done(); err != nil {
		v.errs = append(v.errs, err.(Problems)...)
	}
	if k.n == 0 {
		return nil
	}
	return k.result()
}

// csvTable reads a small CSV table (taps_file, readings_file) with its header,
// giving each cell's position.
type csvTable struct {
	name   string
	header []string
	rows   [][]string
	pos    [][]Where
}

// readTable reads the table in f, named name, through track (Campaign.track).
func readTable(name string, f *os.File, track func(string, *os.File) (io.Reader, func())) (*csvTable, error) {
	if st, err := f.Stat(); err == nil && st.Size() > maxTableBytes {
		return nil, fmt.Errorf("the table is larger than %d MiB (it holds one row per tap or reading)", maxTableBytes>>20)
	}
	src, done := track(name, f)
	defer done()
	cr := csv.NewReader(io.LimitReader(src, maxTableBytes))
	cr.TrimLeadingSpace = true
	cr.FieldsPerRecord = 0
	t := &csvTable{name: name}
	for {
		rec, err := cr.Read()
		if err == io.EOF {
			break
		}
		if err != nil {
			return nil, err
		}
		if t.header == nil {
			t.header = rec
			continue
		}
		pos := make([]Where, len(rec))
		for i := range rec {
			line, col := cr.FieldPos(i)
			pos[i] = Where{File: name, Line: line, Column: col}
		}
		t.rows = append(t.rows, rec)
		t.pos = append(t.pos, pos)
	}
	if t.header == nil {
		return nil, fmt.Errorf("empty file: no header row")
	}
	return t, nil
}

// tableNumber parses a cell as a finite number.
func (v *validator) tableNumber(cell string, w Where, path, col string) (float64, bool) {
	x, err := strconv.ParseFloat(strings.TrimSpace(cell), 64)
	if err != nil || math.IsInf(x, 0) || math.IsNaN(x) {
		v.errf(w, path, ErrType, "column %q: want a finite number, got %q", col, cell)
		return 0, false
	}
	return x, true
}

func (v *validator) openTable(p Place, path, key, file string) *csvTable {
	name := v.c.Path(file)
	f, err := OpenRegular(name)
	var t *csvTable
	if err == nil {
		defer f.Close()
		t, err = readTable(name, f, v.c.track)
	}
	if err != nil {
		var pe *csv.ParseError
		if errors.As(err, &pe) {
			v.errs = append(v.errs, &Problem{Where: Where{File: name, Line: pe.Line, Column: pe.Column}, Path: path + "." + key, Err: wrapf(ErrFile, "%v", pe.Err)})
		} else {
			v.errf(p.Of(key), path+"."+key, ErrFile, "cannot read %q: %v", file, unwrapPath(err))
		}
		return nil
	}
	return t
}

// hasColumns reports whether a table's header has every needed column,
// naming each missing one.
func (v *validator) hasColumns(t *csvTable, col map[string]int, path string, need ...string) bool {
	ok := true
	for _, n := range need {
		if _, found := col[n]; !found {
			v.errf(Where{File: t.name, Line: 1}, path, ErrColumn, "column %q is missing from the header", n)
			ok = false
		}
	}
	return ok
}

// loadTaps fills e.Taps from taps_file: columns id, x_m, surface, and
// area_m2 with nz (panels) or width_m (strips, nz optional).
func (v *validator) loadTaps(e *PressureEntry, path string) {
	t := v.openTable(e.At, path, "taps_file", e.TapsFile)
	if t == nil {
		return
	}
	col := map[string]int{}
	for i, h := range t.header {
		col[strings.TrimSpace(h)] = i
	}
	if !v.hasColumns(t, col, path+".taps_file", "id", "x_m", "surface") {
		return
	}
	for r, rec := range t.rows {
		tp := fmt.Sprintf("%s.taps[%d]", path, r)
		tap := Tap{At: Place{Where: t.pos[r][0], keys: map[string]Where{}}}
		for name, i := range col {
			if i >= len(rec) {
				continue
			}
			w := t.pos[r][i]
			cell := strings.TrimSpace(rec[i])
			switch name {
			case "id":
				tap.ID = cell
			case "surface":
				tap.Surface = cell
			case "x_m", "area_m2", "width_m", "nz":
				if cell == "" {
					continue
				}
				x, ok := v.tableNumber(cell, w, tp+"."+name, name)
				if !ok {
					continue
				}
				switch name {
				case "x_m":
					tap.XM = x
				case "area_m2":
					tap.AreaM2 = x
				case "width_m":
					tap.WidthM = x
				case "nz":
					tap.Nz = x
				}
			default:
				continue
			}
			tap.At.keys[name] = w
		}
		e.Taps = append(e.Taps, tap)
	}
}

// loadReadings fills e.Readings from readings_file: columns config,
// speed_kmh, direction (optional), then one column per tap id.
func (v *validator) loadReadings(e *PressureEntry, path string) {
	t := v.openTable(e.At, path, "readings_file", e.ReadingsFile)
	if t == nil {
		return
	}
	fixed := map[string]bool{"config": true, "speed_kmh": true, "direction": true}
	col := map[string]int{}
	for i, h := range t.header {
		col[strings.TrimSpace(h)] = i
	}
	if !v.hasColumns(t, col, path+".readings_file", "config", "speed_kmh") {
		return
	}
	for r, rec := range t.rows {
		rp := fmt.Sprintf("%s.readings[%d]", path, r)
		rd := Reading{At: Place{Where: t.pos[r][0], keys: map[string]Where{}}}
		for i, h := range t.header {
			h = strings.TrimSpace(h)
			if i >= len(rec) {
				continue
			}
			w, cell := t.pos[r][i], strings.TrimSpace(rec[i])
			switch {
			case h == "config":
				rd.Config = cell
			case cell == "" && !fixed[h]:
				continue // a missing tap reading is reported by the tap check
			case h == "speed_kmh":
				rd.SpeedKmh, _ = v.tableNumber(cell, w, rp+".speed_kmh", h)
			case h == "direction":
				if cell != "" {
					d, _ := v.tableNumber(cell, w, rp+".direction", h)
					rd.Direction = int(d)
					if float64(rd.Direction) != d {
						v.errf(w, rp+".direction", ErrRange, "direction must be 1 or -1, got %q", cell)
					}
				}
			default:
				if x, ok := v.tableNumber(cell, w, rp+".pa."+h, h); ok {
					rd.Pa = append(rd.Pa, Value{Key: h, V: x, At: w})
				}
			}
			if fixed[h] {
				rd.At.keys[h] = w
			}
		}
		rd.At.keys["pa"] = rd.At.Where
		e.Readings = append(e.Readings, rd)
	}
}

// Hash returns the hex SHA-256 of the campaign file and every file it read,
// in the order read, each preceded by its length so that no two different
// sets of files hash alike. A campaign from Load has it from the bytes
// validation and the adapters read (the files as they were then), files
// read by neither being read now; from Parse, or if a read stopped early,
// the files are read again.
func (c *Campaign) Hash() (string, error) {
	if d := c.digest; d != nil && d.upTo(c.Files) {
		if sum, ok := d.sum(c.Files); ok {
			return sum, nil
		}
	}
	d := &digest{h: sha256.New()}
	for _, name := range c.Files {
		if err := d.add(name); err != nil {
			return "", err
		}
	}
	return hex.EncodeToString(d.h.Sum(nil)), nil
}

// DetectedFormats lists, once per log file, how the reader read it — the
// format keys given and what it detected — for a person to confirm:
// `logs/day1.csv: delimiter ";", decimal ",", header on line 3, …`.
func (c *Campaign) DetectedFormats() []string {
	var out []string
	seen := map[string]bool{}
	add := func(ls []LogSpec) {
		for _, l := range ls {
			if l.Detected != "" && !seen[l.File] {
				seen[l.File] = true
				out = append(out, l.File+": "+l.Detected)
			}
		}
	}
	for _, e := range c.Evidence.RideHeight {
		add(e.Logs)
	}
	for _, e := range c.Evidence.Pressure {
		add(e.Logs)
	}
	return out
}
