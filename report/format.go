package report

import (
	"fmt"
	"math"

	"liftfuse/fuse"
	"liftfuse/methods/air"
)

// interval formats an estimate as "mean [lo, hi]" with the given decimals.
func interval(e fuse.Estimate, dec int) string {
	return fmt.Sprintf("%+.*f [%+.*f, %+.*f]", dec, e.Mean, dec, e.Lo, dec, e.Hi)
}

// percent formats a probability (or a credible level) as a whole
// percentage, with a space before the sign as the SI Brochure (9th ed.,
// 5.4.7) writes it. A probability that would round to 0 % or 100 % reads
// "<1 %" or ">99 %": a sampled posterior never makes either certain. NaN
// (nothing to say) reads "–".
func percent(p float64) string {
	switch {
	case math.IsNaN(p):
		return "–"
	case p < 0.005:
		return "<1 %"
	case p > 0.995:
		return ">99 %"
	}
	return fmt.Sprintf("%.0f %%", 100*p)
}

// isPercent is a probability after its symbol: "= 42 %", or "<1 %" and
// ">99 %" with no equals sign before them.
func isPercent(p float64) string {
	s := percent(p)
	if s[0] == '<' || s[0] == '>' {
		return s
	}
	return "= " + s
}

// forceUnit is the campaign's display unit of force (report.force_unit):
// every force the report and the terminal tables print is in it.
type forceUnit struct {
	name    string
	newtons float64 // newtons per one of the unit
}

// newForceUnit looks up a force unit by its name (N, kgf, lbf).
func newForceUnit(name string) (forceUnit, error) {
	k, err := air.NewtonsPer(name)
	if err != nil {
		return forceUnit{}, err
	}
	return forceUnit{name: name, newtons: k}, nil
}

// of converts newtons to the unit.
func (u forceUnit) of(n float64) float64 { return n / u.newtons }

// est converts an estimate in newtons to the unit.
func (u forceUnit) est(e fuse.Estimate) fuse.Estimate { return e.Scale(1 / u.newtons) }

// unitText is a unit as the text prints it: the words the command line
// and the result document use ("m2") written as everywhere else ("m²").
func unitText(u string) string {
	switch u {
	case "m2":
		return "m²"
	case "m3":
		return "m³"
	}
	return u
}
