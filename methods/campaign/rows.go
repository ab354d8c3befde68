package campaign

import (
	"fmt"

	"liftfuse/methods/logs"
)

// Rows checks the rows of one log as they are read: the one owner of the
// row rules of format 1 beyond the reader's own (every asked-for cell a
// finite number, time increasing): direction ±1, configuration ids known
// (up to maxUnknownIDs listed), at least one row. Validation's read of a
// log and every adapter's read of it call Row on each row, so a fault
// reads the same whoever finds it; the span and the ids it gathers are
// what Finish checks the log's segments and the configurations against
// when the adapters' read is the only one (Options.Stream).
type Rows struct {
	c    *Campaign // nil: ids are not checked
	l    *LogSpec
	time int // asked-for columns of the read: time, direction, config (−1: none)
	dir  int
	cfg  int

	n       int
	t0, t1  float64
	ids     map[string]string // ids seen, interned; "" for an unknown one
	unknown int
	probs   []*Problem
}

// maxUnknownIDs bounds the unknown configuration ids listed per log.
const maxUnknownIDs = 5

// NewRows checks the rows of log l, read with its time, direction and
// config columns at the asked-for indices time, dir and cfg (−1 when the
// read has no such column). c checks the configuration ids; nil takes
// every id.
func NewRows(c *Campaign, l *LogSpec, time, dir, cfg int) *Rows {
	return &Rows{c: c, l: l, time: time, dir: dir, cfg: cfg, ids: map[string]string{}}
}

// Row checks the reader's current row and returns its configuration id
// ("" without a config column, or for an unknown id, which is listed by
// Done) and direction (0 without a direction column). A direction other
// than ±1 is an error (a *Problem at its cell): the read stops there.
// It is called on every row: Quick takes the common one.
func (k *Rows) Row(r *logs.Reader) (config string, dir int, err error) {
	if dir, ok := k.Quick(r); ok {
		return "", dir, nil
	}
	return k.row(r)
}

// Quick is Row for the common row, small enough to inline into a
// caller's loop: a row after the first, in a log without a config
// column, whose direction is ±1 or not logged. It returns the direction
// and true, or, having done nothing, false: Row then takes the row.
func (k *Rows) Quick(r *logs.Reader) (dir int, ok bool) {
	if k.n == 0 || k.cfg >= 0 {
		return 0, false
	}
	if k.dir >= 0 {
		d := r.Float(k.dir)
		if d != 1 && d != -1 {
			return 0, false
		}
		dir = int(d)
	}
	k.n++
	k.t1 = r.Float(k.time) // time increases strictly (the reader's rule)
	return dir, true
}

// row is Row for any row: the count, the time, the first row's time,
// the direction, the configuration id.
func (k *Rows) row(r *logs.Reader) (config string, dir int, err error) {
	k.n++
	k.t1 = r.Float(k.time)
	if k.n == 1 {
		k.t0 = k.t1
	}
	if k.dir >= 0 {
		d := r.Float(k.dir)
		if err := rowDirection(d); err != nil {
			return "", 0, k.problem(r, k.dir, "direction", k.l.Direction, err)
		}
		dir = int(d)
	}
	if k.cfg >= 0 {
		b := r.Text(k.cfg)
		id, ok := k.ids[string(b)]
		if !ok {
			id = k.newID(r, string(b))
		}
		config = id
	}
	return config, dir, nil
}

// newID checks an id met for the first time; an unknown one is listed
// at its first row (up to maxUnknownIDs) and reads as "".
func (k *Rows) newID(r *logs.Reader, id string) string {
	if k.c != nil {
		if err := k.c.rowConfig(id); err != nil {
			k.ids[id] = ""
			if k.unknown++; k.unknown <= maxUnknownIDs {
				k.probs = append(k.probs, k.problem(r, k.cfg, "config", k.l.Config, err))
			}
			return ""
		}
	}
	k.ids[id] = id
	return id
}

func (k *Rows) problem(r *logs.Reader, col int, key, field string, err error) *Problem {
	return &Problem{Where: Where{File: r.File(), Line: r.Line(), Column: r.Column(col)}, Path: join(k.l.path, key),
		Err: fmt.Errorf("column %q: %w", field, err)}
}

// Done ends a read that went through to the end of the file without a
// reader error: the unknown ids met, or a log without data rows, are
// Problems. A clean read is kept for Finish.
func (k *Rows) Done() error {
	if k.n == 0 {
		k.probs = append(k.probs, &Problem{Where: k.l.At.Of("file"), Path: join(k.l.path, "file"),
			Err: wrapf(ErrFile, "log %q has a header but no data rows", k.l.File)})
	}
	if len(k.probs) > 0 {
		return Problems(k.probs)
	}
	if k.c != nil && k.c.stream != nil {
		k.c.stream.read(k.l, k.result())
	}
	return nil
}

// result is what the read found of the log: its span and the known ids.
func (k *Rows) result() *scanResult {
	res := &scanResult{t0: k.t0, t1: k.t1, configs: map[string]bool{}}
	for _, id := range k.ids {
		if id != "" {
			res.configs[id] = true
		}
	}
	return res
}

// rowDirection checks one logged direction cell: +1 or −1. It is called
// on every row, so it is small enough to inline; the message is built
// apart.
func rowDirection(d float64) error {
	if d != 1 && d != -1 {
		return badDirection(d)
	}
	return nil
}

//go:noinline
func badDirection(d float64) error {
	return wrapf(ErrRange, "direction must be 1 or -1, got %g", d)
}

// rowConfig checks one logged configuration id cell.
func (c *Campaign) rowConfig(id string) error {
	if !c.HasConfig(id) {
		return wrapf(ErrReference, "unknown configuration %q (known: %s)", id, WordList(c.ConfigIDs()))
	}
	return nil
}
