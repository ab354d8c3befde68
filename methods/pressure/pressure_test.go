package pressure_test

import (
	"fmt"
	"math"
	"testing"

	"gonum.org/v1/gonum/mat"

	"liftfuse/fuse"
	"liftfuse/methods/air"
	"liftfuse/methods/campaign"
	"liftfuse/methods/evidence"
	"liftfuse/methods/pressure"
)

// cylinderCp is the potential-flow pressure coefficient on a circular
// cylinder, Cp = 1 − 4 sin²θ (Anderson, Fundamentals of Aerodynamics,
// §3.13 — from memory).
func cylinderCp(theta float64) float64 { s := math.Sin(theta); return 1 - 4*s*s }

// TestCylinderUpperHalf: the upper half of a cylinder alone carries an
// upward force coefficient of 5/3 on the diameter. Per unit span, with the
// outward normal's vertical component sin θ and p = q·Cp,
//
//	F/(q·2R) = −½ ∫₀^π Cp(θ) sin θ dθ = −½ (2 − 4·4/3) = 5/3.
//
// Both integration modes must reach it: panels around the arc (area R·Δθ,
// nz = sin θ) and centreline strips along x = R(1 − cos θ) of unit width
// (the plan-view projection).
func TestCylinderUpperHalf(t *testing.T) {
	const R, n = 0.5, 2000
	const tol = 1e-5 // both rules converge as 1/n²: about 1e-6 here
	q := 1.0
	var panels, strips []campaign.Tap
	pa := map[string]float64{}
	for k := range n {
		th := math.Pi * (float64(k) + 0.5) / n // panel midpoints
		id := fmt.Sprintf("p%d", k)
		panels = append(panels, campaign.Tap{ID: id, XM: R * (1 - math.Cos(th)), Surface: campaign.SurfaceUpper, AreaM2: R * math.Pi / n, Nz: math.Sin(th)})
		pa[id] = q * cylinderCp(th)
	}
	for k := 0; k <= n; k++ {
		th := math.Pi * float64(k) / n // stations, ends included
		id := fmt.Sprintf("s%d", k)
		strips = append(strips, campaign.Tap{ID: id, XM: R * (1 - math.Cos(th)), Surface: campaign.SurfaceUpper, WidthM: 1})
		pa[id] = q * cylinderCp(th)
	}
	for _, tt := range []struct {
		mode string
		taps []campaign.Tap
	}{{campaign.ModePanels, panels}, {campaign.ModeStrips, strips}} {
		t.Run(tt.mode, func(t *testing.T) {
			ps, err := pressure.Panels(&campaign.PressureEntry{Mode: tt.mode, Taps: tt.taps})
			if err != nil {
				t.Fatal(err)
			}
			f := pressure.Integrate(ps, func(id string) float64 { return pa[id] }, 2*R)
			if c := f.Total / (q * 2 * R); math.Abs(c-5.0/3) > tol {
				t.Errorf("force coefficient %.7f, want 5/3", c)
			}
			// Fore-aft symmetry: the moment about the front axle at x = 0 with
			// the rear axle at x = 2R splits the load evenly.
			if math.Abs(f.Front-f.Rear) > tol {
				t.Errorf("split %.6f / %.6f, want equal halves", f.Front, f.Rear)
			}
		})
	}
}

// TestFlatPlate: a flat roof panel under uniform suction p carries −p·A
// exactly, split to the axles by the lever rule.
func TestFlatPlate(t *testing.T) {
	ps := []pressure.Panel{{ID: "a", X: 0.9, Surface: campaign.SurfaceUpper, A: 2, Nz: 1}}
	f := pressure.Integrate(ps, func(string) float64 { return -100 }, 2.5)
	if f.Total != 200 {
		t.Errorf("force %v N, want 200", f.Total)
	}
	// Lever rule: the rear axle takes F·x/L = 200·0.9/2.5 = 72 N.
	if math.Abs(f.Rear-72) > 1e-12 || math.Abs(f.Front-128) > 1e-12 {
		t.Errorf("split %v / %v, want 128 / 72", f.Front, f.Rear)
	}
}

// closedBody is a box covered top and bottom: every upper panel has a floor
// panel of the same plan-view area at the same x, so Σ A·n = 0.
func closedBody() []campaign.Tap {
	var taps []campaign.Tap
	for i, x := range []float64{-0.5, 0.4, 1.2, 2.0, 2.9} {
		a := 0.4 + 0.1*float64(i)
		taps = append(taps,
			campaign.Tap{ID: fmt.Sprintf("u%d", i), XM: x, Surface: campaign.SurfaceUpper, AreaM2: a / 0.8, Nz: 0.8},
			campaign.Tap{ID: fmt.Sprintf("l%d", i), XM: x, Surface: campaign.SurfaceLower, AreaM2: a, Nz: -1})
	}
	return taps
}

