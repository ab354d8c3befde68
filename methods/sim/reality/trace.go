package reality

import "math"

// trace is the day's speed history on a uniform time grid: the passes of
// every configuration, with the logger off between configurations.
type trace struct {
	t, v, a []float64 // time s, true ground speed m/s, acceleration m/s²
	dir     []int     // travel direction ±1
	cfg     []int     // configuration index
	pass    []int     // pass index
	hold    []int     // hold index, −1 outside a steady hold
	holds   []hold
	passes  []span
	blocks  []span // one per configuration
}

// span is a stretch of samples [From, To) of one configuration.
type span struct {
	Cfg, Dir, From, To int
}

// hold is one steady hold: its samples, its nominal speed and its pass.
type hold struct {
	span
	Pass     int
	SpeedKmh float64
}

// buildTrace lays out the runs of every configuration. Each pass stands,
// ramps at the plan's acceleration to each speed, holds it (rising at the
// creep rate, centred on the speed), ramps to rest and stands again;
// passes alternate direction starting with +1.
func buildTrace(d *Day) *trace {
	tr := &trace{}
	r := d.Runs
	dt := 1 / d.Log.RateHz
	T := 0.0
	for ci := range d.Configs {
		if ci > 0 {
			T += r.ChangeS
		}
		b := span{Cfg: ci, Dir: 1, From: len(tr.t)}
		for p := 0; p < 2*r.Repeats; p++ {
			dir := 1 - 2*(p%2)
			T = tr.addPass(d, ci, dir, T, dt)
		}
		b.To = len(tr.t)
		tr.blocks = append(tr.blocks, b)
	}
	return tr
}

// addPass appends one pass starting at time T and returns the time after it.
func (tr *trace) addPass(d *Day, ci, dir int, T, dt float64) float64 {
	r := d.Runs
	pi := len(tr.passes)
	ps := span{Cfg: ci, Dir: dir, From: len(tr.t)}
	creep := kmh(r.CreepKmhPerS) // m/s²
	phase := func(dur, v0, v1 float64, hi int) {
		n := int(math.Round(dur / dt))
		if n < 1 {
			return
		}
		acc := (v1 - v0) / (float64(n) * dt)
		for j := range n {
			tr.t = append(tr.t, T+float64(j)*dt)
			tr.v = append(tr.v, v0+(v1-v0)*float64(j)/float64(n))
			tr.a = append(tr.a, acc)
			tr.dir = append(tr.dir, dir)
			tr.cfg = append(tr.cfg, ci)
			tr.pass = append(tr.pass, pi)
			tr.hold = append(tr.hold, hi)
		}
		T += float64(n) * dt
	}
	phase(r.StandS, 0, 0, -1)
	v := 0.0
	for _, s := range r.SpeedsKmh {
		half := creep * r.HoldS / 2
		v0, v1 := kmh(s)-half, kmh(s)+half
		phase(math.Abs(v0-v)/r.AccelMs2, v, v0, -1)
		h := hold{span: span{Cfg: ci, Dir: dir, From: len(tr.t)}, Pass: pi, SpeedKmh: s}
		phase(r.HoldS, v0, v1, len(tr.holds))
		h.To = len(tr.t)
		tr.holds = append(tr.holds, h)
		v = v1
	}
	phase(v/r.AccelMs2, v, 0, -1)
	phase(r.StandS, 0, 0, -1)
	ps.To = len(tr.t)
	tr.passes = append(tr.passes, ps)
	return T
}
