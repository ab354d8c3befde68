package fuse

import (
	"fmt"
	"math"
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
		return 0
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
	return 1 / (1 + (1-offPrior)/offPrior*math.Exp(logZ-logZoff))
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
// off (P(off) > flagOff): the joint posterior is refitted with those
// entries' random errors and own systematic priors widened by κ (the "off"
// alternatives of pOff, both at once), its configurations and deltas become
// the result's, the plain fusion's move to Result.Plain, and Fused.Posterior
// becomes the robust one, so that plan and crosscheck use it too.
func robustHeadline(out *Fused, full *model, in Input, set Settings, lo *looFits) error {
	res := out.Result
	off := map[int]bool{}
	for e, p := range lo.pOff {
		if p > flagOff {
			off[e] = true
			res.DownWeighted = append(res.DownWeighted, full.entries[e])
		}
	}
	if len(off) == 0 || len(full.entries) < 2 {
		return nil
	}
	R, err := full.variant(off, true, true).fit()
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
	res.Warnings = append(res.Warnings, fmt.Sprintf("the headline figures are the robust fusion's: the errors of %s are widened ×%g because it looks off; the plain fusion is shown beside them",
		quoteJoin(res.DownWeighted), kappa))
	return nil
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
