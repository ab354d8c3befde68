package logs

import (
	"bytes"
	"errors"
	"fmt"
	"io"
	"math"
)

// Sentinel errors wrapped by ParseError.
var (
	ErrEmpty         = errors.New("empty file: no header row")
	ErrNoColumn      = errors.New("no such column in the header")
	ErrMissingCell   = errors.New("missing value")
	ErrNotNumber     = errors.New("not a number")
	ErrNotFinite     = errors.New("not a finite number")
	ErrNotIncreasing = errors.New("time is not strictly increasing")
	ErrBlankLine     = errors.New("blank line inside the data")
	ErrLongLine      = errors.New("line longer than 1 MiB")
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
// numbers.
type Column struct {
	Name string
	Text bool
}

const (
	bufSize     = 256 << 10
	maxLineSize = 1 << 20
)

// Reader streams the rows of a log, keeping only the asked-for columns. Its
// memory is a fixed buffer, whatever the file's length.
type Reader struct {
	// Increasing, when ≥ 0, is the index (into the asked-for columns) of a
	// column that must grow strictly from row to row, such as time.
	Increasing int

	src   io.Reader
	file  string
	cols  []Column
	want  []int // file column → asked index, or -1
	nfile int
	names []string

	buf        []byte
	start, end int
	eof        bool

	line      int
	blankLine int // line of a blank line not yet followed by data, or 0
	vals      []float64
	at        []int // 1-based column of each asked-for cell in the current row
	text      [][]byte
	prev      float64
	havePrev  bool
	err       error
}

// NewReader reads the header row of src and finds the columns. file names
// the source in errors.
func NewReader(src io.Reader, file string, cols []Column) (*Reader, error) {
	r := &Reader{
		Increasing: -1,
		src:        src,
		file:       file,
		cols:       cols,
		buf:        make([]byte, bufSize),
		vals:       make([]float64, len(cols)),
		at:         make([]int, len(cols)),
		text:       make([][]byte, len(cols)),
	}
	header, ok := r.nextLine()
	if r.err != nil {
		return nil, r.err
	}
	for ok && len(bytes.TrimSpace(header)) == 0 {
		header, ok = r.nextLine()
	}
	if !ok {
		if r.err != nil {
			return nil, r.err
		}
		return nil, &ParseError{File: file, Line: 1, Err: ErrEmpty}
	}
	names := map[string]int{}
	for i, name := range splitCells(header, nil) {
		name = bytes.Trim(bytes.TrimSpace(name), `"`)
		if _, dup := names[string(name)]; !dup {
			names[string(name)] = i
		}
		r.names = append(r.names, string(name))
		r.nfile = i + 1
	}
	r.want = make([]int, r.nfile)
	for i := range r.want {
		r.want[i] = -1
	}
	for k, c := range cols {
		i, found := names[c.Name]
		if !found {
			return nil, &ParseError{File: file, Line: r.line, Field: c.Name, Err: ErrNoColumn}
		}
		r.want[i] = k
	}
	return r, nil
}

// Names returns the header's column names, in file order.
func (r *Reader) Names() []string { return r.names }

// Next advances to the next row; it returns false at the end or on the
// first error (see Err).
func (r *Reader) Next() bool {
	if r.err != nil {
		return false
	}
	for {
		line, ok := r.nextLine()
		if !ok {
			return false
		}
		if len(bytes.TrimSpace(line)) == 0 {
			if r.blankLine == 0 {
				r.blankLine = r.line
			}
			continue
		}
		if r.blankLine != 0 {
			r.err = &ParseError{File: r.file, Line: r.blankLine, Err: ErrBlankLine}
			return false
		}
		return r.parseRow(line)
	}
}

func (r *Reader) parseRow(line []byte) bool {
	col, start, found := 0, 0, 0
	for {
		end := bytes.IndexByte(line[start:], ',')
		last := end < 0
		if last {
			end = len(line)
		} else {
			end += start
		}
		if col < r.nfile {
			if k := r.want[col]; k >= 0 {
				if !r.cell(k, line[start:end], start+1) {
					return false
				}
				found++
			}
		}
		col++
		if last {
			break
		}
		start = end + 1
	}
	if found < len(r.cols) {
		for i, k := range r.want {
			if k >= 0 && i >= col {
				r.err = &ParseError{File: r.file, Line: r.line, Column: len(line) + 1, Field: r.cols[k].Name, Err: ErrMissingCell}
				return false
			}
		}
	}
	return true
}

func (r *Reader) cell(k int, b []byte, column int) bool {
	r.at[k] = column
	b = bytes.TrimSpace(b)
	if len(b) >= 2 && b[0] == '"' && b[len(b)-1] == '"' {
		b = b[1 : len(b)-1]
	}
	if len(b) == 0 {
		r.err = &ParseError{File: r.file, Line: r.line, Column: column, Field: r.cols[k].Name, Err: ErrMissingCell}
		return false
	}
	if r.cols[k].Text {
		r.text[k] = b
		return true
	}
	x, err := ParseFloat(b)
	switch {
	case err != nil:
		r.err = &ParseError{File: r.file, Line: r.line, Column: column, Field: r.cols[k].Name, Err: fmt.Errorf("%w: %q", ErrNotNumber, b)}
		return false
	case math.IsInf(x, 0) || math.IsNaN(x):
		r.err = &ParseError{File: r.file, Line: r.line, Column: column, Field: r.cols[k].Name, Err: fmt.Errorf("%w: %q", ErrNotFinite, b)}
		return false
	}
	if k == r.Increasing {
		if r.havePrev && !(x > r.prev) {
			r.err = &ParseError{File: r.file, Line: r.line, Column: column, Field: r.cols[k].Name,
				Err: fmt.Errorf("%w: %g after %g", ErrNotIncreasing, x, r.prev)}
			return false
		}
		r.prev, r.havePrev = x, true
	}
	r.vals[k] = x
	return true
}

// Float returns the value of asked-for column k in the current row.
func (r *Reader) Float(k int) float64 { return r.vals[k] }

// Text returns the bytes of asked-for text column k in the current row;
// they are valid until the next call to Next.
func (r *Reader) Text(k int) []byte { return r.text[k] }

// Column returns the 1-based character column where asked-for column k's
// cell starts in the current row.
func (r *Reader) Column(k int) int { return r.at[k] }

// Line returns the 1-based line number of the current row.
func (r *Reader) Line() int { return r.line }

// Err returns the first error met, or nil at a clean end of file.
func (r *Reader) Err() error { return r.err }

// nextLine returns the next line without its line ending.
func (r *Reader) nextLine() ([]byte, bool) {
	for {
		if i := bytes.IndexByte(r.buf[r.start:r.end], '\n'); i >= 0 {
			line := r.buf[r.start : r.start+i]
			r.start += i + 1
			r.line++
			return bytes.TrimSuffix(line, []byte{'\r'}), true
		}
		if r.eof {
			if r.start == r.end {
				return nil, false
			}
			line := r.buf[r.start:r.end]
			r.start = r.end
			r.line++
			return bytes.TrimSuffix(line, []byte{'\r'}), true
		}
		r.fill()
		if r.err != nil {
			return nil, false
		}
	}
}

func (r *Reader) fill() {
	if r.start > 0 {
		n := copy(r.buf, r.buf[r.start:r.end])
		r.start, r.end = 0, n
	}
	if r.end == len(r.buf) {
		if len(r.buf) >= maxLineSize {
			r.err = &ParseError{File: r.file, Line: r.line + 1, Err: ErrLongLine}
			return
		}
		r.buf = append(r.buf, make([]byte, len(r.buf))...)
	}
	n, err := r.src.Read(r.buf[r.end:])
	r.end += n
	switch {
	case err == io.EOF:
		r.eof = true
	case err != nil:
		r.err = &ParseError{File: r.file, Line: r.line + 1, Err: err}
	}
}

// splitCells appends the comma-separated cells of line to dst.
func splitCells(line []byte, dst [][]byte) [][]byte {
	for {
		i := bytes.IndexByte(line, ',')
		if i < 0 {
			return append(dst, line)
		}
		dst = append(dst, line[:i])
		line = line[i+1:]
	}
}
