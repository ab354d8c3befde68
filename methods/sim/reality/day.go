package reality

// Day is one simulated test day: the physical car and what the campaign
// states about it, its configurations with their true lift, the weather,
// the runs driven, the sensors fitted and the faults planted. Fields marked
// "true" are the physics; "stated" fields are what the campaign file says.
type Day struct {
	Title string
	Date  string // ISO date
	Site  string

	Car     Car
	Configs []Config
	Air     Air
	Runs    Runs
	Log     LogOptions
	Sensors []Sensor   // ride-height sensors, logged in one CSV
	Taps    []TapEntry // pressure-tap entries, one readings CSV each

	// ExactKnowledge makes the campaign state the true values of springs,
	// motion ratios, tyres, drag, centre-of-gravity height, tyre growth and
	// calibration gains. When false, each stated value is drawn around the
	// true one with the stated uncertainty (the shop knows its car only
	// that well).
	ExactKnowledge bool

	Faults Faults
	Keys   Keys

	ReportSpeedsKmh []float64 // report speeds; default [100, 150]
}

// Keys chooses which keys of the campaign format are written.
type Keys int

const (
	// KeysV2 writes the model-v2 additions where the day needs them
	// (laser x_m, vehicle.cg_height_m, air.gust_sd_ms, max_speed_kmh,
	// airspeed columns).
	KeysV2 Keys = iota
	// KeysV1 writes only keys of format 1 as first published, so a loader
	// that knows nothing of model v2 reads the file.
	KeysV1
)

// Car is the physical vehicle.
type Car struct {
	Label         string
	Body          string  // fastback, notchback, …
	WheelbaseM    float64 // L
	MassKg        float64 // test mass with driver and instruments
	FrontStaticKg float64 // static front axle load
	FrontalAreaM2 float64

	CdAM2       float64 // true drag area
	DragHeightM float64 // true height of the drag's line of action
	DragSDPct   float64 // stated uncertainty of C_D·A·h_D

	CGHeightM    float64 // true centre-of-gravity height
	CGHeightSDM  float64 // stated prior sd (v2 key)
	TyreGrowthMm float64 // true radial growth at 100 km/h
	GrowthSDMm   float64 // stated prior sd of the growth

	// RoadMm is the sd of the wheels' motion from road roughness at
	// 100 km/h (growing with speed, zero at rest). It dithers the friction
	// band: at speed the body wanders inside it, at rest it sticks where
	// the last load change left it. Default 0: none.
	RoadMm float64

	Front, Rear Axle
}

// Axle is one axle's suspension and tyres (per wheel, both wheels equal).
type Axle struct {
	SpringNPerMm float64 // true spring rate
	MotionRatio  float64 // true spring travel per wheel travel
	TyreNPerMm   float64 // true radial tyre rate per tyre

	SpringSDPct   float64 // stated uncertainties
	MotionRatioSD float64
	TyreSDPct     float64

	StaticHeightMm float64 // body-to-ground at the axle, static
	StictionMm     float64 // half-width of the friction band
	// ProgressivePerMm p: the wheel rate grows as k_w·(1 + p·c) with
	// compression c from static (floored at half the static rate).
	ProgressivePerMm float64
	// BumpGapMm is the wheel travel in compression from static before the
	// bump stop touches; BumpRateNPerMm the extra wheel rate beyond it.
	// A zero rate means no bump stop.
	BumpGapMm      float64
	BumpRateNPerMm float64
}

// Config is one configuration and its true lift (SAE J1594 axle lift).
type Config struct {
	ID   string
	Note string
	// Front, Rear: C_L·A of each axle at 100 km/h, m².
	Front, Rear float64
	// FrontSlope, RearSlope: γ of the linear speed model, m² per 100 km/h
	// above 100 km/h. Both zero on every config: constant speed model.
	FrontSlope, RearSlope float64
}

