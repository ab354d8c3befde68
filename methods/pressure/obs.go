package pressure

import (
	"fmt"
	"math"

	"gonum.org/v1/gonum/mat"

	"liftfuse/methods/air"
	"liftfuse/methods/campaign"
	"liftfuse/methods/evidence"
)

// builder turns an entry's readings into evidence. The taps integrate the
// covered force F_a of axle a (Integrate); the integration scale s says how
// far the taps' integral is from the true covered force, s·F_a. The axle
// lift adds what the taps do not see, the uncovered patches U_a and the
// pitch of drag P_a (−q·m on the front, +q·m on the rear; m log-normal, see
// DragPitch):
//
//	β_a·q = s·F_a + U_a + P_a,   U_a = −q·Σ_j Cp_j·A_j·n_j·share_{j,a}
//
// Writing s = 1 + σ with σ an additive nuisance (prior N(0, model_sd_pct²)),
// this is exact and linear in every unknown but the product σ·F_a:
//
//	y_a = F_a = β_a·q − U_a − P_a − F_a·σ + ε_a
//
// so the scale multiplies only what the taps integrate, and the patches and
// the drag pitch stay outside it. The drag pitch's rows are linear in m; m
// itself is a log-normal nuisance, which fusion carries as a factor on the
// stated m (a known shift of the rows given that factor). The coefficient of σ must not be the
// observed F_a itself: it equals y, so σ = −1 would fit every reading
// exactly and the data would drag σ there (errors in variables). It is
// the pilot's covered force b̂_a·q(w) instead (b̂_a the configuration's
// fitted dF_a/dq, see fitPilot), which scales with q like the lift; its
// error (b̂ − b)·σ·q is second order. ε is the sensor noise and the reference
// offset; with an unknown direction of travel the session wind's error in
// q is common to both rows of the reading, a rank-one covariance
// σ_w²·c·cᵀ with c_a = b̂_a·ρ·V (b̂_a the pilot dF_a/dq); the run-to-run
// wind adds σ_g²·c·cᵀ with the direction's sign over the readings of one
// run (package gust; see runs).
type builder struct {
	c      *campaign.Campaign
	e      *campaign.PressureEntry
	panels []Panel
	wind   string
	rho    float64
	pilot  map[string][2]float64 // config → b̂_f, b̂_r (m²)
	gustSD float64
	used   map[string]bool
}

func newBuilder(c *campaign.Campaign, e *campaign.PressureEntry, panels []Panel, wind string) *builder {
	return &builder{c: c, e: e, panels: panels, wind: wind, rho: c.Density(), pilot: map[string][2]float64{}, used: map[string]bool{}}
}

// IntegrationName returns the nuisance name of an entry's integration
// scale error σ = s − 1.
func IntegrationName(entry string) string { return entry + "/integration" }

func uncoveredName(entry string, j int) string { return fmt.Sprintf("%s/uncovered[%d]", entry, j) }

// declare lists the nuisances the observations use.
func (b *builder) declare() []evidence.Nuisance {
	var ns []evidence.Nuisance
	if b.used[evidence.WindName] {
		ns = append(ns, evidence.Nuisance{Name: evidence.WindName, Label: "along-road wind", Unit: "m/s", SD: b.c.Air.WindSDMs, PerRun: true})
	}
	if n, ok := DragPitch(b.c); ok {
		ns = append(ns, n)
	}
	for j, u := range b.e.Uncovered {
		ns = append(ns, evidence.Nuisance{Name: uncoveredName(b.e.ID, j),
			Label: fmt.Sprintf("%s uncovered %s patch at x = %.2f m", b.e.ID, u.Surface, u.XM), Unit: evidence.UnitCp, Mean: u.CpMean, SD: math.Max(u.CpSD, 1e-6)})
	}
	if b.e.ModelSDPct > 0 {
		ns = append(ns, evidence.Nuisance{Name: IntegrationName(b.e.ID), Label: b.e.ID + " integration scale s − 1", Unit: "fraction", SD: b.e.ModelSDPct / 100})
	}
	return ns
}

// noiseCov is the error covariance of (F_f, F_r) of one reading:
// independent sensor noise plus the reference offset δ, common to the
// reading, along u = (−Σ A n (1 − x/L), −Σ A n x/L).
func (b *builder) noiseCov() *mat.SymDense {
	L := b.c.Vehicle.WheelbaseM
	cov := mat.NewSymDense(2, nil)
	var u [2]float64
	s2 := b.e.SensorSDPa * b.e.SensorSDPa
	for _, pn := range b.panels {
		an := pn.A * pn.Nz
		g := [2]float64{an * (1 - pn.X/L), an * pn.X / L}
		u[0] -= g[0]
		u[1] -= g[1]
		addOuter(cov, g, s2)
	}
	addOuter(cov, u, b.e.ReferenceSDPa*b.e.ReferenceSDPa)
	cov.SetSym(0, 0, cov.At(0, 0)+1e-9)
	cov.SetSym(1, 1, cov.At(1, 1)+1e-9)
	return cov
}

