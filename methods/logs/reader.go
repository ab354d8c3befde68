package logs

import (
	"bytes"
	"errors"
	"fmt"
	"io"
	"math"
	"runtime"
	"sync"
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
	chunkSize   = 256 << 10 // bytes of log per block
	maxLineSize = 1 << 20
	inFlight    = 4 // blocks read ahead of the consumer
)

// Reader streams the rows of a log, keeping only the asked-for columns.
//
// The file is cut into blocks of about 1 MiB at line ends; with Workers > 1
// the blocks are parsed in parallel while the caller consumes earlier ones
// in order, so parsing overlaps the caller's own work. Memory is a few
// blocks, whatever the file's length. Call Close when stopping early.
type Reader struct {
	// Increasing, when ≥ 0, is the index (into the asked-for columns) of a
	// column that must grow strictly from row to row, such as time.
	Increasing int
	// Workers is the number of goroutines that parse blocks (default
	// GOMAXPROCS); set it before the first call to Next.
	Workers int

	src   io.Reader
	file  string
	cols  []Column
	want  []int // file column → asked index, or −1
	names []string
	rest  []byte // bytes after the header, read while finding it
	line  int    // line number of the header

	started bool
	order   chan chan *block
	done    chan struct{}
	pool    sync.Pool   // consumed blocks
	spare   chan *block // blocks whose buffer was taken, for their arrays

	cur      *block
	i        int
	prev     float64
	havePrev bool
	blank    int // first line of trailing blank lines of the previous block
	err      error
}

// block is one parsed piece of the log.
type block struct {
	data  []byte
	rows  int
	line  []int32     // line number of each row
	start []int32     // offset of each row in data
	vals  [][]float64 // per asked column (numeric)
	text  [][][2]int32
	// trailing is the line of the first blank line after the last row, or 0
	trailing int
	err      error
}

// NewReader reads the header row of src and finds the columns. file names
// the source in errors.
func NewReader(src io.Reader, file string, cols []Column) (*Reader, error) {
	r := &Reader{Increasing: -1, Workers: runtime.GOMAXPROCS(0), src: src, file: file, cols: cols}
	buf := make([]byte, 0, 64<<10)
	// Read until the first non-blank line is complete.
	for {
		if i := headerEnd(buf); i >= 0 {
			header := buf[:i]
			r.rest = append([]byte(nil), buf[i+1:]...)
			r.line += bytes.Count(header, []byte{'\n'}) + 1
			header = lastLine(header)
			return r, r.setHeader(header)
		}
		if len(buf) >= maxLineSize {
			return nil, &ParseError{File: file, Line: 1, Err: ErrLongLine}
		}
		tmp := make([]byte, 64<<10)
		n, err := src.Read(tmp)
		buf = append(buf, tmp[:n]...)
		if err == io.EOF {
			if len(bytes.TrimSpace(buf)) == 0 {
				return nil, &ParseError{File: file, Line: 1, Err: ErrEmpty}
			}
			r.line += bytes.Count(buf, []byte{'\n'}) + 1
			return r, r.setHeader(lastLine(bytes.TrimRight(buf, "\r\n\t ")))
		}
		if err != nil {
			return nil, &ParseError{File: file, Line: 1, Err: err}
		}
	}
}

// headerEnd returns the index of the newline ending the first non-blank
// line of buf, or −1.
func headerEnd(buf []byte) int {
	off := 0
	for {
		i := bytes.IndexByte(buf[off:], '\n')
		if i < 0 {
			return -1
		}
		if len(bytes.TrimSpace(buf[off:off+i])) > 0 {
			return off + i
		}
		off += i + 1
	}
}

func lastLine(b []byte) []byte {
	if i := bytes.LastIndexByte(b, '\n'); i >= 0 {
		b = b[i+1:]
	}
	return bytes.TrimSuffix(b, []byte{'\r'})
}

func (r *Reader) setHeader(header []byte) error {
	index := map[string]int{}
	for i, name := range splitCells(header, nil) {
		name = bytes.Trim(bytes.TrimSpace(name), `"`)
		if _, dup := index[string(name)]; !dup {
			index[string(name)] = i
		}
		r.names = append(r.names, string(name))
	}
	r.want = make([]int, len(r.names))
	for i := range r.want {
		r.want[i] = -1
	}
	for k, c := range r.cols {
		i, ok := index[c.Name]
		if !ok {
			return &ParseError{File: r.file, Line: r.line, Field: c.Name, Err: ErrNoColumn}
		}
		r.want[i] = k
	}
	return nil
}

// Names returns the header's column names, in file order.
func (r *Reader) Names() []string { return r.names }

