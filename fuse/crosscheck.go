package fuse

import (
	"fmt"
	"math"
	"sort"

	"gonum.org/v1/gonum/stat/distuv"

	"liftfuse/methods/evidence"
)

// CrosscheckFormat is the format string of the cross-check document.
const CrosscheckFormat = "liftfuse.crosscheck/1"

// Claim is a result to check against the campaign: an axle's lift of a
// configuration at a speed, in N, kgf, lbf or m² (C_L·A).
type Claim struct {
	Config   string  `json:"config"`
	Axle     string  `json:"axle"`
	SpeedKmh float64 `json:"speed_kmh"`
	Value    float64 `json:"value"`
	SD       float64 `json:"sd"`
	Unit     string  `json:"unit"`
	// NewtonsPerUnit is how many newtons one of Unit is, for a claimed
	// force (the caller converts the unit name); unused for "m2".
	NewtonsPerUnit float64 `json:"-"`
}

// Predictive is the campaign's posterior predictive of the claimed quantity.
type Predictive struct {
	Mean float64 `json:"mean"`
	SD   float64 `json:"sd"`
	Unit string  `json:"unit"`
}

// Explanation is how far one modelled error would have to move, in its own
// prior standard deviations, to put the claim at the centre of the
// predictive, and where that would put it in physical units.
type Explanation struct {
	Nuisance  string  `json:"nuisance"`
	Entry     string  `json:"entry"`
	ShiftSD   float64 `json:"shift_sd"`
	Value     float64 `json:"value"` // the error's value that would explain the claim, in Unit
	Unit      string  `json:"unit"`  // "×" for a scale factor
	Plausible bool    `json:"plausible"`
	Note      string  `json:"note"`
}

// Verdicts of a cross-check.
const (
	// VerdictConsistent: the campaign agrees with the claim (p > 0.1); no
	// explanation is needed or listed.
	VerdictConsistent = "consistent"
	// VerdictExplained: some single modelled error within its physical
	// bounds and 4 prior sd would reconcile the claim.
	VerdictExplained = "explained"
	// VerdictUnexplained: no single modelled error explains it.
	VerdictUnexplained = "unexplained"
)

// consistentP is the p-value above which a claim is called consistent
// with the campaign (model.md, "Agreement and fault localisation").
const consistentP = 0.1

// Crosscheck is the cross-check document, format liftfuse.crosscheck/1.
type Crosscheck struct {
	Format     string     `json:"format"`
	Claim      Claim      `json:"claim"`
	Predictive Predictive `json:"predictive"`
	Z          float64    `json:"z"`
	PValue     float64    `json:"p_value"`
	// Verdict is VerdictConsistent, VerdictExplained or
	// VerdictUnexplained; Summary says it in one line.
	Verdict string `json:"verdict"`
	Summary string `json:"summary"`
	// Explanations are the plausible single errors (within physical
	// bounds and 4 prior sd), cheapest first; empty when consistent.
	Explanations []Explanation `json:"explanations"`
	// Checks are things of the trade to look at, for the kinds of entry
	// involved, when no modelled error plausibly (within 2 prior sd)
	// explains the claim.
	Checks []string `json:"checks,omitempty"`
	// Headline and DownWeighted say which fusion the prediction is from
	// (see Result.Headline); empty for a standalone posterior.
	Headline     string   `json:"headline,omitempty"`
	DownWeighted []string `json:"down_weighted,omitempty"`
}

// Physical bounds of a single explanation (model.md): an along-road wind
// of at most 15 m/s (a strong gale, Beaufort 7 — from memory), a scale
// factor within [0.5, 2], a shift of at most 4 prior sd, and a Cp within
// [−3, 1.05] (above 1 is impossible outside stagnation; below −3 is beyond
// any road car's surface — common practice, no source).
const (
	maxWindMs  = 15
	minScale   = 0.5
	maxScale   = 2
	maxShiftSD = 4
	minCp      = -3
	maxCp      = 1.05
)

// tradeChecks are what an engineer looks at, by kind of entry, when the
// numbers cannot be reconciled by the modelled errors (common practice,
// no source); commonChecks apply whatever the kind.
var (
	tradeChecks = map[evidence.Kind][]string{
		evidence.KindRideHeight: {
			"a sensor's calibration gain wrong or copied from another sensor (re-check it against gauge blocks)",
			"a sensor bracket or mount that flexes under load or vibration",
			"a change of fuel load or driver between runs (static height moves)",
			"a tyre pressure change (hot versus cold, a slow puncture)",
		},
		evidence.KindPressure: {
			"a tap tube pinched, blocked or leaking (Cp near zero among non-zero neighbours, or changing with speed)",
			"the reference port moved, or exposed to the car's own flow",
			"taps zeroed with a fan or the engine running, or not zeroed at standstill",
		},
		evidence.KindVortex: {
			"senses read in crossing traffic or a gust",
			"a tuft or vane fouled or stuck",
		},
	}
	commonChecks = []string{
		"speeds not matched between the A and B runs (compare the windows' speeds per configuration)",
		"a configuration change not logged, or logged on the wrong segment",
		"a different ride height or rake set-up between the claim's test and this one",
	}
)

