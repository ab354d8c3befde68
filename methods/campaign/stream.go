package campaign

import "fmt"

// stream is what Load leaves for Finish when the adapters' reads of the
// logs are the only ones (Options.Stream): each log's place, the
// configurations informed so far, and what each read found.
type stream struct {
	opt      Options
	informed map[string]bool
	pending  []pendingLog
	reads    map[*LogSpec]*scanResult
}

// pendingLog is a log whose body validation left to the adapters; key is
// its scanKey (file, columns, format).
type pendingLog struct {
	l         *LogSpec
	path, key string
}

// read keeps what an adapter's clean read of log l found.
func (s *stream) read(l *LogSpec, res *scanResult) { s.reads[l] = res }

// Finish completes the validation of a campaign loaded with
// Options.Stream, once the adapters have read its logs through (err is
// their error, nil if they succeeded): each log's segments lie inside its
// time span, the configurations the logs inform (a warning for one
// informed by no method, added to Warnings), and a log that no adapter
// read is read now. On any fault, the adapters' or the logs', the
// campaign is loaded again with every log read by validation, so that the
// problems are exactly those Load lists, all at once and in file order;
// the adapters' error is returned when validation finds none.
// Without Options.Stream, or when called again, it returns err.
func (c *Campaign) Finish(err error) error {
	s := c.stream
	if s == nil {
		return err
	}
	c.stream = nil
	if err == nil {
		err = s.finish(c)
	}
	if err == nil {
		return nil
	}
	opt := s.opt
	opt.Stream = false
	if _, lerr := Load(c.File, opt); lerr != nil {
		return lerr
	}
	return err
}

// finish applies what the reads found to the campaign's rules, reading
// now a log that no adapter read.
func (s *stream) finish(c *Campaign) error {
	v := &validator{c: c, opt: s.opt, informed: s.informed}
	byKey := map[string]*scanResult{}
	for _, p := range s.pending {
		if res := s.reads[p.l]; res != nil {
			byKey[p.key] = res
		}
	}
	for _, p := range s.pending {
		res, ok := byKey[p.key]
		if !ok {
			cols, ix := p.l.LogColumns()
			res = v.scanBody(p.l, p.path, c.Path(p.l.File), cols, ix)
			byKey[p.key] = res
		}
		if res != nil {
			v.useScan(p.l, p.path, res)
		}
	}
	v.uninformed()
	if len(v.errs) > 0 {
		sortProblems(v.errs)
		return Problems(v.errs)
	}
	c.Warnings = append(c.Warnings, v.warns...)
	return nil
}

// uninformed warns of each configuration that no evidence speaks of.
func (v *validator) uninformed() {
	for _, cf := range v.c.Configurations {
		if !v.informed[cf.ID] {
			v.warnf(cf.At.Where, "configurations", "configuration %q is informed by no method: its result is the prior alone", cf.ID)
		}
	}
}

// useScan applies what a read of log l found: the configurations its
// rows inform, and its segments inside its time span.
func (v *validator) useScan(l *LogSpec, path string, res *scanResult) {
	for id := range res.configs {
		v.informed[id] = true
	}
	for k, s := range l.Segments {
		if s.FromS < res.t0 || s.ToS > res.t1 {
			v.errf(s.At.Where, fmt.Sprintf("%s.segments[%d]", path, k), ErrRange,
				"segment %g–%g s lies outside the log's time span %g–%g s", s.FromS, s.ToS, res.t0, res.t1)
		}
	}
}
