package fuse

import (
	"fmt"
	"math"
	"slices"
	"sync"

	"gonum.org/v1/gonum/mat"

	"liftfuse/methods"
)

// Settings are the campaign-level choices fusion needs.
type Settings struct {
	Configs  []string // configuration ids, in campaign order
	PriorSD  float64  // σ_β of the lift parameters (and γ), m²
	Linear   bool     // speed_model: linear
	Seed     uint64
	Credible float64 // central interval level, e.g. 0.9

	// MinESS is the bulk effective sample size the sampler draws for
	// (default 2000); MaxDraws bounds the draws per chain (default 20000).
	MinESS   float64
	MaxDraws int
}

func (s Settings) withDefaults() Settings {
	if s.PriorSD == 0 {
		s.PriorSD = methods.DefaultCLASDM2
	}
	if s.Credible == 0 {
		s.Credible = methods.DefaultCredible
	}
	if s.MinESS == 0 {
		s.MinESS = 2000
	}
	if s.MaxDraws == 0 {
		s.MaxDraws = 20000
	}
	return s
}

// Param kinds of the linear part.
const (
	kindBeta = iota
	kindGamma
	kindNuisance
)

// linParam is one parameter of the linear-Gaussian part: a lift parameter
// β (or its speed slope γ) or an additive nuisance.
type linParam struct {
	kind   int
	config string
	axle   string
	nuis   methods.Nuisance
	mean   float64
	prec   float64 // prior precision; 0 for a flat prior
	owners map[int]bool
}

// phiParam is one parameter of the non-linear part: the log of a scale
// factor, or a wind speed.
type phiParam struct {
	name   string
	label  string
	sd     float64
	wind   bool
	perRun bool
	unit   string
	owners map[int]bool
}

type entryRef struct {
	col int
	v   float64
}

type phiRef struct {
	idx int
	pow float64
}

// row is one Gaussian observation in indexed form:
//
//	y = s(φ)·q(w)·Σ_k w_k·(β_k + γ_k·vfac) + Σ_j c_j·ν_j + ε
//	q(w) = q0 + a·w + c·w²
type row struct {
	y        float64
	lift     []entryRef // β columns with their weights w_k
	gamma    []entryRef // γ columns with weights w_k·vfac
	q0, a, c float64
	v        float64 // mean ground speed, m/s
	wind     int     // φ index of the wind, or −1
	scales   []phiRef
	nuis     []entryRef
	nuisPerQ []entryRef // nuisances proportional to q: coefficient·q(w)/q0
	entry    int
	label    string
}

// block is a set of rows with a full (or diagonal) error covariance.
type block struct {
	rows   []int
	diag   []float64     // 1/σ² when the covariance is diagonal
	prec   *mat.SymDense // Σ⁻¹ otherwise
	precD  []float64     // the same, dense row-major
	logdet float64       // log|Σ|
	entry  int
	// uniform is true when every row shares its scales and airspeed, so
	// their factors s(φ)·q(w) are computed once.
	uniform bool
}

// model is the joint model of a set of Evidence values: the indexed data,
// shared by every variant of the model, and what a variant may change.
type model struct {
	*data

	// The robust layer's "entry looks off" alternatives: inflate[e] > 1
	// multiplies entry e's random error sd (and makes its signs
	// uninformative); inflateSys[e] > 1 multiplies the prior sds of the
	// nuisances and scale factors that e alone owns.
	inflate, inflateSys []float64
	// start is where the Laplace fit begins, by φ name (zero elsewhere):
	// the joint posterior's mode, for the fits that leave entries out.
	start map[string]float64

	priorOnce sync.Once
	prior     *prior // prior terms under this variant's inflation
}

// data is the evidence in indexed form; it is not changed once built.
type data struct {
	set     Settings
	entries []string
	kinds   []methods.Kind
	lin     []linParam
	phi     []phiParam
	rows    []row
	blocks  []block
	signs   []sign
	// groups summarise the rows of diagonal blocks; fullBlocks lists the
	// other blocks, conditioned row by row.
	groups     []group
	fullBlocks []int
	informed   map[string]bool   // configurations some evidence speaks of
	beta       map[[2]string]int // (config, axle) → column of β
	gamma      map[[2]string]int
}

// vref is V_ref of the linear speed model, m/s.
var vref = methods.KmhToMs(methods.RefSpeedKmh)

