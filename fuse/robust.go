package fuse

import (
	"fmt"
	"math"
	"sort"
	"strings"

	"liftfuse/methods/evidence"
)

// Robust layer: each entry's errors may be inflated by κ with prior
// probability offPrior (model.md, "Agreement").
const (
	kappa    = 5.0
	offPrior = 0.05
)

// robustOthers refits the others' posterior of each entry robustly where
// some other entry looks off (P(off) > flagOff): such an entry would drag
// the others' posterior along and make the good entries disagree with it,
// so the others are fused with that entry's random errors and own
// systematic priors inflated by κ. An entry that looks off itself is
// checked against the plain fusion of the others: two entries in conflict
// (two pots on one axle, one with a wrong gain, and nothing else as
// precise) both look off, and each must then meet the other at full
// weight, not a prediction from which its rival was removed.
func (lo *looFits) robustOthers(evs []evidence.Evidence) error {
	if len(evs) == 1 {
		return nil
	}
	for ei, ev := range evs {
		off := lo.offAmongOthers(ei)
		if len(off) == 0 {
			continue
		}
		om, err := lo.othersModel(evs, ei)
		if err != nil {
			return err
		}
		if lo.others[ei], err = om.variant(off, true, true).fit(); err != nil {
			return fmt.Errorf("every entry but %q, robustly: %w", ev.Entry, err)
		}
	}
	return nil
}

// offAmongOthers returns the entries that look off (P(off) > flagOff), by
// their index in the model of every entry but ei; none when ei looks off
// itself.
func (lo *looFits) offAmongOthers(ei int) map[int]bool {
	off := map[int]bool{}
	if lo.pOff[ei] > flagOff {
		return off
	}
	k := 0
	for j := range lo.pOff {
		if j == ei {
			continue
		}
		if lo.pOff[j] > flagOff {
			off[k] = true
		}
		k++
	}
	return off
}

// pOff is the posterior probability that entry e's errors are inflated by
// κ. "Off" is either of two alternatives, equally likely: its random errors
// are κ times larger, or the priors of its own systematic errors (stiffness,
// gain, tyre growth, offsets, …) are κ times wider. From Laplace estimates
// of the evidence of each,
//
//	P(off) = π·Z_off / (π·Z_off + (1 − π)·Z),  Z_off = ½(Z_noise + Z_sys),  π = 0.05
func (m *model) pOff(e int, logZ float64) float64 {
	return logistic(m.logOddsOff(e, logZ))
}

// logOddsOff is log(π·Z_off / ((1 − π)·Z)), the log posterior odds that
// entry e is off (see pOff); −Inf when neither alternative can be fitted.
func (m *model) logOddsOff(e int, logZ float64) float64 {
	var logZs []float64
	for _, sys := range []bool{false, true} {
		alt := m.variant(map[int]bool{e: true}, !sys, sys)
		_, _, lz, err := alt.laplace()
		if err != nil || math.IsNaN(lz) {
			continue
		}
		logZs = append(logZs, lz)
	}
	if len(logZs) == 0 {
		return math.Inf(-1)
	}
	// log Z_off = log ½ Σ Z_k, computed stably.
	mx := math.Inf(-1)
	for _, l := range logZs {
		mx = math.Max(mx, l)
	}
	var s float64
	for _, l := range logZs {
		s += math.Exp(l - mx)
	}
	logZoff := mx + math.Log(s/2)
	return math.Log(offPrior/(1-offPrior)) + logZoff - logZ
}

func logistic(x float64) float64 { return 1 / (1 + math.Exp(-x)) }

// tieOdds is the factor of evidence below which two entries that both look
// off cannot be told apart: the data favour one over the other by less
// than 3 : 1 ("barely worth mentioning" on Jeffreys's scale — Kass &
// Raftery 1995, from memory).
const tieOdds = 3.0

