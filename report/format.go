package report

import (
	"fmt"
	"math"

	"liftfuse/fuse"
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
