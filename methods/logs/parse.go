package logs

import (
	"bytes"
	"errors"
	"fmt"
	"math"
)

// parse parses the lines of data into b (whose buffer holds data). Lines
// are numbered from 1 at data's start, in b and in its error: the
// consumer, taking the blocks in order, shifts them to the file's lines
// (block.shift), so that no one counts a block's lines before parsing it.
func (r *Reader) parse(b *block, data []byte) *block {
	b.data, b.first = data, 1
	// room for the rows the data likely holds, at once: a cell array
	// grown by doubling would touch every smaller copy's memory too
	if need := len(r.cols) * (len(data)/r.rowBytes*9/8 + 16); cap(b.vals) < need {
		b.vals = make([]float64, 0, need)
	}
	if cap(b.shapes) < len(r.plan) {
		b.shapes = make([]shape, len(r.plan))
	}
	b.shapes = b.shapes[:len(r.plan)]
	for j, k := range r.plan { // learnt afresh: the block may have served another log
		b.shapes[j] = shape{k: k, text: k >= 0 && r.kind[k] == kindText}
	}
	// The common row (not blank, with room, every cell in its column's
	// shape) is read here, its cells straight into vals; parseRow takes
	// any other up from the cell where shapedCells stopped.
	sh, vals, nc := b.shapes, b.vals, len(r.cols)
	quick, rows := r.format.Empty != EmptySkip, 0
	line, blank := 0, 0
	for off := 0; off < len(data) && b.err == nil; {
		e := bytes.IndexByte(data[off:], '\n')
		next := off + e + 1
		if e < 0 {
			e, next = len(data)-off, len(data)
		}
		row := data[off : off+e]
		line++
		if e > maxLineSize {
			b.err = &ParseError{File: r.file, Line: line, Err: ErrLongLine}
			break
		}
		if len(row) > 0 && row[len(row)-1] == '\r' {
			row = row[:len(row)-1]
		}
		j, at := 0, 0 // where parseRow takes the row up
		if n := len(vals); quick && blank == 0 && len(row) > 0 && row[0] != ' ' && row[0] != '\t' && n+nc <= cap(vals) {
			if j, at = r.shapedCells(sh, vals[n:n+nc], row, off, 0, 0); j == len(sh) {
				vals, rows, off = vals[:n+nc], rows+1, next
				continue
			}
		}
		rowOff := off
		off = next
		if (len(row) == 0 || row[0] == ' ' || row[0] == '\t') && isBlank(row) {
			if blank == 0 {
				blank = line
			}
			continue
		}
		if blank != 0 {
			b.err = &ParseError{File: r.file, Line: blank, Err: ErrBlankLine}
			break
		}
		b.vals, b.rows, rows = vals, b.rows+rows, 0
		if err := r.parseRow(b, row, rowOff, line, j, at); err != nil && err != errSkipRow {
			b.err = err
		}
		vals = b.vals
	}
	b.vals, b.rows = vals, b.rows+rows
	if b.err == nil {
		b.lines, b.trailing = line, blank
	}
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

// errSkipRow drops a row with an empty cell (EmptySkip).
var errSkipRow = errors.New("row skipped")

// parseRow appends one row's asked-for cells to b, reading the cells up
// to the last asked-for one (the rest of the line is not looked at), from
// cell j at byte at: the cells before it are in place already, just past
// b.vals' length (parse read them there, where there was room). Cells in
// their column's shape are read by shapedCells, other plain cells where
// they are found (fastCells); a cell that is not plain takes the general
// path (cell: spaces, quotes, an exponent, many digits, an empty cell, a
// time), and the ones after it go back to fastCells. A row dropped by the
// empty-cell policy returns errSkipRow.
func (r *Reader) parseRow(b *block, row []byte, off, line, j, at int) error {
	nc := len(r.cols)
	base := len(b.vals)
	if base+nc > cap(b.vals) { // j is 0: no cell is in place
		b.vals = append(b.vals, make([]float64, nc)...)
	}
	b.vals = b.vals[:base+nc]
	out := b.vals[base : base+nc]
	j, at = r.shapedCells(b.shapes, out, row, off, j, at)
	if j < len(r.plan) {
		j, at = r.fastCells(b.shapes, out, row, off, j, at)
	}
	if j < len(r.plan) {
		if err := r.slowCells(b.shapes, out, row, off, line, j, at); err != nil {
			b.vals = b.vals[:base]
			return err
		}
	}
	if r.format.Empty == EmptySkip {
		b.line = append(b.line, int32(line))
	}
	b.rows++
	return nil
}

// slowCells reads the rest of a row from cell j at byte at, where
// fastCells stopped: each cell it cannot take goes the general way.
func (r *Reader) slowCells(sh []shape, out []float64, row []byte, off, line, j, at int) error {
	for {
		if at > len(row) {
			return r.shortRow(out, r.plan[j:], len(row), line)
		}
		end := cellEnd(row, at, r.delim) // a cell fastCells left: asked for
		if err := r.cell(out, r.plan[j], row, at, end, line, off); err != nil {
			return err
		}
		if j, at = r.fastCells(sh, out, row, off, j+1, end+1); j == len(r.plan) {
			return nil
		}
	}
}

// shortRow deals with the asked-for cells of plan that a row of n bytes
// ended before, as empty cells.
func (r *Reader) shortRow(out []float64, plan []int, n, line int) error {
	for _, k := range plan {
		if k >= 0 {
			if err := r.empty(out, k, line, n+1); err != nil {
				return err
			}
		}
	}
	return nil
}

// plainText reports whether a text cell is kept as it stands: not empty,
// and neither end a space, a quote or a byte that may start or end a
// multi-byte space (what cell would trim).
func plainText(c []byte) bool {
	return len(c) > 0 && plainEnd(c[0]) && plainEnd(c[len(c)-1])
}

func plainEnd(c byte) bool { return c > ' ' && c != '"' && c < 0x80 }

// empty deals with an empty (or absent) cell of asked-for column k, at
// character column col, by the format's policy.
func (r *Reader) empty(out []float64, k, line, col int) error {
	switch {
	case r.format.Empty == EmptySkip:
		return errSkipRow
	case r.format.Empty == EmptyHold && k != r.timeK:
		out[k] = math.Float64frombits(noSpan) // a NaN, and no text span
		return nil
	}
	return &ParseError{File: r.file, Line: line, Column: col, Field: r.cols[k].Name, Err: ErrMissingCell}
}

// cell parses one asked-for cell, row[at:end], by the general rules: spaces
// and double quotes around it are dropped, text is kept as a span, a number
// must parse exactly as strconv.ParseFloat would (after the decimal comma
// becomes a point) and be finite, a time must read by its format.
func (r *Reader) cell(out []float64, k int, row []byte, at, end, line, off int) error {
	cell := bytes.TrimSpace(row[at:end])
	if len(cell) >= 2 && cell[0] == '"' && cell[len(cell)-1] == '"' {
		cell = cell[1 : len(cell)-1]
	}
	if len(cell) == 0 {
		return r.empty(out, k, line, at+1)
	}
	fail := func(sentinel error) error {
		return &ParseError{File: r.file, Line: line, Column: at + 1, Field: r.cols[k].Name, Err: fmt.Errorf("%w: %q", sentinel, cell)}
	}
	switch r.kind[k] {
	case kindText:
		s := off + cap(row) - cap(cell) // cell is a sub-slice of row
		out[k] = span(s, s+len(cell))
		return nil
	case kindClock, kindISO:
		ns, ok := r.timeNanos(k, cell)
		if !ok {
			want := "clock time h:mm:ss[.fff]"
			if r.kind[k] == kindISO {
				want = "RFC 3339 time such as 2026-05-01T12:00:00.25+02:00"
			}
			return &ParseError{File: r.file, Line: line, Column: at + 1, Field: r.cols[k].Name, Err: fmt.Errorf("%w: %q (want %s)", ErrNotTime, cell, want)}
		}
		out[k] = math.Float64frombits(uint64(ns))
		return nil
	}
	x, err := parseDecimal(cell, r.dec)
	if err != nil {
		return fail(ErrNotNumber)
	}
	if math.IsInf(x, 0) || math.IsNaN(x) {
		return fail(ErrNotFinite)
	}
	out[k] = x
	return nil
}

// timeNanos reads a clock or ISO cell of column k.
func (r *Reader) timeNanos(k int, cell []byte) (int64, bool) {
	if r.kind[k] == kindClock {
		return clockNanos(cell, r.dec)
	}
	return isoNanos(cell)
}

// parseDecimal is ParseFloat for a number written with the decimal mark
// dec: with ',' the number may hold no '.', and its ',' reads as a point.
func parseDecimal(cell []byte, dec byte) (float64, error) {
	if dec != ',' {
		return ParseFloat(cell)
	}
	if bytes.IndexByte(cell, '.') >= 0 || len(cell) > 64 {
		return 0, ErrNotNumber
	}
	var buf [64]byte
	n := copy(buf[:], cell)
	if i := bytes.IndexByte(buf[:n], ','); i >= 0 {
		buf[i] = '.'
	}
	return ParseFloat(buf[:n])
}

// splitCells appends the cells of line, cut at delim, to dst.
func splitCells(line []byte, delim byte, dst [][]byte) [][]byte {
	for {
		i := bytes.IndexByte(line, delim)
		if i < 0 {
			return append(dst, line)
		}
		dst = append(dst, line[:i])
		line = line[i+1:]
	}
}
