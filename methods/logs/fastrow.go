package logs

import "bytes"

// fastCells reads the cells of a row from plan[j:], starting at byte at,
// for as long as they are plain, and returns where it stopped: j =
// len(r.plan) when the row is done, else the cell for the general path.
// Plain cells are
//
//   - a cell that is not asked for: skipped to its delimiter, not parsed;
//   - a text cell with plain ends (plainText): kept as a span of the data;
//   - a plain decimal filling its cell: an optional sign, digits,
//     optionally the decimal mark and more digits, at most 19 digits in
//     all (the most a uint64 holds) whose integer m stays within 2^53.
//     Then m and 10^f (f ≤ 19 fraction digits) are exact doubles, and the
//     one correctly rounded quotient m/10^f is the correctly rounded value
//     of the decimal (Clinger's fast path, as in fastFloat), the bits
//     strconv.ParseFloat gives.
//
// It is the way for the cells that shapedCells does not take: a cell in a
// layout new to its column, whose shape it learns (shape.learn), a cell of
// more than eight bytes, the cells after one of those. The loops go
// a byte at a time: a column's cells have much the same length from row to
// row, so the processor predicts where each loop ends and runs ahead. A
// word-at-a-time conversion of a cell found this way measured slower (each
// cell then waits on the length found in the one before: a shape knows it
// beforehand), and so did a call per cell (the caller's values go to memory
// and back). The number is read inline, with few values live, so that its
// digits stay in a register.
func (r *Reader) fastCells(sh []shape, out []float64, row []byte, off, j, at int) (int, int) {
	for ; j < len(r.plan) && at <= len(row); j++ {
		k := r.plan[j]
		if k >= 0 && r.kind[k] == kindNum {
			i := at
			if i < len(row) && (row[i] == '-' || row[i] == '+') {
				i++
			}
			var m uint64
			start := i
			for ; i < len(row) && row[i]-'0' <= 9; i++ {
				m = m*10 + uint64(row[i]-'0')
			}
			nd, frac := i-start, 0
			if i < len(row) && row[i] == r.dec {
				i++
				fs := i
				for ; i < len(row) && row[i]-'0' <= 9; i++ {
					m = m*10 + uint64(row[i]-'0')
				}
				frac = i - fs
				nd += frac
			}
			if nd == 0 || nd > 19 || m > 1<<53 || i < len(row) && row[i] != r.delim {
				return j, at
			}
			x := float64(int64(m))
			if frac > 0 {
				x /= pow10[frac]
			}
			if row[at] == '-' {
				x = -x
			}
			out[k] = x
			sh[j].learn(row[at:i], frac, r.dec)
			at = i + 1
			continue
		}
		end := at
		for end < len(row) && row[end] != r.delim {
			end++
		}
		if k >= 0 {
			if r.kind[k] != kindText || !plainText(row[at:end]) {
				return j, at
			}
			out[k] = span(off+at, off+end)
		}
		at = end + 1
	}
	return j, at
}

// cellEnd returns the index of the first delim at or after at in row, or
// len(row) when there is none.
func cellEnd(row []byte, at int, delim byte) int {
	if i := bytes.IndexByte(row[at:], delim); i >= 0 {
		return at + i
	}
	return len(row)
}
