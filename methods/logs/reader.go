package logs

import (
	"bytes"
	"errors"
	"fmt"
	"io"
	"math"
	"runtime"
	"unicode/utf8"
)

// Sentinel errors wrapped by ParseError.
var (
	ErrEmpty         = errors.New("empty file: no header row")
	ErrNoColumn      = errors.New("not in the header")
	ErrMissingCell   = errors.New("missing value")
	ErrNotNumber     = errors.New("not a number")
	ErrNotFinite     = errors.New("not a finite number")
	ErrNotIncreasing = errors.New("time is not strictly increasing")
	ErrBlankLine     = errors.New("blank line inside the data")
	ErrLongLine      = errors.New("line longer than 1 MiB")
	ErrNoHeader      = errors.New("no header line")
	ErrNotTime       = errors.New("not a time")
)

// ParseError is a fault at a place in a log. Column is the 1-based character
// column where the cell starts; Field is the column's header name.
type ParseError struct {
	File   string
	Line   int
	Column int
	Field  string
	Err    error
}

func (e *ParseError) Error() string {
	pos := fmt.Sprintf("%s:%d", e.File, e.Line)
	if e.Column > 0 {
		pos = fmt.Sprintf("%s:%d", pos, e.Column)
	}
	if e.Field != "" {
		return fmt.Sprintf("%s: column %q: %v", pos, e.Field, e.Err)
	}
	return fmt.Sprintf("%s: %v", pos, e.Err)
}

func (e *ParseError) Unwrap() error { return e.Err }

// Column asks for one column by its header name. A Text column is handed
// over as bytes (a configuration id, say); the others are parsed as finite
// numbers. The Time column (at most one) is read by Format.Time and must
// increase strictly; clock and ISO times are yielded as seconds from the
// log's first sample.
type Column struct {
	Name string
	Text bool
	Time bool
}

// column kinds, by how a cell is read
const (
	kindNum uint8 = iota
	kindText
	kindClock // int64 nanoseconds of the day, stored in the float's bits until Next
	kindISO   // int64 Unix nanoseconds, likewise
)

const (
	// chunkSize is the bytes of log per block: for liftfuse reduce on the
	// benchmark log (whole processes, 15–21 pairs in turn), 256 KiB took 2–3 % longer
	// and 2 MiB more, 512 KiB longer still, 64 KiB the same.
	chunkSize   = 128 << 10
	maxLineSize = 1 << 20
	inFlight    = 4 // blocks read ahead of the consumer
)

// Reader streams the rows of a log, keeping only the asked-for columns.
//
// The file is cut into blocks of about 128 KiB at line ends; with Workers > 1
// the blocks are parsed in parallel while the caller consumes earlier ones
// in order, so parsing overlaps the caller's own work. Memory is a few
// blocks, whatever the file's length. Call Close when stopping early.
type Reader struct {
	// Increasing, when ≥ 0, is the index (into the asked-for columns) of a
	// column that must grow strictly from row to row, such as time. A
	// column marked Time sets it; set it before the first call to Next.
	Increasing int
	// Workers is the number of goroutines that parse blocks (default
	// GOMAXPROCS); set it before the first call to Next.
	Workers int

	src   io.Reader
	file  string
	cols  []Column
	want  []int // file column → asked index, or −1
	plan  []int // want up to the last asked-for column
	names []string
	rest  []byte // bytes after the header, read while finding it
	line  int    // line number of the last line before the data

	format  Format  // as settled on: given keys, then detected ones
	delim   byte    // format.Delimiter
	dec     byte    // format.Decimal
	kind    []uint8 // per asked column
	timeK   int     // asked index of the time column, or −1
	post    bool    // rows need the consumer's pass (hold, clock or ISO time)
	hold    []bool  // per asked column: holds its last value (EmptyHold)
	last    []float64
	lastTxt [][]byte
	has     []bool
	t0      int64 // nanoseconds of the first sample (clock, ISO)
	haveT0  bool
	day     int64 // nanoseconds added for midnights passed (clock)
	prevNs  int64

	started bool
	order   chan chan *block
	done    chan struct{}

	cur      *block
	i        int
	fast     int     // the last row of cur that Next steps to alone: −1 with the post pass or after an error
	base     int     // index of the current row's first cell in cur.vals
	prev     float64 // the Increasing column's last value; −Inf at first
	blank    int     // first line of trailing blank lines of the previous block
	nextLine int     // line of the next block's first byte
	rowBytes int     // bytes per row, estimated from the head of the file
	err      error
}

