package reality

import (
	"math"
	"testing"
)

// quiet returns the default day without friction, road, wind or gusts, so
// every hold sample can be checked by hand.
func quiet() *Day {
	d := Default()
	d.defaults()
	d.Car.Front.StictionMm, d.Car.Rear.StictionMm, d.Car.RoadMm = 0, 0, 0
	d.Air.WindMs, d.Air.GustSDMs = 0, 0
	return d
}

// TestHeave checks each sample of the steady holds against the static
// deflection F/k by hand: a pot sees ΔF/(2·k_w), a laser over the rear axle
// ΔF/(2·k_w) + ΔF/(2·k_t) + G·(V/100)², and a creeping speed adds
// m·a·h/L to the front and takes it from the rear.
func TestHeave(t *testing.T) {
	cases := []struct {
		name  string
		creep float64 // km/h/s
	}{{"steady", 0}, {"creeping", 0.75}}
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			d := quiet()
			d.Runs.CreepKmhPerS = c.creep
			rho := Density(d.Air.TemperatureC, d.Air.PressureHPa, d.Air.HumidityPct)
			tr := buildTrace(d)
			st := simulate(d, tr, rho, 1)
			car := d.Car
			kf, kr := WheelRate(car.Front.SpringNPerMm, car.Front.MotionRatio), WheelRate(car.Rear.SpringNPerMm, car.Rear.MotionRatio)
			laser := d.Sensors[2]
			for _, h := range tr.holds {
				cf := d.Configs[h.Cfg]
				for k := h.From; k < h.To; k++ {
					v := tr.v[k]
					q := 0.5 * rho * v * v
					dm := car.MassKg * (c.creep / 3.6) * car.CGHeightM / car.WheelbaseM
					Ff, Fr := q*cf.Front+dm, q*cf.Rear-dm
					near(t, "front pot", st.suspF[k], Ff/(2*kf), 1e-9)
					g := car.TyreGrowthMm * math.Pow(v*3.6/100, 2)
					want := car.Rear.StaticHeightMm + Fr/(2*kr) + Fr/(2*car.Rear.TyreNPerMm) + g
					near(t, "rear laser", laser.reading(d, st, k), want, 1e-9)
				}
			}
		})
	}
}

// TestTrace checks the driving plan: every hold's mean speed is its
// nominal speed, its acceleration the creep rate, and passes alternate
// direction.
func TestTrace(t *testing.T) {
	d := quiet()
	d.Runs.CreepKmhPerS = 0.5
	tr := buildTrace(d)
	if want := len(d.Configs) * 2 * d.Runs.Repeats * len(d.Runs.SpeedsKmh); len(tr.holds) != want {
		t.Fatalf("%d holds, want %d", len(tr.holds), want)
	}
	for _, h := range tr.holds {
		var mean float64
		for k := h.From; k < h.To; k++ {
			mean += tr.v[k] * 3.6 / float64(h.To-h.From)
			near(t, "hold acceleration", tr.a[k], 0.5/3.6, 1e-12)
		}
		// The samples are the left ends of the hold's grid steps: the mean
		// sits half a step of creep below the centre.
		near(t, "hold mean", mean, h.SpeedKmh-0.5*0.5/d.Log.RateHz, 1e-9)
	}
	for i, p := range tr.passes {
		if want := 1 - 2*(i%(2*d.Runs.Repeats)%2); p.Dir != want {
			t.Errorf("pass %d direction %d, want %d", i, p.Dir, want)
		}
	}
}

// TestTapSeries: with no noise and no reference offset, the logged taps
// integrate at every sample to q·(β_f − m), q·(β_r + m) less the
// untapped patches — the truth's pressure part (hand-worked split by
// moments about the front axle).
func TestTapSeries(t *testing.T) {
	d := quiet()
	e := &d.Taps[0]
	e.SampleSDPa, e.ReferenceSDPa = 1e-300, 0
	rho := Density(d.Air.TemperatureC, d.Air.PressureHPa, d.Air.HumidityPct)
	tr := buildTrace(d)
	st := simulate(d, tr, rho, 1)
	cols, err := e.series(d, tr, st, 1)
	if err != nil {
		t.Fatal(err)
	}
	L := d.Car.WheelbaseM
	m := DragPitch(d.Car.CdAM2, d.Car.DragHeightM, L)
	for _, k := range []int{tr.holds[0].From, tr.holds[5].To - 1, tr.holds[len(tr.holds)-1].From + 3} {
		var front, rear float64
		for i, p := range e.Panels {
			f, r := split(-cols[i][k]*p.AreaM2*p.Nz, p.XM, L)
			front, rear = front+f, rear+r
		}
		for _, u := range e.Uncovered {
			f, r := split(st.q[k]*panelForce(u.CpTrue, u.AreaM2, u.Nz), u.XM, L)
			front, rear = front+f, rear+r
		}
		c := d.Configs[tr.cfg[k]]
		near(t, "front", front, st.q[k]*(c.Front-m), 1e-9)
		near(t, "rear", rear, st.q[k]*(c.Rear+m), 1e-9)
	}
}
