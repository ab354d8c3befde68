package campaign

import (
	"liftfuse/methods/air"
	"liftfuse/methods/evidence"
)

// Campaign is one test campaign, format 1 (campaign-format.md). Field names
// follow the YAML keys; units are in the key names. Every struct's At records
// where it stood in the file and which keys it had.
type Campaign struct {
	At             Place           `yaml:"-"`
	Liftfuse       int             `yaml:"liftfuse" lf:"required"`
	Campaign       Info            `yaml:"campaign" lf:"required"`
	Vehicle        Vehicle         `yaml:"vehicle" lf:"required"`
	Configurations []Configuration `yaml:"configurations" lf:"required"`
	Air            Air             `yaml:"air" lf:"required"`
	Prior          Prior           `yaml:"prior"`
	Evidence       Entries         `yaml:"evidence" lf:"required"`
	Report         ReportSettings  `yaml:"report"`
	Plan           PlanSettings    `yaml:"plan"`

	// File is the path the campaign was loaded from; Dir is its folder, to
	// which every path inside the file is relative. Files lists every file
	// read (the campaign first), for the result's hash. Warnings are what
	// a person should look at, in file order.
	File     string     `yaml:"-"`
	Dir      string     `yaml:"-"`
	Files    []string   `yaml:"-"`
	Warnings []*Problem `yaml:"-"`

	digest *digest // Hash of Files, as loading read them (Load only)
	stream *stream // what Finish checks after the adapters (Options.Stream)
}

// Info names the campaign.
type Info struct {
	At    Place  `yaml:"-"`
	Title string `yaml:"title" lf:"required"`
	Date  string `yaml:"date" lf:"required"`
	Site  string `yaml:"site"`
	Notes string `yaml:"notes"`
}

// Body styles of format 1.
const (
	BodyFastback       = "fastback"
	BodyNotchbackRaked = "notchback-raked"
	BodyNotchback      = "notchback"
	BodyHatchback      = "hatchback"
	BodyWagon          = "wagon"
	BodyOpenWheel      = "open-wheel"
	BodyOther          = "other"
)

// Vehicle is the car under test.
type Vehicle struct {
	At            Place   `yaml:"-"`
	Label         string  `yaml:"label" lf:"required"`
	Body          string  `yaml:"body" lf:"required"`
	WheelbaseM    float64 `yaml:"wheelbase_m" lf:"required"`
	MassKg        float64 `yaml:"mass_kg" lf:"required"`
	FrontStaticKg float64 `yaml:"front_static_kg"`
	FrontalAreaM2 float64 `yaml:"frontal_area_m2"`
	Drag          *Drag   `yaml:"drag"`
	Axles         Axles   `yaml:"axles" lf:"required"`
	// CGHeightM and CGHeightSDM are the prior of the centre-of-gravity
	// height, the lever of longitudinal load transfer (model v2).
	CGHeightM   float64 `yaml:"cg_height_m"`
	CGHeightSDM float64 `yaml:"cg_height_sd_m"`
}

// Drag enables the pitch-from-drag correction of pressure axle splits.
type Drag struct {
	At            Place   `yaml:"-"`
	CdAM2         float64 `yaml:"cda_m2" lf:"required"`
	CentreHeightM float64 `yaml:"centre_height_m" lf:"required"`
	SDPct         float64 `yaml:"sd_pct"`
}

// Axles holds the front and rear suspension data.
type Axles struct {
	At    Place `yaml:"-"`
	Front Axle  `yaml:"front" lf:"required"`
	Rear  Axle  `yaml:"rear" lf:"required"`
}

// Axle is one axle's springs, installation ratio and tyres.
type Axle struct {
	At            Place   `yaml:"-"`
	SpringNPerMm  float64 `yaml:"spring_n_per_mm" lf:"required"`
	SpringSDPct   float64 `yaml:"spring_sd_pct"`
	MotionRatio   float64 `yaml:"motion_ratio" lf:"required"`
	MotionRatioSD float64 `yaml:"motion_ratio_sd"`
	TyreNPerMm    float64 `yaml:"tyre_n_per_mm" lf:"required"`
	TyreSDPct     float64 `yaml:"tyre_sd_pct"`
}

// Configuration is one state of the car.
type Configuration struct {
	At   Place  `yaml:"-"`
	ID   string `yaml:"id" lf:"required"`
	Note string `yaml:"note"`
}