// Next advances to the next row; it returns false at the end or on the
// first error (see Err).
func (r *Reader) Next() bool {
	if r.err != nil {
		return false
	}
	if !r.started {
		r.start()
	}
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
		if r.cur != nil {
			r.recycle(r.cur)
		}
		if b.rows > 0 && r.blank != 0 {
			r.err = &ParseError{File: r.file, Line: r.blank, Err: ErrBlankLine}
			return false
		}
		r.cur, r.i = b, -1
		if b.rows == 0 && b.err != nil {
			r.err = b.err
			return false
		}
	}
	r.i++
	if k := r.Increasing; k >= 0 {
		x := r.cur.vals[k][r.i]
		if r.havePrev && !(x > r.prev) {
			r.err = &ParseError{File: r.file, Line: r.Line(), Column: r.Column(k), Field: r.cols[k].Name,
				Err: fmt.Errorf("%w: %g after %g", ErrNotIncreasing, x, r.prev)}
			return false
		}
		r.prev, r.havePrev = x, true
	}
	return true
}

// Float returns the value of asked-for column k in the current row.
func (r *Reader) Float(k int) float64 { return r.cur.vals[k][r.i] }

// Text returns the bytes of asked-for text column k in the current row;
// they are valid until the next call to Next.
func (r *Reader) Text(k int) []byte {
	s := r.cur.text[k][r.i]
	return r.cur.data[s[0]:s[1]]
}

// File returns the name the reader gives its source in errors.
func (r *Reader) File() string { return r.file }

// Line returns the 1-based line number of the current row.
func (r *Reader) Line() int { return int(r.cur.line[r.i]) }

