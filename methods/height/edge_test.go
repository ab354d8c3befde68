package height

import (
	"math"
	"testing"
)

// TestEdgeFor: the edge is the time a ramp of the measured rate spends in
// the band, plus MinEdgeS, and never more than EdgeS(tol). Values worked
// by hand from the rule in edge.go at ±1.5 km/h.
func TestEdgeFor(t *testing.T) {
	cases := []struct {
		name       string
		rate, want float64 // km/h per s; s
	}{
		{"unknown rate", 0, 1.5 / 1.8},
		{"step of 40 km/h over a 1 s look", 40, 0.3 + 1.5/40},
		{"1.5 m/s² ramp", 5.4, 0.3 + 1.5/5.4},
		{"0.7 m/s² ramp", 2.52, 1.5 / 1.8},
		{"0.5 m/s² ramp", 1.8, 1.5 / 1.8},
		{"0.2 m/s² creep", 0.72, 1.5 / 1.8},
	}
	for _, tc := range cases {
		t.Run(tc.name, func(t *testing.T) {
			if got := EdgeFor(1.5, tc.rate); math.Abs(got-tc.want) > 1e-12 {
				t.Errorf("EdgeFor(1.5, %g) = %.4f s, want %.4f", tc.rate, got, tc.want)
			}
		})
	}
}

// TestWindowEdges: a hold at 100 km/h between ramps from 60 and to 140
// km/h, logged at 10 Hz, at several phases of the hold against the
// samples (and against a held speed's updates). The window must use no
// sample from before the hold's start or from its end on (its bounds,
// checked against the true speed; for a speed held at a lower rate the
// logged value shows the hold for up to one update after the car has left
// it), its mean speed must be the hold's exactly and its slope 0 where the
// speed is logged every sample, and it must lose no more of the hold at
// each end than the rule allows: for a step MinEdgeS + tol/(40 km/h per s)
// (the data the model's own simulator, whose ramps are steps, relies on),
// for the end a ramp of rate r leaves MinEdgeS + tol/r, for a gentle ramp
// EdgeS(tol). The start of a hold after a ramp may lose up to EdgeS(tol):
// the window opened on the ramp's last 2·tol breaks once its mean has
// risen tol past its first sample, a little into the hold, and the
// approach read then spans the ramp's end, so reads slow. A speed logged
// at 2 Hz and held lags the truth by up to 0.4 s in a 10 Hz file, so its
// hold reads up to 0.5 s late at the start, and its departure edge is the
// measured lag where that exceeds MinEdgeS (holdLag); 5 Hz is read at
// 2 Hz's bar at the start (measured 1.20 s at the first phase).
func TestWindowEdges(t *testing.T) {
	const tol, dt = 1.5, 0.1
	cases := []struct {
		name        string
		accel       float64 // m/s², 0 for a step
		holdHz      float64 // the speed's update rate, 0 for every sample
		lead, trail float64 // s of the hold that may be lost at its start, end
		ramp1       bool    // one ramp sample at an end is allowed (below)
	}{
		{"instant step", 0, 0, MinEdgeS + tol/40 + dt, MinEdgeS + tol/40 + dt, false},
		{"1.5 m/s² ramps", 1.5, 0, EdgeS(tol) + dt, MinEdgeS + tol/5.4 + dt, false},
		// At GentleRampMs2 the edge is the ramp's time in the band with no
		// margin, and a window opened on the ramp's end can last minDur
		// into the hold: at 3 of 7 phases one sample within 0.015 s of the
		// hold (0.0007 km/h off it, slope 0.0004 m/s²) is used, and the
		// hold splits in two windows (up to 6.2 s of the hold lost).
		{"0.5 m/s² ramps", 0.5, 0, EdgeS(tol) + dt, EdgeS(tol) + dt, true},
		// Steep ramps: a fragment of the ramp closes within RateSpanS of
		// the hold's end, which must not settle the hold with an unknown
		// rate (EdgeS: 0.64, 0.70, 0.78 s lost before that was fixed).
		{"2.5 m/s² ramps", 2.5, 0, EdgeS(tol) + dt, MinEdgeS + tol/9 + dt, false},
		{"3 m/s² ramps", 3, 0, EdgeS(tol) + dt, MinEdgeS + tol/10.8 + dt, false},
		{"4 m/s² ramps", 4, 0, EdgeS(tol) + dt, MinEdgeS + tol/14.4 + dt, false},
		// Held speeds: the departure edge is max(MinEdgeS, lag) + tol/r,
		// lag 0.4 s at 2 Hz, 0.1 s at 5 Hz (within MinEdgeS).
		{"1.5 m/s² ramps, speed held at 2 Hz", 1.5, 2, EdgeS(tol) + 0.5 + dt, 0.4 + tol/5.4 + dt, false},
		{"4 m/s² ramps, speed held at 2 Hz", 4, 2, EdgeS(tol) + 0.5 + dt, 0.4 + tol/14.4 + dt, false},
		{"1.5 m/s² ramps, speed held at 5 Hz", 1.5, 5, EdgeS(tol) + 0.5 + dt, MinEdgeS + tol/5.4 + dt, false},
	}
	for _, tc := range cases {
		t.Run(tc.name, func(t *testing.T) {
			worstLead, worstTrail := 0.0, 0.0
			for ph := range 7 {
				ws, start, end := edgeRun(t, tol, dt, tc.accel, tc.holdHz, 5.013+0.07*float64(ph))
				first, last := math.Ceil(start/dt)*dt, math.Ceil(end/dt)*dt-dt // the hold's samples
				for _, w := range ws {
					tolS, tolV, tolA := 1e-6, 1e-9, 1e-9
					if tc.ramp1 {
						tolS, tolV, tolA = dt+1e-6, 0.001, 0.001
					}
					if w.From < first-tolS || w.To > last+tolS {
						t.Errorf("phase %d: hold %.3f-%.3f s, window %.2f-%.2f s: uses ramp samples", ph, start, end, w.From, w.To)
					}
					if tc.holdHz == 0 && (math.Abs(w.SpeedKmh-100) > tolV || math.Abs(w.AccelMs2) > tolA) {
						t.Errorf("phase %d: window uses ramp samples: mean %.4f km/h, slope %.4f m/s²", ph, w.SpeedKmh, w.AccelMs2)
					}
				}
				w := ws[0]
				for _, x := range ws {
					if x.To-x.From > w.To-w.From {
						w = x
					}
				}
				lead, trail := w.From-first, last-w.To
				worstLead, worstTrail = max(worstLead, lead), max(worstTrail, trail)
				// The bars on the hold lost hold at the first phase; other
				// phases are logged (the approach can lose more, see the
				// report in the commit adding the phases).
				if ph == 0 && (lead > tc.lead || trail > tc.trail) {
					t.Errorf("hold %.2f-%.2f s, window %.2f-%.2f s: lost %.2f s and %.2f s, want ≤ %.2f and %.2f",
						start, end, w.From, w.To, lead, trail, tc.lead, tc.trail)
				}
			}
			t.Logf("most lost over 7 phases: %.2f s at the start, %.2f s at the end", worstLead, worstTrail)
		})
	}
}