// Air is the weather and the wind.
type Air struct {
	TemperatureC, PressureHPa, HumidityPct float64

	WindMs   float64 // true session mean along-road wind (headwind for direction +1)
	WindSDMs float64 // stated prior sd of the wind

	GustSDMs       float64 // true sd of the wind's deviation per run
	GustStatedSDMs float64 // stated prior scale (v2 key air.gust_sd_ms); 0: not written
	WithinSDMs     float64 // true sd of the gust noise within a run
	WithinTauS     float64 // its time constant (default 3 s)
}

// Runs is the driving plan: for every configuration, Repeats passes in
// each direction; each pass stands, ramps to each speed in turn, holds it,
// ramps down and stands again.
type Runs struct {
	SpeedsKmh []float64
	HoldS     float64 // steady hold at each speed
	Repeats   int     // passes per direction per configuration
	AccelMs2  float64 // ramp acceleration (default 1.5 m/s²)
	StandS    float64 // standstill at each end of a pass (default 8 s)
	ChangeS   float64 // logger off while the configuration is changed (default 120 s)
	// CreepKmhPerS: speed rises at this constant rate through each hold
	// (the hold's mean stays at its speed). A fault; see Faults.Creep.
	CreepKmhPerS float64
}

// LogOptions shape the ride-height log.
type LogOptions struct {
	RateHz        float64 // default 10
	ConfigColumn  bool    // a "cfg" column instead of segments
	NoDirection   bool    // no "dir" column: segments per pass carry the direction
	SpeedNoiseKmh float64 // noise of the logged ground speed
	SpeedScalePct float64 // true scale error of the speed sensor
	// Probe, when set, adds an airspeed column (v2 key airspeed_kmh).
	Probe *Probe
}

// Probe is an airspeed probe on a boom.
type Probe struct {
	FactorK  float64 // true: q_true = q_meas·(1 + k)
	SDPct    float64 // stated (v2 key air.probe_sd_pct); 0: not written
	NoiseKmh float64
}

// Sensor is a ride-height sensor: a suspension pot at an axle, or a
// body-to-ground laser anywhere along the wheelbase.
type Sensor struct {
	ID    string
	Laser bool   // false: suspension pot
	Axle  string // "front" | "rear": the pot's axle; the laser's nearer axle
	// XM is a laser's spot position behind the front axle (true). Zero with
	// Axle "rear" means over the rear axle; use XSet to place it at 0 m.
	XM   float64
	XSet bool

	MmPerUnit   float64 // true calibration gain
	OffsetUnits float64 // signal at zero reading
	GainSDPct   float64 // stated calibration uncertainty

	NoiseMm  float64 // AR(1) noise sd
	NoisePhi float64 // AR(1) coefficient per sample

	// BallastKg, when set, makes the stiffness come from static ballast
	// points at BallastXM (first mass usually 0).
	BallastKg []float64
	BallastXM float64

	MaxSpeedKmh float64 // v2 key; 0: not written
}

// TapEntry is a pressure-tap entry: tapped panels plus untapped patches.
type TapEntry struct {
	ID            string
	Panels        []Panel
	Uncovered     []Patch
	SensorSDPa    float64 // true and stated per-tap noise of a reading
	ReferenceSDPa float64 // true and stated reference-port offset sd
	ModelSDPct    float64 // stated
	SpeedsKmh     []float64
	// Logged writes the taps as time series in logs/<id>.csv (v2 key
	// pressure.logs) instead of readings; with KeysV1 readings are
	// written all the same. SampleSDPa is the per-sample noise there.
	Logged     bool
	SampleSDPa float64
}

// Panel is a flat piece of body surface with a tap at its centre.
type Panel struct {
	ID      string
	XM      float64
	Surface string // upper | lower
	AreaM2  float64
	Nz      float64 // vertical component of the outward normal
	Cp      float64 // base Cp; a correction is added per configuration
}

// Patch is a piece of surface with no tap: its true Cp and what the
// campaign states about it.
type Patch struct {
	Surface        string
	XM, AreaM2, Nz float64
	CpTrue         float64
	CpMean, CpSD   float64
}
