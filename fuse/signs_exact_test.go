package fuse_test

import (
	"math"
	"testing"

	"gonum.org/v1/gonum/integrate/quad"
	"gonum.org/v1/gonum/stat/distuv"

	"liftfuse/fuse"
	"liftfuse/methods/evidence"
)

// TestSignsAloneAgainstQuadrature: the posterior of one configuration's
// total from vortex senses alone — where the sampler's joint step cannot
// move the chain and the component steps do all the moving — against the
// exact posterior by quadrature. With β_f, β_r ~ N(0, σ²) the total
// T = β_f + β_r has prior N(0, 2σ²), and each sense observed has
// probability ε + (1 − 2ε)·Φ(±T/τ) (the misread and soft-threshold model
// of the vortex evidence), so by Bayes' rule the posterior density is
// their product, normalised; its moments by Gauss–Legendre quadrature
// (gonum integrate/quad) and its 5 % and 95 % points from the CDF on a
// fine trapezoid grid. Tolerances in posterior sd: 0.15 on the mean, 0.25
// on the interval's ends (5 and 8 Monte Carlo standard errors at a bulk
// ESS of 1100), 10 % on the sd.
func TestSignsAloneAgainstQuadrature(t *testing.T) {
	const sigma, eps, tau = 0.3, 0.1, 0.05
	for _, tc := range []struct {
		name   string
		senses []bool // true: lift
	}{
		{"all lift", []bool{true, true, true}},
		{"split four to one", []bool{true, true, false, true, true}},
		{"split two to two", []bool{true, false, false, true}},
	} {
		t.Run(tc.name, func(t *testing.T) {
			var signs []evidence.Sign
			for _, up := range tc.senses {
				signs = append(signs, evidence.Sign{Terms: []evidence.Term{{Config: "c", Axle: "front", W: 1}, {Config: "c", Axle: "rear", W: 1}},
					Air: evidence.Airspeed{V: 30}, Lift: up, Misread: eps, Softness: tau, Label: "s"})
			}
			total := evidence.Quantity{Config: "c", Axle: "total"}
			evs := []evidence.Evidence{{Entry: "v", Kind: evidence.KindVortex, Signs: signs, Informs: []evidence.Quantity{total}}}
			P, err := fuse.Fit(evs, fuse.Settings{Configs: []string{"c"}, PriorSD: sigma, Seed: 7, Credible: 0.9})
			if err != nil {
				t.Fatal(err)
			}
			got, _ := P.Quantity(total)

			prior := distuv.Normal{Mu: 0, Sigma: sigma * math.Sqrt2}
			dens := func(x float64) float64 {
				d := prior.Prob(x)
				for _, up := range tc.senses {
					p := eps + (1-2*eps)*distuv.UnitNormal.CDF(x/tau)
					if !up {
						p = 1 - p
					}
					d *= p
				}
				return d
			}
			lo, hi := -10*prior.Sigma, 10*prior.Sigma
			z := quad.Fixed(dens, lo, hi, 400, nil, 0)
			mean := quad.Fixed(func(x float64) float64 { return x * dens(x) }, lo, hi, 400, nil, 0) / z
			vr := quad.Fixed(func(x float64) float64 { return (x - mean) * (x - mean) * dens(x) }, lo, hi, 400, nil, 0) / z
			sd := math.Sqrt(vr)
			q05, q95 := quantiles(dens, lo, hi, 0.05, 0.95)

			t.Logf("sampled mean %.4f sd %.4f [%.4f, %.4f]; exact %.4f %.4f [%.4f, %.4f]", got.Mean, got.SD, got.Lo, got.Hi, mean, sd, q05, q95)
			if d := math.Abs(got.Mean-mean) / sd; d > 0.15 {
				t.Errorf("mean %.4f, exact %.4f (%.2f sd off)", got.Mean, mean, d)
			}
			if r := got.SD / sd; math.Abs(r-1) > 0.1 {
				t.Errorf("sd %.4f, exact %.4f (ratio %.3f)", got.SD, sd, r)
			}
			if d := math.Max(math.Abs(got.Lo-q05), math.Abs(got.Hi-q95)) / sd; d > 0.25 {
				t.Errorf("interval [%.4f, %.4f], exact [%.4f, %.4f] (%.2f sd off)", got.Lo, got.Hi, q05, q95, d)
			}
		})
	}
}

// quantiles returns the points of a density on [lo, hi] (unnormalised)
// below which fractions a and b of its mass lie, by the trapezoid rule on
// 200 000 intervals and linear interpolation.
func quantiles(dens func(float64) float64, lo, hi, a, b float64) (float64, float64) {
	const n = 200000
	h := (hi - lo) / n
	cdf := make([]float64, n+1)
	prev := dens(lo)
	for i := 1; i <= n; i++ {
		cur := dens(lo + float64(i)*h)
		cdf[i] = cdf[i-1] + 0.5*h*(prev+cur)
		prev = cur
	}
	at := func(f float64) float64 {
		target := f * cdf[n]
		for i := 1; i <= n; i++ {
			if cdf[i] >= target {
				return lo + h*(float64(i-1)+(target-cdf[i-1])/(cdf[i]-cdf[i-1]))
			}
		}
		return hi
	}
	return at(a), at(b)
}
