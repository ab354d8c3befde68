package height_test

import (
	"fmt"
	"math"
	"testing"

	"gonum.org/v1/gonum/stat"

	"liftfuse/methods/air"
	"liftfuse/methods/campaign"
	"liftfuse/methods/evidence"
	"liftfuse/methods/height"
)

// tight is the tolerance for values given to about seven significant digits
// in their sources.
const tight = 5e-7

func TestLowPass(t *testing.T) {
	// Exact zero-order-hold discretisation of a first-order lag (Franklin,
	// Powell & Workman, Digital Control of Dynamic Systems — from memory):
	// α = 1 − e^(−Δt/τ); after t = τ a unit step has risen to 1 − e⁻¹.
	const tau, dt = 0.1, 0.01
	if got := height.Alpha(dt, tau); math.Abs(got-0.0951626) > tight {
		t.Errorf("α = %.7f, want 0.0951626", got)
	}
	f := height.LowPass{Tau: tau}
	f.Step(0, 0)
	var y float64
	for i := 1; i <= 10; i++ {
		y = f.Step(float64(i)*dt, 1)
	}
	if math.Abs(y-0.6321206) > tight {
		t.Errorf("step response at t = τ is %.7f, want 1 − e⁻¹ = 0.6321206", y)
	}
	// Cutoff 1/(2πτ) (common practice, no source).
	if got := height.Cutoff(tau); math.Abs(got-1.59155) > 1e-5 {
		t.Errorf("cutoff = %.5f Hz, want 1.59155", got)
	}
}

// TestLowPassJitteredSteps: on a log whose sample times jitter (a logger's
// clock), each step takes its own α = 1 − e^(−Δt/τ) (the exact
// discretisation above), reusing the last one only for a step within 1e-9
// of it: the output follows the step-by-step recursion to 1e-12.
func TestLowPassJitteredSteps(t *testing.T) {
	const tau = 0.5
	f := height.LowPass{Tau: tau}
	var tm, want float64
	for i := range 2000 {
		dt := 0.01 * (1 + 0.004*math.Sin(float64(i))) // ±0.4 % jitter
		if i%3 == 0 {
			dt = 0.01 // steps repeated, as a clean clock writes them
		}
		x := math.Sin(float64(i) / 50)
		if i == 0 {
			want = x
		} else {
			tm += dt
			want += -math.Expm1(-dt/tau) * (x - want)
		}
		if got := f.Step(tm, x); math.Abs(got-want) > 1e-12 {
			t.Fatalf("sample %d: %.15f, the recursion with its own step %.15f", i, got, want)
		}
	}
}

func TestMovingAverage(t *testing.T) {
	m := height.NewMovingAverage(3)
	var got []float64
	for _, x := range []float64{3, 6, 9, 12} {
		got = append(got, m.Step(x))
	}
	// Worked by hand: 3, (3+6)/2, (3+6+9)/3, (6+9+12)/3.
	want := []float64{3, 4.5, 6, 9}
	for i := range want {
		if got[i] != want[i] {
			t.Fatalf("moving average = %v, want %v", got, want)
		}
	}
}

func TestWheelRate(t *testing.T) {
	// Milliken & Milliken, Race Car Vehicle Dynamics, ch. 16 (from memory):
	// 50 N/mm through an installation ratio of 0.7 is 24.5 N/mm at the
	// wheel; with a 209.65 N/mm tyre in series, 21.94 N/mm.
	kw := height.WheelRate(50, 0.7)
	if math.Abs(kw-24.5) > 1e-12 {
		t.Errorf("wheel rate %v, want 24.5", kw)
	}
	if got := height.Series(kw, 209.65); math.Abs(got-21.94) > 0.005 {
		t.Errorf("with the tyre in series %v, want 21.94", got)
	}
	// The axle heave stiffness a pot sees is both wheels: 2·k·MR².
	s := height.SpringStiffness("front", campaign.Axle{SpringNPerMm: 50, SpringSDPct: 5, MotionRatio: 0.7, MotionRatioSD: 0.014, TyreNPerMm: 209.65, TyreSDPct: 10}, false)
	if math.Abs(s.K-49) > 1e-12 {
		t.Errorf("pot stiffness %v N/mm, want 49", s.K)
	}
	// First-order relative sd: √(0.05² + (2·0.014/0.7)²) = √(0.0025 + 0.0016).
	if math.Abs(s.RelSD()-math.Sqrt(0.0041)) > 1e-12 {
		t.Errorf("relative sd %v, want %v", s.RelSD(), math.Sqrt(0.0041))
	}
	l := height.SpringStiffness("front", campaign.Axle{SpringNPerMm: 50, MotionRatio: 0.7, TyreNPerMm: 209.65}, true)
	if math.Abs(l.K-2*21.94) > 0.01 {
		t.Errorf("laser stiffness %v N/mm, want 2 × 21.94", l.K)
	}
}

func TestBallastAgainstGonum(t *testing.T) {
	pts := []campaign.BallastPoint{
		{AddedKg: 0, XM: 2.3, Signal: 2.204},
		{AddedKg: 40, XM: 2.3, Signal: 2.151},
		{AddedKg: 80, XM: 2.3, Signal: 2.097},
		{AddedKg: 120, XM: 2.1, Signal: 2.052},
	}
	const L = 2.58
	cal := height.Calibration{Gain: 24}
	s, err := height.BallastStiffness("rear-pot", evidence.AxleRear, pts, L, cal)
	if err != nil {
		t.Fatal(err)
	}
	var xs, ys []float64
	for _, p := range pts {
		xs = append(xs, p.AddedKg*air.StandardGravity*p.XM/L)
		ys = append(ys, 24*p.Signal)
	}
	_, slope := stat.LinearRegression(xs, ys, nil, false)
	if math.Abs(s.K-(-1/slope)) > 1e-9*s.K {
		t.Errorf("K = %v, gonum's regression gives %v", s.K, -1/slope)
	}
	if !s.GainCancels || s.SE <= 0 {
		t.Errorf("a ballast stiffness is in the sensor's units (gain cancels) and has a standard error: %+v", s)
	}
	if _, err := height.BallastStiffness("x", evidence.AxleRear, []campaign.BallastPoint{{AddedKg: 0, XM: 2, Signal: 1}, {AddedKg: 50, XM: 2, Signal: 1.1}}, L, cal); err == nil {
		t.Error("a body that rises under ballast was accepted")
	}
}

func ExampleSpringStiffness() {
	front := campaign.Axle{SpringNPerMm: 32, SpringSDPct: 5, MotionRatio: 0.92, MotionRatioSD: 0.02, TyreNPerMm: 230, TyreSDPct: 10}
	pot := height.SpringStiffness("front", front, false)
	laser := height.SpringStiffness("front", front, true)
	fmt.Printf("pot sees %.1f N/mm ± %.1f %%, laser sees %.1f N/mm ± %.1f %%\n", pot.K, 100*pot.RelSD(), laser.K, 100*laser.RelSD())
	// Output: pot sees 54.2 N/mm ± 6.6 %, laser sees 48.5 N/mm ± 6.0 %
}