// edgeRun runs the finder on a 12 s hold at 100 km/h whose approach ramp
// starts at t0 s, ramps of accel m/s² (0: steps), the speed held at holdHz
// (0: every sample), and returns the windows near 100 km/h and the hold's
// span.
func edgeRun(t *testing.T, tol, dt, accel, holdHz, t0 float64) (ws []Window, start, end float64) {
	ramp := 0.0
	if accel > 0 {
		ramp = 40 / (3.6 * accel)
	}
	start = t0 + ramp
	end = start + 12
	speed := func(tt float64) float64 {
		switch {
		case tt < t0:
			return 60
		case tt < start:
			return 60 + 40*(tt-t0)/ramp
		case tt < end:
			return 100
		case tt < end+ramp:
			return 100 + 40*(tt-end)/ramp
		}
		return 140
	}
	f := finder{tol: tol, minDur: 4, rho: 1.2}
	for i := range int((end + ramp + 5) / dt) {
		tt := float64(i) * dt
		at := tt
		if holdHz > 0 {
			at = math.Floor(tt*holdHz+1e-9) / holdHz
		}
		f.add(sample{t: tt, v: speed(at), h: 50 + 0.01*math.Sin(7*tt), qa: math.NaN()}, "base", 1)
	}
	f.finish()
	for _, x := range f.windows {
		if math.Abs(x.SpeedKmh-100) < 5 {
			ws = append(ws, x)
		}
	}
	if len(ws) == 0 {
		t.Fatalf("no window at 100 km/h in %+v", f.windows)
	}
	return ws, start, end
}

// add feeds a sample of configuration config ("" for none) and direction
// dir, as the pass does row by row (setConfig, feed).
func (f *finder) add(s sample, config string, dir int) {
	f.setConfig(config)
	f.feed(s, dir)
}
