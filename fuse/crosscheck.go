package fuse

import (
	"fmt"
	"math"
	"sort"
	"strings"

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
// predictive.
type Explanation struct {
	Nuisance  string  `json:"nuisance"`
	Entry     string  `json:"entry"`
	ShiftSD   float64 `json:"shift_sd"`
	Plausible bool    `json:"plausible"`
	Note      string  `json:"note"`
}

// Crosscheck is the cross-check document, format liftfuse.crosscheck/1.
type Crosscheck struct {
	Format       string        `json:"format"`
	Claim        Claim         `json:"claim"`
	Predictive   Predictive    `json:"predictive"`
	Z            float64       `json:"z"`
	PValue       float64       `json:"p_value"`
	Explanations []Explanation `json:"explanations"`
	// Checks are things of the trade to look at when no modelled error
	// plausibly explains the claim.
	Checks []string `json:"checks,omitempty"`
}

// tradeChecks are what an engineer looks at when the numbers cannot be
// reconciled by the modelled errors (common practice, no source).
var tradeChecks = []string{
	"speeds not matched between the A and B runs (compare the windows' speeds per configuration)",
	"a sensor bracket or mount that flexes under load or vibration",
	"a change of fuel load or driver between runs (static height moves)",
	"a tyre pressure change (hot versus cold, a slow puncture)",
	"a configuration change not logged, or logged on the wrong segment",
	"a different ride height or rake set-up between the claim's test and this one",
}

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
func (f *Fused) Crosscheck(cl Claim, rho float64) (*Crosscheck, error) {
	return f.Posterior.Crosscheck(cl, rho)
}

// Crosscheck is Fused.Crosscheck against any posterior: with an entry's
// standalone posterior and the other entries' estimate as the claim, it asks
// which of the entry's own errors would have to move to reach the others.
func (P *Posterior) Crosscheck(cl Claim, rho float64) (*Crosscheck, error) {
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
	out.Explanations = m.explanations(cl.Value, T, vals)
	plausible := false
	for _, e := range out.Explanations {
		plausible = plausible || e.Plausible
	}
	if !plausible && math.Abs(out.Z) > 2 {
		out.Checks = tradeChecks
	}
	return out, nil
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

// explanations asks every modelled error with a proper prior how far it
// would have to move to explain the claimed value (see Crosscheck), the
// cheapest explanation first.
func (m *model) explanations(claim float64, T []float64, vals [][]float64) []Explanation {
	out := []Explanation{}
	add := func(i int, label, unit string, owners map[int]bool, priorMean, priorSD float64, logScale bool) {
		if ex, ok := explain(claim, T, vals[i], label, unit, priorMean, priorSD, logScale); ok {
			ex.Entry = m.ownerNames(owners)
			out = append(out, ex)
		}
	}
	for i, lp := range m.lin {
		if lp.kind != kindNuisance || lp.prec == 0 {
			continue
		}
		add(i, lp.nuis.Label, lp.nuis.Unit, lp.owners, lp.nuis.Mean, lp.nuis.SD, false)
	}
	p := len(m.lin)
	for j, ph := range m.phi {
		add(p+j, ph.label, ph.unit, ph.owners, 0, ph.sd, !ph.wind)
	}
	sort.SliceStable(out, func(a, b int) bool { return math.Abs(out[a].ShiftSD) < math.Abs(out[b].ShiftSD) })
	return out
}

// explain is one error's explanation of the claim from the draws of T and
// of the error ν: shift = (claim − E[T|y])·σ / Cov(T, ν | y), plausible
// within 2 prior sds. ok is false when ν has no prior spread or does not
// move T.
func explain(claim float64, T, nu []float64, label, unit string, priorMean, priorSD float64, logScale bool) (Explanation, bool) {
	if len(nu) < 2 || priorSD <= 0 {
		return Explanation{}, false
	}
	tm, tv := meanVar(T)
	_, vv := meanVar(nu)
	c := covariance(T, nu)
	if vv <= 0 || math.Abs(c) < 1e-12*math.Sqrt(vv*tv) {
		return Explanation{}, false
	}
	shift := (claim - tm) * priorSD / c
	target := priorMean + shift*priorSD
	ex := Explanation{Nuisance: label, ShiftSD: shift, Plausible: math.Abs(shift) <= 2}
	if logScale {
		ex.Note = fmt.Sprintf("the %s factor would have to be ×%.3g instead of ×1 (prior ±%.1f %%)", label, math.Exp(target), 100*priorSD)
	} else {
		ex.Note = strings.Replace(fmt.Sprintf("the %s would have to be %.3g %s instead of %.3g ± %.3g", label, target, unit, priorMean, priorSD), "  ", " ", 1)
	}
	return ex, true
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
