package checks

import (
	"fmt"
	"math"

	"gonum.org/v1/gonum/stat/distuv"

	"liftfuse/methods/campaign"
	"liftfuse/methods/evidence"
	"liftfuse/methods/pressure"
)

// estimate is one entry's own, rough C_L·A of one configuration's axle
// (m², at 100 km/h for ride heights, at the readings' speeds for taps):
// β = Raw + Corr, where Raw is what the entry measured and Corr what the
// campaign adds (a laser's tyre-growth prior, the pitch of drag, uncovered
// patches). A sign slip in the data flips Raw and keeps Corr. SD is its
// standard deviation, systematic parts (stiffness, gain, integration
// scale, drag pitch) included.
type estimate struct {
	Entry     string
	Kind      evidence.Kind
	Config    string
	Axle      string
	Raw, Corr float64
	SD        float64
}

func (e estimate) beta() float64   { return e.Raw + e.Corr }
func (e estimate) mirror() float64 { return -e.Raw + e.Corr }

// pressureEstimates averages the readings' implied C_L·A per configuration
// and axle and adds back the pitch of drag m = C_D·A·h/L (taps carry β_f − m
// and β_r + m) and the uncovered patches' prior force −Cp·A·n_z per axle by
// moments.
func pressureEstimates(c *campaign.Campaign, r *pressure.Result) []estimate {
	L := c.Vehicle.WheelbaseM
	var m, msd float64
	if d := c.Vehicle.Drag; d != nil {
		m = d.CdAM2 * d.CentreHeightM / L
		msd = m * d.SDPct / 100
	}
	rel := r.Entry.ModelSDPct / 100
	var out []estimate
	for _, cfg := range c.Configurations {
		for _, axle := range []string{evidence.AxleFront, evidence.AxleRear} {
			var xs []float64
			for _, rd := range r.Readings {
				if rd.Config != cfg.ID || rd.Q <= 0 {
					continue
				}
				f := rd.ImpliedCLA()
				if axle == evidence.AxleFront {
					xs = append(xs, f.Front)
				} else {
					xs = append(xs, f.Rear)
				}
			}
			if len(xs) == 0 {
				continue
			}
			raw, v := meanVar(xs)
			corr, cv := m, msd*msd
			if axle == evidence.AxleRear {
				corr = -m
			}
			for _, u := range r.Entry.Uncovered {
				share := 1 - u.XM/L
				if axle == evidence.AxleRear {
					share = u.XM / L
				}
				corr += -u.CpMean * u.AreaM2 * u.Nz * share
				cv += math.Pow(u.CpSD*u.AreaM2*u.Nz*share, 2)
			}
			beta := raw + corr
			out = append(out, estimate{Entry: r.Entry.ID, Kind: evidence.KindPressure, Config: cfg.ID, Axle: axle,
				Raw: raw, Corr: corr, SD: math.Sqrt(v/float64(len(xs)) + cv + rel*rel*beta*beta)})
		}
	}
	return out
}

// meanVar returns the mean and the sample variance (0 for one value).
func meanVar(xs []float64) (float64, float64) {
	var s float64
	for _, x := range xs {
		s += x
	}
	mu := s / float64(len(xs))
	if len(xs) < 2 {
		return mu, 0
	}
	var v float64
	for _, x := range xs {
		v += (x - mu) * (x - mu)
	}
	return mu, v / float64(len(xs)-1)
}

// maxCLA is the size of an axle C_L·A no road car reaches (model.md:
// "|C_L·A| beyond 1.5 m² for a road car").
const maxCLA = 1.5

// claTooLarge reports, per entry, the estimate most beyond ±1.5 m² when the
// one-sided p-value P(|β| ≤ 1.5) ≈ Φ((1.5 − |β̂|)/sd) is below alphaCLA
// shared over the entry's estimates.
func claTooLarge(est []estimate) []Check {
	var out []Check
	for _, id := range entryIDs(est) {
		mine := byEntry(est, id)
		best, bestP := -1, 1.0
		for k, e := range mine {
			p := distuv.UnitNormal.CDF((maxCLA - math.Abs(e.beta())) / e.SD)
			if p < bestP {
				best, bestP = k, p
			}
		}
		if best < 0 || bestP >= alphaCLA/float64(len(mine)) {
			continue
		}
		e := mine[best]
		out = append(out, Check{Check: IDCLATooLarge, Entry: id, Config: e.Config, PValue: bestP,
			Where:  fmt.Sprintf("%s C_L·A %.2f ± %.2f m²", e.Axle, e.beta(), e.SD),
			Cause:  "a C_L·A beyond 1.5 m² is out of reach for a road car: unit or sign slip? (speed in m/s under a km/h column, a calibration in the wrong unit, a tap table in the wrong unit)",
			Action: fmt.Sprintf("check %s's units: speed column, calibration gain, stiffness, pressures in Pa", id)})
	}
	return out
}