// addOuter adds s2·g·gᵀ to a 2×2 covariance.
func addOuter(cov *mat.SymDense, g [2]float64, s2 float64) {
	cov.SetSym(0, 0, cov.At(0, 0)+s2*g[0]*g[0])
	cov.SetSym(1, 1, cov.At(1, 1)+s2*g[1]*g[1])
	cov.SetSym(0, 1, cov.At(0, 1)+s2*g[0]*g[1])
}

// windSens returns c_a = b̂_a·ρ·V·sign, each row's change per m/s of wind.
func (b *builder) windSens(rd Reading, sign float64) [2]float64 {
	p := b.pilot[rd.Config]
	k := b.rho * air.KmhToMs(rd.SpeedKmh) * sign
	return [2]float64{p[0] * k, p[1] * k}
}

// rows builds the two observations (front, rear) of reading ri and their
// covariance without the run-to-run wind.
func (b *builder) rows(ri int, rd Reading) ([2]evidence.Obs, *mat.SymDense) {
	e, L := b.e, b.c.Vehicle.WheelbaseM
	V := air.KmhToMs(rd.SpeedKmh)
	cov := b.noiseCov()
	as := evidence.Airspeed{Q: rd.Q, V: V, Rho: b.rho, Dir: float64(rd.Direction), Wind: b.wind}
	if rd.Direction == 0 {
		if b.wind != "" {
			// Unknown direction: the wind's sign changes from reading to
			// reading, so it is no shared nuisance but an error common to
			// the reading's rows, with E[q] = q + ½ρσ_w².
			sw := b.c.Air.WindSDMs
			as.Wind, as.Q = "", rd.Q+0.5*b.rho*sw*sw
			addOuter(cov, b.windSens(rd, 1), sw*sw)
		}
	}
	if as.Wind != "" {
		b.used[as.Wind] = true
	}
	q := as.Q
	var obs [2]evidence.Obs
	for k, axle := range []string{evidence.AxleFront, evidence.AxleRear} {
		F := [2]float64{rd.Forces.Front, rd.Forces.Rear}[k]
		o := evidence.Obs{
			Y:     F,
			Terms: []evidence.Term{{Config: rd.Config, Axle: axle, W: 1}},
			Air:   as,
			Label: fmt.Sprintf("reading %d, %s, %.4g km/h, %s", ri+1, rd.Config, rd.SpeedKmh, axle),
		}
		if b.c.Vehicle.Drag != nil {
			sgn := -1.0
			if axle == evidence.AxleRear {
				sgn = 1
			}
			o.Nuis = append(o.Nuis, evidence.Coef{Name: DragPitchName, C: sgn * q, PerQ: true})
		}
		for j, up := range e.Uncovered {
			share := 1 - up.XM/L
			if axle == evidence.AxleRear {
				share = up.XM / L
			}
			// taps = total − uncovered, and the uncovered force is −Cp·q·A·n.
			o.Nuis = append(o.Nuis, evidence.Coef{Name: uncoveredName(e.ID, j), C: q * up.AreaM2 * up.Nz * share, PerQ: true})
		}
		if e.ModelSDPct > 0 {
			o.Nuis = append(o.Nuis, evidence.Coef{Name: IntegrationName(e.ID), C: -b.pilot[rd.Config][k] * q, PerQ: true})
		}
		obs[k] = o
	}
	return obs, cov
}

// block builds the observations of the readings of one run (see runs):
// each reading's two rows with its own covariance, plus σ_g²·c·cᵀ over the
// whole run, c the rows' sensitivities to the run's wind deviation.
func (b *builder) block(run []int, rds []Reading) (evidence.Block, error) {
	n := 2 * len(run)
	obs := make([]evidence.Obs, 0, n)
	cov := mat.NewSymDense(n, nil)
	c := make([]float64, 0, n)
	for a, ri := range run {
		o, cv := b.rows(ri, rds[ri])
		obs = append(obs, o[:]...)
		for i := range 2 {
			for j := i; j < 2; j++ {
				cov.SetSym(2*a+i, 2*a+j, cv.At(i, j))
			}
		}
		sens := b.windSens(rds[ri], dirSign(rds[ri].Direction))
		c = append(c, sens[:]...)
	}
	s2 := b.gustSD * b.gustSD
	for i := range n {
		for j := i; j < n; j++ {
			cov.SetSym(i, j, cov.At(i, j)+s2*c[i]*c[j])
		}
	}
	return evidence.NewBlock(obs, cov)
}

// dirSign is the sign of a direction, +1 when unknown (the sign is then
// common to the reading's rows, which is all a run of one reading needs).
func dirSign(d int) float64 {
	if d == 0 {
		return 1
	}
	return float64(d)
}

// runs groups the readings, in the order the campaign lists them (the
// order they were driven), into runs: consecutive readings of one
// configuration and one known direction are one pass and share its wind
// deviation; a reading of unknown direction is a run of its own.
func runs(rds []Reading) [][]int {
	var out [][]int
	for i, rd := range rds {
		if k := len(out); k > 0 && rd.Direction != 0 {
			last := rds[out[k-1][len(out[k-1])-1]]
			if last.Config == rd.Config && last.Direction == rd.Direction {
				out[k-1] = append(out[k-1], i)
				continue
			}
		}
		out = append(out, []int{i})
	}
	return out
}
