package reality

import (
	"slices"
)

// Truth is what the simulated car really did: the answer a test compares
// the tool's figures with.
type Truth struct {
	Seed        int64         `json:"seed"`
	RefSpeedKmh float64       `json:"ref_speed_kmh"` // reference speed of the linear model
	SpeedModel  string        `json:"speed_model"`   // constant | linear
	Configs     []ConfigTruth `json:"configs"`
	Faults      []string      `json:"faults,omitempty"`
	Nuisances   Nuisances     `json:"nuisances"`
}

// ConfigTruth is one configuration's true lift. Front and Rear are SAE J1594
// axle lift, C_L·A in m², about a ground-level mid-wheelbase centre (so the
// change of each axle's contact loads per dynamic pressure), at 100 km/h.
type ConfigTruth struct {
	ID         string  `json:"id"`
	Front      float64 `json:"front"`
	Rear       float64 `json:"rear"`
	Total      float64 `json:"total"`
	FrontSlope float64 `json:"front_slope,omitempty"` // γ, linear speed model
	RearSlope  float64 `json:"rear_slope,omitempty"`
	// CLF, CLR, CL are the SAE coefficients on the frontal area.
	CLF float64 `json:"c_lf,omitempty"`
	CLR float64 `json:"c_lr,omitempty"`
	CL  float64 `json:"c_l,omitempty"`
	// PressureFront, PressureRear: the vertical pressure resultant split to
	// the axles by moments, m² — what ideal taps integrate (axle lift
	// without the pitch of drag).
	PressureFront float64      `json:"pressure_front"`
	PressureRear  float64      `json:"pressure_rear"`
	AtSpeeds      []SpeedTruth `json:"at_speeds"`
}

// SpeedTruth is the lift at one airspeed: C_L·A (m²) and force in still air
// at the day's density (N).
type SpeedTruth struct {
	SpeedKmh float64 `json:"speed_kmh"`
	Front    float64 `json:"front"`
	Rear     float64 `json:"rear"`
	Total    float64 `json:"total"`
	FrontN   float64 `json:"front_n"`
	RearN    float64 `json:"rear_n"`
	TotalN   float64 `json:"total_n"`
}

// Nuisances are the true values of what the campaign knows only roughly.
type Nuisances struct {
	DensityKgM3  float64   `json:"density_kg_m3"`
	WindMs       float64   `json:"wind_ms"`
	RunGustsMs   []float64 `json:"run_gusts_ms"`
	DragPitchM2  float64   `json:"drag_pitch_m2"` // C_D·A·h_D/L
	CGHeightM    float64   `json:"cg_height_m"`
	TyreGrowthMm float64   `json:"tyre_growth_mm"`
	// Heave rates, N/mm for both wheels of the axle: at the wheel (what a
	// pot sees) and to the ground, tyres in series (what a laser sees).
	FrontHeaveNPerMm  float64       `json:"front_heave_n_per_mm"`
	RearHeaveNPerMm   float64       `json:"rear_heave_n_per_mm"`
	FrontGroundNPerMm float64       `json:"front_ground_n_per_mm"`
	RearGroundNPerMm  float64       `json:"rear_ground_n_per_mm"`
	ProbeFactorK      float64       `json:"probe_factor_k,omitempty"`
	Sensors           []SensorTruth `json:"sensors"`
}

// SensorTruth is a sensor's true position and gain beside the stated gain.
type SensorTruth struct {
	ID              string  `json:"id"`
	XM              float64 `json:"x_m"`
	MmPerUnit       float64 `json:"mm_per_unit"`
	StatedMmPerUnit float64 `json:"stated_mm_per_unit"`
}

// truth assembles the truth of a day.
func truth(d *Day, rho float64, st *state, s stated, seed int64) *Truth {
	L := d.Car.WheelbaseM
	m := DragPitch(d.Car.CdAM2, d.Car.DragHeightM, L)
	t := &Truth{Seed: seed, RefSpeedKmh: 100, SpeedModel: "constant", Faults: d.Faults.List()}
	speeds := slices.Concat(d.Runs.SpeedsKmh, d.ReportSpeedsKmh)
	slices.Sort(speeds)
	speeds = slices.Compact(speeds)
	for _, c := range d.Configs {
		ct := ConfigTruth{ID: c.ID, Front: c.Front, Rear: c.Rear, Total: c.Front + c.Rear, FrontSlope: c.FrontSlope,
			RearSlope: c.RearSlope, PressureFront: c.Front - m, PressureRear: c.Rear + m}
		if c.FrontSlope != 0 || c.RearSlope != 0 {
			t.SpeedModel = "linear"
		}
		if A := d.Car.FrontalAreaM2; A > 0 {
			ct.CLF, ct.CLR, ct.CL = c.Front/A, c.Rear/A, ct.Total/A
		}
		for _, v := range speeds {
			f, r := lift(c, kmh(v))
			q := DynamicPressure(rho, kmh(v))
			ct.AtSpeeds = append(ct.AtSpeeds, SpeedTruth{SpeedKmh: v, Front: f, Rear: r, Total: f + r,
				FrontN: q * f, RearN: q * r, TotalN: q * (f + r)})
		}
		t.Configs = append(t.Configs, ct)
	}
	t.Nuisances = nuisances(d, rho, st, s, m)
	return t
}

func nuisances(d *Day, rho float64, st *state, s stated, m float64) Nuisances {
	wf, wr := newWheel(d.Car.Front), newWheel(d.Car.Rear)
	n := Nuisances{DensityKgM3: rho, WindMs: d.Air.WindMs, RunGustsMs: st.gusts, DragPitchM2: m,
		CGHeightM: d.Car.CGHeightM, TyreGrowthMm: d.Car.TyreGrowthMm,
		FrontHeaveNPerMm: 2 * wf.k, RearHeaveNPerMm: 2 * wr.k,
		FrontGroundNPerMm: 2 * InSeries(wf.k, wf.tyre), RearGroundNPerMm: 2 * InSeries(wr.k, wr.tyre)}
	if d.Log.Probe != nil {
		n.ProbeFactorK = d.Log.Probe.FactorK
	}
	for _, sn := range d.Sensors {
		n.Sensors = append(n.Sensors, SensorTruth{ID: sn.ID, XM: sn.position(d.Car.WheelbaseM), MmPerUnit: sn.MmPerUnit,
			StatedMmPerUnit: s.gains[sn.ID]})
	}
	return n
}
