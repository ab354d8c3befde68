package report

import (
	"fmt"
	"math"
	"slices"
	"strings"

	"liftfuse/fuse"
)

// Which fusion the headline figures are, and the model checks that
// tripped, as page 1, Agreement and the terminal say them. The result
// document carries them (result-format.md: headline, down_weighted, plain,
// checks); headlineOf and checksOf are the only places that read those
// fields, so that the rest of the package works on the types below.

// headline says which fusion the result's configurations and deltas are.
type headline struct {
	// known is false while the result document does not say (before the
	// fields exist, or from an older document): the text then says
	// nothing of it.
	known bool
	// robust: some entry looked off and its errors were widened; the
	// headline figures are the robust fusion's.
	robust bool
	// downWeighted names the entries whose errors were widened.
	downWeighted []string
	// plainDeltas are the plain fusion's changes (every entry at its
	// stated errors), when the headline is robust.
	plainDeltas []fuse.DeltaResult
}

// modelCheck is one tripped model check of an entry, as page 1 words it.
type modelCheck struct{ fuse.Check }

// headlineOf reads which fusion the headline figures are (result
// document: headline, down_weighted, plain). A document without a
// headline (format 1 before these fields) is not known.
func headlineOf(res *fuse.Result) headline {
	h := headline{known: res.Headline != "", robust: res.Headline == fuse.HeadlineRobust, downWeighted: res.DownWeighted}
	if res.Plain != nil {
		h.plainDeltas = res.Plain.Deltas
	}
	return h
}

// checksOf reads the model checks that tripped (result document: checks).
func checksOf(res *fuse.Result) []modelCheck {
	var out []modelCheck
	for _, c := range res.Checks {
		out = append(out, modelCheck{c})
	}
	return out
}

// checkName is a check's name in words: "height-not-linear" reads
// "height not linear".
func checkName(c string) string { return strings.ReplaceAll(c, "-", " ") }

// sentence is a model check as one sentence of page 1: where, what, how
// sure, the likely cause and what to do.
func (c modelCheck) sentence() string {
	return c.Text(checkName(c.Check.Check), "; likely ") + "."
}

// flaggedEffect is what page 1 says a flagged entry does to the headline
// figures: down-weighted by the robust fusion, kept at its stated errors
// by the plain one, or (unknown) the wording of format 1.
func (h headline) flaggedEffect(id string) string {
	switch {
	case !h.known:
		return "the fused figures down-weight it, see Agreement."
	case h.robust && slices.Contains(h.downWeighted, id):
		return "the headline figures are from the robust fusion, which widens its errors; see Agreement."
	}
	return "the headline figures keep it at its stated errors; see Agreement."
}

// robustNote is page 1's account of a robust headline: which entries
// were down-weighted, and for each change (up to maxProseChanges) the
// axle the down-weighting moved most, robust against plain, in C_L·A.
// Empty for a plain or unknown headline.
func (h headline) robustNote(deltas []fuse.DeltaResult) string {
	if !h.known || !h.robust {
		return ""
	}
	s := fmt.Sprintf("The headline figures are from the robust fusion: the errors of %s were widened because %s the others.",
		List(h.downWeighted), map[bool]string{true: "it disagreed with", false: "they disagreed with"}[len(h.downWeighted) == 1])
	var moved []string
	for i, d := range deltas {
		if i == maxProseChanges {
			break
		}
		p, ok := plainDelta(h.plainDeltas, d)
		if !ok {
			continue
		}
		ax, rob, pl := mostMoved(d, p)
		moved = append(moved, fmt.Sprintf("%s's %s change against %s would be %s m² of %s instead of %s", d.Config, ax, d.Versus, claText(pl), symCLA, claText(rob)))
	}
	if len(moved) > 0 {
		s += " With every entry at its stated errors (the plain fusion), " + join(moved, "; and ") + "."
	}
	return s
}

// plainDelta finds the plain fusion's change of the same configurations.
func plainDelta(ds []fuse.DeltaResult, d fuse.DeltaResult) (fuse.DeltaResult, bool) {
	for _, p := range ds {
		if p.Config == d.Config && p.Versus == d.Versus {
			return p, true
		}
	}
	return fuse.DeltaResult{}, false
}

// mostMoved is the axle whose C_L·A change the down-weighting moved most,
// in standard deviations of the robust estimate, with both estimates.
func mostMoved(rob, pl fuse.DeltaResult) (string, fuse.Estimate, fuse.Estimate) {
	best, by := 0, -1.0
	r := [3]fuse.Estimate{rob.Front.CLA, rob.Rear.CLA, rob.Total.CLA}
	p := [3]fuse.Estimate{pl.Front.CLA, pl.Rear.CLA, pl.Total.CLA}
	for i := range r {
		d := math.Abs(r[i].Mean - p[i].Mean)
		if r[i].SD > 0 {
			d /= r[i].SD
		}
		if d > by {
			best, by = i, d
		}
	}
	return axles[best], r[best], p[best]
}

// claText is a C_L·A estimate in words: "−0.147 (−0.152 to −0.142)".
func claText(e fuse.Estimate) string {
	return fmt.Sprintf("%+.3f (%+.3f to %+.3f)", e.Mean, e.Lo, e.Hi)
}
