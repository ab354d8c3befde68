package campaign

import (
	"errors"
	"fmt"
	"sort"
	"strings"
)

// Sentinel errors that a Problem wraps, so callers can ask errors.Is.
var (
	ErrSyntax     = errors.New("yaml syntax")
	ErrUnknownKey = errors.New("unknown key")
	ErrMissing    = errors.New("missing required key")
	ErrType       = errors.New("wrong type")
	ErrRange      = errors.New("value out of range")
	ErrDuplicate  = errors.New("duplicate id")
	ErrReference  = errors.New("unknown reference")
	ErrFile       = errors.New("file problem")
	ErrColumn     = errors.New("column problem")
	ErrOverlap    = errors.New("overlapping segments")
	ErrNotApply   = errors.New("method does not apply")
	ErrFormat     = errors.New("unsupported format")
)

// Where is a position in an input file: the file, its 1-based line and
// column. The zero Where means "no position known".
type Where struct {
	File   string
	Line   int
	Column int
}

func (w Where) String() string {
	switch {
	case w.File == "":
		return ""
	case w.Line == 0:
		return w.File
	case w.Column == 0:
		return fmt.Sprintf("%s:%d", w.File, w.Line)
	}
	return fmt.Sprintf("%s:%d:%d", w.File, w.Line, w.Column)
}

// Problem is one fault (or, with Warning set, one thing a person should look
// at) in a campaign, placed at a file position and a YAML path such as
// evidence.pressure[0].readings[2].
type Problem struct {
	Where
	Path    string
	Err     error
	Warning bool
}

func (p *Problem) Error() string {
	var b strings.Builder
	if s := p.Where.String(); s != "" {
		b.WriteString(s)
		b.WriteString(": ")
	}
	if p.Path != "" {
		b.WriteString(p.Path)
		b.WriteString(": ")
	}
	b.WriteString(p.Err.Error())
	return b.String()
}

func (p *Problem) Unwrap() error { return p.Err }

// Problems is every error found in one campaign; it is itself an error.
type Problems []*Problem

func (ps Problems) Error() string {
	lines := make([]string, len(ps))
	for i, p := range ps {
		lines[i] = p.Error()
	}
	return strings.Join(lines, "\n")
}

// Unwrap lets errors.Is and errors.As see every problem.
func (ps Problems) Unwrap() []error {
	errs := make([]error, len(ps))
	for i, p := range ps {
		errs[i] = p
	}
	return errs
}

// sortProblems orders problems by file, line and column, keeping the order in
// which equal positions were found.
func sortProblems(ps []*Problem) {
	sort.SliceStable(ps, func(i, j int) bool {
		a, b := ps[i].Where, ps[j].Where
		if a.File != b.File {
			return a.File < b.File
		}
		if a.Line != b.Line {
			return a.Line < b.Line
		}
		return a.Column < b.Column
	})
}

// wrapf returns an error that reads as the formatted message and wraps kind.
func wrapf(kind error, format string, args ...any) error {
	return &kindError{kind: kind, msg: fmt.Sprintf(format, args...)}
}

type kindError struct {
	kind error
	msg  string
}

func (e *kindError) Error() string { return e.msg }
func (e *kindError) Unwrap() error { return e.kind }

// ErrData is wrapped when an entry's data (its calibration, its ballast
// readings, its logs) say something no physical car can: found by an
// adapter after loading, and traced back to the entry's key.
var ErrData = errors.New("implausible data")

// EntryProblem places an error an adapter found in evidence entry id at
// that entry's key (e.g. "stiffness"), so that it carries file:line:column
// like every loading problem.
func (c *Campaign) EntryProblem(id, key string, err error) *Problem {
	at, path := c.entryPlace(id)
	if key != "" {
		path += "." + key
	}
	if !errors.Is(err, ErrData) {
		err = fmt.Errorf("%w: %w", ErrData, err)
	}
	return &Problem{Where: at.Of(key), Path: path, Err: err}
}

// entryPlace finds an evidence entry by id.
func (c *Campaign) entryPlace(id string) (Place, string) {
	e := &c.Evidence
	for i := range e.RideHeight {
		if e.RideHeight[i].ID == id {
			return e.RideHeight[i].At, fmt.Sprintf("evidence.ride_height[%d]", i)
		}
	}
	for i := range e.Pressure {
		if e.Pressure[i].ID == id {
			return e.Pressure[i].At, fmt.Sprintf("evidence.pressure[%d]", i)
		}
	}
	for i := range e.Vortex {
		if e.Vortex[i].ID == id {
			return e.Vortex[i].At, fmt.Sprintf("evidence.vortex[%d]", i)
		}
	}
	return e.At, "evidence"
}