// block is one parsed piece of the log.
type block struct {
	buf  []byte // the block's own buffer, data and the carried bytes after it
	data []byte
	rows int
	// first is the line of the first row; the rows are the lines that
	// follow it, unless rows may be dropped (EmptySkip): then line holds
	// each row's line, counted from 1 at the block's start (see shift).
	first int
	line  []int32
	lines int // lines in data
	// vals holds the asked-for cells row by row (row i, column k at
	// i·len(cols)+k): numbers (NaN: an empty cell to hold), clock and ISO
	// times as int64 nanoseconds in the float's bits until Next converts
	// them, text as a span of data packed in the bits (see span).
	vals []float64
	// shapes holds the layout of each planned column's cell that the
	// byte loop last read, tried on the next rows (shape)
	shapes []shape
	// trailing is the line of the first blank line after the last row, or 0
	trailing int
	err      error
}

// NewReader reads the header row of src and finds the columns, detecting
// the format (see Format). file names the source in errors.
func NewReader(src io.Reader, file string, cols []Column) (*Reader, error) {
	return NewReaderFormat(src, file, cols, Format{})
}

// NewReaderFormat is NewReader with the format keys a campaign gives; zero
// keys are detected. Every asked-for column missing from the header is
// reported at once: the error is then an errors.Join of *ParseError values
// (see ParseErrors), each listing the header's columns and the closest name.
func NewReaderFormat(src io.Reader, file string, cols []Column, f Format) (*Reader, error) {
	if err := f.Check(); err != nil {
		return nil, &ParseError{File: file, Line: 1, Err: err}
	}
	r := &Reader{Increasing: -1, Workers: runtime.GOMAXPROCS(0), src: src, file: file, cols: cols, format: f, timeK: -1}
	r.kind = make([]uint8, len(cols))
	for k, c := range cols {
		if c.Text {
			r.kind[k] = kindText
		}
		if c.Time && r.timeK < 0 {
			r.timeK, r.Increasing = k, k
		}
	}
	if err := r.readHead(); err != nil {
		return nil, err
	}
	r.rowBytes = rowBytes(r.rest)
	return r, nil
}

// Detected returns the format the reader settled on: the keys it was
// given and the ones it detected. Time is TimeDetect until it is known
// (at NewReader when a column is marked Time, else at the first Next).
func (r *Reader) Detected() Format { return r.format }

// setHeader splits the header line with the settled delimiter and finds
// the asked-for columns; a missing one is an error (all of them at once).
func (r *Reader) setHeader(header []byte) error {
	r.names = headerNames(header, r.delim)
	index := make(map[string]int, len(r.names))
	for i, name := range r.names {
		if _, dup := index[name]; !dup {
			index[name] = i
		}
	}
	r.want = make([]int, len(r.names))
	for i := range r.want {
		r.want[i] = -1
	}
	var errs []error
	for k, c := range r.cols {
		i, ok := index[c.Name]
		if !ok {
			col := 1
			if near, ok := ClosestName(c.Name, r.names); ok {
				col = cellColumn(header, r.delim, index[near])
			}
			errs = append(errs, &ParseError{File: r.file, Line: r.line, Column: col, Field: c.Name, Err: missingColumn(c.Name, r.names)})
			continue
		}
		r.want[i] = k
	}
	last := -1
	for i, k := range r.want {
		if k >= 0 {
			last = i
		}
	}
	r.plan = r.want[:last+1]
	switch len(errs) {
	case 0:
		return nil
	case 1:
		return errs[0]
	}
	return errors.Join(errs...)
}