// Air is the weather of the test day.
type Air struct {
	At           Place   `yaml:"-"`
	TemperatureC float64 `yaml:"temperature_c" lf:"required"`
	PressureHPa  float64 `yaml:"pressure_hpa" lf:"required"`
	HumidityPct  float64 `yaml:"humidity_pct" lf:"required"`
	CO2ppm       float64 `yaml:"co2_ppm"`
	WindSDMs     float64 `yaml:"wind_sd_ms"`
	// ProbeSDPct is the position error of an airspeed probe, in percent of
	// q; GustSDMs the prior scale of the run-to-run wind scatter (model v2).
	ProbeSDPct float64 `yaml:"probe_sd_pct"`
	GustSDMs   float64 `yaml:"gust_sd_ms"`
}

// Speed models of format 1.
const (
	SpeedConstant = "constant"
	SpeedLinear   = "linear"
)

// Prior sets the prior of the lift parameters.
type Prior struct {
	At         Place   `yaml:"-"`
	CLASDM2    float64 `yaml:"cla_sd_m2"`
	SpeedModel string  `yaml:"speed_model"`
}

// Entries is the evidence of every method.
type Entries struct {
	At         Place             `yaml:"-"`
	RideHeight []RideHeightEntry `yaml:"ride_height"`
	Pressure   []PressureEntry   `yaml:"pressure"`
	Vortex     []VortexEntry     `yaml:"vortex"`
}

// Axle and sensor names.
const (
	AxleFront = evidence.AxleFront
	AxleRear  = evidence.AxleRear
	AxleTotal = evidence.AxleTotal

	SensorPot   = "pot"
	SensorLaser = "laser"
)

// RideHeightEntry is one ride-height sensor with its logs.
type RideHeightEntry struct {
	At          Place       `yaml:"-"`
	ID          string      `yaml:"id" lf:"required"`
	Axle        string      `yaml:"axle" lf:"required"`
	Sensor      string      `yaml:"sensor" lf:"required"`
	Calibration Calibration `yaml:"calibration" lf:"required"`
	Stiffness   Stiffness   `yaml:"stiffness" lf:"required"`
	FrictionMm  float64     `yaml:"friction_mm"`
	TyreGrowth  TyreGrowth  `yaml:"tyre_growth"`
	Drift       bool        `yaml:"drift"`
	Steady      Steady      `yaml:"steady"`
	FilterTauS  float64     `yaml:"filter_tau_s"`
	Logs        []LogSpec   `yaml:"logs" lf:"required"`
	// XM is a laser's spot position behind the front axle, m; after
	// defaults it is set (0 for a front laser, the wheelbase for a rear
	// one) and At.Has("x_m") tells whether the file gave it.
	XM float64 `yaml:"x_m"`
	// MaxSpeedKmh drops windows above this speed (bump stops, end stops);
	// 0: no limit.
	MaxSpeedKmh float64 `yaml:"max_speed_kmh"`
}

// Calibration maps a sensor signal to mm of body height: a linear gain or a
// least-squares fit of calibration points.
type Calibration struct {
	At        Place   `yaml:"-"`
	MmPerUnit float64 `yaml:"mm_per_unit"`
	Points    []Pair  `yaml:"points"`
	SDPct     float64 `yaml:"sd_pct"`
}

// Stiffness sources.
const (
	FromSprings = "springs"
	FromBallast = "ballast"
)

// Stiffness says where the heave stiffness seen at the sensor comes from.
type Stiffness struct {
	At      Place          `yaml:"-"`
	From    string         `yaml:"from" lf:"required"`
	Ballast []BallastPoint `yaml:"ballast"`
}

// BallastPoint is one static reading with a known added mass.
type BallastPoint struct {
	At      Place   `yaml:"-"`
	AddedKg float64 `yaml:"added_kg" lf:"required"`
	XM      float64 `yaml:"x_m" lf:"required"`
	Signal  float64 `yaml:"signal" lf:"required"`
}

// TyreGrowth is the prior of a tyre's radial growth at 100 km/h.
type TyreGrowth struct {
	At         Place   `yaml:"-"`
	MmAt100kmh float64 `yaml:"mm_at_100kmh"`
	SDMm       float64 `yaml:"sd_mm"`
}

