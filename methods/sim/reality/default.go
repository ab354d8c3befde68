package reality

// Default returns an invented test day to derive variants from: a small
// front-engined coupe on a closed runway, a baseline and a rear spoiler,
// two suspension pots (the rear one with ballast stiffness), a laser over
// the rear axle and a set of roof and floor taps. Clean: no faults, no
// gusts beyond a light run-to-run scatter, campaign keys of format 1 plus
// the v2 keys. Change fields of the result to make a variant.
func Default() *Day {
	return &Day{
		Title: "Rear spoiler trial on a small coupe",
		Date:  "2026-11-03",
		Site:  "Invented airfield, closed runway (simulated)",
		Car: Car{
			Label: "Small coupe, test car 3", Body: "fastback",
			WheelbaseM: 2.45, MassKg: 1180, FrontStaticKg: 650, FrontalAreaM2: 1.85,
			CdAM2: 0.62, DragHeightM: 0.50, DragSDPct: 20,
			CGHeightM: 0.48, CGHeightSDM: 0.10, RoadMm: 0.3,
			TyreGrowthMm: 0.5, GrowthSDMm: 0.5,
			Front: Axle{SpringNPerMm: 28, MotionRatio: 0.93, TyreNPerMm: 220,
				SpringSDPct: 5, MotionRatioSD: 0.02, TyreSDPct: 10, StaticHeightMm: 118, StictionMm: 0.15},
			Rear: Axle{SpringNPerMm: 34, MotionRatio: 0.80, TyreNPerMm: 220,
				SpringSDPct: 5, MotionRatioSD: 0.02, TyreSDPct: 10, StaticHeightMm: 126, StictionMm: 0.15},
		},
		Configs: []Config{
			{ID: "baseline", Note: "as delivered", Front: 0.10, Rear: 0.08},
			{ID: "spoiler", Note: "rear spoiler, 50 mm", Front: 0.115, Rear: -0.06},
		},
		Air: Air{TemperatureC: 14, PressureHPa: 1009, HumidityPct: 70, WindMs: 1.2, WindSDMs: 1.5,
			GustSDMs: 0.3, GustStatedSDMs: 1.5},
		Runs: Runs{SpeedsKmh: []float64{80, 110, 140, 160}, HoldS: 16, Repeats: 2},
		Log:  LogOptions{RateHz: 10, SpeedNoiseKmh: 0.1},
		Sensors: []Sensor{
			{ID: "front-pot", Axle: "front", MmPerUnit: 24, OffsetUnits: 1.5, GainSDPct: 1, NoiseMm: 0.25, NoisePhi: 0.5},
			{ID: "rear-pot", Axle: "rear", MmPerUnit: 23.5, OffsetUnits: 1.5, GainSDPct: 1, NoiseMm: 0.25, NoisePhi: 0.5,
				BallastKg: []float64{0, 40, 80}, BallastXM: 2.2},
			{ID: "rear-laser", Laser: true, Axle: "rear", MmPerUnit: 1, GainSDPct: 0.5, NoiseMm: 0.4, NoisePhi: 0.6},
		},
		Taps:            []TapEntry{defaultTaps()},
		ReportSpeedsKmh: []float64{100, 150},
	}
}

// defaultTaps is a roof-and-floor tap set with one untapped diffuser patch.
// Base Cp values are of the usual shape over a saloon's centreline (suction
// over the roof and bonnet, stagnation at the nose, mild suction under the
// floor) — invented, not measured.
func defaultTaps() TapEntry {
	return TapEntry{
		ID: "body-taps", SensorSDPa: 2.5, ReferenceSDPa: 4, ModelSDPct: 25,
		SpeedsKmh: []float64{110, 140},
		Panels: []Panel{
			{ID: "u1", XM: -0.55, Surface: "upper", AreaM2: 0.35, Nz: 0.6, Cp: 0.3},
			{ID: "u2", XM: 0.30, Surface: "upper", AreaM2: 0.80, Nz: 0.95, Cp: -0.2},
			{ID: "u3", XM: 1.00, Surface: "upper", AreaM2: 0.50, Nz: 0.5, Cp: 0.1},
			{ID: "u4", XM: 1.55, Surface: "upper", AreaM2: 1.00, Nz: 1.0, Cp: -0.55},
			{ID: "u5", XM: 2.30, Surface: "upper", AreaM2: 0.80, Nz: 0.6, Cp: -0.3},
			{ID: "u6", XM: 2.95, Surface: "upper", AreaM2: 0.40, Nz: 0.97, Cp: -0.1},
			{ID: "l1", XM: -0.45, Surface: "lower", AreaM2: 0.50, Nz: -1, Cp: -0.35},
			{ID: "l2", XM: 0.50, Surface: "lower", AreaM2: 0.90, Nz: -1, Cp: -0.3},
			{ID: "l3", XM: 1.25, Surface: "lower", AreaM2: 1.00, Nz: -1, Cp: -0.25},
			{ID: "l4", XM: 2.00, Surface: "lower", AreaM2: 0.90, Nz: -1, Cp: -0.2},
			{ID: "l5", XM: 2.80, Surface: "lower", AreaM2: 0.50, Nz: -1, Cp: -0.2},
		},
		Uncovered: []Patch{{Surface: "lower", XM: 3.3, AreaM2: 0.35, Nz: -1, CpTrue: -0.2, CpMean: -0.1, CpSD: 0.15}},
	}
}
