package height

import (
	"math"
	"math/rand/v2"
	"testing"

	"liftfuse/methods/campaign"
	"liftfuse/methods/evidence"
)

// testCar is a two-axle car for the physics checks.
func testCar() *campaign.Campaign {
	return &campaign.Campaign{Vehicle: campaign.Vehicle{WheelbaseM: 2.6, MassKg: 1300, CGHeightM: 0.5, CGHeightSDM: 0.1,
		Axles: campaign.Axles{
			Front: campaign.Axle{SpringNPerMm: 30, SpringSDPct: 5, MotionRatio: 0.9, MotionRatioSD: 0.02, TyreNPerMm: 230, TyreSDPct: 8},
			Rear:  campaign.Axle{SpringNPerMm: 35, SpringSDPct: 5, MotionRatio: 0.85, MotionRatioSD: 0.02, TyreNPerMm: 230, TyreSDPct: 8},
		}}}
}

func laserAt(axle string, x float64) *campaign.RideHeightEntry {
	return &campaign.RideHeightEntry{ID: "l", Axle: axle, Sensor: campaign.SensorLaser, XM: x,
		Stiffness: campaign.Stiffness{From: campaign.FromSprings}}
}

// TestLoadTransfer: m·a·h/L (Milliken & Milliken, Race Car Vehicle
// Dynamics, 1995, ch. 18 — from memory): 1300 kg braking at 1 g with the
// centre of gravity 0.5 m up on a 2.6 m wheelbase moves
// 1300·9.80665·0.5/2.6 = 2451.7 N to the front.
func TestLoadTransfer(t *testing.T) {
	if got := LoadTransferN(1300, -9.80665, 0.5, 2.6); math.Abs(got+2451.66) > 0.01 {
		t.Errorf("load transfer %.2f N, want −2451.66", got)
	}
}

// TestLeverWeights: a laser 0.8 m behind the rear axle of a 2.6 m car sees
// δ_f·(1 − x/L) + δ_r·x/L = −0.3077·δ_f + 1.3077·δ_r (the rigid body's
// line through the two axles), each axle's stiffness the wheel rate
// 2·k·MR² in series with 2·k_t (springs in series: 1/k = 1/k₁ + 1/k₂,
// e.g. Halliday, Resnick & Walker, Fundamentals of Physics — from memory).
func TestLeverWeights(t *testing.T) {
	c := testCar()
	cases := []struct {
		name   string
		axle   string
		x      float64
		atAxle bool
		wf, wr float64
	}{
		{"over the rear axle", campaign.AxleRear, 2.6, true, 0, 1},
		{"over the front axle", campaign.AxleFront, 0, true, 1, 0},
		{"0.8 m behind the rear axle", campaign.AxleRear, 3.4, false, -0.8 / 2.6, 3.4 / 2.6},
		{"mid-wheelbase", campaign.AxleFront, 1.3, false, 0.5, 0.5},
	}
	for _, tc := range cases {
		t.Run(tc.name, func(t *testing.T) {
			e := laserAt(tc.axle, tc.x)
			own := SpringStiffness(tc.axle, c.Vehicle.Axles.Rear, true)
			if tc.axle == campaign.AxleFront {
				own = SpringStiffness(tc.axle, c.Vehicle.Axles.Front, true)
			}
			lv, err := NewLever(c, e, own)
			if err != nil {
				t.Fatal(err)
			}
			if lv.AtAxle != tc.atAxle {
				t.Fatalf("at axle %v, want %v", lv.AtAxle, tc.atAxle)
			}
			w := map[string]float64{}
			for _, s := range lv.Axles {
				w[s.Axle] = s.W
				ax := c.Vehicle.Axles.Front
				if s.Axle == campaign.AxleRear {
					ax = c.Vehicle.Axles.Rear
				}
				kw, kt := 2*ax.SpringNPerMm*ax.MotionRatio*ax.MotionRatio, 2*ax.TyreNPerMm
				if want := 1 / (1/kw + 1/kt); math.Abs(s.Stiffness.K-want) > 1e-9 {
					t.Errorf("%s stiffness %.4f, want %.4f", s.Axle, s.Stiffness.K, want)
				}
			}
			if math.Abs(w[campaign.AxleFront]-tc.wf) > 1e-12 || math.Abs(w[campaign.AxleRear]-tc.wr) > 1e-12 {
				t.Errorf("weights %v, want front %.4f rear %.4f", w, tc.wf, tc.wr)
			}
			var share float64
			for _, r := range lv.Refs() {
				if r.Name == "rear-tyres" || r.Name == "front-tyres" {
					share += r.Pow
				}
			}
			if share >= 0 {
				t.Errorf("tyre powers sum to %v: a stiffer tyre must shrink the compliance", share)
			}
		})
	}
}

