package reality

// The campaign document, format 1 (campaign-format.md), as this package
// writes it. These types are our own: the simulator does not import the
// loader. Required keys carry no omitempty, so a zero is written.

type doc struct {
	Liftfuse       int         `yaml:"liftfuse"`
	Campaign       docInfo     `yaml:"campaign"`
	Vehicle        docVehicle  `yaml:"vehicle"`
	Configurations []docConfig `yaml:"configurations"`
	Air            docAir      `yaml:"air"`
	Prior          *docPrior   `yaml:"prior,omitempty"`
	Evidence       docEvidence `yaml:"evidence"`
	Report         docReport   `yaml:"report"`
}

type docInfo struct {
	Title string `yaml:"title"`
	Date  string `yaml:"date"`
	Site  string `yaml:"site,omitempty"`
	Notes string `yaml:"notes,omitempty"`
}

type docVehicle struct {
	Label         string   `yaml:"label"`
	Body          string   `yaml:"body"`
	WheelbaseM    float64  `yaml:"wheelbase_m"`
	MassKg        float64  `yaml:"mass_kg"`
	FrontStaticKg float64  `yaml:"front_static_kg,omitempty"`
	FrontalAreaM2 float64  `yaml:"frontal_area_m2,omitempty"`
	CGHeightM     float64  `yaml:"cg_height_m,omitempty"`
	CGHeightSDM   float64  `yaml:"cg_height_sd_m,omitempty"`
	Drag          *docDrag `yaml:"drag,omitempty"`
	Axles         struct {
		Front docAxle `yaml:"front"`
		Rear  docAxle `yaml:"rear"`
	} `yaml:"axles"`
}

type docDrag struct {
	CdAM2         float64 `yaml:"cda_m2"`
	CentreHeightM float64 `yaml:"centre_height_m"`
	SDPct         float64 `yaml:"sd_pct"`
}

type docAxle struct {
	SpringNPerMm  float64 `yaml:"spring_n_per_mm"`
	SpringSDPct   float64 `yaml:"spring_sd_pct"`
	MotionRatio   float64 `yaml:"motion_ratio"`
	MotionRatioSD float64 `yaml:"motion_ratio_sd"`
	TyreNPerMm    float64 `yaml:"tyre_n_per_mm"`
	TyreSDPct     float64 `yaml:"tyre_sd_pct"`
}

type docConfig struct {
	ID   string `yaml:"id"`
	Note string `yaml:"note,omitempty"`
}

type docAir struct {
	TemperatureC float64 `yaml:"temperature_c"`
	PressureHPa  float64 `yaml:"pressure_hpa"`
	HumidityPct  float64 `yaml:"humidity_pct"`
	WindSDMs     float64 `yaml:"wind_sd_ms,omitempty"`
	GustSDMs     float64 `yaml:"gust_sd_ms,omitempty"`
	ProbeSDPct   float64 `yaml:"probe_sd_pct,omitempty"`
}

type docPrior struct {
	SpeedModel string `yaml:"speed_model"`
}

type docEvidence struct {
	RideHeight []docHeight   `yaml:"ride_height,omitempty"`
	Pressure   []docPressure `yaml:"pressure,omitempty"`
}

type docHeight struct {
	ID          string     `yaml:"id"`
	Axle        string     `yaml:"axle"`
	Sensor      string     `yaml:"sensor"`
	XM          *float64   `yaml:"x_m,omitempty"`
	MaxSpeedKmh float64    `yaml:"max_speed_kmh,omitempty"`
	Calibration docCal     `yaml:"calibration"`
	Stiffness   docStiff   `yaml:"stiffness"`
	FrictionMm  float64    `yaml:"friction_mm,omitempty"`
	TyreGrowth  *docGrowth `yaml:"tyre_growth,omitempty"`
	Logs        []docLog   `yaml:"logs"`
}

type docCal struct {
	MmPerUnit float64 `yaml:"mm_per_unit"`
	SDPct     float64 `yaml:"sd_pct,omitempty"`
}

type docStiff struct {
	From    string       `yaml:"from"`
	Ballast []docBallast `yaml:"ballast,omitempty"`
}

type docBallast struct {
	AddedKg float64 `yaml:"added_kg"`
	XM      float64 `yaml:"x_m"`
	Signal  float64 `yaml:"signal"`
}

type docGrowth struct {
	MmAt100kmh float64 `yaml:"mm_at_100kmh"`
	SDMm       float64 `yaml:"sd_mm"`
}

type docLog struct {
	File        string   `yaml:"file"`
	Time        string   `yaml:"time"`
	SpeedKmh    string   `yaml:"speed_kmh"`
	AirspeedKmh string   `yaml:"airspeed_kmh,omitempty"`
	Signal      string   `yaml:"signal"`
	Direction   string   `yaml:"direction,omitempty"`
	Config      string   `yaml:"config,omitempty"`
	Segments    []docSeg `yaml:"segments,omitempty"`
}

type docSeg struct {
	Config    string  `yaml:"config"`
	FromS     float64 `yaml:"from_s"`
	ToS       float64 `yaml:"to_s"`
	Direction int     `yaml:"direction,omitempty"`
}

type docPressure struct {
	ID            string      `yaml:"id"`
	Mode          string      `yaml:"mode"`
	SensorSDPa    float64     `yaml:"sensor_sd_pa"`
	ReferenceSDPa float64     `yaml:"reference_sd_pa"`
	ModelSDPct    float64     `yaml:"model_sd_pct,omitempty"`
	Taps          []docTap    `yaml:"taps"`
	Uncovered     []docPatch  `yaml:"uncovered,omitempty"`
	ReadingsFile  string      `yaml:"readings_file,omitempty"`
	Logs          []docTapLog `yaml:"logs,omitempty"`
}

// docTapLog is a tap entry's log (model v2).
type docTapLog struct {
	File      string            `yaml:"file"`
	Time      string            `yaml:"time"`
	SpeedKmh  string            `yaml:"speed_kmh"`
	Direction string            `yaml:"direction,omitempty"`
	Segments  []docSeg          `yaml:"segments,omitempty"`
	Taps      map[string]string `yaml:"taps,flow"`
}

type docTap struct {
	ID      string  `yaml:"id"`
	XM      float64 `yaml:"x_m"`
	Surface string  `yaml:"surface"`
	AreaM2  float64 `yaml:"area_m2"`
	Nz      float64 `yaml:"nz"`
}

type docPatch struct {
	Surface string  `yaml:"surface"`
	XM      float64 `yaml:"x_m"`
	AreaM2  float64 `yaml:"area_m2"`
	Nz      float64 `yaml:"nz"`
	CpMean  float64 `yaml:"cp_mean"`
	CpSD    float64 `yaml:"cp_sd"`
}

type docReport struct {
	SpeedsKmh       []float64 `yaml:"speeds_kmh,flow"`
	Credible        float64   `yaml:"credible"`
	ReferenceConfig string    `yaml:"reference_config"`
	Seed            int64     `yaml:"seed"`
}
