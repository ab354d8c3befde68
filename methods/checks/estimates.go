package checks

import (
	"fmt"
	"maps"
	"math"
	"slices"
	"strings"

	"gonum.org/v1/gonum/mat"
	"gonum.org/v1/gonum/stat"
	"gonum.org/v1/gonum/stat/distuv"

	"liftfuse/methods/campaign"
	"liftfuse/methods/evidence"
	"liftfuse/methods/pressure"
)

// estimate is one entry's own, rough C_L·A of one configuration's axle
// (m², at 100 km/h for ride heights, at the readings' speeds for taps):
// β = Raw + Corr, where Raw is what the entry measured and Corr what the
// campaign adds (a laser's tyre-growth prior, the pitch of drag, uncovered
// patches). A sign slip in the data flips Raw and keeps Corr.
//
// Its errors are Stat, the entry's own noise (independent between
// configurations), and named systematic errors, with the names of the
// evidence (the axle's springs, a sensor's gain, the tyre growth, the pitch
// of drag, an integration scale) so that an error two entries share is
// counted once when they are compared: Abs[name] is an error's size in m²,
// Rel[name] its relative size (the error is β·Rel). SD is the total.
type estimate struct {
	Entry     string
	Kind      evidence.Kind
	Config    string
	Axle      string
	Raw, Corr float64
	Stat      float64
	Abs, Rel  map[string]float64
	SD        float64
}

func (e estimate) beta() float64   { return e.Raw + e.Corr }
func (e estimate) mirror() float64 { return -e.Raw + e.Corr }

// comp returns the size of the named error at lift b.
func (e estimate) comp(name string, b float64) float64 { return e.Abs[name] + b*e.Rel[name] }

// names lists the estimate's systematic errors.
func (e estimate) names() []string {
	var out []string
	for n := range e.Abs {
		out = append(out, n)
	}
	for n := range e.Rel {
		if _, ok := e.Abs[n]; !ok {
			out = append(out, n)
		}
	}
	slices.Sort(out) // sums in a fixed order: the same bits every run
	return out
}

// total sets SD from Stat and the systematic errors at β.
func (e *estimate) total() {
	v := e.Stat * e.Stat
	for _, n := range e.names() {
		v += math.Pow(e.comp(n, e.beta()), 2)
	}
	e.SD = math.Sqrt(v)
}

// pressureEstimates averages the readings' implied C_L·A per configuration
// and axle and adds back the pitch of drag m = C_D·A·h/L (taps carry β_f − m
// and β_r + m) and the uncovered patches' prior force −Cp·A·n_z per axle by
// moments. m is log-normal (pressure.DragPitch): it enters with its mean
// and sd, e^{μ+σ²/2} and that times √(e^{σ²} − 1) (gonum's
// distuv.LogNormal), the Gaussian that matches its first two moments.
func pressureEstimates(c *campaign.Campaign, r *pressure.Result) []estimate {
	L := c.Vehicle.WheelbaseM
	var m, msd float64
	if n, ok := pressure.DragPitch(c); ok {
		ln := distuv.LogNormal{Mu: math.Log(n.Mean), Sigma: n.SD}
		m, msd = ln.Mean(), ln.StdDev()
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
			e := estimate{Entry: r.Entry.ID, Kind: evidence.KindPressure, Config: cfg.ID, Axle: axle, Raw: raw,
				Stat: math.Sqrt(v / float64(len(xs))), Abs: map[string]float64{}, Rel: map[string]float64{}}
			e.Corr, e.Abs[pressure.DragPitchName] = m, msd
			if axle == evidence.AxleRear {
				e.Corr, e.Abs[pressure.DragPitchName] = -m, -msd
			}
			for j, u := range r.Entry.Uncovered {
				share := 1 - u.XM/L
				if axle == evidence.AxleRear {
					share = u.XM / L
				}
				e.Corr += -u.CpMean * u.AreaM2 * u.Nz * share
				e.Abs[fmt.Sprintf("%s/uncovered[%d]", r.Entry.ID, j)] = -u.CpSD * u.AreaM2 * u.Nz * share
			}
			if rel > 0 {
				e.Rel[r.Entry.ID+"/integration"] = rel
			}
			e.total()
			out = append(out, e)
		}
	}
	return out
}

// meanVar returns the mean and the sample variance (0 for one value).
func meanVar(xs []float64) (float64, float64) {
	if len(xs) < 2 {
		return stat.Mean(xs, nil), 0
	}
	return stat.MeanVariance(xs, nil)
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
		out = append(out, Check{Check: evidence.IDCLATooLarge, Entry: id, Config: e.Config, PValue: bestP,
			Where:  fmt.Sprintf("%s C_L·A %.2f ± %.2f m²", e.Axle, e.beta(), e.SD),
			Cause:  "a C_L·A beyond 1.5 m² is out of reach for a road car: unit or sign slip? (speed in m/s under a km/h column, a calibration in the wrong unit, a tap table in the wrong unit)",
			Action: fmt.Sprintf("check %s's units: speed column, calibration gain, stiffness, pressures in Pa", id)})
	}
	return out
}

// pair compares entry a's estimates with entry b's on the quantities both
// inform: χ² = δᵀC⁻¹δ of δ = β_a − β_b, and of a's mirror image
// −Raw + Corr − β_b, each on k degrees of freedom (k = 0: nothing shared).
// C holds both entries' noise and their systematic errors, a named error
// the two share entering the difference once, with both coefficients
// (pairCov).
func pair(est []estimate, a, b string) (pSame, pMirror float64, k int) {
	return pairOn(est, a, b, nil)
}

