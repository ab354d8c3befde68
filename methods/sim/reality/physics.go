package reality

import "math"

// refSpeed is the reference speed of the linear speed model, m/s.
const refSpeed = 100 / 3.6

// state is the physics of every sample of the trace.
type state struct {
	vAir, q      []float64 // airspeed m/s, dynamic pressure Pa
	upF, upR     []float64 // upward load change on each axle's contact patches, N
	suspF, suspR []float64 // suspension extension at the wheel after friction, mm
	bodyF, bodyR []float64 // body rise at the axle, suspension and tyres, mm
	growth       []float64 // tyre growth, mm
	gusts        []float64 // wind deviation of each pass, m/s
}

// lift returns the axle lift coefficients (m²) of configuration c at
// airspeed v: β + γ·(v − V_ref)/V_ref.
func lift(c Config, v float64) (front, rear float64) {
	s := (v - refSpeed) / refSpeed
	return c.Front + c.FrontSlope*s, c.Rear + c.RearSlope*s
}

// simulate runs the car through the trace.
func simulate(d *Day, tr *trace, rho float64, seed int64) *state {
	n := len(tr.t)
	st := &state{vAir: make([]float64, n), q: make([]float64, n), upF: make([]float64, n), upR: make([]float64, n),
		suspF: make([]float64, n), suspR: make([]float64, n), bodyF: make([]float64, n), bodyR: make([]float64, n),
		growth: make([]float64, n)}
	gr := stream(seed, "gust/run")
	st.gusts = make([]float64, len(tr.passes))
	for i := range st.gusts {
		st.gusts[i] = d.Air.GustSDMs * gr.NormFloat64()
	}
	within := newAR1(stream(seed, "gust/within"), d.Air.WithinSDMs, math.Exp(-1/(d.Log.RateHz*d.Air.WithinTauS)))
	car := d.Car
	L := car.WheelbaseM
	wf, wr := newWheel(car.Front), newWheel(car.Rear)
	pf, pr := &play{f: car.Front.StictionMm}, &play{f: car.Rear.StictionMm}
	phi := math.Exp(-1 / (d.Log.RateHz * 0.05)) // road inputs: 50 ms correlation
	rf := newAR1(stream(seed, "road/front"), car.RoadMm, phi)
	rr := newAR1(stream(seed, "road/rear"), car.RoadMm, phi)
	for k := range n {
		dir := float64(tr.dir[k])
		st.vAir[k] = tr.v[k] + dir*(d.Air.WindMs+st.gusts[tr.pass[k]]+within.next())
		st.q[k] = DynamicPressure(rho, st.vAir[k])
		bf, br := lift(d.Configs[tr.cfg[k]], st.vAir[k])
		dm := LoadTransfer(car.MassKg, tr.a[k], car.CGHeightM, L)
		st.upF[k] = st.q[k]*bf + dm
		st.upR[k] = st.q[k]*br - dm
		// Each wheel carries half its axle's load change; lift unloads it.
		// Road inputs scale with speed and shake the friction band.
		road := tr.v[k] / refSpeed
		st.suspF[k] = pf.step(-wf.compression(-st.upF[k]/2) + road*rf.next())
		st.suspR[k] = pr.step(-wr.compression(-st.upR[k]/2) + road*rr.next())
		st.bodyF[k] = st.suspF[k] + st.upF[k]/(2*wf.tyre)
		st.bodyR[k] = st.suspR[k] + st.upR[k]/(2*wr.tyre)
		g := tr.v[k] / refSpeed
		st.growth[k] = car.TyreGrowthMm * g * g
	}
	return st
}