// TestReferenceOffsetCancels: on a body covered top and bottom, an offset of
// the reference port adds −δ·Σ A·n to the total, which is nothing (common
// practice, no source); the axle split keeps it too where each station is
// covered on both sides.
func TestReferenceOffsetCancels(t *testing.T) {
	taps := closedBody()
	ps, err := pressure.Panels(&campaign.PressureEntry{Mode: campaign.ModePanels, Taps: taps})
	if err != nil {
		t.Fatal(err)
	}
	p := func(id string) float64 { return -50 * float64(len(id)) * (1 + float64(id[1]-'0')) }
	base := pressure.Integrate(ps, p, 2.5)
	shifted := pressure.Integrate(ps, func(id string) float64 { return p(id) + 37 }, 2.5)
	if d := shifted.Total - base.Total; math.Abs(d) > 1e-9 {
		t.Errorf("a 37 Pa reference offset moved the total by %g N", d)
	}
	if d := shifted.Rear - base.Rear; math.Abs(d) > 1e-9 {
		t.Errorf("a 37 Pa reference offset moved the rear by %g N", d)
	}
}

// TestStripsMatchTrapezoid: strips on a centreline reproduce a trapezoid
// integral of −p·w along x computed here by hand, stations unevenly spaced.
func TestStripsMatchTrapezoid(t *testing.T) {
	xs := []float64{-0.3, 0.2, 0.9, 1.1, 2.0, 2.7}
	ws := []float64{1.1, 1.3, 1.2, 1.25, 1.3, 1.0}
	ps := []float64{-120, -300, -80, -260, -140, -60}
	var taps []campaign.Tap
	pa := map[string]float64{}
	for i := range xs {
		id := fmt.Sprintf("c%d", i)
		taps = append(taps, campaign.Tap{ID: id, XM: xs[i], Surface: campaign.SurfaceUpper, WidthM: ws[i]})
		pa[id] = ps[i]
	}
	panels, err := pressure.Panels(&campaign.PressureEntry{Mode: campaign.ModeStrips, Taps: taps})
	if err != nil {
		t.Fatal(err)
	}
	f := pressure.Integrate(panels, func(id string) float64 { return pa[id] }, 2.5)
	var want, wantMoment float64
	for i := 0; i+1 < len(xs); i++ {
		h := xs[i+1] - xs[i]
		a, b := -ps[i]*ws[i], -ps[i+1]*ws[i+1]
		want += h * (a + b) / 2
		wantMoment += h * (a*xs[i] + b*xs[i+1]) / 2
	}
	if math.Abs(f.Total-want) > 1e-9 || math.Abs(f.Rear-wantMoment/2.5) > 1e-9 {
		t.Errorf("strips give %v (rear %v), trapezoid %v (rear %v)", f.Total, f.Rear, want, wantMoment/2.5)
	}
	// The same data written as panels with the tributary areas by hand.
	var asPanels []campaign.Tap
	for i := range xs {
		lo, hi := xs[max(i-1, 0)], xs[min(i+1, len(xs)-1)]
		if i == 0 {
			lo = xs[0]
		}
		asPanels = append(asPanels, campaign.Tap{ID: taps[i].ID, XM: xs[i], Surface: campaign.SurfaceUpper, AreaM2: ws[i] * (hi - lo) / 2, Nz: 1})
	}
	pp, _ := pressure.Panels(&campaign.PressureEntry{Mode: campaign.ModePanels, Taps: asPanels})
	g := pressure.Integrate(pp, func(id string) float64 { return pa[id] }, 2.5)
	if math.Abs(g.Total-f.Total) > 1e-9 || math.Abs(g.Rear-f.Rear) > 1e-9 {
		t.Errorf("panels %v, strips %v", g, f)
	}
}

