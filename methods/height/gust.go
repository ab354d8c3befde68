package height

import (
	"fmt"

	"gonum.org/v1/gonum/mat"

	"liftfuse/methods/air"
	"liftfuse/methods/gust"
)

// gustModel is the run-to-run wind seen by an entry: per log, the runs (as
// positions among the log's windows), each window's sensitivity to its
// run's wind deviation (mm per m/s) and each run's nuisance name; and the
// points the scatter estimate reads.
type gustModel struct {
	runs   [][][]int
	sens   [][]float64
	names  [][]string
	groups []gust.Group
}

// minGustSD keeps a run's wind nuisance proper when the data say the
// scatter is nil (m/s).
const minGustSD = 1e-3

// GustName returns the nuisance name of the wind deviation of the run of a
// log file that begins at t s: every sensor logged in that file sees the
// same deviation, so the name is the file's and the run's, not the entry's.
func GustName(file string, t float64) string { return fmt.Sprintf("gust/%s@%.1fs", file, t) }

// gusts splits each log's windows into runs, fits the pilot, and collects
// each log's pilot design, data and runs for the scatter estimate (its
// restricted likelihood, package gust), which ReduceAll makes once over
// every entry. Windows read with an airspeed
// probe carry no gust term: the probe measures the wind.
func (b *builder) gusts(perLog [][]int) gustModel {
	g := gustModel{runs: make([][][]int, len(perLog)), sens: make([][]float64, len(perLog)), names: make([][]string, len(perLog))}
	if b.c.Air.GustSDMs <= 0 {
		return g
	}
	for li, idx := range perLog {
		if len(idx) == 0 {
			continue
		}
		keys := make([]gust.Key, len(idx))
		for k, i := range idx {
			w := b.res.Windows[i]
			keys[k] = gust.Key{Log: li, Config: w.Config, Direction: w.Direction, SpeedKmh: w.SpeedKmh, From: w.From, To: w.To}
			if w.Probe {
				keys[k].SpeedKmh = 0
			}
		}
		g.runs[li] = gust.Runs(keys)
		X, y, wt, col := b.pilotDesign(idx)
		g.sens[li] = b.sensitivities(idx, X, y, wt, col)
		grp := gust.Group{X: X, Y: y, Var: make([]float64, len(idx)), C: g.sens[li], Runs: g.runs[li], Shared: b.pilotShared()}
		for k := range idx {
			grp.Var[k] = 1 / wt[k]
		}
		for _, run := range g.runs[li] {
			g.names[li] = append(g.names[li], GustName(b.e.Logs[li].File, b.res.Windows[idx[run[0]]].From))
			base := 0.0
			if b.res.Windows[idx[run[0]]].Direction == 0 && b.wind != "" {
				base = b.c.Air.WindSDMs * b.c.Air.WindSDMs
			}
			grp.Base = append(grp.Base, base)
		}
		g.groups = append(g.groups, grp)
	}
	return g
}

// runOf returns, for each position of a log's windows, the index of its run
// (−1: none).
func (g gustModel) runOf(li, n int) []int {
	out := make([]int, n)
	for k := range out {
		out[k] = -1
	}
	for r, run := range g.runs[li] {
		for _, k := range run {
			out[k] = r
		}
	}
	return out
}

// pilotDesign is the pilot fit of one log's windows, with the tyre growth
// at its prior mean taken off y (its column, ∝ V², would be collinear with
// the lift slopes): a static offset, the drift if modelled, the
// centre-of-gravity height h_cg on each window's load-transfer coefficient
// (accelCoef), and per configuration a slope p_c on q (mm/Pa) and a
// mean-wind column ρ·Dir·V (its coefficient is p_c·w). h_cg is fitted, not
// held at its prior mean like the growth: the scatter estimate integrates
// the pilot's coefficients out, and a load transfer fixed at a wrong h_cg —
// or windows whose mean accelerations carry more error than their stated
// one, as a speed logged at a lower rate than the file gives at a ramp's
// edge — would leave a pattern the scatter reads as run-to-run wind. It
// returns the design, y, the weights 1/variance and each configuration's
// columns (q, wind or −1).
func (b *builder) pilotDesign(idx []int) (X *mat.Dense, y, wt []float64, col map[string][2]int) {
	ws := b.res.Windows
	n := len(idx)
	col = map[string][2]int{}
	p := b.pilotShared()
	for _, i := range idx {
		w := ws[i]
		c, ok := col[w.Config]
		if !ok {
			c = [2]int{p, -1}
			p++
		}
		if c[1] < 0 && !w.Probe && w.Direction != 0 {
			c[1] = p
			p++
		}
		col[w.Config] = c
	}
	X = mat.NewDense(n, p, nil)
	y = make([]float64, n)
	wt = make([]float64, n)
	tbar := meanTime(ws, idx)
	for k, i := range idx {
		w := ws[i]
		y[k] = w.HeightMM - b.known(w)
		wt[k] = 1 / b.variance(w)
		X.Set(k, 0, 1)
		X.Set(k, 1, accelCoef(b.c.Vehicle, b.res.Lever, w.AccelMs2))
		if b.e.Drift {
			X.Set(k, 2, (w.From+w.To)/2-tbar)
		}
		c := col[w.Config]
		X.Set(k, c[0], w.Q)
		if c[1] >= 0 && !w.Probe {
			X.Set(k, c[1], b.rho*float64(w.Direction)*air.KmhToMs(w.SpeedKmh))
		}
	}
	return X, y, wt, col
}

// pilotShared is the number of the pilot's columns common to every
// configuration, which come first: the offset, h_cg and the drift if
// modelled.
func (b *builder) pilotShared() int {
	if b.e.Drift {
		return 3
	}
	return 2
}

// sensitivities fits the pilot and returns each window's gust sensitivity
// p_c·ρ·V·Dir (Dir 0, unknown, counts as +1: the sign is common to a run;
// 0 for standstill and probe windows).
func (b *builder) sensitivities(idx []int, X *mat.Dense, y, wt []float64, col map[string][2]int) []float64 {
	beta, _ := gust.Fit(X, y, wt)
	sens := make([]float64, len(idx))
	for k, i := range idx {
		w := b.res.Windows[i]
		if w.Probe || w.AtRest() {
			continue
		}
		dir := float64(w.Direction)
		if dir == 0 {
			dir = 1
		}
		sens[k] = beta[col[w.Config][0]] * b.rho * air.KmhToMs(w.SpeedKmh) * dir
	}
	return sens
}

// known is the part of a window's height the pilot takes as known: tyre
// growth at its prior mean.
func (b *builder) known(w Window) float64 {
	var y float64
	if b.laser {
		for _, cf := range b.res.Lever.growthCoefs(w.SpeedSq) {
			y += cf.C * b.e.TyreGrowth.MmAt100kmh
		}
	}
	return y
}
