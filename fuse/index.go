package fuse

import (
	"fmt"
	"slices"

	"liftfuse/methods/evidence"
)

// vref is V_ref of the linear speed model, m/s.
var vref = evidence.RefSpeedKmh / 3.6 // m/s

// indexer holds the name → index maps while a model's data are built.
type indexer struct {
	*model
	nuisIdx map[string]int // additive nuisance name → column of θ
	phiIdx  map[string]int // scale group or wind name → index of φ
	// winds are the nuisances that some observation uses as its
	// airspeed's wind: they enter non-linearly, as φ.
	winds map[string]bool
	// logn are the log-normal nuisances: their log factor is a φ (none
	// when stated exactly), their terms the rows' offsets.
	logn map[string]evidence.Nuisance
	// refs and phis hold the rows' short lists of terms (see arena);
	// lift, gam, nuis, perQ and scales are one row's, built before they
	// are kept there
	refs                  arena[entryRef]
	phis                  arena[phiRef]
	lift, gam, nuis, perQ []entryRef
	scales                []phiRef
}

// arena hands out short slices from shared chunks: one allocation per
// chunk, not one per row's list of terms (a 24-configuration model has
// some ten thousand such lists, and a fusion builds eleven models).
type arena[T any] []T

// keep returns a copy of s in the arena (nil for none), its capacity its
// length, so that an append to it moves it rather than overwrite the next.
func (a *arena[T]) keep(s []T) []T {
	if len(s) == 0 {
		return nil
	}
	if cap(*a)-len(*a) < len(s) {
		*a = make([]T, 0, max(arenaChunk, len(s)))
	}
	n := len(*a)
	*a = append(*a, s...)
	return (*a)[n : n+len(s) : n+len(s)]
}

// arenaChunk is the number of values an arena allocates at a time.
const arenaChunk = 2048

// newModel indexes the evidence in three steps: the lift columns, every
// entry's nuisances and scale groups, and the observations. Nuisances and
// scale groups of the same name in several entries are one parameter; their
// priors must agree.
func newModel(evs []evidence.Evidence, set Settings) (*model, error) {
	set = set.withDefaults()
	m := &model{data: &data{set: set, beta: map[[2]string]int{}, gamma: map[[2]string]int{}, informed: map[string]bool{}}}
	m.indexLift()
	ix := &indexer{model: m, nuisIdx: map[string]int{}, phiIdx: map[string]int{}, winds: windNames(evs), logn: map[string]evidence.Nuisance{}}
	for ei, ev := range evs {
		if err := ix.registerEntry(ei, ev); err != nil {
			return nil, err
		}
	}
	m.presize(evs)
	for ei, ev := range evs {
		if err := ix.indexObservations(ei, ev); err != nil {
			return nil, err
		}
	}
	m.buildGroups()
	if err := m.undirected(); err != nil {
		return nil, err
	}
	return m, nil
}

// presize gives the model's rows, blocks and signs the capacity of the
// evidence's, so that indexing them does not copy them as they grow.
func (m *model) presize(evs []evidence.Evidence) {
	var rows, blocks, signs int
	for _, ev := range evs {
		for _, b := range ev.Blocks {
			rows += len(b.Obs)
		}
		blocks += len(ev.Blocks)
		signs += len(ev.Signs)
	}
	m.rows = make([]row, 0, rows)
	m.blocks = make([]block, 0, blocks)
	m.signs = make([]sign, 0, signs)
}

// indexLift lays out the lift columns of θ: β of front and rear of every
// configuration, then with the linear speed model their slopes γ, each
// with prior N(0, σ_β²).
func (m *model) indexLift() {
	set := m.set
	for _, c := range set.Configs {
		for _, ax := range []string{evidence.AxleFront, evidence.AxleRear} {
			m.beta[[2]string{c, ax}] = len(m.lin)
			m.lin = append(m.lin, linParam{kind: kindBeta, config: c, axle: ax, prec: 1 / (set.PriorSD * set.PriorSD)})
		}
	}
	if set.Linear {
		for _, c := range set.Configs {
			for _, ax := range []string{evidence.AxleFront, evidence.AxleRear} {
				m.gamma[[2]string{c, ax}] = len(m.lin)
				m.lin = append(m.lin, linParam{kind: kindGamma, config: c, axle: ax, prec: 1 / (set.PriorSD * set.PriorSD)})
			}
		}
	}
}

// gammaOf returns the column of the speed slope γ of the β in column col:
// the γ columns follow the β columns in the same order (see indexLift).
func (m *model) gammaOf(col int) int { return col + 2*len(m.set.Configs) }

// windNames returns the nuisances some observation uses as its wind.
func windNames(evs []evidence.Evidence) map[string]bool {
	winds := map[string]bool{}
	for _, ev := range evs {
		for _, b := range ev.Blocks {
			for _, o := range b.Obs {
				if o.Air.Wind != "" {
					winds[o.Air.Wind] = true
				}
			}
		}
	}
	return winds
}