// TestBallastLaserAway: a ballast stiffness cannot serve a laser that sees
// both axles.
func TestBallastLaserAway(t *testing.T) {
	e := laserAt(campaign.AxleRear, 3.4)
	e.Stiffness.From = campaign.FromBallast
	if _, err := NewLever(testCar(), e, Stiffness{K: 50}); err == nil {
		t.Error("a ballast stiffness for a laser away from its axle was accepted")
	}
}

// TestAccelCoef: a pot on the rear axle under 1 m/s² of acceleration sinks
// by m·a·h/(L·K_r); per metre of h_cg that is 1300·1/2.6/K_r mm, and the
// front pot rises by the same load over K_f. A laser at mid-wheelbase sees
// half of each.
func TestAccelCoef(t *testing.T) {
	c := testCar()
	rear := SpringStiffness(campaign.AxleRear, c.Vehicle.Axles.Rear, false)
	lv := Lever{AtAxle: true, Axles: []AxleShare{{Axle: campaign.AxleRear, W: 1, Stiffness: rear}}}
	if got, want := accelCoef(c.Vehicle, lv, 1), -500/rear.K; math.Abs(got-want) > 1e-12 {
		t.Errorf("rear pot: %.5f mm per m of h_cg, want %.5f", got, want)
	}
	mid, err := NewLever(c, laserAt(campaign.AxleFront, 1.3), Stiffness{})
	if err != nil {
		t.Fatal(err)
	}
	kf, kr := mid.Axles[0].Stiffness.K, mid.Axles[1].Stiffness.K
	if got, want := accelCoef(c.Vehicle, mid, 2), 2*500*(0.5/kf-0.5/kr); math.Abs(got-want) > 1e-12 {
		t.Errorf("mid laser: %.5f, want %.5f", got, want)
	}
}

// TestMeanAccel: a window's mean acceleration is the slope of the means
// of its 1 s batches — exact for a straight line (a hold, a
// creep), and still exact when the speed is logged at 2 Hz and held in a
// 10 Hz file with the window starting mid-step (each batch holds every
// phase of the step twice, so each mean lags the line by the same 0.2 s:
// worked here by hand).
func TestMeanAccel(t *testing.T) {
	cases := []struct {
		name   string
		speed  func(tt float64) float64 // km/h
		wantMs float64
	}{
		{"constant speed", func(float64) float64 { return 120 }, 0},
		{"creep 0.75 km/h/s", func(tt float64) float64 { return 120 + 0.75*tt }, 0.75 / 3.6},
		{"creep held at 2 Hz from mid-step", func(tt float64) float64 { return 120 + 0.75*math.Floor(2*(tt+0.3)+1e-9)/2 }, 0.75 / 3.6},
	}
	for _, tc := range cases {
		t.Run(tc.name, func(t *testing.T) {
			var s speedEnds
			for i := range 81 {
				tt := 0.1 * float64(i)
				s.add(100+tt, tc.speed(tt))
			}
			e := s.accel()
			a := e.a
			if math.Abs(a/3.6-tc.wantMs) > 1e-9 || e.rss > 1e-9 {
				t.Errorf("mean acceleration %.6f m/s² (rss %.3g), want %.6f", a/3.6, e.rss, tc.wantMs)
			}
		})
	}
}

