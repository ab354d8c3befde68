package fuse

import (
	"fmt"
	"math"
	"sort"

	"gonum.org/v1/gonum/stat/distuv"

	"liftfuse/methods/evidence"
)

// Diagnose says which single error of a suspect entry would explain its
// disagreement with the others, from the entry's leave-one-out statistic
// (predictive.go): t = A(y_e − μ_e(x̄)) with covariance V. If the entry's
// own error j (prior sd σ_j) were off by δ, its data would move by J_j·δ
// and t by a_j·δ, a_j = (A J)_j; the δ that explains most of t, and what is
// left, are
//
//	δ = a_jᵀV⁺t / a_jᵀV⁺a_j,   d²_j = d² − (a_jᵀV⁺t)² / a_jᵀV⁺a_j,
//
// and j explains the disagreement when d²_j is unremarkable
// (P(χ²_{r−1} > d²_j) ≥ 0.01, r the rank of V) and δ stays within the
// physical bounds of a single explanation (≤ 4 prior sd, scale factors in
// [0.5, 2], …; see errorTerm.within). Only the entry's own errors are asked:
// one it shares with another entry (the springs of an axle, the wind, the
// pitch of drag) moves both sides alike. The document is a cross-check of
// the quantity where the entry disagrees most (Agreement.Worst): the
// others' estimate is the claim, the entry's standalone posterior the
// prediction. An entry whose agreement p-value exceeds 0.1 (a suspect by
// P(off) alone) is called consistent, with no list; with no explanation,
// the summary is "no single modelled error explains it" and the trade's
// checks for the entry's kind follow. nil when the entry is not a suspect or
// has no standalone and others' posteriors.
func (f *Fused) Diagnose(entry string) (*Crosscheck, error) {
	var ag *Agreement
	for _, m := range f.Result.Methods {
		if m.ID == entry {
			ag = m.Agreement
		}
	}
	alone, others := f.Standalone[entry], f.Others[entry]
	if ag == nil || !ag.Suspect || ag.Worst == nil || alone == nil || others == nil {
		return nil, nil
	}
	w := ag.Worst
	e, _ := others.Quantity(evidence.Quantity{Config: w.Config, Axle: w.Axle})
	cl := Claim{Config: w.Config, Axle: w.Axle, SpeedKmh: evidence.RefSpeedKmh, Value: e.Mean, SD: e.SD, Unit: "m2"}
	st := f.loo[entry]
	if st == nil || st.Vp == nil {
		// Sign evidence: the cross-check of the claim on the entry's own errors.
		return alone.crosscheck(cl, f.Result.Air.DensityKgM3, f.full.sharedKeys())
	}
	a, _ := alone.Quantity(evidence.Quantity{Config: w.Config, Axle: w.Axle})
	cc := &Crosscheck{Format: CrosscheckFormat, Claim: cl, Predictive: Predictive{Mean: a.Mean, SD: a.SD, Unit: "m2"},
		Z: -w.Sigmas, PValue: ag.PValue, Explanations: []Explanation{}}
	if ag.PValue > consistentP {
		cc.Verdict = VerdictConsistent
		cc.Summary = fmt.Sprintf("consistent: its data agree with the others' prediction (p = %.2g), though P(off) = %.2f", ag.PValue, ag.POff)
		return cc, nil
	}
	e0 := f.full.entryIndex(entry)
	cc.judge(f.full.singleErrors(st, entry), (&model{data: &data{kinds: f.full.kinds[e0 : e0+1]}}).tradeChecks)
	return cc, nil
}

// singleErrors lists the entry's own errors that alone would explain its
// leave-one-out discrepancy (see Diagnose), the cheapest first.
func (m *model) singleErrors(st *looStat, entry string) []Explanation {
	out := []Explanation{}
	k, _ := st.AJ.Dims()
	rank := 0
	if _, r := st.metric(); r > 0 {
		rank = r
	}
	aj := make([]float64, k)
	for c, col := range st.cols {
		et, ok := m.ownErrorTerm(col)
		if !ok {
			continue
		}
		for i := range k {
			aj[i] = st.AJ.At(i, c)
		}
		q := quadForm(st.Vp, aj)
		if !(q > 0) {
			continue
		}
		var at float64
		for i := range k {
			for j := range k {
				at += aj[i] * st.Vp.At(i, j) * st.t[j]
			}
		}
		delta := at / q
		rest := math.Max(0, st.d2-at*at/q)
		p := 1.0
		if rank > 1 {
			p = distuv.ChiSquared{K: float64(rank - 1)}.Survival(rest)
		}
		shift := delta / et.sd
		target := et.mean + delta
		if p < suspectP || !et.within(shift, target) {
			continue
		}
		out = append(out, et.explanation(entry, shift, target))
	}
	sort.SliceStable(out, func(a, b int) bool { return math.Abs(out[a].ShiftSD) < math.Abs(out[b].ShiftSD) })
	return out
}

// ownErrorTerm describes parameter k of (θ, φ) as an error of one entry
// alone with a proper prior; ok is false for a lift parameter, a flat
// offset or an error shared with other entries.
func (m *model) ownErrorTerm(k int) (errorTerm, bool) {
	if m.priorPrecision(k) == 0 || m.sharedParam(k) {
		return errorTerm{}, false
	}
	p := len(m.lin)
	if k >= p {
		return m.phiErrorTerm(k - p), true
	}
	lp := m.lin[k]
	if lp.kind != kindNuisance {
		return errorTerm{}, false
	}
	return errorTerm{label: lp.nuis.Label, unit: lp.nuis.Unit, mean: lp.nuis.Mean, sd: lp.nuis.SD}, true
}

// explanation words an error's explaining value: target on the parameter's
// scale (the log of a scale factor or of a log-normal nuisance's factor),
// shift in prior sd; a log-normal nuisance's value in its own unit.
func (et errorTerm) explanation(entry string, shift, target float64) Explanation {
	ex := Explanation{Nuisance: et.label, Entry: entry, ShiftSD: shift, Value: target, Unit: et.unit, Plausible: math.Abs(shift) <= 2}
	if et.median > 0 {
		f := math.Exp(target)
		ex.Value = et.median * f
		ex.Note = fmt.Sprintf("the %s would have to be %.3g %s instead of %.3g %s as stated (×%.3g; prior ±%.0f %%)",
			et.label, ex.Value, et.unit, et.median, et.unit, f, 100*et.sd)
		return ex
	}
	if et.logScale {
		ex.Value, ex.Unit = math.Exp(target), "×"
		ex.Note = fmt.Sprintf("the %s factor would have to be ×%.3g instead of ×1 (prior ±%.1f %%)", et.label, ex.Value, 100*et.sd)
		return ex
	}
	unit := ""
	if et.unit != "" {
		unit = " " + et.unit
	}
	ex.Note = fmt.Sprintf("the %s would have to be %.3g%s instead of %.3g ± %.3g", et.label, target, unit, et.mean, et.sd)
	return ex
}
