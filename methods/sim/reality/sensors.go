package reality

import (
	"math/rand/v2"
)

// standardGravity is g_n, m/s² (CGPM 1901; ISO 80000-3).
const standardGravity = 9.80665

// position returns a sensor's true spot position behind the front axle.
func (s Sensor) position(L float64) float64 {
	if s.XSet || s.XM != 0 {
		return s.XM
	}
	if s.Axle == "rear" {
		return L
	}
	return 0
}

// reading returns what a sensor measures at sample k, mm, before noise: a
// pot its axle's suspension extension, a laser the body-to-ground height
// at its spot (static height, body rise with tyres, tyre growth).
func (s Sensor) reading(d *Day, st *state, k int) float64 {
	if !s.Laser {
		if s.Axle == "rear" {
			return st.suspR[k]
		}
		return st.suspF[k]
	}
	L := d.Car.WheelbaseM
	x := s.position(L)
	static := atX(d.Car.Front.StaticHeightMm, d.Car.Rear.StaticHeightMm, x, L)
	return static + atX(st.bodyF[k], st.bodyR[k], x, L) + st.growth[k]
}

// signals returns a sensor's logged signal at every sample:
// (reading + AR(1) noise)/gain + offset.
func (s Sensor) signals(d *Day, st *state, seed int64) []float64 {
	noise := newAR1(stream(seed, "noise/"+s.ID), s.NoiseMm, s.NoisePhi)
	out := make([]float64, len(st.q))
	for k := range out {
		out[k] = (s.reading(d, st, k)+noise.next())/s.MmPerUnit + s.OffsetUnits
	}
	return out
}

// ballast returns the sensor's signal with each ballast mass added at rest
// (engine off, no aero): the mass splits to the axles by its position, each
// wheel takes half its axle's share through the spring law, the tyres
// deflect, the friction band leaves the body anywhere within ±f, and the
// reading carries a fifth of the sensor's noise (a few seconds averaged).
func (s Sensor) ballast(d *Day, seed int64) []float64 {
	r := stream(seed, "ballast/"+s.ID)
	car := d.Car
	L := car.WheelbaseM
	wf, wr := newWheel(car.Front), newWheel(car.Rear)
	out := make([]float64, len(s.BallastKg))
	for i, m := range s.BallastKg {
		W := m * standardGravity
		lf, lr := W*(1-s.BallastXM/L), W*s.BallastXM/L
		ef := -wf.compression(lf/2) + band(r, car.Front.StictionMm)
		er := -wr.compression(lr/2) + band(r, car.Rear.StictionMm)
		var mm float64
		switch {
		case !s.Laser && s.Axle == "rear":
			mm = er
		case !s.Laser:
			mm = ef
		default:
			x := s.position(L)
			bf, br := ef-lf/(2*wf.tyre), er-lr/(2*wr.tyre)
			mm = atX(car.Front.StaticHeightMm, car.Rear.StaticHeightMm, x, L) + atX(bf, br, x, L)
		}
		out[i] = (mm+0.2*s.NoiseMm*r.NormFloat64())/s.MmPerUnit + s.OffsetUnits
	}
	return out
}

// band draws where friction leaves the body: uniform in ±f.
func band(r *rand.Rand, f float64) float64 { return f * (2*r.Float64() - 1) }