// registerEntry checks an entry and registers it with its nuisances and
// scale groups (a scale group with no spread is fixed at 1 and left out).
func (ix *indexer) registerEntry(ei int, ev evidence.Evidence) error {
	if err := ev.Check(); err != nil {
		return err
	}
	m := ix.model
	m.entries = append(m.entries, ev.Entry)
	for _, q := range ev.Informs {
		m.informed[q.Config] = true
	}
	m.kinds = append(m.kinds, ev.Kind)
	m.inflate = append(m.inflate, 1)
	m.inflateSys = append(m.inflateSys, 1)
	for _, n := range ev.Nuisances {
		if err := ix.registerNuisance(ei, n); err != nil {
			return err
		}
	}
	for _, s := range ev.Scales {
		if s.SD == 0 {
			continue
		}
		if err := ix.addPhi(ei, phiParam{name: s.Name, label: s.Label, sd: s.SD}); err != nil {
			return err
		}
	}
	return nil
}

// registerNuisance declares a nuisance of entry ei: a wind as a φ, a
// log-normal one as the φ of its log factor (none when stated exactly),
// any other as an additive column of θ with prior N(μ, σ²) (precision 0
// when flat), or adds ei as an owner of one already declared with the
// same prior.
func (ix *indexer) registerNuisance(ei int, n evidence.Nuisance) error {
	m := ix.model
	if ix.winds[n.Name] {
		return ix.addPhi(ei, phiParam{name: n.Name, label: n.Label, sd: n.SD, wind: true, perRun: n.PerRun, unit: n.Unit})
	}
	_, gauss := ix.nuisIdx[n.Name]
	if _, logn := ix.logn[n.Name]; gauss && n.LogNormal || logn && !n.LogNormal {
		return fmt.Errorf("fuse: nuisance %q is declared log-normal by one entry and not by another", n.Name)
	}
	if n.LogNormal {
		if o, ok := ix.logn[n.Name]; ok && (o.Mean != n.Mean || o.SD != n.SD) {
			return fmt.Errorf("fuse: log-normal nuisance %q is declared twice with different priors (median %g, log-sd %g and %g, %g)", n.Name, o.Mean, o.SD, n.Mean, n.SD)
		}
		ix.logn[n.Name] = n
		if n.SD == 0 {
			return nil
		}
		return ix.addPhi(ei, phiParam{name: n.Name, label: n.Label, sd: n.SD, perRun: n.PerRun, unit: n.Unit, median: n.Mean})
	}
	if i, ok := ix.nuisIdx[n.Name]; ok {
		p := &m.lin[i]
		if p.nuis.Mean != n.Mean || p.nuis.SD != n.SD || p.nuis.Flat != n.Flat {
			return fmt.Errorf("fuse: nuisance %q is declared twice with different priors (%g ± %g and %g ± %g)", n.Name, p.nuis.Mean, p.nuis.SD, n.Mean, n.SD)
		}
		p.owners[ei] = true
		return nil
	}
	prec := 0.0
	if !n.Flat {
		prec = 1 / (n.SD * n.SD)
	}
	ix.nuisIdx[n.Name] = len(m.lin)
	m.lin = append(m.lin, linParam{kind: kindNuisance, nuis: n, mean: n.Mean, prec: prec, owners: map[int]bool{ei: true}})
	return nil
}

// prior describes a non-linear parameter's prior for an error message.
func (p phiParam) prior() string {
	switch {
	case p.wind:
		return fmt.Sprintf("a wind of sd %g m/s", p.sd)
	case p.median != 0:
		return fmt.Sprintf("log-normal of median %g, log-sd %g", p.median, p.sd)
	}
	return fmt.Sprintf("a scale factor of log-sd %g", p.sd)
}

// addPhi declares a non-linear parameter of entry ei, or adds ei as an
// owner of one already declared with the same prior.
func (ix *indexer) addPhi(ei int, p phiParam) error {
	m := ix.model
	if i, ok := ix.phiIdx[p.name]; ok {
		if o := m.phi[i]; o.sd != p.sd || o.median != p.median || o.wind != p.wind {
			return fmt.Errorf("fuse: %q is declared twice with different priors (%s and %s)", p.name, o.prior(), p.prior())
		}
		m.phi[i].owners[ei] = true
		return nil
	}
	ix.phiIdx[p.name] = len(m.phi)
	p.owners = map[int]bool{ei: true}
	m.phi = append(m.phi, p)
	return nil
}