// TestConjugatePosterior: with no scale factor, wind, drag or uncovered
// patch, the pressure evidence is linear-Gaussian, and its standalone
// posterior must equal the conjugate one computed here from scratch:
// prior N(0, σ²I) on (β_f, β_r) of each configuration, one 2×2 block per
// reading with covariance Σ_k σ_p²·g_k g_kᵀ + σ_ref²·u uᵀ.
func TestConjugatePosterior(t *testing.T) {
	const L, sigP, sigRef, priorSD = 2.5, 3.0, 6.0, 1.0
	taps := closedBody()
	taps = append(taps, campaign.Tap{ID: "extra", XM: 1.6, Surface: campaign.SurfaceUpper, AreaM2: 0.7, Nz: 1})
	e := campaign.PressureEntry{ID: "taps", Mode: campaign.ModePanels, SensorSDPa: sigP, ReferenceSDPa: sigRef, ModelSDPct: 0, Taps: taps}
	readings := []conjReading{{"a", 100}, {"a", 130}, {"b", 100}, {"b", 120}}
	for i, r := range readings {
		var pa campaign.Values
		for j, tp := range taps {
			pa = append(pa, campaign.Value{Key: tp.ID, V: -200 + 30*math.Sin(float64(3*i+j))})
		}
		e.Readings = append(e.Readings, campaign.Reading{Config: r.config, SpeedKmh: r.kmh, Direction: 1, Pa: pa})
	}
	c := &campaign.Campaign{
		Vehicle:        campaign.Vehicle{WheelbaseM: L, Body: campaign.BodyFastback},
		Configurations: []campaign.Configuration{{ID: "a"}, {ID: "b"}},
		Air:            campaign.Air{TemperatureC: 20, PressureHPa: 1013.25, HumidityPct: 50, CO2ppm: 400},
	}
	res, err := pressure.Reduce(c, &e, "")
	if err != nil {
		t.Fatal(err)
	}
	P, err := fuse.Fit([]evidence.Evidence{res.Evidence}, fuse.Settings{Configs: []string{"a", "b"}, PriorSD: priorSD, Seed: 1, Credible: 0.9})
	if err != nil {
		t.Fatal(err)
	}

	mean, cov := conjugate(t, &e, readings, L, sigP, sigRef, priorSD)
	const rel = 1e-6
	for i, q := range []evidence.Quantity{{Config: "a", Axle: "front"}, {Config: "a", Axle: "rear"}, {Config: "b", Axle: "front"}, {Config: "b", Axle: "rear"}} {
		got, _ := P.Quantity(q)
		if math.Abs(got.Mean-mean.AtVec(i)) > rel*math.Abs(mean.AtVec(i)) || math.Abs(got.SD-math.Sqrt(cov.At(i, i))) > rel*math.Sqrt(cov.At(i, i)) {
			t.Errorf("%v: %v ± %v, closed form %v ± %v", q, got.Mean, got.SD, mean.AtVec(i), math.Sqrt(cov.At(i, i)))
		}
	}
}

func ExampleTrapezoidWeights() {
	// Centreline stations at x = 0, 0.4 and 1.4 m: each stands for half of
	// the gaps beside it.
	fmt.Printf("%.2f\n", pressure.TrapezoidWeights([]float64{0, 0.4, 1.4}))
	// Output: [0.20 0.70 0.50]
}

// conjugate is the closed-form posterior of TestConjugatePosterior, from
// scratch. Parameters: βf(a), βr(a), βf(b), βr(b).
func conjugate(t *testing.T, e *campaign.PressureEntry, readings []conjReading, L, sigP, sigRef, priorSD float64) (mat.VecDense, mat.SymDense) {
	taps := e.Taps
	rho := air.Density(20, 101325, 0.5, 0.0004)
	prec := mat.NewSymDense(4, nil)
	for i := range 4 {
		prec.SetSym(i, i, 1/(priorSD*priorSD))
	}
	rhs := mat.NewVecDense(4, nil)
	for i, r := range readings {
		q := 0.5 * rho * math.Pow(r.kmh/3.6, 2)
		cov := mat.NewSymDense(2, nil)
		var u [2]float64
		var y [2]float64
		for _, tp := range taps {
			pk, _ := e.Readings[i].Pa.Get(tp.ID)
			an := tp.AreaM2 * tp.Nz
			g := [2]float64{an * (1 - tp.XM/L), an * tp.XM / L}
			y[0] -= pk * g[0]
			y[1] -= pk * g[1]
			u[0] -= g[0]
			u[1] -= g[1]
			for a := range 2 {
				for b := a; b < 2; b++ {
					cov.SetSym(a, b, cov.At(a, b)+sigP*sigP*g[a]*g[b])
				}
			}
		}
		for a := range 2 {
			for b := a; b < 2; b++ {
				cov.SetSym(a, b, cov.At(a, b)+sigRef*sigRef*u[a]*u[b])
			}
		}
		var w mat.SymDense
		var ch mat.Cholesky
		ch.Factorize(cov)
		ch.InverseTo(&w)
		col := 0
		if r.config == "b" {
			col = 2
		}
		X := mat.NewDense(2, 4, nil)
		X.Set(0, col, q)
		X.Set(1, col+1, q)
		var xtw mat.Dense
		xtw.Mul(X.T(), &w)
		var xtwx mat.Dense
		xtwx.Mul(&xtw, X)
		for a := range 4 {
			for b := a; b < 4; b++ {
				prec.SetSym(a, b, prec.At(a, b)+xtwx.At(a, b))
			}
		}
		var xtwy mat.VecDense
		xtwy.MulVec(&xtw, mat.NewVecDense(2, y[:]))
		rhs.AddVec(rhs, &xtwy)
	}
	var ch mat.Cholesky
	if !ch.Factorize(prec) {
		t.Fatal("posterior precision not positive definite")
	}
	var mean mat.VecDense
	ch.SolveVecTo(&mean, rhs)
	var cov mat.SymDense
	ch.InverseTo(&cov)
	return mean, cov
}

// conjReading is a reading of TestConjugatePosterior.
type conjReading struct {
	config string
	kmh    float64
}