// refinePOff makes P(off) a sequential diagnosis when some entry looks off.
// P(off) of one entry, computed with every other entry at full weight,
// also runs high for a correct entry whose rival is faulty: with a pot
// reading 12 % high, a correct pot on the same axle disagrees with the
// fused figure the faulty one drags along. So: the entry most likely off
// is taken to be off (its errors widened ×κ, both alternatives at once),
// together with any entry the data cannot tell from it (odds within
// tieOdds), and P(off) of every other entry is computed again given that;
// repeated until no remaining entry looks off. Entries taken to be off
// keep the P(off) with which they were taken.
func (lo *looFits) refinePOff(logZ float64) error {
	full := lo.full
	worst := 0.0
	for _, p := range lo.pOff {
		worst = math.Max(worst, p)
	}
	if worst <= flagOff || len(lo.pOff) < 3 {
		return nil
	}
	off := map[int]bool{}
	for len(off) < len(lo.pOff) {
		base := full
		if len(off) > 0 {
			base = full.variant(off, true, true)
			_, _, lz, err := base.laplace()
			if err != nil {
				return fmt.Errorf("P(off) with %d entries down-weighted: %w", len(off), err)
			}
			logZ = lz
		}
		odds := map[int]float64{}
		top := -1
		for e := range lo.pOff {
			if off[e] {
				continue
			}
			odds[e] = base.logOddsOff(e, logZ)
			if top < 0 || odds[e] > odds[top] {
				top = e
			}
		}
		for e, o := range odds {
			lo.pOff[e] = logistic(o)
		}
		if top < 0 || odds[top] <= 0 {
			return nil
		}
		for e, o := range odds {
			if o > 0 && o >= odds[top]-math.Log(tieOdds) {
				off[e] = true
			}
		}
	}
	return nil
}

// variant returns a copy of the model (sharing its data) with the entries
// in off inflated by κ: their random errors when noise is set, their own
// systematic priors when sys is set.
func (m *model) variant(off map[int]bool, noise, sys bool) *model {
	alt := &model{data: m.data, start: m.start}
	alt.inflate = append([]float64(nil), m.inflate...)
	alt.inflateSys = append([]float64(nil), m.inflateSys...)
	for e := range off {
		if noise {
			alt.inflate[e] = kappa
		}
		if sys {
			alt.inflateSys[e] = kappa
		}
	}
	return alt
}

// robustHeadline makes the robust fusion the headline when some entry looks
// off (P(off) > flagOff) or the model checks condemn some data: the joint
// posterior is refitted with the condemned data distrusted (see
// distrusted; the agreement figures are then recomputed against the others'
// data that passed their checks) and the errors of the entries that look
// off widened by κ (the "off" alternatives of pOff, both at once); its
// configurations and deltas become the result's, the plain fusion's move
// to Result.Plain, and Fused.Posterior becomes the robust one, so that plan
// and crosscheck use it too.
func robustHeadline(out *Fused, full *model, in Input, set Settings, lo *looFits) error {
	ck, err := distrusted(full, in, lo)
	if err != nil {
		return err
	}
	base, pOff := full, lo.pOff
	var cd condemned
	if ck != nil {
		ck.agreements(out, full, in.Evidence)
		base, pOff, cd = ck.lo.full, ck.lo.pOff, ck.cd
	}
	res := out.Result
	off := map[int]bool{}
	var widened []string
	for e, id := range full.entries {
		switch {
		case cd.all(id):
		case pOff[e] > flagOff:
			off[e] = true
			widened = append(widened, id)
		case len(cd[id]) == 0:
			continue
		}
		res.DownWeighted = append(res.DownWeighted, id)
	}
	if len(res.DownWeighted) == 0 || len(full.entries) < 2 {
		res.DownWeighted = []string{}
		return nil
	}
	R, err := base.variant(off, true, true).fit()
	if err != nil {
		return fmt.Errorf("the robust fusion (down-weighting %s): %w", joinMax(res.DownWeighted, 4), err)
	}
	res.Plain = &PlainFusion{Configs: res.Configs, Deltas: res.Deltas}
	scratch := &Result{}
	configResults(scratch, R, in, set)
	deltaResults(scratch, R, in.Reference, set.Configs)
	res.Configs, res.Deltas = scratch.Configs, scratch.Deltas
	res.Headline = HeadlineRobust
	out.Posterior = R
	res.Warnings = append(res.Warnings, robustLead+robustWhy(full.entries, cd, widened)+"; the plain fusion is shown beside them")
	return nil
}