// TestMeanAccelError: the error of a window's acceleration comes from the
// scatter of its 1 s batch means about their line, so it holds for the
// speeds loggers write: white noise at the file's rate (a batch mean has
// σ²/10), a 2 Hz speed held under a creep (σ²/2: two values a batch; the
// steps between rows would read it √5 too precise) and AR(1) noise of
// φ = 0.9 a sample, as the model's own simulator draws its speed (the
// variance of a mean of n AR(1) samples, σ²/n·[(1 + φ)/(1 − φ) −
// 2φ(1 − φⁿ)/(n(1 − φ)²)]: Box & Jenkins, Time Series Analysis — from
// memory). The pooled scatter allows for the batch means' correlation
// (it divides by tr(MR), batchnoise.go); on this seed it reads 0.94 of
// the formula under AR(1), 0.96 and 1.05 on seeds (5, 6) and (7, 8), about
// a standard deviation of its own sampling error at 800 batches (measured
// in review); the bar is 10 %, 15 % for AR(1).
func TestMeanAccelError(t *testing.T) {
	ar := func(phi, n float64) float64 {
		return ((1+phi)/(1-phi) - 2*phi*(1-math.Pow(phi, n))/(n*(1-phi)*(1-phi))) / n
	}
	cases := []struct {
		name      string
		hold      int     // rows per logged value
		phi, rate float64 // AR(1) coefficient a row; creep, km/h/s
		wantVar   float64 // variance of a batch mean per σ²
		tol       float64
	}{
		{"white, 10 Hz", 1, 0, 0, 0.1, 0.10},
		{"white, 2 Hz held, creeping 0.75 km/h/s", 5, 0, 0.75, 0.5, 0.10},
		{"AR(1) φ = 0.9, 10 Hz", 1, 0.9, 0, ar(0.9, 10), 0.15},
	}
	for _, tc := range cases {
		t.Run(tc.name, func(t *testing.T) {
			rng := rand.New(rand.NewPCG(3, 4))
			var s speedEnds
			v, x := 0.0, 0.0
			for i := range 8000 {
				tt := 0.1 * float64(i)
				x = tc.phi*x + math.Sqrt(1-tc.phi*tc.phi)*rng.NormFloat64()
				if i%tc.hold == 0 {
					v = 120 + tc.rate*tt + 0.3*x
				}
				s.add(tt, v)
			}
			e := s.accel()
			a := e.a
			e.atSpeed = true
			n := pooledBatchNoise([]ends{e})
			got := n.v
			want := tc.wantVar * 0.09
			if math.Abs(got/want-1) > tc.tol {
				t.Errorf("batch-mean variance %.4g (km/h)², want %.4g within %.0f %%", got, want, 100*tc.tol)
			}
			if se := e.errorOf(n); math.Abs(a-tc.rate) > 4*se {
				t.Errorf("acceleration %.5f ± %.3g km/h/s, want %.5f", a, se, tc.rate)
			}
		})
	}
}

// TestGrowthAtLever: tyre growth at the laser is the axles' growth through
// the same lever.
func TestGrowthAtLever(t *testing.T) {
	lv, err := NewLever(testCar(), laserAt(campaign.AxleRear, 3.4), Stiffness{})
	if err != nil {
		t.Fatal(err)
	}
	cs := lv.growthCoefs(2)
	got := map[string]float64{}
	for _, c := range cs {
		got[c.Name] = c.C
	}
	if math.Abs(got["front-tyre-growth"]+2*0.8/2.6) > 1e-12 || math.Abs(got["rear-tyre-growth"]-2*3.4/2.6) > 1e-12 {
		t.Errorf("growth coefficients %v", got)
	}
	_ = evidence.AxleFront
}