// Crosscheck compares a claim with the campaign's posterior predictive and
// asks each modelled error how far it would have to move to explain it.
//
// The predictive of the claimed force at speed V is that of q(V)·β(V),
// q = ½ρV² (no wind: the claim is taken as in still air). With T the
// claimed quantity and ν one modelled error with prior N(μ, σ²), moving the
// prior's centre by δ moves the posterior mean of T by Cov(T, ν | y)·δ/σ²
// (exact for the linear-Gaussian part: ∂E[θ|y]/∂μ₀ = Λ⁻¹Λ₀). The shift that
// centres the predictive on the claim, in prior standard deviations, is
//
//	shift = (claim − E[T|y])·σ / Cov(T, ν | y)
//
// so an error the data already pin down (small posterior covariance with
// T) is an expensive explanation, as it should be. Scale factors are read
// on their log scale, where their prior is normal.
//
// The prediction is the headline fusion's: the robust one when some entry
// looks off (Result.Headline), which the document records.
func (f *Fused) Crosscheck(cl Claim, rho float64) (*Crosscheck, error) {
	cc, err := f.Posterior.Crosscheck(cl, rho)
	if err != nil {
		return nil, err
	}
	if f.Result != nil {
		cc.Headline, cc.DownWeighted = f.Result.Headline, f.Result.DownWeighted
	}
	return cc, nil
}

// sharedKeys names (by paramKey) the errors that more than one entry
// declares.
func (m *model) sharedKeys() map[string]bool {
	out := map[string]bool{}
	for i, lp := range m.lin {
		if lp.kind == kindNuisance && len(lp.owners) > 1 {
			out[m.paramKey(i)] = true
		}
	}
	for j, ph := range m.phi {
		if len(ph.owners) > 1 {
			out[m.paramKey(len(m.lin)+j)] = true
		}
	}
	return out
}

// Crosscheck is Fused.Crosscheck against any posterior: with an entry's
// standalone posterior and the other entries' estimate as the claim, it asks
// which of the entry's own errors would have to move to reach the others.
func (P *Posterior) Crosscheck(cl Claim, rho float64) (*Crosscheck, error) {
	return P.crosscheck(cl, rho, nil)
}

// crosscheck is Crosscheck with the errors named in shared (by paramKey)
// left out of the explanations.
func (P *Posterior) crosscheck(cl Claim, rho float64, shared map[string]bool) (*Crosscheck, error) {
	m := P.p.m
	if _, ok := m.beta[[2]string{cl.Config, evidence.AxleFront}]; !ok {
		return nil, fmt.Errorf("unknown configuration %q", cl.Config)
	}
	k, err := claimFactor(cl, rho)
	if err != nil {
		return nil, err
	}
	T, vals := P.claimDraws(P.weightsAt(cl.SpeedKmh, []evidence.Term{{Config: cl.Config, Axle: cl.Axle, W: k}}))
	tm, tv := meanVar(T)
	out := &Crosscheck{Format: CrosscheckFormat, Claim: cl, Predictive: Predictive{Mean: tm, SD: math.Sqrt(tv), Unit: cl.Unit}}
	out.Z = (cl.Value - tm) / math.Sqrt(tv+cl.SD*cl.SD)
	out.PValue = 2 * distuv.UnitNormal.CDF(-math.Abs(out.Z))
	out.Explanations = []Explanation{}
	if out.PValue > consistentP {
		out.Verdict = VerdictConsistent
		out.Summary = fmt.Sprintf("consistent: the campaign agrees with the claim (p = %.2g)", out.PValue)
		return out, nil
	}
	out.judge(m.explanations(cl.Value, T, vals, shared), m.tradeChecks)
	return out, nil
}

// judge gives a claim the data do not agree with its explanations and
// verdict: explained by the cheapest single error, or by none; the trade's
// checks are added when no explanation is plausible.
func (cc *Crosscheck) judge(ex []Explanation, trade func() []string) {
	cc.Explanations = ex
	plausible := false
	for _, e := range ex {
		plausible = plausible || e.Plausible
	}
	if len(ex) == 0 {
		cc.Verdict, cc.Summary = VerdictUnexplained, "no single modelled error explains it"
	} else {
		cc.Verdict = VerdictExplained
		cc.Summary = fmt.Sprintf("the cheapest single explanation: %s (%+.1f prior sd)", ex[0].Note, ex[0].ShiftSD)
	}
	if !plausible {
		cc.Checks = trade()
	}
}

// tradeChecks lists the trade's checks for the kinds of entry in the
// model, then those common to every kind.
func (m *model) tradeChecks() []string {
	var out []string
	seen := map[evidence.Kind]bool{}
	for _, k := range m.kinds {
		if !seen[k] {
			seen[k] = true
			out = append(out, tradeChecks[k]...)
		}
	}
	return append(out, commonChecks...)
}

