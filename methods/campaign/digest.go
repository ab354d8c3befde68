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

// digest is Hash computed from the bytes that a run reads anyway: the
// campaign file, then each file in the order Files lists them, each
// preceded by its size (Hash's layout). fed counts the files of Files
// hashed whole. A file is hashed as validation reads it, or as an adapter
// reads it (Campaign.Read) when validation read only its header, unless
// later (Options.HashLater): then the adapters' reads feed nothing. A file
// read by neither before a later one is needed is read again for the hash
// alone (upTo). A read that stops early breaks the digest, and Hash then
// reads every file again. One digest per loaded campaign.
type digest struct {
	mu     sync.Mutex
	h      hash.Hash
	fed    int
	broken bool
	later  bool
}

// sum returns the digest's hex SHA-256 if it covers every file of files.
func (d *digest) sum(files []string) (string, bool) {
	if d == nil {
		return "", false
	}
	d.mu.Lock()
	defer d.mu.Unlock()
	if d.broken || d.fed != len(files) {
		return "", false
	}
	return hex.EncodeToString(d.h.Sum(nil)), true
}

// upTo hashes, reading them again, the files of files not hashed yet, and
// reports whether the digest then covers exactly files.
func (d *digest) upTo(files []string) bool {
	d.mu.Lock()
	defer d.mu.Unlock()
	for !d.broken && d.fed < len(files) {
		if err := d.add(files[d.fed]); err != nil {
			d.broken = true
		}
	}
	return !d.broken && d.fed == len(files)
}

// add hashes the size and bytes of the file name (d.mu held).
func (d *digest) add(name string) error {
	f, err := OpenRegular(name)
	if err != nil {
		return err
	}
	defer f.Close()
	st, err := f.Stat()
	if err != nil {
		return err
	}
	fmt.Fprintf(d.h, "%d\n", st.Size())
	if n, err := io.Copy(d.h, f); err != nil || n != st.Size() {
		return fmt.Errorf("%s changed while it was read", name)
	}
	d.fed++
	return nil
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

// addFile records that the campaign reads the file name (once in Files).
func (c *Campaign) addFile(name string) {
	if !slices.Contains(c.Files, name) {
		c.Files = append(c.Files, name)
	}
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

// Read returns the reader through which an adapter reads name, a file of
// Files open as f, and a function to call once the read is over (after
// the log reader is closed). A file not hashed yet (a log whose body
// validation left to the adapters, Options.Stream) is hashed as it is
// read, the files before it in Files being hashed first if they are not;
// with Options.HashLater it is read as it is, and Hash reads it again.
func (c *Campaign) Read(name string, f *os.File) (io.Reader, func()) {
	d := c.digest
	i := slices.Index(c.Files, name)
	if d == nil || d.later || i < 0 || !d.upTo(c.Files[:i]) {
		return f, func() {}
	}
	return d.start(f)
}

// start hashes f's size, then what is read through the returned reader;
// the returned function ends the read and counts the file if the read
// covered its whole size, else breaks the digest.
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
		} else {
			d.broken = true
		}
	}
}