// newModel indexes the evidence. Nuisances and scale groups of the same name
// in several entries are one parameter; their priors must agree.
func newModel(evs []methods.Evidence, set Settings) (*model, error) {
	set = set.withDefaults()
	m := &model{data: &data{set: set, beta: map[[2]string]int{}, gamma: map[[2]string]int{}, informed: map[string]bool{}}}
	for _, c := range set.Configs {
		for _, ax := range []string{methods.AxleFront, methods.AxleRear} {
			m.beta[[2]string{c, ax}] = len(m.lin)
			m.lin = append(m.lin, linParam{kind: kindBeta, config: c, axle: ax, prec: 1 / (set.PriorSD * set.PriorSD)})
		}
	}
	if set.Linear {
		for _, c := range set.Configs {
			for _, ax := range []string{methods.AxleFront, methods.AxleRear} {
				m.gamma[[2]string{c, ax}] = len(m.lin)
				m.lin = append(m.lin, linParam{kind: kindGamma, config: c, axle: ax, prec: 1 / (set.PriorSD * set.PriorSD)})
			}
		}
	}
	nuisIdx := map[string]int{}
	phiIdx := map[string]int{}
	// Winds are the nuisances that some observation uses as its airspeed's
	// wind: they enter non-linearly.
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
	for ei, ev := range evs {
		if err := ev.Check(); err != nil {
			return nil, err
		}
		m.entries = append(m.entries, ev.Entry)
		for _, q := range ev.Informs {
			m.informed[q.Config] = true
		}
		m.kinds = append(m.kinds, ev.Kind)
		m.inflate = append(m.inflate, 1)
		m.inflateSys = append(m.inflateSys, 1)
		// addPhi declares a non-linear parameter, or adds an owner to one
		// already declared with the same prior.
		addPhi := func(p phiParam) error {
			if i, ok := phiIdx[p.name]; ok {
				if m.phi[i].sd != p.sd {
					return fmt.Errorf("fuse: %q is declared with sd %g and %g", p.name, m.phi[i].sd, p.sd)
				}
				m.phi[i].owners[ei] = true
				return nil
			}
			phiIdx[p.name] = len(m.phi)
			p.owners = map[int]bool{ei: true}
			m.phi = append(m.phi, p)
			return nil
		}
		for _, n := range ev.Nuisances {
			if winds[n.Name] {
				if err := addPhi(phiParam{name: n.Name, label: n.Label, sd: n.SD, wind: true, perRun: n.PerRun, unit: n.Unit}); err != nil {
					return nil, err
				}
				continue
			}
			if i, ok := nuisIdx[n.Name]; ok {
				p := &m.lin[i]
				if p.nuis.Mean != n.Mean || p.nuis.SD != n.SD || p.nuis.Flat != n.Flat {
					return nil, fmt.Errorf("fuse: nuisance %q is declared twice with different priors (%g ± %g and %g ± %g)", n.Name, p.nuis.Mean, p.nuis.SD, n.Mean, n.SD)
				}
				p.owners[ei] = true
				continue
			}
			prec := 0.0
			if !n.Flat {
				prec = 1 / (n.SD * n.SD)
			}
			nuisIdx[n.Name] = len(m.lin)
			m.lin = append(m.lin, linParam{kind: kindNuisance, nuis: n, mean: n.Mean, prec: prec, owners: map[int]bool{ei: true}})
		}
		for _, s := range ev.Scales {
			if s.SD == 0 {
				continue
			}
			if err := addPhi(phiParam{name: s.Name, label: s.Label, sd: s.SD}); err != nil {
				return nil, err
			}
		}
	}
	terms := func(ts []methods.Term, v float64) (lift, gam []entryRef, err error) {
		for _, t := range ts {
			k := [2]string{t.Config, t.Axle}
			i, ok := m.beta[k]
			if !ok {
				return nil, nil, fmt.Errorf("fuse: evidence names configuration %q, which the campaign does not list", t.Config)
			}
			lift = append(lift, entryRef{i, t.W})
			if set.Linear {
				gam = append(gam, entryRef{m.gamma[k], t.W * (v - vref) / vref})
			}
		}
		return lift, gam, nil
	}
	for ei, ev := range evs {
		for _, b := range ev.Blocks {
			bl := block{entry: ei}
			for _, o := range b.Obs {
				r := row{y: o.Y, entry: ei, label: o.Label, wind: -1, q0: o.Air.Q, v: o.Air.V}
				var err error
				if r.lift, r.gamma, err = terms(o.Terms, o.Air.V); err != nil {
					return nil, err
				}
				if o.Air.Wind != "" {
					r.wind = phiIdx[o.Air.Wind]
					r.a = o.Air.Rho * o.Air.Dir * o.Air.V
					r.c = 0.5 * o.Air.Rho
				}
				for _, s := range o.Scales {
					if i, ok := phiIdx[s.Name]; ok {
						r.scales = append(r.scales, phiRef{i, s.Pow})
					}
				}
				for _, c := range o.Nuis {
					if c.PerQ && r.wind >= 0 && r.q0 > 0 {
						r.nuisPerQ = append(r.nuisPerQ, entryRef{nuisIdx[c.Name], c.C / r.q0})
						continue
					}
					r.nuis = append(r.nuis, entryRef{nuisIdx[c.Name], c.C})
				}
				bl.rows = append(bl.rows, len(m.rows))
				m.rows = append(m.rows, r)
			}
			bl.uniform = true
			for _, ri := range bl.rows[1:] {
				a, b := &m.rows[bl.rows[0]], &m.rows[ri]
				if a.q0 != b.q0 || a.a != b.a || a.c != b.c || a.wind != b.wind || !slices.Equal(a.scales, b.scales) {
					bl.uniform = false
				}
			}
			if err := bl.setCov(b.Cov); err != nil {
				return nil, fmt.Errorf("fuse: entry %q: %w", ev.Entry, err)
			}
			m.blocks = append(m.blocks, bl)
		}
		for _, s := range ev.Signs {
			sg := sign{up: s.Lift, misread: s.Misread, softness: s.Softness, entry: ei, label: s.Label, v: s.Air.V}
			var err error
			if sg.lift, sg.gamma, err = terms(s.Terms, s.Air.V); err != nil {
				return nil, err
			}
			sg.all = append(append([]entryRef(nil), sg.lift...), sg.gamma...)
			m.signs = append(m.signs, sg)
		}
	}
	m.buildGroups()
	if err := m.undirected(); err != nil {
		return nil, err
	}
	return m, nil
}