// claimFactor returns k with the claimed quantity T = k·β(V) in the
// claim's unit: 1 for m² (C_L·A), else q(V)/(newtons per unit), q = ½ρV².
func claimFactor(cl Claim, rho float64) (float64, error) {
	if cl.Unit == "m2" {
		return 1, nil
	}
	if !(cl.NewtonsPerUnit > 0) {
		return 0, fmt.Errorf("claim in %q: newtons per unit not given", cl.Unit)
	}
	return dynamicPressure(rho, cl.SpeedKmh) / cl.NewtonsPerUnit, nil
}

// claimDraws returns the pooled draws of T = wᵀθ and, column by column, of
// every parameter (θ then φ).
func (P *Posterior) claimDraws(w []entryRef) (T []float64, vals [][]float64) {
	m := P.p.m
	p := len(m.lin)
	vals = make([][]float64, m.dim())
	P.jointDraws(func(theta, phi []float64) {
		var t float64
		for _, r := range w {
			t += r.v * theta[r.col]
		}
		T = append(T, t)
		for i := range p {
			vals[i] = append(vals[i], theta[i])
		}
		for j := range phi {
			vals[p+j] = append(vals[p+j], phi[j])
		}
	})
	return T, vals
}

// errorTerm is one modelled error that might explain a claim: its prior
// N(Mean, SD²) (on the log scale for a scale factor) and what it is.
type errorTerm struct {
	label, unit string
	mean, sd    float64
	logScale    bool // a scale factor: the value is exp of the parameter
	wind        bool
	// median > 0: a log-normal nuisance, median·exp of the parameter, in
	// unit (the pitch of drag in m²)
	median float64
}

// phiErrorTerm describes φ parameter j as an error term.
func (m *model) phiErrorTerm(j int) errorTerm {
	ph := m.phi[j]
	return errorTerm{label: ph.label, unit: ph.unit, sd: ph.sd, logScale: !ph.wind, wind: ph.wind, median: ph.median}
}

// explanations asks every modelled error with a proper prior how far it
// would have to move to explain the claimed value (see Crosscheck) and
// keeps the single errors that stay within their physical bounds, the
// cheapest explanation first.
func (m *model) explanations(claim float64, T []float64, vals [][]float64, skip map[string]bool) []Explanation {
	out := []Explanation{}
	add := func(i int, et errorTerm, owners map[int]bool) {
		if skip[m.paramKey(i)] {
			return
		}
		if ex, ok := explain(claim, T, vals[i], et); ok {
			ex.Entry = m.ownerNames(owners)
			out = append(out, ex)
		}
	}
	for i, lp := range m.lin {
		if lp.kind != kindNuisance || lp.prec == 0 {
			continue
		}
		add(i, errorTerm{label: lp.nuis.Label, unit: lp.nuis.Unit, mean: lp.nuis.Mean, sd: lp.nuis.SD}, lp.owners)
	}
	p := len(m.lin)
	for j, ph := range m.phi {
		add(p+j, m.phiErrorTerm(j), ph.owners)
	}
	sort.SliceStable(out, func(a, b int) bool { return math.Abs(out[a].ShiftSD) < math.Abs(out[b].ShiftSD) })
	return out
}

// explain is one error's explanation of the claim from the draws of T and
// of the error ν: shift = (claim − E[T|y])·σ / Cov(T, ν | y), plausible
// within 2 prior sds. ok is false when ν has no prior spread, does not move
// T, or would have to leave its physical bounds (more than 4 prior sd, a
// wind above 15 m/s, a scale factor outside [0.5, 2], a Cp outside
// [−3, 1.05]).
func explain(claim float64, T, nu []float64, et errorTerm) (Explanation, bool) {
	if len(nu) < 2 || et.sd <= 0 {
		return Explanation{}, false
	}
	tm, tv := meanVar(T)
	_, vv := meanVar(nu)
	c := covariance(T, nu)
	if vv <= 0 || math.Abs(c) < 1e-12*math.Sqrt(vv*tv) {
		return Explanation{}, false
	}
	shift := (claim - tm) * et.sd / c
	target := et.mean + shift*et.sd
	if !et.within(shift, target) {
		return Explanation{}, false
	}
	return et.explanation("", shift, target), true
}

// within reports whether a shift of an error, in prior sd, and the value
// it leads to stay within the physical bounds of a single explanation.
func (et errorTerm) within(shift, target float64) bool {
	switch {
	case math.Abs(shift) > maxShiftSD || math.IsNaN(shift):
		return false
	case et.wind:
		return math.Abs(target) <= maxWindMs
	case et.logScale:
		return math.Exp(target) >= minScale && math.Exp(target) <= maxScale
	case et.unit == evidence.UnitCp:
		return target >= minCp && target <= maxCp
	}
	return true
}

// ownerNames lists the entries that share a parameter.
func (m *model) ownerNames(owners map[int]bool) string {
	var ids []string
	for e := range owners {
		ids = append(ids, m.entries[e])
	}
	sort.Strings(ids)
	return joinMax(ids, 4)
}
