package height

import "io"

// progressReader reports bytes read.
type progressReader struct {
	r      io.Reader
	done   int64
	total  int64
	report func(done, total int64)
	last   int64
}

func (p *progressReader) Read(b []byte) (int, error) {
	n, err := p.r.Read(b)
	p.done += int64(n)
	if p.done-p.last >= 4<<20 || err == io.EOF {
		p.report(p.done, p.total)
		p.last = p.done
	}
	return n, err
}
