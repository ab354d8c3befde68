package fuse

import (
	"fmt"
	"math"
	"slices"

	"liftfuse/methods/evidence"
)

// looFits are the leave-one-out fits behind the agreement figures: for
// every entry e, its standalone posterior p(θ | y_e), the posterior of every
// other entry p(θ | y_−e), and P(off) of e under the joint model.
type looFits struct {
	alone, others []*Posterior
	pOff          []float64
	// ag and st are each entry's agreement and statistic, computed with
	// its others' posterior agOf as soon as that was fitted (see
	// fitOthers)
	ag   []*Agreement
	st   []*looStat
	agOf []*Posterior

	full *model
	// setAlone and setOthers are the settings of the standalone and the
	// others' fits; start is the joint posterior's mode of φ, where every
	// fit begins, with the curvature there.
	setAlone, setOthers Settings
	start               *warmStart
}

// leaveOneOut fits each entry alone and every entry but it: 2M independent
// fits, run two at a time (each is seeded on its own, so the order does not
// matter). Every fit starts its Laplace search at the joint posterior's
// mode of φ. The others' posteriors feed only the agreement distance (a
// mean and a covariance) and its replicates, never a reported interval: a
// third of the draws suffice (MinESS/3, at least 400 — the bulk ESS
// Vehtari et al. 2021 ask of any summary). The standalone posteriors are reported, as
// "what each method says" beside the fused figures: they draw for a bulk
// ESS of MinESS/2 but at least 1000, the floor every reported figure is
// held to (issue 15), so that the five to ten fits behind the fused one
// do not cost five to ten times its draws.
func leaveOneOut(full *model, P *Posterior, evs []evidence.Evidence) (*looFits, error) {
	M := len(evs)
	set := full.set
	lo := &looFits{alone: make([]*Posterior, M), others: make([]*Posterior, M), pOff: make([]float64, M),
		ag: make([]*Agreement, M), st: make([]*looStat, M), agOf: make([]*Posterior, M), full: full, setAlone: set, setOthers: set, start: newWarmStart(full, P.p)}
	// Their differences between configurations are not reported: their
	// diagnostics need not track them.
	lo.setAlone.reference, lo.setOthers.reference = "", ""
	lo.setOthers.MinESS = math.Max(400, set.MinESS/3)
	lo.setAlone.MinESS = math.Max(math.Min(1000, set.MinESS), set.MinESS/2)
	full.start = lo.start
	// The others' fits first: each is about the joint fit's size and
	// carries its entry's agreement, so the two workers do not end on one
	// long job while the other waits (errs keeps the entries' order).
	errs := make([]error, 2*M)
	parallel(2*M, func(j int) {
		switch ei := j % M; {
		case j >= M:
			lo.alone[ei], errs[2*ei] = lo.fitAlone(ei, evs[ei])
		case M > 1:
			if lo.others[ei], errs[2*ei+1] = lo.fitOthers(evs, ei); errs[2*ei+1] == nil {
				lo.pOff[ei] = full.pOff(ei, P.p.logZ)
			}
		}
	})
	for _, err := range errs {
		if err != nil {
			return nil, err
		}
	}
	return lo, nil
}

// fitAlone fits one entry on its own, p(θ | y_e), and compacts it (see
// Posterior.compact): should its nuisances' draws be wanted later, the
// same seeded fit is made again.
func (lo *looFits) fitAlone(ei int, ev evidence.Evidence) (*Posterior, error) {
	P, err := lo.fitAloneWhole(ei, ev)
	if err == nil {
		P.compact(func() (*Posterior, error) { return lo.fitAloneWhole(ei, ev) }, nil)
	}
	return P, err
}

// fitAloneWhole is fitAlone without the compaction.
func (lo *looFits) fitAloneWhole(ei int, ev evidence.Evidence) (*Posterior, error) {
	set := lo.setAlone
	set.track = lo.entryQuantities(ei, ev)
	am, err := newModel([]evidence.Evidence{ev}, set)
	if err != nil {
		return nil, fmt.Errorf("entry %q alone: %w", ev.Entry, err)
	}
	am.start = lo.start
	P, err := am.fit()
	if err != nil {
		return nil, fmt.Errorf("entry %q alone: %w", ev.Entry, err)
	}
	return P, nil
}

// entryQuantities are the quantities a fit made for entry ei tracks (see
// Settings.track): those it informs — its standalone figures — and the
// lift of every axle its data read, among which its agreement names the
// worst disagreement that the planner and the cross-check then read from
// the standalone and the others' posteriors (a laser between the axles
// reads both axles' lift but informs its own).
func (lo *looFits) entryQuantities(ei int, ev evidence.Evidence) []evidence.Quantity {
	out := append([]evidence.Quantity{}, ev.Informs...)
	for _, c := range lo.full.entryCols(ei) {
		if lp := lo.full.lin[c]; lp.kind == kindBeta {
			out = append(out, evidence.Quantity{Config: lp.config, Axle: lp.axle})
		}
	}
	return out
}

