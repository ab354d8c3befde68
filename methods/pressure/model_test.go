package pressure_test

import (
	"math"
	"testing"

	"liftfuse/methods/air"
	"liftfuse/methods/campaign"
	"liftfuse/methods/evidence"
	"liftfuse/methods/pressure"
)

// v2Campaign is a car with drag and a pressure entry with one uncovered
// patch, readings at three speeds in the given direction.
func v2Campaign(dir int) (*campaign.Campaign, *campaign.PressureEntry) {
	taps := closedBody()
	taps = append(taps, campaign.Tap{ID: "roof", XM: 1.6, Surface: campaign.SurfaceUpper, AreaM2: 1.2, Nz: 1})
	e := &campaign.PressureEntry{ID: "taps", Mode: campaign.ModePanels, SensorSDPa: 2, ReferenceSDPa: 3, ModelSDPct: 25, Taps: taps,
		Uncovered: []campaign.Patch{{Surface: campaign.SurfaceLower, XM: 3.2, AreaM2: 0.4, Nz: -1, CpMean: -0.1, CpSD: 0.1}}}
	for _, kmh := range []float64{90, 120, 150} {
		var pa campaign.Values
		q := air.DynamicPressure(1.2, air.KmhToMs(kmh))
		for j, tp := range taps {
			cp := -0.3 + 0.05*math.Sin(float64(3*j))
			if tp.ID == "roof" {
				cp = -0.8
			}
			pa = append(pa, campaign.Value{Key: tp.ID, V: cp * q})
		}
		e.Readings = append(e.Readings, campaign.Reading{Config: "a", SpeedKmh: kmh, Direction: dir, Pa: pa})
	}
	c := &campaign.Campaign{
		Vehicle:        campaign.Vehicle{WheelbaseM: 2.5, Body: campaign.BodyFastback, Drag: &campaign.Drag{CdAM2: 0.6, CentreHeightM: 0.5, SDPct: 20}},
		Configurations: []campaign.Configuration{{ID: "a"}},
		Air:            campaign.Air{TemperatureC: 20, PressureHPa: 1013.25, HumidityPct: 50, CO2ppm: 400, WindSDMs: 1},
	}
	return c, e
}

// predict evaluates an observation's mean at given parameter and nuisance
// values, with no wind (q = Q): s·Σ w·β·Q + Σ c·ν.
func predict(o evidence.Obs, beta map[string]float64, nuis map[string]float64) float64 {
	var lift float64
	for _, t := range o.Terms {
		lift += t.W * beta[t.Axle]
	}
	y := lift * o.Air.Q
	for _, c := range o.Nuis {
		y += c.C * nuis[c.Name]
	}
	return y
}

// TestIntegrationScaleAlgebra: at the truth, every observation's mean
// equals the taps' integral. The truth is built from the physics, not from
// the adapter: the true covered force is s·F_a (the scale multiplies what
// the taps integrate), an uncovered patch carries −Cp·q·A·n_z split by the
// lever rule, and drag D = q·C_D·A at height h pitches the nose up,
// moving D·h/L from the front contact loads to the rear (SAE J1594 axle
// lift; moments about the rear contact patch — common practice, no source).
func TestIntegrationScaleAlgebra(t *testing.T) {
	c, e := v2Campaign(1)
	c.Air.WindSDMs = 0
	res, err := pressure.Reduce(c, e, "")
	if err != nil {
		t.Fatal(err)
	}
	const s, cpU = 0.8, -0.25
	m := 0.6 * 0.5 / 2.5
	u := e.Uncovered[0]
	for ri, rd := range res.Readings {
		q := rd.Q
		unc := -cpU * q * u.AreaM2 * u.Nz
		beta := map[string]float64{
			evidence.AxleFront: (s*rd.Forces.Front + unc*(1-u.XM/2.5) + m*q) / q,
			evidence.AxleRear:  (s*rd.Forces.Rear + unc*u.XM/2.5 - m*q) / q,
		}
		nuis := map[string]float64{pressure.IntegrationName("taps"): s - 1, pressure.DragPitchName: m, "taps/uncovered[0]": cpU}
		for _, o := range readingObs(res.Evidence, ri) {
			if got := predict(o, beta, nuis); math.Abs(got-o.Y) > 1e-9*math.Abs(o.Y)+1e-9 {
				t.Errorf("%s: predicted %.6f at the truth, observed %.6f", o.Label, got, o.Y)
			}
		}
	}
	for _, sg := range res.Evidence.Scales {
		t.Errorf("scale group %q left on the lift term", sg.Name)
	}
}