// headerNames splits a header line into names, spaces and quotes dropped.
func headerNames(header []byte, delim byte) []string {
	var names []string
	for _, name := range splitCells(header, delim, nil) {
		names = append(names, string(bytes.Trim(bytes.TrimSpace(name), `"`)))
	}
	return names
}

// cellColumn returns the 1-based character column where cell i of line
// starts.
func cellColumn(line []byte, delim byte, i int) int {
	at := 0
	for ; i > 0; i-- {
		j := bytes.IndexByte(line[at:], delim)
		if j < 0 {
			return 0
		}
		at += j + 1
	}
	return utf8.RuneCount(line[:at]) + 1
}

// Names returns the header's column names, in file order.
func (r *Reader) Names() []string { return r.names }

// Next advances to the next row; it returns false at the end or on the
// first error (see Err). The row accessors (Float, Text, Line, Column)
// then no longer apply.
func (r *Reader) Next() bool {
	// the common case: a row of the current block, no post pass, no error
	if r.i < r.fast {
		base, k := r.base+len(r.cols), r.Increasing
		if k < 0 {
			r.i, r.base = r.i+1, base
			return true
		}
		if x := r.cur.vals[base+k]; x > r.prev {
			r.i, r.base, r.prev = r.i+1, base, x
			return true
		}
	}
	return r.next() // which finds a fault again
}

// next is Next for the first row, a new block, a row that needs the
// consumer's pass, or after an error.
func (r *Reader) next() bool {
	if r.err != nil {
		return false
	}
	if !r.started {
		if r.err = r.start(); r.err != nil {
			return false
		}
		r.prev = math.Inf(-1)
	}
	for {
		if r.cur != nil && r.i+1 < r.cur.rows {
			r.i++
			r.base += len(r.cols)
		} else if !r.advance() {
			return false
		}
		if r.post && !r.postRow() {
			if r.err != nil {
				return false
			}
			continue // a row dropped while a held column has no value yet
		}
		break
	}
	if k := r.Increasing; k >= 0 {
		if x := r.cur.vals[r.base+k]; x > r.prev {
			r.prev = x
		} else {
			return r.notIncreasing(k, x)
		}
	}
	return true
}

// notIncreasing stops the reader at a value x of column k that does not
// grow.
func (r *Reader) notIncreasing(k int, x float64) bool {
	r.err = &ParseError{File: r.file, Line: r.Line(), Column: r.Column(k), Field: r.cols[k].Name,
		Err: fmt.Errorf("%w: %g after %g", ErrNotIncreasing, x, r.prev)}
	r.fast = -1
	return false
}

// shift moves the line numbers of a block parsed from line 1 (and of its
// error) to the file's lines, n lines down.
func (b *block) shift(n int) {
	b.first += n
	if b.trailing != 0 {
		b.trailing += n
	}
	var pe *ParseError
	if errors.As(b.err, &pe) {
		pe.Line += n
	}
}

// advance moves to the next parsed row, taking the next block when the
// current one is used up.
func (r *Reader) advance() bool {
	for r.cur == nil || r.i+1 >= r.cur.rows {
		if r.cur != nil && r.cur.err != nil {
			r.err = r.cur.err
			return false
		}
		if r.cur != nil && r.cur.trailing != 0 && r.blank == 0 {
			r.blank = r.cur.trailing
		}
		res, ok := <-r.order
		if !ok {
			return false
		}
		b := <-res
		b.shift(r.nextLine - 1)
		r.nextLine += b.lines
		if r.cur != nil {
			putBlock(r.cur)
		}
		if b.rows > 0 && r.blank != 0 {
			r.err = &ParseError{File: r.file, Line: r.blank, Err: ErrBlankLine}
			return false
		}
		r.cur, r.i, r.fast = b, -1, b.rows-1
		if r.post {
			r.fast = -1
		}
		if b.rows == 0 && b.err != nil {
			r.err = b.err
			return false
		}
	}
	r.i++
	r.base = r.i * len(r.cols)
	return true
}

