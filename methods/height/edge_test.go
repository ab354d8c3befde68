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
// km/h, logged at 10 Hz. The window's statistics must hold no sample of
// either ramp (its mean speed is the hold's exactly, its slope 0), and
// must lose no more of the hold at each end than the rule allows: for a
// step MinEdgeS + tol/(40 km/h per s) (the data the model's own
// simulator, whose ramps are steps, relies on), for the end a 1.5 m/s²
// ramp leaves MinEdgeS + tol/rate, for a gentle ramp EdgeS(tol). The
// start of a hold after a ramp may lose up to EdgeS(tol): the window
// opened on the ramp's last 2·tol breaks once its mean has risen tol past
// its first sample, a little into the hold, and the approach read then
// spans the ramp's end, so reads slow. A speed logged at 2 Hz and held
// lags the truth by up to 0.5 s, so its hold reads up to 0.5 s late.
func TestWindowEdges(t *testing.T) {
	const tol, dt = 1.5, 0.1
	cases := []struct {
		name        string
		accel       float64 // m/s², 0 for a step
		holdHz      float64 // the speed's update rate, 0 for every sample
		lead, trail float64 // s of the hold that may be lost at its start, end
	}{
		{"instant step", 0, 0, MinEdgeS + tol/40 + dt, MinEdgeS + tol/40 + dt},
		{"1.5 m/s² ramps", 1.5, 0, EdgeS(tol) + dt, MinEdgeS + tol/5.4 + dt},
		{"0.5 m/s² ramps", 0.5, 0, EdgeS(tol) + dt, EdgeS(tol) + dt},
		// Steep ramps: a fragment of the ramp closes within RateSpanS of
		// the hold's end, which must not settle the hold with an unknown
		// rate (EdgeS: 0.64, 0.70, 0.78 s lost before that was fixed).
		{"2.5 m/s² ramps", 2.5, 0, EdgeS(tol) + dt, MinEdgeS + tol/9 + dt},
		{"3 m/s² ramps", 3, 0, EdgeS(tol) + dt, MinEdgeS + tol/10.8 + dt},
		{"4 m/s² ramps", 4, 0, EdgeS(tol) + dt, MinEdgeS + tol/14.4 + dt},
		{"1.5 m/s² ramps, speed held at 2 Hz", 1.5, 2, EdgeS(tol) + 0.5 + dt, EdgeS(tol) + 0.5 + dt},
	}
	for _, tc := range cases {
		t.Run(tc.name, func(t *testing.T) {
			ramp := 0.0
			if tc.accel > 0 {
				ramp = 40 / (3.6 * tc.accel)
			}
			start := 5 + ramp // the hold's span, s
			end := start + 12
			speed := func(tt float64) float64 {
				switch {
				case tt < 5:
					return 60
				case tt < start:
					return 60 + 40*(tt-5)/ramp
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
				if tc.holdHz > 0 {
					at = math.Floor(tt*tc.holdHz+1e-9) / tc.holdHz
				}
				f.add(sample{t: tt, v: speed(at), h: 50 + 0.01*math.Sin(7*tt), qa: math.NaN()}, "base", 1)
			}
			f.close()
			f.finish()
			var w *Window
			for i := range f.windows {
				if math.Abs(f.windows[i].SpeedKmh-100) < 5 {
					w = &f.windows[i]
				}
			}
			if w == nil {
				t.Fatalf("no window at 100 km/h in %+v", f.windows)
			}
			if math.Abs(w.SpeedKmh-100) > 1e-9 || math.Abs(w.AccelMs2) > 1e-9 {
				t.Errorf("window uses ramp samples: mean %.4f km/h, slope %.4f m/s²", w.SpeedKmh, w.AccelMs2)
			}
			lead, trail := w.From-start, end-dt-w.To
			t.Logf("hold %.2f-%.2f s, window %.2f-%.2f s: lost %.2f s and %.2f s", start, end, w.From, w.To, lead, trail)
			if lead > tc.lead || trail > tc.trail {
				t.Errorf("hold %.2f-%.2f s, window %.2f-%.2f s: lost %.2f s and %.2f s, want ≤ %.2f and %.2f",
					start, end, w.From, w.To, lead, trail, tc.lead, tc.trail)
			}
		})
	}
}
