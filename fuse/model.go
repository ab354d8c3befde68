package fuse

import (
	"fmt"
	"math"
	"sync"

	"gonum.org/v1/gonum/mat"

	"liftfuse/methods/evidence"
)

// Settings are the campaign-level choices fusion needs.
type Settings struct {
	Configs  []string // configuration ids, in campaign order
	PriorSD  float64  // σ_β of the lift parameters (and γ), m²
	Linear   bool     // speed_model: linear
	Seed     uint64
	Credible float64 // central interval level, e.g. 0.9

	// MinESS is the bulk effective sample size the sampler draws for
	// (default 1100: every reported figure is held to 1000, issue 15, and
	// the 10 % above it is a margin for the estimate's own noise);
	// MaxDraws bounds the draws per chain (default 20000).
	MinESS   float64
	MaxDraws int

	// reference is the result's reference configuration (Input.Reference):
	// the differences to it are tracked by the sampler's diagnostics too.
	reference string
	// track, when set, are the only quantities whose convergence gates
	// the sampling (see trackedColumns): those of the one entry a
	// standalone or leave-one-out fit is made for.
	track []evidence.Quantity
}

// Fallbacks when a caller leaves Settings zero; the campaign's defaults
// (methods/campaign) are the same values.
const (
	defaultPriorSD  = 1.0 // m²
	defaultCredible = 0.9
)

// dynamicPressure returns q = ½·ρ·V² in Pa for a density in kg/m³ and a
// speed in km/h.
func dynamicPressure(rho, kmh float64) float64 {
	v := kmh / 3.6
	return 0.5 * rho * v * v
}

func (s Settings) withDefaults() Settings {
	if s.PriorSD == 0 {
		s.PriorSD = defaultPriorSD
	}
	if s.Credible == 0 {
		s.Credible = defaultCredible
	}
	if s.MinESS == 0 {
		s.MinESS = 1100
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
	nuis   evidence.Nuisance
	mean   float64
	prec   float64 // prior precision; 0 for a flat prior
	owners map[int]bool
}

// phiParam is one parameter of the non-linear part: the log of a scale
// factor, a wind speed, or the log of the factor s of a log-normal nuisance
// ν = median·s (the pitch of drag; median > 0 marks it).
type phiParam struct {
	name   string
	label  string
	sd     float64
	wind   bool
	perRun bool
	unit   string
	median float64
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

// offRef is a row's term of a log-normal nuisance ν = M·e^φ: the known
// value v·e^{φ_idx} (v = c·M for the coefficient c; v = c·M/q0, times
// q(w), when it scales with q), idx −1 for a nuisance stated exactly.
// Given φ it is a known shift of the observation.
type offRef struct {
	idx  int
	v    float64
	perQ bool
	set  int // {(idx, 1)} among the model's scaleSets, or −1
}

// offset returns a row's terms of log-normal nuisances at φ, q = q(w).
func (r *row) offset(phi []float64, q float64) float64 {
	var o float64
	for _, t := range r.offs {
		v := t.v
		if t.idx >= 0 {
			v *= math.Exp(phi[t.idx])
		}
		if t.perQ {
			v *= q
		}
		o += v
	}
	return o
}

// row is one Gaussian observation in indexed form:
//
//	y = s(φ)·q(w)·Σ_k w_k·(β_k + γ_k·vfac) + Σ_j c_j·ν_j + o(φ) + ε
//	q(w) = q0 + a·w + c·w²
//
// with o(φ) the terms of its log-normal nuisances (see offRef).
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
	offs     []offRef   // log-normal nuisances: o(φ)
	scaleSet int        // index of its scales among the model's distinct sets
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
	// start is where the Laplace fit begins (zero where nil or silent):
	// the joint posterior's, for the fits that leave entries out.
	start *warmStart

	priorOnce sync.Once
	prior     *prior // prior terms under this variant's inflation
}

// data is the evidence in indexed form; it is not changed once built.
type data struct {
	set     Settings
	entries []string
	kinds   []evidence.Kind
	lin     []linParam
	phi     []phiParam
	rows    []row
	blocks  []block
	signs   []sign
	// groups summarise the rows of diagonal blocks; fullBlocks lists the
	// other blocks, conditioned row by row.
	groups     []group
	fullBlocks []int
	terms      *termTable // the groups merged by basis function (terms.go)
	lay        *layout    // the order Λ is factorised in
	// scaleSets are the distinct scales of the rows and the factors e^φ
	// of the log-normal nuisances, so that a conditioning computes each
	// once
	scaleSets [][]phiRef
	signComps [][]int // per sign: the layout components of its columns
	// per sign: the position ranges [lo, hi) of its components, then
	// that of the shared nuisances
	signSpans [][][2]int
	compSigns [][]int // per layout component: the signs that involve it
	allSigns  []int   // 0 … len(signs)−1
	// sameAsPrev[i]: sign i repeats sign i − 1 (markRepeats)
	sameAsPrev []bool
	informed   map[string]bool   // configurations some evidence speaks of
	beta       map[[2]string]int // (config, axle) → column of β
	gamma      map[[2]string]int
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
		if err := bl.setCov(evidence.Block{Cov: cov}); err != nil {
			return err
		}
	}
	m.groups, m.fullBlocks = nil, nil
	m.priorOnce, m.prior = sync.Once{}, nil
	m.buildGroups()
	return nil
}

// setCov stores the inverse covariance and its log-determinant.
func (b *block) setCov(eb evidence.Block) error {
	if eb.Var != nil {
		b.diag = make([]float64, len(eb.Var))
		for i, v := range eb.Var {
			b.diag[i] = 1 / v
			b.logdet += math.Log(v)
		}
		return nil
	}
	cov := eb.Cov
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
func (m *model) quantity(q evidence.Quantity) []entryRef {
	switch q.Axle {
	case evidence.AxleTotal:
		return []entryRef{{m.beta[[2]string{q.Config, evidence.AxleFront}], 1}, {m.beta[[2]string{q.Config, evidence.AxleRear}], 1}}
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
