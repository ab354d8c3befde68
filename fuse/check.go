package fuse

import "liftfuse/methods/evidence"

// Check is one tripped model check, as the result document carries it
// (evidence.ModelCheck).
type Check = evidence.ModelCheck

// AddChecks appends tripped model checks to a result document: each to
// Checks and, as its Line, to Warnings. Run does this for Input.Checks; a
// caller that builds a document otherwise (reduce --json) uses it too.
func (r *Result) AddChecks(cs []Check) {
	if r.Checks == nil {
		r.Checks = []Check{}
	}
	for _, c := range cs {
		r.Checks = append(r.Checks, c)
		r.Warnings = append(r.Warnings, c.Line())
	}
}
