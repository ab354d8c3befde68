package checks

import (
	"sort"

	"liftfuse/methods"
	"liftfuse/methods/campaign"
	"liftfuse/methods/evidence"
	"liftfuse/methods/height"
	"liftfuse/methods/pressure"
)

// Check is one tripped model check (evidence.ModelCheck, the type the
// fusion and the result document take).
type Check = evidence.ModelCheck

// Per-entry false-alarm budget of each test (see doc.go): the sum over one
// entry's tests is at most 1 %.
const (
	alphaNotLinear = 0.002
	alphaResidual  = 0.002
	alphaTapSpeed  = 0.003
	alphaCpHigh    = 0.002
	alphaBlocked   = 0.001
	alphaMirror    = 0.002
	alphaCLA       = 0.002
)

// Run returns every tripped model check of a reduced campaign, entry by
// entry in the order of r.Entries, then the cross-entry checks.
func Run(c *campaign.Campaign, r *methods.Reduced) []Check {
	if c == nil || r == nil {
		return nil
	}
	var out []Check
	var est []estimate
	var runs []heightRun
	for _, e := range r.Entries {
		switch d := e.Detail.(type) {
		case *height.Result:
			data := newEntryData(c, d)
			fits := heightFits(c, d, data)
			runs = append(runs, heightRun{d, fits})
			out = append(out, notLinear(c, d, fits)...)
			out = append(out, residuals(c, d, data, fits)...)
			out = append(out, negativeGain(d)...)
			est = append(est, heightEstimates(c, d, fits)...)
		case *pressure.Result:
			out = append(out, tapChecks(c, d)...)
			est = append(est, pressureEstimates(c, d)...)
		}
	}
	out = append(out, confirmNotLinear(c, runs, out)...)
	out = append(out, speedUnits(c, r)...)
	out = append(out, claTooLarge(est)...)
	out = append(out, mirrored(est)...)
	out = confirmGain(out, est)
	sort.SliceStable(out, func(i, j int) bool { return entryRank(r, out[i].Entry) < entryRank(r, out[j].Entry) })
	return out
}

// entryRank is an entry's place in r.Entries.
func entryRank(r *methods.Reduced, id string) int {
	for i, e := range r.Entries {
		if e.ID == id {
			return i
		}
	}
	return len(r.Entries)
}