// Steady sets how steady windows are found in a log.
type Steady struct {
	At           Place   `yaml:"-"`
	SpeedTolKmh  float64 `yaml:"speed_tol_kmh"`
	MinDurationS float64 `yaml:"min_duration_s"`
}

// LogSpec names a log file and its columns. Ride-height logs name a
// signal; pressure logs name their taps' columns.
type LogSpec struct {
	At          Place      `yaml:"-"`
	File        string     `yaml:"file" lf:"required"`
	Format      *LogFormat `yaml:"format"`
	Time        string     `yaml:"time" lf:"required"`
	SpeedKmh    string     `yaml:"speed_kmh"`
	SpeedMs     string     `yaml:"speed_ms"`
	AirspeedKmh string     `yaml:"airspeed_kmh"`
	AirspeedMs  string     `yaml:"airspeed_ms"`
	QPa         string     `yaml:"q_pa"`
	SpeedFile   *SpeedFile `yaml:"speed_file"`
	Signal      string     `yaml:"signal"`
	Taps        Names      `yaml:"taps"`
	Direction   string     `yaml:"direction"`
	Config      string     `yaml:"config"`
	Segments    []Segment  `yaml:"segments"`
	// Detected is what the log reader found of the file's format
	// (delimiter, decimal mark, header line, units row, time), filled by
	// Load for a person to confirm.
	Detected string `yaml:"-"`

	path string // the log's place in the campaign, for messages ("evidence.ride_height[0].logs[1]")
}

// Time formats and empty-cell policies of a log (LogFormat).
const (
	TimeSeconds = "seconds"
	TimeClock   = "clock"
	TimeISO     = "iso"

	EmptyError = "error"
	EmptyHold  = "hold"
	EmptySkip  = "skip"
)

// LogFormat says how a logger wrote its file; a key that is absent is
// detected from the file.
type LogFormat struct {
	At         Place  `yaml:"-"`
	Delimiter  string `yaml:"delimiter"`
	Decimal    string `yaml:"decimal"`
	HeaderLine int    `yaml:"header_line"`
	SkipLines  int    `yaml:"skip_lines"`
	Time       string `yaml:"time"`
	Empty      string `yaml:"empty"`
}

// SpeedFile is speed logged by another device, joined to the log by time
// (linear interpolation) after adding OffsetS to its time.
type SpeedFile struct {
	At       Place      `yaml:"-"`
	File     string     `yaml:"file" lf:"required"`
	Format   *LogFormat `yaml:"format"`
	Time     string     `yaml:"time" lf:"required"`
	SpeedKmh string     `yaml:"speed_kmh"`
	SpeedMs  string     `yaml:"speed_ms"`
	OffsetS  float64    `yaml:"offset_s"`
}

// Segment assigns a time span of a log to a configuration.
type Segment struct {
	At        Place   `yaml:"-"`
	Config    string  `yaml:"config" lf:"required"`
	FromS     float64 `yaml:"from_s" lf:"required"`
	ToS       float64 `yaml:"to_s" lf:"required"`
	Direction int     `yaml:"direction"`
}

// Pressure integration modes and surfaces.
const (
	ModePanels = "panels"
	ModeStrips = "strips"

	SurfaceUpper = "upper"
	SurfaceLower = "lower"
)

// PressureEntry is one set of pressure taps with its readings.
type PressureEntry struct {
	At            Place   `yaml:"-"`
	ID            string  `yaml:"id" lf:"required"`
	Mode          string  `yaml:"mode" lf:"required"`
	SensorSDPa    float64 `yaml:"sensor_sd_pa"` // required unless the taps are logged in time
	ReferenceSDPa float64 `yaml:"reference_sd_pa" lf:"required"`
	ModelSDPct    float64 `yaml:"model_sd_pct"`
	Taps          []Tap   `yaml:"taps"`
	// Logs hold the taps logged in time, instead of readings (model v2).
	Logs []LogSpec `yaml:"logs"`
	// Steady sets how steady windows are found in those logs.
	Steady       Steady    `yaml:"steady"`
	TapsFile     string    `yaml:"taps_file"`
	Uncovered    []Patch   `yaml:"uncovered"`
	Readings     []Reading `yaml:"readings"`
	ReadingsFile string    `yaml:"readings_file"`
}

