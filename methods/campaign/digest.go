package campaign

import (
	"encoding/hex"
	"fmt"
	"hash"
	"io"
	"os"
	"slices"
	"sync"
)

// digest is Hash computed from the bytes that loading reads anyway: the
// campaign file, then each file validation reads in full, in the order
// Files lists them, each preceded by its size (Hash's layout). fed counts
// the files of Files hashed whole; when a read stops early, a file is read
// elsewhere or its size changed, the stream falls behind Files and Hash
// reads the files again. One digest per loaded campaign.
type digest struct {
	mu  sync.Mutex
	h   hash.Hash
	fed int
}

// sum returns the digest's hex SHA-256 if it covers every file of files.
func (d *digest) sum(files []string) (string, bool) {
	if d == nil {
		return "", false
	}
	d.mu.Lock()
	defer d.mu.Unlock()
	if d.fed != len(files) {
		return "", false
	}
	return hex.EncodeToString(d.h.Sum(nil)), true
}

// tee hashes what is read through it, until done.
type tee struct {
	d    *digest
	n    int64
	done bool
}

// Write feeds the digest; the log reader calls it from its own goroutine,
// hence the lock, and a read that goes on after done (a reader closed
// early) no longer counts.
func (t *tee) Write(p []byte) (int, error) {
	t.d.mu.Lock()
	defer t.d.mu.Unlock()
	if !t.done {
		t.d.h.Write(p)
		t.n += int64(len(p))
	}
	return len(p), nil
}

// track records that the campaign reads the open file f (as addFile) and
// returns the reader to read it through and a function to call once the
// read is over (after the log reader is closed). The first read of a file
// that is next in Hash's order is hashed on the way; it counts when it
// covered the file's whole size.
func (c *Campaign) track(name string, f *os.File) (io.Reader, func()) {
	if slices.Contains(c.Files, name) {
		return f, func() {}
	}
	c.Files = append(c.Files, name)
	d := c.digest
	if d == nil || d.fed != len(c.Files)-1 {
		return f, func() {}
	}
	return d.start(f)
}

// start hashes f's size, then what is read through the returned reader;
// the returned function ends the read and counts the file if the read
// covered its whole size.
func (d *digest) start(f *os.File) (io.Reader, func()) {
	st, err := f.Stat()
	if err != nil {
		return f, func() {}
	}
	d.mu.Lock()
	fmt.Fprintf(d.h, "%d\n", st.Size())
	d.mu.Unlock()
	t := &tee{d: d}
	return io.TeeReader(f, t), func() {
		d.mu.Lock()
		defer d.mu.Unlock()
		t.done = true
		if t.n == st.Size() {
			d.fed++
		}
	}
}