// TestUndirectedWind: with the direction unknown, the wind's error in q is
// common to the reading's two rows: the covariance grows by σ_w²·c·cᵀ,
// c_a = (dF_a/dq)·ρ·V, a rank-one term (its correlation is ±1), and the
// rows name no wind nuisance; with the direction known they name it and
// the covariance is the sensor's alone.
func TestUndirectedWind(t *testing.T) {
	cd, ed := v2Campaign(1)
	cu, eu := v2Campaign(0)
	directed, err := pressure.Reduce(cd, ed, evidence.WindName)
	if err != nil {
		t.Fatal(err)
	}
	undirected, err := pressure.Reduce(cu, eu, evidence.WindName)
	if err != nil {
		t.Fatal(err)
	}
	rho := cu.Density()
	for ri, rd := range undirected.Readings {
		od, ou := readingObs(directed.Evidence, ri), readingObs(undirected.Evidence, ri)
		cd, cu := readingCov(directed.Evidence, ri), readingCov(undirected.Evidence, ri)
		if od[0].Air.Wind != evidence.WindName || ou[0].Air.Wind != "" {
			t.Fatalf("reading %d: wind %q directed, %q undirected", ri+1, od[0].Air.Wind, ou[0].Air.Wind)
		}
		// The taps here scale exactly with q, so dF/dq = F/q.
		V := air.KmhToMs(rd.SpeedKmh)
		c := [2]float64{rd.Forces.Front / rd.Q * rho * V, rd.Forces.Rear / rd.Q * rho * V}
		for _, ij := range [][2]int{{0, 0}, {0, 1}, {1, 1}} {
			got := cu[ij[0]][ij[1]] - cd[ij[0]][ij[1]]
			if want := c[ij[0]] * c[ij[1]]; math.Abs(got-want) > 1e-6*math.Abs(want)+1e-9 {
				t.Errorf("reading %d cov%v grew by %.4f, want %.4f", ri+1, ij, got, want)
			}
		}
		if want := rd.Q + 0.5*rho; math.Abs(ou[0].Air.Q-want) > 1e-9 {
			t.Errorf("E[q] %.4f, want q + ½ρσ_w² = %.4f", ou[0].Air.Q, want)
		}
	}
}

// at locates row k of reading ri among the blocks (readings in order, two
// rows each): the block and the row's position in it.
func at(ev evidence.Evidence, ri, k int) (evidence.Block, int) {
	n := 2*ri + k
	for _, b := range ev.Blocks {
		if n < len(b.Obs) {
			return b, n
		}
		n -= len(b.Obs)
	}
	panic("no such row")
}

func readingObs(ev evidence.Evidence, ri int) [2]evidence.Obs {
	bf, i := at(ev, ri, 0)
	br, j := at(ev, ri, 1)
	return [2]evidence.Obs{bf.Obs[i], br.Obs[j]}
}

func readingCov(ev evidence.Evidence, ri int) [2][2]float64 {
	b, i := at(ev, ri, 0)
	return [2][2]float64{{b.At(i, i), b.At(i, i+1)}, {b.At(i+1, i), b.At(i+1, i+1)}}
}

// TestRuns: consecutive readings of one configuration and one known
// direction are one pass; a reading of unknown direction is its own run.
// A run's readings share one block, and with a run-to-run wind scatter
// their rows are correlated across readings.
func TestRuns(t *testing.T) {
	c, e := v2Campaign(1)
	e.Readings[2].Direction = -1
	c.Air.GustSDMs = 1.5
	res, err := pressure.Reduce(c, e, evidence.WindName)
	if err != nil {
		t.Fatal(err)
	}
	if len(res.Evidence.Blocks) != 2 || len(res.Evidence.Blocks[0].Obs) != 4 {
		t.Fatalf("%d blocks (first of %d rows), want 2 (first of 4)", len(res.Evidence.Blocks), len(res.Evidence.Blocks[0].Obs))
	}
	if res.GustSDMs <= 0 || res.Evidence.Blocks[0].At(1, 2) == 0 {
		t.Errorf("gust sd %g, cross-reading covariance %g: the run's readings must share its wind", res.GustSDMs, res.Evidence.Blocks[0].At(1, 2))
	}
}

// TestDragPitchPrior: the pitch of drag is declared log-normal with the
// stated m = C_D·A·h_D/L as its median (0.6 m² · 0.5 m / 2.5 m = 0.12 m²,
// hand-worked) and log-sd sd_pct/100, shared by name; sd_pct 0 (valid in
// the campaign format) states m exactly and reduces.
func TestDragPitchPrior(t *testing.T) {
	for _, tc := range []struct {
		name  string
		sdPct float64
	}{
		{"stated to 20 %", 20},
		{"stated exactly", 0},
	} {
		t.Run(tc.name, func(t *testing.T) {
			c, e := v2Campaign(1)
			c.Vehicle.Drag.SDPct = tc.sdPct
			res, err := pressure.Reduce(c, e, evidence.WindName)
			if err != nil {
				t.Fatal(err)
			}
			var got *evidence.Nuisance
			for i, n := range res.Evidence.Nuisances {
				if n.Name == pressure.DragPitchName {
					got = &res.Evidence.Nuisances[i]
				}
			}
			if got == nil || !got.LogNormal || math.Abs(got.Mean-0.12) > 1e-12 || math.Abs(got.SD-tc.sdPct/100) > 1e-12 || got.Unit != "m²" {
				t.Errorf("drag pitch declared %+v, want log-normal, median 0.12 m², log-sd %g", got, tc.sdPct/100)
			}
		})
	}
}
