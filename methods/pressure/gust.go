package pressure

import (
	"gonum.org/v1/gonum/mat"

	"liftfuse/methods/air"
	"liftfuse/methods/gust"
)

// fitPilot fits, per configuration and axle, the taps' force against q:
// F_a = b_a·q + u_a·ρ·Dir·V (the second column, the mean wind's share
// p·w, only when the configuration has readings of known direction). b_a
// is the pilot dF_a/dq the wind's linearised errors use.
func (b *builder) fitPilot(rds []Reading) {
	byConfig := map[string][]int{}
	var order []string
	for i, rd := range rds {
		if byConfig[rd.Config] == nil {
			order = append(order, rd.Config)
		}
		byConfig[rd.Config] = append(byConfig[rd.Config], i)
	}
	for _, cfg := range order {
		idx := byConfig[cfg]
		X, _ := b.design(rds, idx)
		var p [2]float64
		for k := range 2 {
			beta, _ := gust.Fit(X, axleForces(rds, idx, k), ones(len(idx)))
			p[k] = beta[0]
		}
		b.pilot[cfg] = p
	}
}

// design is the pilot's design matrix for readings idx of one
// configuration; directed reports whether it has the wind column.
func (b *builder) design(rds []Reading, idx []int) (*mat.Dense, bool) {
	directed := false
	for _, i := range idx {
		directed = directed || rds[i].Direction != 0
	}
	p := 1
	if directed {
		p = 2
	}
	X := mat.NewDense(len(idx), p, nil)
	for k, i := range idx {
		X.Set(k, 0, rds[i].Q)
		if directed {
			X.Set(k, 1, b.rho*float64(rds[i].Direction)*air.KmhToMs(rds[i].SpeedKmh))
		}
	}
	return X, directed
}

func axleForces(rds []Reading, idx []int, axle int) []float64 {
	y := make([]float64, len(idx))
	for k, i := range idx {
		y[k] = [2]float64{rds[i].Forces.Front, rds[i].Forces.Rear}[axle]
	}
	return y
}

func ones(n int) []float64 {
	w := make([]float64, n)
	for i := range w {
		w[i] = 1
	}
	return w
}

// gustScatter estimates the run-to-run wind scatter σ_g from the pilot's
// residuals, the rows of the readings of one run (see runs) sharing the
// deviation (package gust). The rows' noise is taken as independent here
// (the reference offset's correlation is left out of the estimate, not of
// the covariance).
func (b *builder) gustScatter(rds []Reading) (sd, sdOfSD float64) {
	if b.c.Air.GustSDMs <= 0 || len(rds) == 0 {
		return 0, 0
	}
	byConfig := map[string][]int{}
	for i, rd := range rds {
		byConfig[rd.Config] = append(byConfig[rd.Config], i)
	}
	noise := b.noiseCov()
	pts := make([][]gust.Point, len(rds)) // per reading
	for _, idx := range byConfig {
		X, _ := b.design(rds, idx)
		for k := range 2 {
			_, resid := gust.Fit(X, axleForces(rds, idx, k), ones(len(idx)))
			for a, i := range idx {
				base := 0.0
				if rds[i].Direction == 0 && b.wind != "" {
					base = b.c.Air.WindSDMs * b.c.Air.WindSDMs
				}
				c := b.windSens(rds[i], dirSign(rds[i].Direction))
				pts[i] = append(pts[i], gust.Point{R: resid[a], Var: noise.At(k, k), C: c[k], Base: base})
			}
		}
	}
	var byRun [][]gust.Point
	for _, run := range runs(rds) {
		var ps []gust.Point
		for _, ri := range run {
			ps = append(ps, pts[ri]...)
		}
		byRun = append(byRun, ps)
	}
	b.gustSD, sdOfSD = gust.Scatter(byRun, b.c.Air.GustSDMs)
	return b.gustSD, sdOfSD
}
