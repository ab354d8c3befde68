package fuse

import "sync"

// drawStore holds one chain's draws, width values each, in blocks of
// storeBlock draws that are never moved once written (a single slice grown
// by doubling copied every draw so far at each growth, and once more to
// trim it). Within a block the draws are stored by column — value j of
// draw k at j·storeBlock + k — so that a linear combination of a few
// columns (every diagnosed and reported quantity) reads contiguous runs,
// and a block is directly the D × k matrix of a rank-k covariance update.
type drawStore struct {
	width  int
	blocks [][]float64 // each width·storeBlock long, but a trimmed last one
	n      int         // draws held
	// lastStride is the column stride of the last block: storeBlock, or
	// the draws it holds once trimmed
	lastStride int
}

// storeBlock is the number of draws in one block: a block of the widest
// campaigns benchmarked (500 columns) stays within a core's L2 cache while
// a draw's values are written across its columns.
const storeBlock = 64

func newDrawStore(width int) *drawStore { return &drawStore{width: width} }

// blockPool recycles blocks between the fits of one fusion (a standalone
// fit's dropped nuisance columns become the next fit's blocks), sparing
// the zeroing and the page faults of fresh memory. Every value of a block
// that is read was written first (span bounds the draws), so a recycled
// block needs no clearing.
var blockPool sync.Pool

// newBlock returns a block of n values, recycled where one fits: big
// enough, and not more than twice as big (a block of a wide store kept by
// a narrow one, a chain's draws of φ, held that store's width for nothing:
// 20 MB of a 48-configuration fusion's 80). A block that is too big goes
// back for a wider store.
func newBlock(n int) []float64 {
	if b, ok := blockPool.Get().(*[]float64); ok {
		switch c := cap(*b); {
		case c >= n && c <= 2*n:
			return (*b)[:n]
		case c > 2*n:
			blockPool.Put(b)
		}
	}
	return make([]float64, n)
}

// freeBlock hands a block no longer referenced back for reuse.
func freeBlock(b []float64) {
	if cap(b) > 0 {
		blockPool.Put(&b)
	}
}

// add appends one draw (len(x) == width).
func (s *drawStore) add(x []float64) { s.addRows(x, 1) }

// addRows appends n draws given one after another in rows (n·width
// values), as n calls of add would, but column by column: each column's
// run of consecutive draws within a block is written at once.
func (s *drawStore) addRows(rows []float64, n int) {
	w := s.width
	for done := 0; done < n; {
		k := s.n % storeBlock
		if k == 0 && w > 0 {
			s.blocks = append(s.blocks, newBlock(w*storeBlock))
			s.lastStride = storeBlock
		}
		r := min(n-done, storeBlock-k)
		if w > 0 {
			blk, src := s.blocks[len(s.blocks)-1], rows[done*w:(done+r)*w]
			for j := range w {
				dst := blk[j*storeBlock+k : j*storeBlock+k+r]
				for q := range dst {
					dst[q] = src[q*w+j]
				}
			}
		}
		s.n += r
		done += r
	}
}

// at writes draw i into dst (len width) and returns it.
func (s *drawStore) at(i int, dst []float64) []float64 {
	dst = grow(dst, s.width)
	if s.width == 0 {
		return dst
	}
	blk, _, stride := s.span(i/storeBlock, s.n)
	k := i % storeBlock
	for j := range dst {
		dst[j] = blk[j*stride+k]
	}
	return dst
}

// trim drops the draws from n on, releases the blocks they alone held and
// packs a last block that is partly filled (stride its own draws).
func (s *drawStore) trim(n int) {
	n = min(n, s.n)
	s.n = n
	nb := (n + storeBlock - 1) / storeBlock
	if s.width == 0 || nb == 0 {
		return
	}
	for _, b := range s.blocks[nb:] {
		freeBlock(b)
	}
	clear(s.blocks[nb:])
	s.blocks = s.blocks[:nb]
	k := n - (nb-1)*storeBlock
	if k == storeBlock || s.lastStride != storeBlock {
		return
	}
	old, packed := s.blocks[nb-1], make([]float64, s.width*k)
	for j := range s.width {
		copy(packed[j*k:(j+1)*k], old[j*storeBlock:j*storeBlock+k])
	}
	freeBlock(old)
	s.blocks[nb-1], s.lastStride = packed, k
}

// span returns the draws of block b among the first n: its columns, how
// many draws it holds and its column stride (value j of draw k at
// j·stride + k).
func (s *drawStore) span(b, n int) ([]float64, int, int) {
	stride := storeBlock
	if b == len(s.blocks)-1 {
		stride = s.lastStride
	}
	return s.blocks[b], min(storeBlock, n-b*storeBlock), stride
}

// combine writes Σ w·x[col] of the first len(dst) draws into dst.
func (s *drawStore) combine(w []entryRef, dst []float64) {
	clear(dst)
	if s.width == 0 {
		return
	}
	for b := 0; b*storeBlock < len(dst); b++ {
		blk, k, stride := s.span(b, len(dst))
		out := dst[b*storeBlock : b*storeBlock+k]
		for _, t := range w {
			col := blk[t.col*stride : t.col*stride+k]
			for i, v := range col {
				out[i] += t.v * v
			}
		}
	}
}

// pick keeps the columns cols (ascending) of every draw, in that order.
func (s *drawStore) pick(cols []int) {
	if len(cols) == s.width {
		return
	}
	for b := range s.blocks {
		_, _, stride := s.span(b, s.n)
		old := s.blocks[b]
		kept := make([]float64, len(cols)*stride)
		for j, c := range cols {
			copy(kept[j*stride:(j+1)*stride], old[c*stride:(c+1)*stride])
		}
		s.blocks[b] = kept
		freeBlock(old)
	}
	s.width = len(cols)
}

// firstCols returns the columns 0…n−1.
func firstCols(n int) []int {
	cols := make([]int, n)
	for j := range cols {
		cols[j] = j
	}
	return cols
}