// Column returns the 1-based character column where asked-for column k's
// cell starts in the current row.
func (r *Reader) Column(k int) int {
	row := r.cur.data[r.cur.start[r.i]:]
	if e := bytes.IndexByte(row, '\n'); e >= 0 {
		row = row[:e]
	}
	col, at := 0, 0
	for {
		if col < len(r.want) && r.want[col] == k {
			return at + 1
		}
		i := bytes.IndexByte(row[at:], ',')
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

// start launches the block pipeline: one goroutine cuts the input into
// blocks at line ends and hands them to the parsers in order.
func (r *Reader) start() {
	r.started = true
	r.spare = make(chan *block, 2*inFlight+4)
	r.order = make(chan chan *block, inFlight)
	r.done = make(chan struct{})
	jobs := make(chan func(), inFlight)
	workers := max(r.Workers, 1)
	for range workers {
		go func() {
			for job := range jobs {
				job()
			}
		}()
	}
	go func() {
		defer close(r.order)
		defer close(jobs)
		carry := r.rest
		line := r.line + 1 // line of the first byte of carry
		eof := false
		for !eof {
			buf := r.buffer(len(carry))
			copy(buf, carry)
			var readErr error
			target := len(carry) + chunkSize // read at least a block more than the carry
			for len(buf) < target && readErr == nil {
				n, err := r.src.Read(buf[len(buf):cap(buf)])
				buf = buf[:len(buf)+n]
				readErr = err
			}
			if readErr != nil && readErr != io.EOF {
				r.send(&block{err: &ParseError{File: r.file, Line: line, Err: readErr}}, nil)
				return
			}
			eof = readErr == io.EOF
			end := len(buf)
			if !eof {
				end = bytes.LastIndexByte(buf, '\n') + 1
				if end == 0 {
					if len(buf) >= maxLineSize {
						r.send(&block{err: &ParseError{File: r.file, Line: line, Err: ErrLongLine}}, nil)
						return
					}
					carry = buf // a line longer than a block: read on
					continue
				}
			}
			data := buf[:end]
			carry = append([]byte(nil), buf[end:]...)
			first := line
			line += bytes.Count(data, []byte{'\n'})
			res := make(chan *block, 1)
			if !r.send(nil, res) {
				return
			}
			select {
			case jobs <- func() { res <- r.parse(data, first) }:
			case <-r.done:
				return
			}
		}
	}()
}

// send queues a result slot (or a ready block) for the consumer, in order.
func (r *Reader) send(b *block, res chan *block) bool {
	if res == nil {
		res = make(chan *block, 1)
		res <- b
	}
	select {
	case r.order <- res:
		return true
	case <-r.done:
		return false
	}
}

// buffer returns a byte slice of length n (the carried-over partial line)
// with room for a block after it, reusing a recycled block's buffer where
// it can.
func (r *Reader) buffer(n int) []byte {
	const slack = 64 << 10
	if b, ok := r.pool.Get().(*block); ok {
		select {
		case r.spare <- b: // its arrays, for newBlock
		default:
		}
		if cap(b.data) >= chunkSize+n {
			return b.data[:n]
		}
	}
	return make([]byte, n, chunkSize+max(n, slack))
}

// recycle returns a consumed block's memory to the pool.
func (r *Reader) recycle(b *block) {
	if b.err == nil {
		r.pool.Put(b)
	}
}

// newBlock returns an empty block for data, reusing recycled arrays.
func (r *Reader) newBlock(data []byte) *block {
	var b *block
	select {
	case b = <-r.spare:
	default:
		b = &block{vals: make([][]float64, len(r.cols)), text: make([][][2]int32, len(r.cols))}
	}
	b.data, b.rows, b.trailing, b.err = data, 0, 0, nil
	b.line, b.start = b.line[:0], b.start[:0]
	for k, c := range r.cols {
		if c.Text {
			b.text[k] = b.text[k][:0]
		} else {
			b.vals[k] = b.vals[k][:0]
		}
	}
	return b
}

// parse parses the lines of data, the first of which is line first.
func (r *Reader) parse(data []byte, first int) *block {
	b := r.newBlock(data)
	line := first - 1
	blank := 0
	for off := 0; off < len(data); {
		e := bytes.IndexByte(data[off:], '\n')
		next := off + e + 1
		if e < 0 {
			e, next = len(data)-off, len(data)
		}
		row := data[off : off+e]
		line++
		if len(row) > 0 && row[len(row)-1] == '\r' {
			row = row[:len(row)-1]
		}
		if isBlank(row) {
			if blank == 0 {
				blank = line
			}
			off = next
			continue
		}
		if blank != 0 {
			b.err = &ParseError{File: r.file, Line: blank, Err: ErrBlankLine}
			return b
		}
		if err := r.parseRow(b, row, off, line); err != nil {
			b.err = err
			return b
		}
		off = next
	}
	b.trailing = blank
	return b
}

func isBlank(row []byte) bool {
	for _, c := range row {
		if c != ' ' && c != '\t' {
			return false
		}
	}
	return true
}

// parseRow appends one row's asked-for cells to b. Numbers are parsed in
// the same pass that finds the commas; an unusual cell (spaces, quotes, an
// exponent, many digits) takes the general path.
func (r *Reader) parseRow(b *block, row []byte, off, line int) error {
	at, found := 0, 0
	for _, k := range r.want {
		if at > len(row) || found == len(r.cols) {
			break // the row has no more cells, or none that we want
		}
		if k < 0 {
			if i := bytes.IndexByte(row[at:], ','); i >= 0 {
				at += i + 1
			} else {
				at = len(row) + 1
			}
			continue
		}
		found++
		if !r.cols[k].Text {
			if x, n, ok := prefixFloat(row[at:]); ok && (at+n == len(row) || row[at+n] == ',') {
				b.vals[k] = append(b.vals[k], x)
				at += n + 1
				continue
			}
		}
		end := len(row)
		if i := bytes.IndexByte(row[at:], ','); i >= 0 {
			end = at + i
		}
		if err := r.cell(b, k, row, at, end, line, off); err != nil {
			return err
		}
		at = end + 1
	}
	if found < len(r.cols) {
		for k := range r.cols {
			if r.count(b, k) <= b.rows {
				return &ParseError{File: r.file, Line: line, Column: len(row) + 1, Field: r.cols[k].Name, Err: ErrMissingCell}
			}
		}
	}
	b.line = append(b.line, int32(line))
	b.start = append(b.start, int32(off))
	b.rows++
	return nil
}

// count returns how many cells of asked-for column k the block holds.
func (r *Reader) count(b *block, k int) int {
	if r.cols[k].Text {
		return len(b.text[k])
	}
	return len(b.vals[k])
}

// cell parses one asked-for cell, row[at:end], by the general rules: spaces
// and double quotes around it are dropped, text is kept as a span, a number
// must parse exactly as strconv.ParseFloat would and be finite.
func (r *Reader) cell(b *block, k int, row []byte, at, end, line, off int) error {
	cell := bytes.TrimSpace(row[at:end])
	if len(cell) >= 2 && cell[0] == '"' && cell[len(cell)-1] == '"' {
		cell = cell[1 : len(cell)-1]
	}
	if len(cell) == 0 {
		return &ParseError{File: r.file, Line: line, Column: at + 1, Field: r.cols[k].Name, Err: ErrMissingCell}
	}
	if r.cols[k].Text {
		s := int32(off + cap(row) - cap(cell)) // cell is a sub-slice of row
		b.text[k] = append(b.text[k], [2]int32{s, s + int32(len(cell))})
		return nil
	}
	x, err := ParseFloat(cell)
	if err != nil {
		return &ParseError{File: r.file, Line: line, Column: at + 1, Field: r.cols[k].Name, Err: fmt.Errorf("%w: %q", ErrNotNumber, cell)}
	}
	if math.IsInf(x, 0) || math.IsNaN(x) {
		return &ParseError{File: r.file, Line: line, Column: at + 1, Field: r.cols[k].Name, Err: fmt.Errorf("%w: %q", ErrNotFinite, cell)}
	}
	b.vals[k] = append(b.vals[k], x)
	return nil
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
