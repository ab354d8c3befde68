package logs

import (
	"bytes"
	"fmt"
	"io"
)

const (
	headChunk  = 64 << 10    // first read of a file's head
	headLimit  = maxLineSize // most bytes read to find the header
	detectRows = 20          // data lines looked at to detect the decimal mark
)

var bom = []byte("\xEF\xBB\xBF")

// delimiters are tried in this order when the format does not say.
var delimiters = []byte{',', ';', '\t'}

// errReader hands out a read error met while reading the file's head, so
// that it comes after the rows read before it, as it would have.
type errReader struct{ err error }

func (e errReader) Read([]byte) (int, error) { return 0, e.err }

// readHead reads the head of the file (up to about 1 MiB, less once the
// header and the first data lines are in), settles the format, reads the
// header and keeps the bytes after it for the row pipeline.
func (r *Reader) readHead() error {
	var buf []byte
	target, eof := headChunk, false
	var readErr error
	for {
		if cap(buf) < target {
			buf = append(make([]byte, 0, target), buf...)
		}
		for len(buf) < target && !eof {
			n, err := r.src.Read(buf[len(buf):target])
			buf = buf[:len(buf)+n]
			if err != nil {
				eof = true
				if err != io.EOF {
					readErr = err
				}
			}
		}
		final := eof || target >= headLimit
		done, err := r.settle(buf, final)
		if err != nil && readErr != nil {
			return &ParseError{File: r.file, Line: 1, Err: readErr}
		}
		if done || err != nil {
			if readErr != nil {
				r.src = errReader{readErr}
			}
			return err
		}
		target *= 2
	}
}

// headLines cuts buf into lines without their "\r\n" or "\n"; the last,
// unfinished line counts only when final.
func headLines(buf []byte, final bool) (lines [][]byte, ends []int) {
	for off := 0; off < len(buf); {
		i := bytes.IndexByte(buf[off:], '\n')
		if i < 0 {
			if final {
				lines, ends = append(lines, bytes.TrimSuffix(buf[off:], []byte{'\r'})), append(ends, len(buf))
			}
			break
		}
		lines = append(lines, bytes.TrimSuffix(buf[off:off+i], []byte{'\r'}))
		ends = append(ends, off+i+1)
		off += i + 1
	}
	return lines, ends
}

// settle finds the header and the format in the head of the file. done is
// false when more of the file is needed (never when final).
func (r *Reader) settle(buf []byte, final bool) (done bool, err error) {
	buf = bytes.TrimPrefix(buf, bom)
	lines, ends := headLines(buf, final)
	h, delim, err := r.findHeader(lines, final)
	if err != nil || h < 0 {
		if err == nil && final {
			err = r.noHeader(buf, lines)
		}
		return err != nil, err
	}
	skip := max(r.format.SkipLines, 0)
	if !final && len(lines) < h+1+max(skip, 1)+detectRows {
		return false, nil
	}
	r.delim, r.format.Delimiter, r.format.HeaderLine = delim, delim, h+1
	r.line = h + 1
	if err := r.setHeader(lines[h]); err != nil {
		return true, err
	}
	if r.format.SkipLines == 0 && h+1 < len(lines) && r.isUnitsRow(lines[h+1]) {
		skip = 1
	}
	if r.format.SkipLines >= 0 {
		r.format.SkipLines = skip
	}
	last := min(h+skip, len(lines)-1) // index of the last line before the data
	r.line = last + 1
	rest := buf[ends[last]:]
	r.rest = append(make([]byte, 0, len(rest)), rest...)
	data := lines[last+1:]
	r.settleDecimal(data[:min(len(data), detectRows)])
	if r.timeK >= 0 {
		return true, r.settleTime()
	}
	return true, nil
}

// findHeader returns the index of the header line and its delimiter, or
// h = −1 when it is not in the lines yet.
func (r *Reader) findHeader(lines [][]byte, final bool) (h int, delim byte, err error) {
	f := r.format
	if f.HeaderLine > 0 {
		if f.HeaderLine > len(lines) {
			if final {
				return -1, 0, &ParseError{File: r.file, Line: max(len(lines), 1), Err: fmt.Errorf("%w: header_line is %d but the file has %d lines", ErrNoHeader, f.HeaderLine, len(lines))}
			}
			return -1, 0, nil
		}
		h = f.HeaderLine - 1
		_, delim = r.bestDelimiter(lines[h])
		return h, delim, nil
	}
	for i, line := range lines {
		if isBlank(line) {
			continue
		}
		if found, delim := r.bestDelimiter(line); found == len(r.cols) {
			return i, delim, nil
		}
	}
	return -1, 0, nil
}

