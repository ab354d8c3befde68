package height

import (
	"fmt"
	"math"

	"gonum.org/v1/gonum/stat/distuv"

	"liftfuse/methods/air"
	"liftfuse/methods/campaign"
	"liftfuse/methods/evidence"
)

// WheelRate returns the wheel rate of a spring k (N/mm) acting through an
// installation (motion) ratio MR = spring travel per wheel travel:
//
//	k_w = k·MR²
//
// (Milliken & Milliken, Race Car Vehicle Dynamics, ch. 16 — from memory).
func WheelRate(spring, mr float64) float64 { return spring * mr * mr }

// Series returns the rate of two springs in series: 1/k = 1/k1 + 1/k2.
func Series(k1, k2 float64) float64 { return 1 / (1/k1 + 1/k2) }

// ScaleRef names a log-normal scale group and the power to which it enters a
// compliance (1/K): a pot's compliance is 1/(2·k·MR²), so the spring group
// enters with power −1 and the motion-ratio group with −2.
type ScaleRef = evidence.ScaleRef

// Stiffness is the heave stiffness K (N/mm, both wheels of the axle) seen at
// a sensor, and how its uncertainty enters the lift term's scale factor.
type Stiffness struct {
	K      float64
	Groups []evidence.ScaleGroup // groups declared by this stiffness
	Refs   []ScaleRef            // powers on the compliance 1/K
	Source string                // "springs" or "ballast", for the report
	SE     float64               // ballast: standard error of K, N/mm
	// GainCancels is true for a ballast stiffness: it is measured in the
	// sensor's own calibration, so a gain error cancels from the lift term.
	GainCancels bool
	// Warning, when set, is something a person should look at (a ballast
	// fit with no scatter).
	Warning string
}

// RelSD returns the first-order relative uncertainty of the compliance.
func (s Stiffness) RelSD() float64 {
	var v float64
	for _, r := range s.Refs {
		for _, g := range s.Groups {
			if g.Name == r.Name {
				v += r.Pow * r.Pow * g.SD * g.SD
			}
		}
	}
	return math.Sqrt(v)
}

// SpringStiffness returns the axle heave stiffness from the springs, seen by a
// potentiometer (K = 2·k·MR²) or by a body-to-ground laser, which also sees
// the tyres in series (1/K = 1/(2 k_w) + 1/(2 k_t)). The scale groups are
// named by axle so that two sensors on the same springs share them.
//
// To first order in the log domain, with compliance C = C_w + C_t,
// ∂ln C/∂ln k_w = −C_w/C and ∂ln C/∂ln k_t = −C_t/C.
func SpringStiffness(axle string, a campaign.Axle, laser bool) Stiffness {
	groups := []evidence.ScaleGroup{
		{Name: axle + "-springs", Label: axle + " spring rate", SD: a.SpringSDPct / 100},
		{Name: axle + "-motion-ratio", Label: axle + " motion ratio", SD: a.MotionRatioSD / a.MotionRatio},
	}
	kw := 2 * WheelRate(a.SpringNPerMm, a.MotionRatio)
	if !laser {
		return Stiffness{K: kw, Groups: groups, Source: campaign.FromSprings,
			Refs: []ScaleRef{{Name: groups[0].Name, Pow: -1}, {Name: groups[1].Name, Pow: -2}}}
	}
	kt := 2 * a.TyreNPerMm
	K := Series(kw, kt)
	cw, ct := (1/kw)*K, (1/kt)*K // shares of the compliance
	groups = append(groups, evidence.ScaleGroup{Name: axle + "-tyres", Label: axle + " tyre rate", SD: a.TyreSDPct / 100})
	return Stiffness{K: K, Groups: groups, Source: campaign.FromSprings, Refs: []ScaleRef{
		{Name: groups[0].Name, Pow: -cw}, {Name: groups[1].Name, Pow: -2 * cw}, {Name: groups[2].Name, Pow: -ct}}}
}

// DefaultBallastSDPct is the relative sd of a ballast stiffness from two
// points, which carry no scatter of their own (model v2; common practice,
// no source).
const DefaultBallastSDPct = 5

// ballastLevel is the one-sided tail probability at which the Student-t and
// normal quantiles are matched: 0.95, the edge of a 90 % interval (the
// report's default credible level).
const ballastLevel = 0.95

// TInflation returns t_{p,ν}/z_p, the factor by which a normal interval of
// a least-squares slope from n points widens into its Student-t interval
// with ν = n − 2 degrees of freedom (Student 1908; any statistics table,
// e.g. t_{0.95,1} = 6.314). It is 1 for n ≤ 2 (no degrees of freedom: the
// caller uses a stated sd instead).
func TInflation(n int, p float64) float64 {
	if n <= 2 {
		return 1
	}
	t := distuv.StudentsT{Mu: 0, Sigma: 1, Nu: float64(n - 2)}.Quantile(p)
	return t / distuv.UnitNormal.Quantile(p)
}

// BallastStiffness fits static sensor height (mm, through cal) against the
// load each added mass puts on the axle, F = m·g·x/L for the rear and
// m·g·(1 − x/L) for the front, and returns K = −1/slope with the slope's
// uncertainty carried as a log-normal scale group of the entry:
//
//	sd(log K) = (s_b/|b|)·t_{0.95,n−2}/z_{0.95}
//
// so that the group's 90 % interval is the Student-t interval of the slope.
// Two points (or points on an exact line) carry no scatter: the sd is then
// DefaultBallastSDPct and the Stiffness carries a warning.
func BallastStiffness(entry, axle string, pts []campaign.BallastPoint, wheelbase float64, cal Calibration) (Stiffness, error) {
	xs := make([]float64, len(pts))
	ys := make([]float64, len(pts))
	for i, p := range pts {
		share := p.XM / wheelbase
		if axle == evidence.AxleFront {
			share = 1 - share
		}
		xs[i] = p.AddedKg * air.StandardGravity * share
		ys[i] = cal.MM(p.Signal)
	}
	_, slope, se, err := LineFit(xs, ys)
	if err != nil {
		return Stiffness{}, fmt.Errorf("ballast: %w", err)
	}
	if !(slope < 0) {
		return Stiffness{}, fmt.Errorf("ballast: the body does not sink under added mass (slope %.4g mm/N): check the sensor's sign, the calibration or x_m", slope)
	}
	K := -1 / slope
	sd := se / -slope * TInflation(len(pts), ballastLevel)
	var warn string
	if sd < 1e-9 { // round-off of an exact line
		sd = DefaultBallastSDPct / 100
		warn = fmt.Sprintf("%s: the ballast stiffness rests on %d points with no scatter between them: its uncertainty is taken as %g %%; add a third mass to measure it",
			entry, len(pts), float64(DefaultBallastSDPct))
	}
	g := evidence.ScaleGroup{Name: entry + "/ballast-stiffness", Label: entry + " ballast stiffness", SD: sd}
	return Stiffness{K: K, SE: K * g.SD, Groups: []evidence.ScaleGroup{g}, Source: campaign.FromBallast,
		Refs: []ScaleRef{{Name: g.Name, Pow: 1}}, GainCancels: true, Warning: warn}, nil
}