// pair compares entry a's estimates with entry b's on the quantities both
// inform: χ² of β_a − β_b and of a's mirror image −Raw + Corr − β_b, each
// on k degrees of freedom (k = 0: nothing shared).
func pair(est []estimate, a, b string) (pSame, pMirror float64, k int) {
	var same, mirror float64
	for _, e := range byEntry(est, a) {
		for _, o := range byEntry(est, b) {
			if o.Config != e.Config || o.Axle != e.Axle {
				continue
			}
			v := e.SD*e.SD + o.SD*o.SD
			if v <= 0 {
				continue
			}
			same += math.Pow(e.beta()-o.beta(), 2) / v
			mirror += math.Pow(e.mirror()-o.beta(), 2) / v
			k++
		}
	}
	if k == 0 {
		return 1, 1, 0
	}
	return chi2Survival(same, k), chi2Survival(mirror, k), k
}

// mirrorFits is the p-value above which a comparison is taken to fit.
const mirrorFits = 0.05

// mirrorVerdict compares an entry with every other entry it shares a
// quantity with. A pair supports "mirrored" when the entry as measured
// disagrees (p < 5 %) and its mirror image agrees (p > 5 %); it speaks
// against when the reverse holds (mirror p < alphaMirror, as measured
// p > 5 %). The entry is mirrored when at least two other entries support
// it, none speaks against, and the strongest support has p < alphaMirror:
// with two entries only, either could be the one flipped. The p-value is
// the strongest support's.
func mirrorVerdict(est []estimate, id string) (p float64, n int, against bool) {
	p = 1
	for _, o := range entryIDs(est) {
		if o == id {
			continue
		}
		pSame, pMirror, k := pair(est, id, o)
		if k == 0 {
			continue
		}
		switch {
		case pSame < mirrorFits && pMirror > mirrorFits:
			n++
			p = math.Min(p, pSame)
		case pMirror < alphaMirror && pSame > mirrorFits:
			against = true
		}
	}
	return p, n, against
}

// mirrored reports the entries whose lift is the mirror image of the
// others' (mirrorVerdict).
func mirrored(est []estimate) []Check {
	var out []Check
	for _, id := range entryIDs(est) {
		p, n, against := mirrorVerdict(est, id)
		if n < 2 || against || p >= alphaMirror {
			continue
		}
		out = append(out, Check{Check: IDMirror, Entry: id, PValue: p,
			Where:  fmt.Sprintf("against %d other entries", n),
			Cause:  "the entry's lift is the mirror image of the other entries': unit or sign slip? (tap pressures with the wrong sign, a sensor's gain sign, a reference port swapped)",
			Action: fmt.Sprintf("check the sign convention of the data of %s against the others' and re-reduce", id)})
	}
	return out
}

// confirmGain drops a negative-gain note when another entry agrees with the
// entry as measured and not with its mirror image.
func confirmGain(cs []Check, est []estimate) []Check {
	var out []Check
	for _, c := range cs {
		if c.Check == IDGainNegative {
			if _, _, against := mirrorVerdict(est, c.Entry); against {
				continue
			}
		}
		out = append(out, c)
	}
	return out
}

func entryIDs(est []estimate) []string {
	var ids []string
	seen := map[string]bool{}
	for _, e := range est {
		if !seen[e.Entry] {
			seen[e.Entry] = true
			ids = append(ids, e.Entry)
		}
	}
	return ids
}

func byEntry(est []estimate, id string) []estimate {
	var out []estimate
	for _, e := range est {
		if e.Entry == id {
			out = append(out, e)
		}
	}
	return out
}