// othersModel is the model of every entry but entry ei.
func (lo *looFits) othersModel(evs []evidence.Evidence, ei int) (*model, error) {
	rest := append(append([]evidence.Evidence(nil), evs[:ei]...), evs[ei+1:]...)
	set := lo.setOthers
	set.track = lo.entryQuantities(ei, evs[ei])
	om, err := newModel(rest, set)
	if err != nil {
		return nil, err
	}
	om.start = lo.start
	return om, nil
}

// fitOthers fits every entry but entry ei, p(θ | y_−e), computes entry
// ei's agreement with it (kept for agreement, below) and compacts it, the
// nuisances' draws, which the agreement's replicates read, no longer
// needed (see Posterior.compact).
func (lo *looFits) fitOthers(evs []evidence.Evidence, ei int) (*Posterior, error) {
	fit := func() (*Posterior, error) {
		om, err := lo.othersModel(evs, ei)
		if err != nil {
			return nil, err
		}
		return om.fit()
	}
	P, err := fit()
	if err != nil {
		return nil, fmt.Errorf("every entry but %q: %w", evs[ei].Entry, err)
	}
	lo.ag[ei], lo.st[ei] = agreement(lo.full, ei, evs[ei], P)
	lo.agOf[ei] = P
	if lo.ag[ei].PValue < suspectP {
		// The planner reads a suspect's others' joint moments (repeatVar):
		// taken now, from the draws at hand, they outlive the compaction,
		// instead of a refit of the others' posterior later.
		P.joint()
	}
	P.compact(fit, nil)
	return P, nil
}

// agreement returns entry ei's agreement with its others' posterior: the
// one fitOthers computed, while that posterior is still the one in use
// (robustOthers may have refitted it since), else computed now.
func (lo *looFits) agreement(ei int, ev evidence.Evidence) (*Agreement, *looStat) {
	if O := lo.others[ei]; O != nil && O == lo.agOf[ei] {
		return lo.ag[ei], lo.st[ei]
	}
	return agreement(lo.full, ei, ev, lo.others[ei])
}

// compactRefitted compacts the others' posteriors that robustOthers fitted
// anew, refitting them the same way should they be needed whole.
func (lo *looFits) compactRefitted(evs []evidence.Evidence) {
	for ei, O := range lo.others {
		if O == nil || O.compacted {
			continue
		}
		compactOthers(O, lo.full, ei, evs[ei], func() (*Posterior, error) {
			om, err := lo.othersModel(evs, ei)
			if err != nil {
				return nil, err
			}
			if off := lo.offAmongOthers(ei); len(off) > 0 {
				om = om.variant(off, true, true)
			}
			return om.fit()
		})
	}
}

// compactOthers — for the others' posteriors the robust step refitted
// (fitOthers compacts the first fits to β, γ and φ) — computes the joint
// moments where the entry's agreement needs them (Gaussian data) and
// compacts the posterior, keeping
// the draws of the nuisances entry ei's data share with the others: its
// agreement's replicates read them (reference.go), which would otherwise
// cost the others' fit made again.
func compactOthers(P *Posterior, full *model, ei int, ev evidence.Evidence, refit func() (*Posterior, error)) {
	var extra []int
	if len(ev.Blocks) > 0 {
		P.joint()
		extra = sharedCols(full, ei, P.p.m)
	}
	P.compact(refit, extra)
}

// sharedCols returns the columns of θ in model om (ascending) that the
// rows of entry e of the full model read.
func sharedCols(full *model, e int, om *model) []int {
	src := sharedIndex(full, om)
	out := []int{} // none is not nil, which asks for every column
	for _, c := range full.entryCols(e) {
		if j := src[c]; j >= 0 && j < len(om.lin) {
			out = append(out, j)
		}
	}
	slices.Sort(out)
	return slices.Compact(out)
}

// entryCols returns the columns of θ the rows of entry e read, each once.
func (m *model) entryCols(e int) []int {
	seen := map[int]bool{}
	var out []int
	for bi := range m.blocks {
		bl := &m.blocks[bi]
		if bl.entry != e {
			continue
		}
		for _, ri := range bl.rows {
			r := &m.rows[ri]
			for _, ts := range [][]entryRef{r.lift, r.gamma, r.nuis, r.nuisPerQ} {
				for _, t := range ts {
					if !seen[t.col] {
						seen[t.col] = true
						out = append(out, t.col)
					}
				}
			}
		}
	}
	slices.Sort(out)
	return out
}