// Tap is one pressure tap: a panel (area and normal) or a strip station
// (width).
type Tap struct {
	At      Place   `yaml:"-"`
	ID      string  `yaml:"id" lf:"required"`
	XM      float64 `yaml:"x_m" lf:"required"`
	Surface string  `yaml:"surface" lf:"required"`
	AreaM2  float64 `yaml:"area_m2"`
	WidthM  float64 `yaml:"width_m"`
	Nz      float64 `yaml:"nz"`
}

// Patch is an area with no taps, with a prior on its Cp.
type Patch struct {
	At      Place   `yaml:"-"`
	Surface string  `yaml:"surface" lf:"required"`
	XM      float64 `yaml:"x_m" lf:"required"`
	AreaM2  float64 `yaml:"area_m2" lf:"required"`
	Nz      float64 `yaml:"nz" lf:"required"`
	CpMean  float64 `yaml:"cp_mean" lf:"required"`
	CpSD    float64 `yaml:"cp_sd" lf:"required"`
}

// Reading is one set of tap pressures (Pa, relative to the reference port)
// for a configuration, speed and direction.
type Reading struct {
	At        Place   `yaml:"-"`
	Config    string  `yaml:"config" lf:"required"`
	SpeedKmh  float64 `yaml:"speed_kmh" lf:"required"`
	Direction int     `yaml:"direction"`
	Pa        Values  `yaml:"pa" lf:"required"`
}

// Vortex sides and senses.
const (
	SideLeft  = "left"
	SideRight = "right"

	SenseCW  = "cw"
	SenseCCW = "ccw"
)

// VortexEntry is one observer of a trailing vortex's rotation sense.
type VortexEntry struct {
	At           Place       `yaml:"-"`
	ID           string      `yaml:"id" lf:"required"`
	Side         string      `yaml:"side" lf:"required"`
	Informs      string      `yaml:"informs"`
	Misread      float64     `yaml:"misread"`
	SoftnessM2   float64     `yaml:"softness_m2"`
	Observations []VortexObs `yaml:"observations" lf:"required"`
}

// VortexObs is one observed rotation sense, seen from behind looking forward.
type VortexObs struct {
	At       Place   `yaml:"-"`
	Config   string  `yaml:"config" lf:"required"`
	SpeedKmh float64 `yaml:"speed_kmh" lf:"required"`
	Sense    string  `yaml:"sense" lf:"required"`
	RPM      float64 `yaml:"rpm"`
}

// Force units of report.force_unit.
const (
	UnitN   = air.UnitN
	UnitKgf = air.UnitKgf
	UnitLbf = air.UnitLbf
)

// ReportSettings sets what the report shows.
type ReportSettings struct {
	At              Place     `yaml:"-"`
	SpeedsKmh       []float64 `yaml:"speeds_kmh"`
	Credible        float64   `yaml:"credible"`
	ForceUnit       string    `yaml:"force_unit"`
	ReferenceConfig string    `yaml:"reference_config"`
	Seed            int64     `yaml:"seed"`
}

// PlanSettings sets the planning target and the cost of repeats.
type PlanSettings struct {
	At     Place  `yaml:"-"`
	Target Target `yaml:"target"`
	CostH  Values `yaml:"cost_h"`
}

// Target is a planning target: an axle of a configuration, or its
// difference to another configuration.
type Target struct {
	At     Place  `yaml:"-"`
	Config string `yaml:"config"`
	Axle   string `yaml:"axle"`
	Versus string `yaml:"versus"`
}

// Density returns the campaign air's density in kg/m³ (CO₂ 400 ppm unless
// given; defaults must have been applied).
func (a Air) Density() float64 {
	return air.Density(a.TemperatureC, a.PressureHPa*100, a.HumidityPct/100, a.CO2ppm*1e-6)
}

// WindNuisance is the name under which every entry declares the along-road
// wind of the session, or "" when air.wind_sd_ms is 0 (no wind modelled).
func (c *Campaign) WindNuisance() string {
	if c.Air.WindSDMs > 0 {
		return evidence.WindName
	}
	return ""
}

// ConfigIDs returns the configuration ids in file order: the one list every
// package uses.
func (c *Campaign) ConfigIDs() []string {
	ids := make([]string, len(c.Configurations))
	for i, cf := range c.Configurations {
		ids[i] = cf.ID
	}
	return ids
}

// HasConfig reports whether id is one of the campaign's configurations.
func (c *Campaign) HasConfig(id string) bool {
	for _, cf := range c.Configurations {
		if cf.ID == id {
			return true
		}
	}
	return false
}