// quantity names an estimate's configuration and axle.
type quantity struct{ config, axle string }

// shared returns the quantities entries a and b both inform.
func shared(est []estimate, a, b string) map[quantity]bool {
	out := map[quantity]bool{}
	for _, e := range byEntry(est, a) {
		for _, o := range byEntry(est, b) {
			if o.Config == e.Config && o.Axle == e.Axle {
				out[quantity{e.Config, e.Axle}] = true
			}
		}
	}
	return out
}

// pairOn is pair on the quantities in only (all when nil).
func pairOn(est []estimate, a, b string, only map[quantity]bool) (pSame, pMirror float64, k int) {
	var ea, eb []estimate
	for _, e := range byEntry(est, a) {
		if only != nil && !only[quantity{e.Config, e.Axle}] {
			continue
		}
		for _, o := range byEntry(est, b) {
			if o.Config == e.Config && o.Axle == e.Axle {
				ea, eb = append(ea, e), append(eb, o)
			}
		}
	}
	k = len(ea)
	if k == 0 {
		return 1, 1, 0
	}
	chi := func(mirror bool) float64 {
		d := make([]float64, k)
		ba := make([]float64, k)
		for i := range ea {
			ba[i] = ea[i].beta()
			if mirror {
				ba[i] = ea[i].mirror()
			}
			d[i] = ba[i] - eb[i].beta()
		}
		return quadForm(pairCov(ea, eb, ba), d)
	}
	return chi2Survival(chi(false), k), chi2Survival(chi(true), k), k
}

// pairCov is the covariance of β_a,i − β_b,i: each error named in either
// entry contributes g_i g_j with g_i = comp_a,i(name) − comp_b,i(name); the
// noise adds Stat² on the diagonal. ba are a's lifts (measured or
// mirrored), at which its relative errors are sized.
func pairCov(ea, eb []estimate, ba []float64) *mat.SymDense {
	k := len(ea)
	names := map[string]bool{}
	for i := range ea {
		for _, n := range ea[i].names() {
			names[n] = true
		}
		for _, n := range eb[i].names() {
			names[n] = true
		}
	}
	c := mat.NewSymDense(k, nil)
	for _, n := range slices.Sorted(maps.Keys(names)) {
		g := make([]float64, k)
		for i := range ea {
			g[i] = ea[i].comp(n, ba[i]) - eb[i].comp(n, eb[i].beta())
		}
		for i := range k {
			for j := i; j < k; j++ {
				c.SetSym(i, j, c.At(i, j)+g[i]*g[j])
			}
		}
	}
	for i := range k {
		c.SetSym(i, i, c.At(i, i)+ea[i].Stat*ea[i].Stat+eb[i].Stat*eb[i].Stat+1e-12)
	}
	return c
}

// quadForm returns dᵀC⁻¹d (+Inf when C is singular).
func quadForm(c *mat.SymDense, d []float64) float64 {
	var ch mat.Cholesky
	if !ch.Factorize(c) {
		return math.Inf(1)
	}
	x := mat.NewVecDense(len(d), nil)
	if err := ch.SolveVecTo(x, mat.NewVecDense(len(d), append([]float64(nil), d...))); err != nil {
		return math.Inf(1)
	}
	return mat.Dot(x, mat.NewVecDense(len(d), d))
}

// mirrorFits is the p-value above which a comparison is taken to fit.
const mirrorFits = 0.05

// mirrorVerdict compares an entry with every other entry it shares a
// quantity with. A pair supports "mirrored" when the entry as measured
// disagrees (p < 5 %) and its mirror image agrees (p > 5 %); it speaks
// against when the reverse holds (mirror p < alphaMirror, as measured
// p > 5 %). It returns the strongest support's p-value, the supporters and
// whether any pair speaks against.
func mirrorVerdict(est []estimate, id string) (p float64, supporters []string, against bool) {
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
			supporters = append(supporters, o)
			p = math.Min(p, pSame)
		case pMirror < alphaMirror && pSame > mirrorFits:
			against = true
		}
	}
	return p, supporters, against
}

// corroborated says whether entry s agrees, as measured, with some entry
// other than id on the quantities s and id share, and disagrees with none
// there (at alphaMirror).
func corroborated(est []estimate, s, id string) bool {
	agree := false
	on := shared(est, s, id)
	for _, o := range entryIDs(est) {
		if o == s || o == id {
			continue
		}
		pSame, _, k := pairOn(est, s, o, on)
		if k == 0 {
			continue
		}
		if pSame < alphaMirror {
			return false
		}
		agree = agree || pSame > mirrorFits
	}
	return agree
}

// mirrored reports the entries whose lift is the mirror image of the
// others': the strongest support has p < alphaMirror, no pair speaks
// against, and either two other entries support it or the one that does is
// corroborated by a third. With two entries alone either could be the one
// flipped, and nothing is said.
func mirrored(est []estimate) []Check {
	var out []Check
	for _, id := range entryIDs(est) {
		p, sup, against := mirrorVerdict(est, id)
		if against || p >= alphaMirror || len(sup) == 0 || (len(sup) == 1 && !corroborated(est, sup[0], id)) {
			continue
		}
		out = append(out, Check{Check: evidence.IDMirror, Entry: id, PValue: p,
			Where:  fmt.Sprintf("against %s", strings.Join(sup, ", ")),
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
		if c.Check == evidence.IDGainNegative {
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
