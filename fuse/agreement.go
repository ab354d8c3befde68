package fuse

import (
	"fmt"
	"math"

	"gonum.org/v1/gonum/mat"
	"gonum.org/v1/gonum/stat/distuv"

	"liftfuse/methods/evidence"
)

// flagP and flagOff are the agreement flag's thresholds
// (result-format.md): p-value below 0.05, or P(off) above 0.5.
const (
	flagP   = 0.05
	flagOff = 0.5
)

// flagged reports whether an entry disagrees with the others: p < flagP or
// P(off) > flagOff.
func (ag *Agreement) flagged() bool { return ag.PValue < flagP || ag.POff > flagOff }

// warning is the result's warning for a flagged entry, naming the quantity
// where it disagrees most.
func (ag *Agreement) warning(entry string) string {
	msg := fmt.Sprintf("entry %q disagrees with the others (distance %.2f, p = %.3g, P(off) = %.2f)", entry, ag.Distance, ag.PValue, ag.POff)
	if w := ag.Worst; w != nil {
		msg += fmt.Sprintf(": most on %s %s, by %+.3f m² (%.1f sd)", w.Config, w.Axle, w.DiffM2, w.Sigmas)
	}
	return msg
}

// agreement compares entry ev's standalone posterior with the others' on
// the quantities it informs: the Mahalanobis distance
//
//	d² = Δᵀ (C_alone + C_others)⁻¹ Δ,   p = P(χ²_k > d²)
//
// (the two posteriors are independent given the prior, which is wide). For
// sign evidence it is the posterior predictive p-value of the observed
// senses under the others' posterior, with T = −Σ log P(sense | θ).
func agreement(full *model, ei int, ev evidence.Evidence, alone, others *Posterior) *Agreement {
	if len(ev.Blocks) == 0 && len(ev.Signs) > 0 {
		return signAgreement(full, ei, others)
	}
	k := len(ev.Informs)
	if k == 0 {
		return &Agreement{PValue: 1, Note: "informs no quantity"}
	}
	series := func(P *Posterior) ([][]float64, []float64) {
		xs := make([][]float64, k)
		means := make([]float64, k)
		for i, q := range ev.Informs {
			xs[i] = flatten(P.seriesOf(P.weights([]evidence.Term{{Config: q.Config, Axle: q.Axle, W: 1}})))
			means[i], _ = meanVar(xs[i])
		}
		return xs, means
	}
	xa, ma := series(alone)
	xo, mo := series(others)
	C := mat.NewSymDense(k, nil)
	for i := range k {
		for j := i; j < k; j++ {
			C.SetSym(i, j, covariance(xa[i], xa[j])+covariance(xo[i], xo[j]))
		}
	}
	diff := make([]float64, k)
	ag := &Agreement{}
	worst := -1.0
	for i := range k {
		diff[i] = ma[i] - mo[i]
		if s := math.Abs(diff[i]) / math.Sqrt(C.At(i, i)); s > worst {
			worst = s
			ag.Worst = &Disagreement{Config: ev.Informs[i].Config, Axle: ev.Informs[i].Axle, DiffM2: diff[i], Sigmas: diff[i] / math.Sqrt(C.At(i, i))}
		}
	}
	var ch mat.Cholesky
	if !ch.Factorize(C) {
		ag.PValue, ag.Note = 1, "covariance of the comparison is singular"
		return ag
	}
	dv := mat.NewVecDense(k, diff)
	var x mat.VecDense
	if err := ch.SolveVecTo(&x, dv); err != nil {
		ag.PValue, ag.Note = 1, "covariance of the comparison is singular"
		return ag
	}
	d2 := mat.Dot(dv, &x)
	ag.Distance = math.Sqrt(d2)
	ag.PValue = distuv.ChiSquared{K: float64(k)}.Survival(d2)
	return ag
}

func covariance(a, b []float64) float64 {
	ma, _ := meanVar(a)
	mb, _ := meanVar(b)
	var s float64
	for i := range a {
		s += (a[i] - ma) * (b[i] - mb)
	}
	return s / float64(len(a)-1)
}

// signAgreement is the posterior predictive check of an entry's signs
// under the others' posterior (Gelman, Meng & Stern 1996): for each draw θ
// a replicate set of senses is simulated, and p is the share of draws whose
// replicate is at least as improbable as what was observed.
func signAgreement(full *model, ei int, others *Posterior) *Agreement {
	var signs []*sign
	for i := range full.signs {
		if full.signs[i].entry == ei {
			signs = append(signs, &full.signs[i])
		}
	}
	vals := make([][]float64, len(signs))
	for i, s := range signs {
		vals[i] = flatten(others.seriesOf(s.refs()))
	}
	n := len(vals[0])
	rng := newRand(full.set.Seed, 777)
	extreme := 0
	for d := range n {
		var tObs, tRep float64
		for i, s := range signs {
			pUp := s.pUp(vals[i][d])
			pObs := pUp
			if !s.up {
				pObs = 1 - pUp
			}
			tObs -= math.Log(math.Max(pObs, 1e-300))
			pRep := pUp
			if rng.Float64() >= pUp {
				pRep = 1 - pUp
			}
			tRep -= math.Log(math.Max(pRep, 1e-300))
		}
		if tRep >= tObs {
			extreme++
		}
	}
	p := float64(extreme) / float64(n)
	return &Agreement{PValue: p, Distance: math.Abs(distuv.UnitNormal.Quantile(math.Max(p, 1e-300) / 2)),
		Note: "posterior predictive check of the observed senses under the other entries"}
}
