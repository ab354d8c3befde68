package fuse

import (
	"errors"
	"fmt"

	"gonum.org/v1/gonum/mat"

	"liftfuse/methods/evidence"
)

// Model checks that condemn data (model.md, "Model checks"): the ids of
// the checks whose finding makes every datum of the entry wrong (a unit or
// sign slip), and of those that make the entry's data of one configuration
// wrong (a bump stop met, a tap blocked or leaking). A window beyond 4 sd
// condemns one window only and is left to P(off).
var (
	entryChecks = map[string]bool{evidence.IDSpeedUnits: true, evidence.IDMirror: true, evidence.IDCLATooLarge: true,
		evidence.IDGainNegative: true}
	configChecks = map[string]bool{evidence.IDHeightNotLinear: true, evidence.IDTapBlocked: true, evidence.IDTapCpHigh: true,
		evidence.IDTapSpeed: true}
)

// distrustSD is the factor by which the error sd of condemned data is
// widened: their information falls by 10⁶, so they no longer move the
// posterior, while every entry keeps its place in the model (plan lists
// every entry).
const distrustSD = 1e3

// condemned is the data the model checks condemn: entry → the
// configurations condemned, "" meaning every one.
type condemned map[string]map[string]bool

// condemnedBy collects the data the checks condemn.
func condemnedBy(cs []Check) condemned {
	out := condemned{}
	for _, c := range cs {
		cfg := c.Config
		switch {
		case entryChecks[c.Check]:
			cfg = ""
		case !configChecks[c.Check]:
			continue
		}
		if out[c.Entry] == nil {
			out[c.Entry] = map[string]bool{}
		}
		out[c.Entry][cfg] = true
	}
	return out
}

// all reports whether every datum of an entry is condemned.
func (cd condemned) all(entry string) bool { return cd[entry][""] }

// obs reports whether an observation of an entry is condemned: its entry
// entirely, or a configuration of one of its terms.
func (cd condemned) obs(entry string, o evidence.Obs) bool {
	cs := cd[entry]
	if cs[""] {
		return true
	}
	for _, t := range o.Terms {
		if cs[t.Config] {
			return true
		}
	}
	return false
}

// distrust returns the evidence with the condemned observations' errors
// widened by distrustSD (a full covariance as D·Σ·D with D = diag(1 or
// distrustSD)); the rest is shared with evs.
func (cd condemned) distrust(evs []evidence.Evidence) []evidence.Evidence {
	out := append([]evidence.Evidence(nil), evs...)
	for i, ev := range evs {
		if len(cd[ev.Entry]) == 0 {
			continue
		}
		out[i].Blocks = make([]evidence.Block, len(ev.Blocks))
		for b, bl := range ev.Blocks {
			d := make([]float64, len(bl.Obs))
			for k, o := range bl.Obs {
				d[k] = 1
				if cd.obs(ev.Entry, o) {
					d[k] = distrustSD
				}
			}
			nb := evidence.Block{Obs: bl.Obs}
			if bl.Cov == nil {
				nb.Var = make([]float64, len(bl.Var))
				for k, v := range bl.Var {
					nb.Var[k] = v * d[k] * d[k]
				}
			} else {
				n := len(bl.Obs)
				nb.Cov = mat.NewSymDense(n, nil)
				for r := range n {
					for c := r; c < n; c++ {
						nb.Cov.SetSym(r, c, bl.Cov.At(r, c)*d[r]*d[c])
					}
				}
			}
			out[i].Blocks[b] = nb
		}
	}
	return out
}

// checked is the fusion with the condemned data distrusted: its model, its
// leave-one-out fits and each entry's P(off) in it.
type checked struct {
	cd  condemned
	evs []evidence.Evidence
	lo  *looFits
}

// distrusted refits what the agreement figures and the headline rest on
// with the data the model checks condemn distrusted (nil when they condemn
// none): P(off) of every entry not condemned entirely (refined as in
// refinePOff), and for each entry the others' fusion without the condemned
// data, robust where another entry looks off. A check is a verdict on the
// data themselves, which P(off) can only infer: a unit slip that puts three
// ride-height entries off by ×13 makes the one correct entry look off by
// P(off), and a blocked tap drags the others' prediction of a correct pot
// far beyond what widening the taps' errors ×κ absorbs.
func distrusted(full *model, in Input, lo *looFits) (*checked, error) {
	cd := condemnedBy(in.Checks)
	if len(cd) == 0 || len(in.Evidence) < 2 {
		return nil, nil
	}
	evs := cd.distrust(in.Evidence)
	dm, err := newModel(evs, full.set)
	if err != nil {
		return nil, err
	}
	dm.start = lo.start
	ck := &checked{cd: cd, evs: evs, lo: &looFits{full: dm, setOthers: lo.setOthers, start: lo.start,
		alone: lo.alone, others: make([]*Posterior, len(evs)), pOff: make([]float64, len(evs))}}
	_, _, logZ, err := dm.laplace()
	if err != nil {
		return nil, fmt.Errorf("the fusion without the data the model checks condemn: %w", err)
	}
	for e, ev := range evs {
		ck.lo.pOff[e] = lo.pOff[e]
		if !cd.all(ev.Entry) {
			ck.lo.pOff[e] = dm.pOff(e, logZ)
		}
	}
	if err := ck.refine(logZ); err != nil {
		return nil, err
	}
	return ck, ck.fitOthers()
}

// refine is refinePOff over the entries not condemned entirely; those keep
// the P(off) of the plain fusion.
func (ck *checked) refine(logZ float64) error {
	keep := map[int]float64{}
	for e, ev := range ck.evs {
		if ck.cd.all(ev.Entry) {
			keep[e] = ck.lo.pOff[e]
			ck.lo.pOff[e] = 0
		}
	}
	err := ck.lo.refinePOff(logZ)
	for e, p := range keep {
		ck.lo.pOff[e] = p
	}
	return err
}

// fitOthers fits, for each entry, every other entry with the condemned data
// distrusted and, where another entry (not condemned entirely) looks off,
// its errors widened ×κ — unless the entry looks off itself (see
// robustOthers). Two at a time, as leaveOneOut.
func (ck *checked) fitOthers() error {
	errs := make([]error, len(ck.evs))
	parallel(len(ck.evs), func(e int) {
		om, err := ck.lo.othersModel(ck.evs, e)
		if err == nil {
			ck.lo.others[e], err = om.variant(ck.offAmongOthers(e), true, true).fit()
		}
		if err != nil {
			errs[e] = fmt.Errorf("every entry but %q, without the data the model checks condemn: %w", ck.evs[e].Entry, err)
		}
	})
	return errors.Join(errs...)
}

// offAmongOthers is looFits.offAmongOthers without the entries condemned
// entirely (already distrusted).
func (ck *checked) offAmongOthers(ei int) map[int]bool {
	off := ck.lo.offAmongOthers(ei)
	k := 0
	for j, ev := range ck.evs {
		if j == ei {
			continue
		}
		if ck.cd.all(ev.Entry) {
			delete(off, k)
		}
		k++
	}
	return off
}