// indexObservations indexes an entry's blocks of Gaussian observations
// and its signs.
func (ix *indexer) indexObservations(ei int, ev evidence.Evidence) error {
	m := ix.model
	for _, b := range ev.Blocks {
		bl := block{entry: ei, rows: make([]int, 0, len(b.Obs))}
		for _, o := range b.Obs {
			r, err := ix.indexRow(ei, o)
			if err != nil {
				return err
			}
			bl.rows = append(bl.rows, len(m.rows))
			m.rows = append(m.rows, r)
		}
		bl.uniform = m.uniform(bl.rows)
		if err := bl.setCov(b); err != nil {
			return fmt.Errorf("fuse: entry %q: %w", ev.Entry, err)
		}
		m.blocks = append(m.blocks, bl)
	}
	for _, s := range ev.Signs {
		sg := sign{up: s.Lift, misread: s.Misread, softness: s.Softness, entry: ei, label: s.Label, v: s.Air.V}
		var err error
		if sg.lift, sg.gamma, err = ix.liftTerms(s.Terms, s.Air.V); err != nil {
			return err
		}
		sg.all = append(append([]entryRef(nil), sg.lift...), sg.gamma...)
		m.signs = append(m.signs, sg)
	}
	return nil
}

// indexRow indexes one Gaussian observation (see row): its lift terms, its
// airspeed's wind with q(w) = q0 + ρ·dir·V·w + ½ρ·w², its scale factors,
// and its nuisances (those proportional to q enter as c·q(w)/q0 when the
// wind is modelled).
func (ix *indexer) indexRow(ei int, o evidence.Obs) (row, error) {
	r := row{y: o.Y, entry: ei, label: o.Label, wind: -1, q0: o.Air.Q, v: o.Air.V}
	var err error
	if ix.lift, ix.gam, err = ix.liftTermsInto(o.Terms, o.Air.V, ix.lift[:0], ix.gam[:0]); err != nil {
		return row{}, err
	}
	if o.Air.Wind != "" {
		r.wind = ix.phiIdx[o.Air.Wind]
		r.a = o.Air.Rho * o.Air.Dir * o.Air.V
		r.c = 0.5 * o.Air.Rho
	}
	ix.scales, ix.nuis, ix.perQ = ix.scales[:0], ix.nuis[:0], ix.perQ[:0]
	for _, s := range o.Scales {
		if i, ok := ix.phiIdx[s.Name]; ok {
			ix.scales = append(ix.scales, phiRef{i, s.Pow})
		}
	}
	for _, c := range o.Nuis {
		if n, ok := ix.logn[c.Name]; ok {
			ix.addOffset(&r, c, n.Mean)
			continue
		}
		if c.PerQ && r.wind >= 0 && r.q0 > 0 {
			ix.perQ = append(ix.perQ, entryRef{ix.nuisIdx[c.Name], c.C / r.q0})
			continue
		}
		ix.nuis = append(ix.nuis, entryRef{ix.nuisIdx[c.Name], c.C})
	}
	r.lift, r.gamma, r.scales = ix.refs.keep(ix.lift), ix.refs.keep(ix.gam), ix.phis.keep(ix.scales)
	r.nuis, r.nuisPerQ = ix.refs.keep(ix.nuis), ix.refs.keep(ix.perQ)
	return r, nil
}

// addOffset adds to a row the term c·ν of a log-normal nuisance ν of
// median M (see offRef); terms of one nuisance are merged.
func (ix *indexer) addOffset(r *row, c evidence.Coef, M float64) {
	t := offRef{idx: -1, v: c.C * M}
	if i, ok := ix.phiIdx[c.Name]; ok {
		t.idx = i
	}
	if c.PerQ && r.wind >= 0 && r.q0 > 0 {
		t.v, t.perQ = t.v/r.q0, true
	}
	for k := range r.offs {
		if r.offs[k].idx == t.idx && r.offs[k].perQ == t.perQ {
			r.offs[k].v += t.v
			return
		}
	}
	r.offs = append(r.offs, t)
}

// liftTerms returns the β columns of terms with their weights w_k and,
// with the linear speed model, the γ columns with weights
// w_k·(V − V_ref)/V_ref.
func (ix *indexer) liftTerms(ts []evidence.Term, v float64) (lift, gam []entryRef, err error) {
	return ix.liftTermsInto(ts, v, nil, nil)
}

// liftTermsInto is liftTerms appending to lift and gam.
func (ix *indexer) liftTermsInto(ts []evidence.Term, v float64, lift, gam []entryRef) ([]entryRef, []entryRef, error) {
	m := ix.model
	for _, t := range ts {
		k := [2]string{t.Config, t.Axle}
		i, ok := m.beta[k]
		if !ok {
			return nil, nil, fmt.Errorf("fuse: evidence names configuration %q, which the campaign does not list", t.Config)
		}
		lift = append(lift, entryRef{i, t.W})
		if m.set.Linear {
			gam = append(gam, entryRef{m.gamma[k], t.W * (v - vref) / vref})
		}
	}
	return lift, gam, nil
}

// uniform reports whether rows share their scales and airspeed, so that
// their factors s(φ)·q(w) are computed once.
func (m *model) uniform(rows []int) bool {
	for _, ri := range rows[1:] {
		a, b := &m.rows[rows[0]], &m.rows[ri]
		if a.q0 != b.q0 || a.a != b.a || a.c != b.c || a.wind != b.wind || !slices.Equal(a.scales, b.scales) {
			return false
		}
	}
	return true
}
