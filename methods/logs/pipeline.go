package logs

import (
	"bytes"
	"io"
)

// freeBlocks holds the blocks that readers have finished with, for the
// next block of any reader in the process. A block keeps its buffer and
// its cell array, so once the first few blocks of the first log are in
// memory, every later block (and every later log: commands read a log
// more than once) reuses them: no new memory for the system to map in,
// no growing array to copy, and nothing for the garbage collector. A
// sync.Pool would be emptied by every collection.
var freeBlocks = make(chan *block, maxFree)

const (
	maxFree = 2*inFlight + 4 // blocks kept: those one reader has in flight, and more
	slack   = 64 << 10       // buffer room beyond a block, for the carried line
	maxKept = 2 * chunkSize  // a buffer grown beyond this (a long line) is not kept
)

// getBlock returns a free block with room for n carried bytes and a block
// after them.
func getBlock(n int) *block {
	var b *block
	select {
	case b = <-freeBlocks:
	default:
		b = &block{}
	}
	if need := n + chunkSize; cap(b.buf) < need {
		b.buf = make([]byte, 0, need+slack)
	}
	b.data, b.rows, b.trailing, b.err = nil, 0, 0, nil
	b.line, b.vals = b.line[:0], b.vals[:0]
	return b
}

// putBlock hands a consumed block back.
func putBlock(b *block) {
	if b.err != nil || cap(b.buf) > maxKept+slack {
		return
	}
	select {
	case freeBlocks <- b:
	default:
	}
}

// start launches the block pipeline: one goroutine cuts the input into
// blocks at line ends and hands them to the parsers in order.
func (r *Reader) start() error {
	r.started = true
	if r.timeK < 0 && r.Increasing >= 0 && r.Increasing < len(r.cols) && r.kind[r.Increasing] == kindNum {
		r.timeK = r.Increasing
		if err := r.settleTime(); err != nil {
			return err
		}
	}
	r.setupPost()
	r.nextLine = r.line + 1
	r.order = make(chan chan *block, inFlight)
	r.done = make(chan struct{})
	jobs := make(chan func(), inFlight)
	for range max(r.Workers, 1) {
		go func() {
			for job := range jobs {
				job()
			}
		}()
	}
	go r.feed(jobs)
	return nil
}

// feed reads the input into blocks that end at a line's end, carrying
// the unfinished line into the next block, and queues each for a parser
// and, in order, for the consumer.
func (r *Reader) feed(jobs chan<- func()) {
	defer close(r.order)
	defer close(jobs)
	carry := append([]byte(nil), r.rest...)
	for eof := false; !eof; {
		b := getBlock(len(carry))
		buf, err := fill(r.src, append(b.buf[:0], carry...), len(carry)+chunkSize)
		b.buf = buf
		if err != nil && err != io.EOF {
			r.send(&block{err: &ParseError{File: r.file, Line: 1, Err: err}}, nil)
			return
		}
		eof = err == io.EOF
		end := len(buf)
		if !eof {
			end = bytes.LastIndexByte(buf, '\n') + 1
		}
		carry = append(carry[:0], buf[end:]...)
		if end == 0 && !eof {
			putBlock(b)
			if len(carry) >= maxLineSize {
				r.send(&block{err: &ParseError{File: r.file, Line: 1, Err: ErrLongLine}}, nil)
				return
			}
			continue // a line longer than a block: read on
		}
		data := buf[:end]
		res := make(chan *block, 1)
		if !r.send(nil, res) {
			return
		}
		select {
		case jobs <- func() { res <- r.parse(b, data) }:
		case <-r.done:
			return
		}
	}
}

// fill reads src into buf until it holds at least n bytes, the input ends
// (io.EOF) or a read fails.
func fill(src io.Reader, buf []byte, n int) ([]byte, error) {
	if cap(buf) < n {
		buf = append(make([]byte, 0, n+slack), buf...)
	}
	for len(buf) < n {
		k, err := src.Read(buf[len(buf):cap(buf)])
		buf = buf[:len(buf)+k]
		if err != nil {
			return buf, err
		}
	}
	return buf, nil
}

// rowBytes estimates the bytes per row from the data read with the
// header: the mean length of its whole lines, or 16 when it has none.
func rowBytes(head []byte) int {
	n := bytes.Count(head, []byte{'\n'})
	if n == 0 {
		return 16
	}
	return max(bytes.LastIndexByte(head, '\n')/n, 1)
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