// undirected widens the error of observations whose travel direction was
// not logged. Their airspeed is V ± w with the sign unknown, so the
// expected q is that of V² + w² (which the model has) and q scatters by
// about ρ·V·σ_w about it; the lift term scatters by that times the lift,
// which is taken from a pilot fit with the wind at zero:
//
//	extra variance = (ρ·V·σ_w · Σ_k w_k β̂_k)²
//
// (a first-order plug-in: exact treatment would make the error depend on
// the lift being estimated).
func (m *model) undirected() error {
	undirected := false
	for i := range m.rows {
		r := &m.rows[i]
		undirected = undirected || (r.wind >= 0 && r.a == 0 && r.v > 0)
	}
	if !undirected {
		return nil
	}
	var pilot cond
	if err := m.condition(make([]float64, len(m.phi)), &pilot); err != nil {
		return err
	}
	for bi := range m.blocks {
		bl := &m.blocks[bi]
		extra := make([]float64, len(bl.rows))
		some := false
		for i, ri := range bl.rows {
			r := &m.rows[ri]
			if r.wind < 0 || r.a != 0 || r.v == 0 {
				continue
			}
			var lift float64
			for _, t := range r.lift {
				lift += t.v * pilot.mean[t.col]
			}
			rho := 2 * r.c // c = ½ρ
			s := rho * r.v * m.phi[r.wind].sd * lift
			extra[i], some = s*s, true
		}
		if !some {
			continue
		}
		n := len(bl.rows)
		cov := mat.NewSymDense(n, nil)
		if bl.diag != nil {
			for i := range n {
				cov.SetSym(i, i, 1/bl.diag[i])
			}
		} else {
			var ch mat.Cholesky
			if !ch.Factorize(bl.prec) {
				return fmt.Errorf("fuse: a block's covariance is not positive definite")
			}
			if err := ch.InverseTo(cov); err != nil {
				return err
			}
		}
		for i := range n {
			cov.SetSym(i, i, cov.At(i, i)+extra[i]+1e-300)
		}
		*bl = block{rows: bl.rows, entry: bl.entry, uniform: bl.uniform}
		if err := bl.setCov(cov); err != nil {
			return err
		}
	}
	m.groups, m.fullBlocks = nil, nil
	m.priorOnce, m.prior = sync.Once{}, nil
	m.buildGroups()
	return nil
}

// setCov stores the inverse covariance and its log-determinant.
func (b *block) setCov(cov *mat.SymDense) error {
	n := cov.SymmetricDim()
	diagonal := true
	for i := 0; i < n && diagonal; i++ {
		for j := i + 1; j < n; j++ {
			if cov.At(i, j) != 0 {
				diagonal = false
				break
			}
		}
	}
	if diagonal {
		b.diag = make([]float64, n)
		for i := range n {
			v := cov.At(i, i)
			b.diag[i] = 1 / v
			b.logdet += math.Log(v)
		}
		return nil
	}
	var ch mat.Cholesky
	if !ch.Factorize(cov) {
		return fmt.Errorf("covariance not positive definite")
	}
	b.logdet = ch.LogDet()
	b.prec = mat.NewSymDense(n, nil)
	if err := ch.InverseTo(b.prec); err != nil {
		return err
	}
	b.precD = make([]float64, n*n)
	for i := range n {
		for j := range n {
			b.precD[i*n+j] = b.prec.At(i, j)
		}
	}
	return nil
}

// quantities returns the column weights of a quantity (front, rear or total
// β of a configuration) at V_ref.
func (m *model) quantity(q methods.Quantity) []entryRef {
	switch q.Axle {
	case methods.AxleTotal:
		return []entryRef{{m.beta[[2]string{q.Config, methods.AxleFront}], 1}, {m.beta[[2]string{q.Config, methods.AxleRear}], 1}}
	default:
		return []entryRef{{m.beta[[2]string{q.Config, q.Axle}], 1}}
	}
}

// entryIndex returns the index of an entry, or −1.
func (m *model) entryIndex(id string) int {
	for i, e := range m.entries {
		if e == id {
			return i
		}
	}
	return -1
}

// linNames lists the linear parameters, for messages.
func (m *model) linName(i int) string {
	p := m.lin[i]
	switch p.kind {
	case kindBeta:
		return fmt.Sprintf("C_L·A %s %s", p.config, p.axle)
	case kindGamma:
		return fmt.Sprintf("speed slope %s %s", p.config, p.axle)
	}
	return p.nuis.Label
}