// postRow finishes the current row in order: held cells take their
// column's last value, clock and ISO times become seconds from the first
// sample. It returns false when the row is dropped because a held column
// has had no value yet.
func (r *Reader) postRow() bool {
	row, keep := r.cur.vals[r.base:r.base+len(r.cols)], true
	for k, h := range r.hold {
		if !h {
			continue
		}
		if r.kind[k] == kindText {
			if s, e, ok := unspan(row[k]); ok {
				r.lastTxt[k] = append(r.lastTxt[k][:0], r.cur.data[s:e]...)
				r.has[k] = true
			}
			keep = keep && r.has[k]
			continue
		}
		if x := row[k]; x == x {
			r.last[k], r.has[k] = x, true
		} else {
			row[k] = r.last[k]
			keep = keep && r.has[k]
		}
	}
	if !keep {
		return false
	}
	if k := r.timeK; k >= 0 && r.kind[k] >= kindClock {
		ns := int64(math.Float64bits(row[k]))
		if !r.haveT0 {
			r.t0, r.prevNs, r.haveT0 = ns, ns, true
		}
		if r.kind[k] == kindClock && ns+r.day < r.prevNs-nsPerDay/2 {
			r.day += nsPerDay // the clock passed midnight
		}
		ns += r.day
		r.prevNs = ns
		row[k] = float64(ns-r.t0) / float64(nsPerSec)
	}
	return true
}

// Float returns the value of asked-for column k in the current row.
func (r *Reader) Float(k int) float64 { return r.cur.vals[r.base+k] }

// Text returns the bytes of asked-for text column k in the current row;
// they are valid until the next call to Next.
func (r *Reader) Text(k int) []byte {
	s, e, ok := unspan(r.cur.vals[r.base+k])
	if !ok {
		return r.lastTxt[k] // an empty cell, held
	}
	return r.cur.data[s:e]
}

// span packs the offsets of a text cell in data into a float's bits;
// noSpan (all ones) marks an empty cell to hold.
func span(s, e int) float64 { return math.Float64frombits(uint64(s)<<32 | uint64(e)) }

const noSpan = ^uint64(0)

func unspan(x float64) (s, e int, ok bool) {
	u := math.Float64bits(x)
	return int(u >> 32), int(uint32(u)), u != noSpan
}

// File returns the name the reader gives its source in errors.
func (r *Reader) File() string { return r.file }

// Line returns the 1-based line number of the current row.
func (r *Reader) Line() int {
	if r.format.Empty == EmptySkip {
		return r.cur.first - 1 + int(r.cur.line[r.i])
	}
	return r.cur.first + r.i
}

// Column returns the 1-based character column where asked-for column k's
// cell starts in the current row.
func (r *Reader) Column(k int) int {
	row := r.cur.data
	for n := r.Line() - r.cur.first; n > 0; n-- { // the row's start: a slow path for messages
		row = row[bytes.IndexByte(row, '\n')+1:]
	}
	if e := bytes.IndexByte(row, '\n'); e >= 0 {
		row = row[:e]
	}
	col, at := 0, 0
	for {
		if col < len(r.want) && r.want[col] == k {
			return at + 1
		}
		i := bytes.IndexByte(row[at:], r.delim)
		if i < 0 {
			return 0
		}
		at += i + 1
		col++
	}
}

// Err returns the first error met, or nil at a clean end of file.
func (r *Reader) Err() error { return r.err }

// Close stops the reading goroutines; it is safe to call more than once and
// needed only when stopping before the end.
func (r *Reader) Close() {
	if r.started && r.done != nil {
		select {
		case <-r.done:
		default:
			close(r.done)
		}
	}
}

// setupPost readies the consumer's pass over each row: which columns hold
// their last value, and whether time needs converting.
func (r *Reader) setupPost() {
	if r.format.Empty == EmptyHold {
		r.hold = make([]bool, len(r.cols))
		for k := range r.cols {
			r.hold[k] = k != r.timeK
		}
		r.last = make([]float64, len(r.cols))
		r.lastTxt = make([][]byte, len(r.cols))
		r.has = make([]bool, len(r.cols))
		r.post = len(r.cols) > 1 || r.timeK < 0
	}
	if r.timeK >= 0 && r.kind[r.timeK] >= kindClock {
		r.post = true
	}
}
