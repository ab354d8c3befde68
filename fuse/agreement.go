package fuse

import (
	"fmt"
	"math"
	"sort"

	"gonum.org/v1/gonum/stat/distuv"

	"liftfuse/methods/evidence"
)

// The agreement's thresholds. The result document's flag (result-format.md)
// is raised at p < flagP or P(off) > flagOff. The tool names an entry as a
// suspect — warns, down-weights it in the headline, explains it and asks
// for it in the plan — at the stricter p < suspectP (or the same P(off)):
// model.md asks ≤ 1 % false alarms per entry on a clean day, and a
// calibrated p-value at 0.05 would name a correct entry on one clean day
// in twenty.
const (
	flagP    = 0.05
	suspectP = 0.01
	flagOff  = 0.5
)

// judge sets the agreement's Flag (p < flagP or P(off) > flagOff) and
// Suspect (p < suspectP or P(off) > flagOff).
func (ag *Agreement) judge() {
	ag.Flag = ag.PValue < flagP || ag.POff > flagOff
	ag.Suspect = ag.PValue < suspectP || ag.POff > flagOff
}

// Warning is the result's warning for a suspect entry, naming the quantity
// where it disagrees most.
func (ag *Agreement) Warning(entry string) string {
	msg := fmt.Sprintf("entry %q disagrees with the others (distance %.2f, p = %.3g, P(off) = %.2f)", entry, ag.Distance, ag.PValue, ag.POff)
	if w := ag.Worst; w != nil {
		msg += fmt.Sprintf(": most on %s %s, by %+.3f m² (%.1f sd)", w.Config, w.Axle, w.DiffM2, w.Sigmas)
	}
	return msg
}

// agreement compares entry ev with every other entry by the leave-one-out
// predictive of its data (see predictive.go): d² = tᵀV⁻¹t, p = P(χ²_r > d²)
// with r the rank of V, the errors the entry shares with the others
// counted once. Worst is the quantity with the largest |t_i|/√V_ii: t_i is
// in m² what the entry's data say minus what the others predict they would
// say. For an entry of sign evidence only, it is the posterior predictive
// p-value of the observed senses under the others' posterior, with
// T = −Σ log P(sense | θ).
func agreement(full *model, ei int, ev evidence.Evidence, others *Posterior) (*Agreement, *looStat) {
	if len(ev.Blocks) == 0 && len(ev.Signs) > 0 {
		return signAgreement(full, ei, others), nil
	}
	if len(ev.Informs) == 0 {
		return &Agreement{PValue: 1, Note: "informs no quantity"}, nil
	}
	st, ok := looPredictive(full, ei, others)
	if !ok {
		return &Agreement{PValue: 1, Note: "the leave-one-out prediction of its data is singular"}, nil
	}
	ag := &Agreement{}
	worst := -1.0
	for i, q := range st.names {
		sd := math.Sqrt(st.V.At(i, i))
		if sd == 0 || !st.lift[i] {
			continue
		}
		if s := math.Abs(st.t[i]) / sd; s > worst {
			worst = s
			ag.Worst = &Disagreement{Config: q.Config, Axle: q.Axle, DiffM2: st.t[i], Sigmas: st.t[i] / sd}
		}
	}
	Vp, rank := st.metric()
	if rank == 0 {
		ag.PValue, ag.Note = 1, "the leave-one-out prediction of its data is singular"
		return ag, nil
	}
	d2 := quadForm(Vp, st.t)
	st.Vp, st.d2 = Vp, d2
	ag.Distance = math.Sqrt(d2)
	ag.PValue = st.referenceP(full, ei, others, rank)
	return ag, st
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

// Suspects lists the entries a reader should look at, most suspect first:
// those a model check names (a check is a verdict on the data themselves),
// by the smallest p-value of their checks (a rule's 0 first), then those
// the agreement test names as suspects (Agreement.Suspect), by P(off) and
// then by p-value. Entries neither are not listed.
func (r *Result) Suspects() []string {
	type suspect struct {
		id      string
		checked bool
		p, pOff float64
	}
	byID := map[string]*suspect{}
	var list []*suspect
	add := func(id string) *suspect {
		if s, ok := byID[id]; ok {
			return s
		}
		s := &suspect{id: id, p: 1}
		byID[id] = s
		list = append(list, s)
		return s
	}
	for _, c := range r.Checks {
		s := add(c.Entry)
		if !s.checked || c.PValue < s.p {
			s.p = c.PValue
		}
		s.checked = true
	}
	for _, m := range r.Methods {
		if ag := m.Agreement; ag != nil && ag.Suspect {
			if s := add(m.ID); !s.checked {
				s.p, s.pOff = ag.PValue, ag.POff
			}
		}
	}
	sort.SliceStable(list, func(i, j int) bool {
		a, b := list[i], list[j]
		switch {
		case a.checked != b.checked:
			return a.checked
		case !a.checked && a.pOff != b.pOff:
			return a.pOff > b.pOff
		}
		return a.p < b.p // stable: ties keep the order they were added in
	})
	out := make([]string, len(list))
	for i, s := range list {
		out[i] = s.id
	}
	return out
}
