package logs

import "encoding/binary"

// shape is the layout of a short plain decimal cell, learnt from one row
// and tried on the same column of the next: a logger writes a column with
// a fixed number of decimals, so from row to row its cells keep their
// sign, their digits before the mark and after it. A cell that has its
// column's shape is checked and converted eight bytes at a time
// (shapedCells), with no loop over its bytes and no wait for the length of
// the cell before it; any other cell is read byte by byte (fastCells) and
// its shape learnt for the next row. On the benchmark log this reads a
// row in about 20 % fewer instructions (callgrind, BenchmarkParseBlock).
//
// The value is the one the byte loop gives: the same integer m of the
// digits, divided by the same power of ten, negated the same way.
//
// The word tricks: a byte-wise test for bytes below 10 (S. E. Anderson,
// "Bit Twiddling Hacks", "determine if a word has a byte less than n" —
// from memory) and eight digits to an integer in three multiplications
// (pairs, fours, eight; D. Lemire, "Quickly parsing eight digits", 2022
// — from memory).
type shape struct {
	k    int  // the cell's column among those asked for; −1: not asked for
	text bool // a text column: its cells are kept as they stand (plainText)
	n    int  // the cell's bytes, 1 to 8; 0: no shape to try
	// exact holds the bytes the cell must have where mask is set (its
	// sign and decimal mark); other holds the high bit of each of the
	// cell's bytes that is not a digit (sign and mark), of all its bytes
	// in care.
	mask, exact, other, care uint64
	// move and stay select the digits before the mark and after it:
	// those before move up a byte, into the mark's place, so that the
	// digits meet; pad then shifts them to the top of the word.
	move, stay uint64
	pad        uint
	div, sgn   float64 // 10^(digits after the mark); −1 for a cell that starts with '-', else 1
	misses     int     // shapes learnt in this block; learning stops beyond maxMisses
}

// maxMisses bounds how often a block relearns a column's shape: a column
// whose cells change layout row after row goes back to the byte loop for
// the rest of the block, rather than learning a shape on every row.
const maxMisses = 32

const (
	ones  = 0x0101010101010101
	highs = 0x8080808080808080
)

// learn sets s to the shape of the plain decimal cell c (as fastCells
// read it: frac digits after the mark dec, if it has one), or to none
// when the cell is longer than eight bytes. A new shape counts as a miss;
// beyond maxMisses the column has none for the rest of the block.
func (s *shape) learn(c []byte, frac int, dec byte) {
	if s.misses > maxMisses {
		return
	}
	t := shape{k: s.k, text: s.text, misses: s.misses}
	if len(c) <= 8 {
		t.layout(c, frac, dec)
	}
	if t == *s {
		return
	}
	t.misses++
	if t.misses > maxMisses {
		t.n = 0
	}
	*s = t
}

// layout sets the fields of s that the cell c gives.
func (s *shape) layout(c []byte, frac int, dec byte) {
	n, at := uint(len(c)), uint(0)
	s.n, s.div, s.sgn = len(c), pow10[frac], 1
	s.care = highs >> (64 - 8*n)
	if c[0] == '-' || c[0] == '+' {
		at = 1
		s.mask, s.exact, s.other = 0xff, uint64(c[0]), 0x80
		if c[0] == '-' {
			s.sgn = -1
		}
	}
	bytes := func(from, to uint) uint64 { return 1<<(8*to) - 1<<(8*from) } // bytes [from, to)
	s.stay = bytes(at, n)
	if p := n - 1 - uint(frac); p >= at && c[p] == dec { // the mark
		s.mask |= 0xff << (8 * p)
		s.exact |= uint64(dec) << (8 * p)
		s.other |= 0x80 << (8 * p)
		s.move, s.stay = bytes(at, p), bytes(p+1, n)
	}
	s.pad = 64 - 8*n
}

// shapedCells reads the cells of a row from sh[j:], starting at byte at,
// for as long as each is in its column's shape, and returns where it
// stopped, as fastCells does. A column not asked for is skipped to its
// delimiter, a text cell with plain ends kept as a span of the data (off
// is the row's offset in it), written out as in fastCells: one function
// for both, called per cell, parsed a log with four skipped columns a row
// 9 % slower (BenchmarkParseBlock's rows, t_s and rear_laser_mm asked). Eight bytes are read at row[at:], within the
// row's buffer (its capacity) but perhaps beyond the row: only the cell's
// own bytes are looked at.
func (r *Reader) shapedCells(sh []shape, out []float64, row []byte, off, j, at int) (int, int) {
	delim := r.delim
	for ; j < len(sh); j++ {
		s := &sh[j]
		if s.k < 0 || s.text {
			end := at
			for end < len(row) && row[end] != delim {
				end++
			}
			if s.k >= 0 {
				if end > len(row) || !plainText(row[at:end]) {
					return j, at
				}
				out[s.k] = span(off+at, off+end)
			}
			at = end + 1
			continue
		}
		e := at + s.n
		if s.n == 0 || e > len(row) || at+8 > cap(row) || e < len(row) && row[e] != delim {
			return j, at
		}
		w := binary.LittleEndian.Uint64(row[at : at+8])
		x := w ^ '0'*ones // digits become 0 to 9
		// the high bit of each byte that is not a digit: of x+0x76 when
		// x ≥ 10, of x when x ≥ 0x80. A byte x ≥ 0x8a carries into the
		// next, but it is flagged itself, a carry only reaches the bytes
		// after it, and a flagged byte fails the check unless it is the
		// sign or the mark, which exact holds below 0x80.
		if ((x+(0x80-10)*ones)|x)&highs&s.care != s.other || w&s.mask != s.exact {
			return j, at
		}
		m := ((x&s.move)<<8 | x&s.stay) << (s.pad & 63)
		// eight digits, the first in the lowest byte, to their integer:
		// pairs, then fours, then the eight
		m = (m*10 + m>>8) & 0x00ff00ff00ff00ff
		m = (m*100 + m>>16) & 0x0000ffff0000ffff
		m = (m*10000 + m>>32) & 0xffffffff
		out[s.k] = float64(int64(m)) / s.div * s.sgn // the byte loop's x/10^f, negated
		at = e + 1
	}
	return j, at
}