// bestDelimiter returns the delimiter (the format's, or the one among
// ',', ';', '\t') under which line holds the most asked-for columns, ties
// going to the one that cuts it into most cells, then to the first tried.
func (r *Reader) bestDelimiter(line []byte) (found int, delim byte) {
	cands := delimiters
	switch {
	case r.format.Delimiter != 0:
		cands = []byte{r.format.Delimiter}
	case r.format.Decimal == ',':
		cands = delimiters[1:] // the decimal comma rules out ',' cells
	}
	bestCells := -1
	for _, d := range cands {
		names := headerNames(line, d)
		have := make(map[string]bool, len(names))
		for _, n := range names {
			have[n] = true
		}
		n := 0
		for _, c := range r.cols {
			if have[c.Name] {
				n++
			}
		}
		if n > found || (n == found && len(names) > bestCells) {
			found, delim, bestCells = n, d, len(names)
		}
	}
	return found, delim
}

// noHeader is the error when no line of the head holds every asked-for
// column: one error per column missing from the line that holds most of
// them (the first non-blank line when none holds any).
func (r *Reader) noHeader(buf []byte, lines [][]byte) error {
	best, bestFound := -1, -1
	var bestDelim byte
	for i, line := range lines {
		if isBlank(line) {
			continue
		}
		if found, d := r.bestDelimiter(line); found > bestFound {
			best, bestFound, bestDelim = i, found, d
		}
	}
	if best < 0 {
		if len(bytes.TrimSpace(buf)) > 0 {
			return &ParseError{File: r.file, Line: 1, Err: ErrLongLine}
		}
		return &ParseError{File: r.file, Line: 1, Err: ErrEmpty}
	}
	r.delim, r.line = bestDelim, best+1
	return r.setHeader(lines[best])
}

// isUnitsRow tells whether line, right under the header, is a units row:
// it has a non-empty cell and no cell that reads as a number (with either
// decimal mark) or a time.
func (r *Reader) isUnitsRow(line []byte) bool {
	nonEmpty := false
	for _, c := range splitCells(line, r.delim, nil) {
		c = trimCell(c)
		if len(c) == 0 {
			continue
		}
		nonEmpty = true
		if looksLikeValue(c) {
			return false
		}
	}
	return nonEmpty
}

func trimCell(c []byte) []byte {
	c = bytes.TrimSpace(c)
	if len(c) >= 2 && c[0] == '"' && c[len(c)-1] == '"' {
		c = c[1 : len(c)-1]
	}
	return c
}

func looksLikeValue(c []byte) bool {
	if _, err := ParseFloat(c); err == nil {
		return true
	}
	if _, err := parseDecimal(c, ','); err == nil {
		return true
	}
	if _, ok := clockNanos(c, ','); ok {
		return true
	}
	_, ok := isoNanos(c)
	return ok
}

// settleDecimal detects the decimal comma in the first data lines: with
// ';' or '\t' as delimiter, ',' when some number cell is written "12,5"
// and none "12.5". Time-of-day cells are not counted.
func (r *Reader) settleDecimal(data [][]byte) {
	if r.format.Decimal != 0 {
		r.dec = r.format.Decimal
		return
	}
	r.dec = '.'
	if r.delim == ',' {
		r.format.Decimal = '.'
		return
	}
	comma, dot := 0, 0
	for _, line := range data {
		for i, c := range splitCells(line, r.delim, nil) {
			if len(r.cols) > 0 && (i >= len(r.want) || r.want[i] < 0 || r.kind[r.want[i]] == kindText) {
				continue
			}
			c = trimCell(c)
			if bytes.IndexByte(c, ':') >= 0 {
				continue
			}
			if bytes.IndexByte(c, ',') >= 0 {
				if _, err := parseDecimal(c, ','); err == nil {
					comma++
				}
			} else if bytes.IndexByte(c, '.') >= 0 {
				if _, err := ParseFloat(c); err == nil {
					dot++
				}
			}
		}
	}
	if comma > 0 && dot == 0 {
		r.dec = ','
	}
	r.format.Decimal = r.dec
}

// settleTime settles how the time column is written: as the format says,
// else by the first data row's time cell (a number: seconds; else clock or
// ISO time when it reads as such).
func (r *Reader) settleTime() error {
	k := r.timeK
	if r.kind[k] == kindText {
		r.timeK = -1
		return nil
	}
	t := r.format.Time
	if t == TimeDetect {
		t = TimeSeconds
		if c := r.firstCell(k); c != nil {
			if _, err := parseDecimal(c, r.dec); err != nil {
				if _, ok := clockNanos(c, r.dec); ok {
					t = TimeClock
				} else if _, ok := isoNanos(c); ok {
					t = TimeISO
				}
			}
		}
	}
	r.format.Time = t
	switch t {
	case TimeClock:
		r.kind[k] = kindClock
	case TimeISO:
		r.kind[k] = kindISO
	}
	return nil
}

// firstCell returns the first non-empty cell of asked-for column k in the
// data lines read with the head, or nil.
func (r *Reader) firstCell(k int) []byte {
	col := -1
	for i, w := range r.want {
		if w == k {
			col = i
			break
		}
	}
	lines, _ := headLines(r.rest, false)
	for _, line := range lines[:min(len(lines), detectRows)] {
		cells := splitCells(line, r.delim, nil)
		if col < len(cells) {
			if c := trimCell(cells[col]); len(c) > 0 {
				return c
			}
		}
	}
	return nil
}