// robustLead begins the warning of a robust headline.
const robustLead = "the headline figures are the robust fusion's: "

// IsRobustWarning reports whether w is the result's warning that the
// headline figures are the robust fusion's (which a report may say in its
// own words).
func IsRobustWarning(w string) bool { return strings.HasPrefix(w, robustLead) }

// robustWhy says what the robust fusion changed.
func robustWhy(entries []string, cd condemned, widened []string) string {
	var left []string
	for _, id := range entries {
		cs := cd[id]
		switch {
		case cs[""]:
			left = append(left, fmt.Sprintf("all of %q", id))
		case len(cs) > 0:
			var cfgs []string
			for c := range cs {
				cfgs = append(cfgs, c)
			}
			sort.Strings(cfgs)
			left = append(left, fmt.Sprintf("%q in %s", id, strings.Join(cfgs, ", ")))
		}
	}
	var parts []string
	if len(left) > 0 {
		parts = append(parts, "the data that failed their model checks are left out ("+strings.Join(left, "; ")+")")
	}
	if len(widened) > 0 {
		verb := "it looks"
		if len(widened) > 1 {
			verb = "they look"
		}
		parts = append(parts, fmt.Sprintf("the errors of %s are widened ×%g because %s off", quoteJoin(widened), kappa, verb))
	}
	return strings.Join(parts, "; ")
}

// agreements recomputes each entry's agreement against the others' fusion
// with the condemned data distrusted (ck.lo.others), its P(off) in that
// fusion, and the warnings of suspect entries in place of the plain
// fusion's.
func (ck *checked) agreements(out *Fused, full *model, evs []evidence.Evidence) {
	res := out.Result
	ags, sts := make([]*Agreement, len(evs)), make([]*looStat, len(evs))
	parallel(len(evs), func(ei int) { // each entry's replicates have their own seed
		ags[ei], sts[ei] = agreement(full, ei, evs[ei], ck.lo.others[ei])
	})
	for ei, ev := range evs {
		mr := &res.Methods[ei]
		old := mr.Agreement
		ag, st := ags[ei], sts[ei]
		ag.POff = ck.lo.pOff[ei]
		ag.judge()
		mr.Agreement = ag
		out.Others[ev.Entry], out.loo[ev.Entry] = ck.lo.others[ei], st
		res.Warnings = replaceWarning(res.Warnings, old, ag, ev.Entry)
	}
}

// replaceWarning puts the warning of agreement ag (none when not a suspect)
// where old's stood, or at the end.
func replaceWarning(ws []string, old, ag *Agreement, entry string) []string {
	at := -1
	if old != nil && old.Suspect {
		w := old.Warning(entry)
		for i := range ws {
			if ws[i] == w {
				at = i
				break
			}
		}
	}
	switch {
	case at >= 0 && ag.Suspect:
		ws[at] = ag.Warning(entry)
	case at >= 0:
		ws = append(ws[:at], ws[at+1:]...)
	case ag.Suspect:
		ws = append(ws, ag.Warning(entry))
	}
	return ws
}

// quoteJoin lists ids in quotes: "a", "b" and "c".
func quoteJoin(ids []string) string {
	q := make([]string, len(ids))
	for i, id := range ids {
		q[i] = fmt.Sprintf("%q", id)
	}
	switch len(q) {
	case 0:
		return ""
	case 1:
		return q[0]
	}
	return strings.Join(q[:len(q)-1], ", ") + " and " + q[len(q)-1]
}
