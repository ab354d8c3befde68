package sim

import (
	"fmt"
	"io"
	"path/filepath"

	"liftfuse/methods/campaign"
	"liftfuse/methods/evidence"
)

// Spec is a simulation spec, format 1. Keys carry their units as in the
// campaign file; the vehicle, report and plan blocks are the campaign's own.
type Spec struct {
	At             campaign.Place          `yaml:"-"`
	Format         int                     `yaml:"liftfuse_simulate" lf:"required"`
	Seed           int64                   `yaml:"seed"`
	Campaign       campaign.Info           `yaml:"campaign" lf:"required"`
	Vehicle        campaign.Vehicle        `yaml:"vehicle" lf:"required"`
	Configurations []Config                `yaml:"configurations" lf:"required"`
	Air            Air                     `yaml:"air" lf:"required"`
	Prior          campaign.Prior          `yaml:"prior"`
	Truth          Truth                   `yaml:"truth"`
	Runs           Runs                    `yaml:"runs"`
	RideHeight     []Height                `yaml:"ride_height"`
	Pressure       []Pressure              `yaml:"pressure"`
	Vortex         []Vortex                `yaml:"vortex"`
	Report         campaign.ReportSettings `yaml:"report"`
	Plan           campaign.PlanSettings   `yaml:"plan"`
}

// Config is a configuration with its true lift: C_L·A per axle at 100 km/h,
// and (for a speed-dependent car) its change per 100 km/h above that.
type Config struct {
	At         campaign.Place `yaml:"-"`
	ID         string         `yaml:"id" lf:"required"`
	Note       string         `yaml:"note"`
	FrontCLAM2 float64        `yaml:"front_cla_m2" lf:"required"`
	RearCLAM2  float64        `yaml:"rear_cla_m2" lf:"required"`
	FrontSlope float64        `yaml:"front_slope_m2"`
	RearSlope  float64        `yaml:"rear_slope_m2"`
}

// Air is the campaign's air plus the true along-road wind (in the +1
// direction of travel).
type Air struct {
	At           campaign.Place `yaml:"-"`
	TemperatureC float64        `yaml:"temperature_c" lf:"required"`
	PressureHPa  float64        `yaml:"pressure_hpa" lf:"required"`
	HumidityPct  float64        `yaml:"humidity_pct" lf:"required"`
	WindSDMs     float64        `yaml:"wind_sd_ms"`
	WindMs       float64        `yaml:"wind_ms"`
}

// Truth holds the true values of what the campaign knows only roughly.
// Scales are true/declared; zero means 1.
type Truth struct {
	At            campaign.Place `yaml:"-"`
	FrontSprings  float64        `yaml:"front_spring_scale"`
	RearSprings   float64        `yaml:"rear_spring_scale"`
	TyreGrowthMm  float64        `yaml:"tyre_growth_mm"`
	DragScale     float64        `yaml:"drag_scale"`
	PressureScale float64        `yaml:"pressure_scale"`
}

// Runs is the test plan of each configuration: runs at each speed, in
// alternating directions, each framed by rolling at low speed and a stop.
type Runs struct {
	At        campaign.Place `yaml:"-"`
	SpeedsKmh []float64      `yaml:"speeds_kmh"`
	Repeats   int            `yaml:"repeats"`
	HoldS     float64        `yaml:"hold_s"`
	LowKmh    float64        `yaml:"low_kmh"`
	RateHz    float64        `yaml:"rate_hz"`
	SpeedSD   float64        `yaml:"speed_sd_kmh"`
}

// Height is a simulated ride-height sensor.
type Height struct {
	At          campaign.Place      `yaml:"-"`
	ID          string              `yaml:"id" lf:"required"`
	Axle        string              `yaml:"axle" lf:"required"`
	Sensor      string              `yaml:"sensor" lf:"required"`
	NoiseMm     float64             `yaml:"noise_mm" lf:"required"`
	NoisePhi    float64             `yaml:"noise_phi"`
	FrictionMm  float64             `yaml:"friction_mm"`
	MmPerUnit   float64             `yaml:"mm_per_unit"`
	GainErrPct  float64             `yaml:"gain_error_pct"`
	Stiffness   string              `yaml:"stiffness"`
	BallastXM   float64             `yaml:"ballast_x_m"`
	TyreGrowth  campaign.TyreGrowth `yaml:"tyre_growth"`
	DriftMmPerH float64             `yaml:"drift_mm_per_h"`
}

// Pressure is a simulated set of taps: each tap's Cp has a base shape, and
// two smooth modes on the upper surface are scaled per configuration so that
// the taps carry the true axle lift.
type Pressure struct {
	At            campaign.Place `yaml:"-"`
	ID            string         `yaml:"id" lf:"required"`
	SensorSDPa    float64        `yaml:"sensor_sd_pa" lf:"required"`
	ReferenceSDPa float64        `yaml:"reference_sd_pa" lf:"required"`
	ModelSDPct    float64        `yaml:"model_sd_pct"`
	SpeedsKmh     []float64      `yaml:"speeds_kmh" lf:"required"`
	Taps          []Tap          `yaml:"taps" lf:"required"`
	Uncovered     []Patch        `yaml:"uncovered"`
}

// Tap is a panel tap with its base Cp.
type Tap struct {
	At      campaign.Place `yaml:"-"`
	ID      string         `yaml:"id" lf:"required"`
	XM      float64        `yaml:"x_m" lf:"required"`
	Surface string         `yaml:"surface" lf:"required"`
	AreaM2  float64        `yaml:"area_m2" lf:"required"`
	Nz      float64        `yaml:"nz" lf:"required"`
	Cp      float64        `yaml:"cp" lf:"required"`
}

// Patch is an uncovered patch: its declared Cp prior and its true Cp.
type Patch struct {
	At      campaign.Place `yaml:"-"`
	Surface string         `yaml:"surface" lf:"required"`
	XM      float64        `yaml:"x_m" lf:"required"`
	AreaM2  float64        `yaml:"area_m2" lf:"required"`
	Nz      float64        `yaml:"nz" lf:"required"`
	CpMean  float64        `yaml:"cp_mean" lf:"required"`
	CpSD    float64        `yaml:"cp_sd" lf:"required"`
	TrueCp  float64        `yaml:"true_cp" lf:"required"`
}

// Vortex is a simulated vortex observer.
type Vortex struct {
	At        campaign.Place `yaml:"-"`
	ID        string         `yaml:"id" lf:"required"`
	Side      string         `yaml:"side" lf:"required"`
	Informs   string         `yaml:"informs"`
	SpeedsKmh []float64      `yaml:"speeds_kmh" lf:"required"`
	Misread   float64        `yaml:"misread"`
}

// Load reads a spec file strictly.
func Load(path string) (*Spec, error) {
	f, err := campaign.OpenRegular(path)
	if err != nil {
		return nil, campaign.Problems{campaign.Errorf(campaign.Where{File: path}, "", campaign.ErrFile, "cannot read spec: %v", err)}
	}
	defer f.Close()
	return Parse(f, path)
}

// Parse reads a spec from src; name is used in messages.
func Parse(src io.Reader, name string) (*Spec, error) {
	var s Spec
	if err := campaign.Decode(src, name, &s); err != nil {
		return nil, err
	}
	if s.Format != 1 {
		return nil, campaign.Problems{campaign.Errorf(s.At.Of("liftfuse_simulate"), "liftfuse_simulate", campaign.ErrFormat, "spec format %d is not supported (this liftfuse reads format 1)", s.Format)}
	}
	s.defaults()
	return &s, s.check()
}

func (s *Spec) defaults() {
	one := func(x *float64) {
		if *x == 0 {
			*x = 1
		}
	}
	one(&s.Truth.FrontSprings)
	one(&s.Truth.RearSprings)
	one(&s.Truth.DragScale)
	one(&s.Truth.PressureScale)
	r := &s.Runs
	if len(r.SpeedsKmh) == 0 {
		r.SpeedsKmh = []float64{80, 110, 140}
	}
	if r.Repeats == 0 {
		r.Repeats = 2
	}
	if r.HoldS == 0 {
		r.HoldS = 16
	}
	if r.LowKmh == 0 {
		r.LowKmh = 35
	}
	if r.RateHz == 0 {
		r.RateHz = 10
	}
	if !r.At.Has("speed_sd_kmh") {
		r.SpeedSD = 0.35
	}
	if !s.Air.At.Has("wind_sd_ms") {
		s.Air.WindSDMs = campaign.DefaultWindSDMs
	}
	for i := range s.RideHeight {
		h := &s.RideHeight[i]
		if h.MmPerUnit == 0 {
			h.MmPerUnit = 1
			if h.Sensor == campaign.SensorPot {
				h.MmPerUnit = 24
			}
		}
		if h.Stiffness == "" {
			h.Stiffness = campaign.FromSprings
		}
		if h.BallastXM == 0 {
			h.BallastXM = 0.9 * s.Vehicle.WheelbaseM
			if h.Axle == evidence.AxleFront {
				h.BallastXM = 0.1 * s.Vehicle.WheelbaseM
			}
		}
		if !h.At.Has("noise_phi") {
			h.NoisePhi = 0.85
		}
		if !h.TyreGrowth.At.Has("mm_at_100kmh") && !h.TyreGrowth.At.Has("sd_mm") {
			h.TyreGrowth = campaign.TyreGrowth{MmAt100kmh: campaign.DefaultGrowthMm, SDMm: campaign.DefaultGrowthSDMm}
		}
	}
	for i := range s.Vortex {
		if s.Vortex[i].Informs == "" {
			s.Vortex[i].Informs = evidence.AxleTotal
		}
	}
}

// check reports what would make a spec impossible to simulate; the campaign
// it writes is validated again by the loader.
func (s *Spec) check() error {
	var ps campaign.Problems
	bad := func(p campaign.Place, path, key, format string, args ...any) {
		ps = append(ps, campaign.Errorf(p.Of(key), path+"."+key, campaign.ErrRange, format, args...))
	}
	if len(s.Configurations) == 0 {
		bad(s.At, "", "configurations", "at least one configuration is needed")
	}
	if s.Runs.RateHz < 1 || s.Runs.RateHz > 2000 {
		bad(s.Runs.At, "runs", "rate_hz", "rate_hz must lie in [1, 2000], got %g", s.Runs.RateHz)
	}
	if s.Runs.HoldS < 5 {
		bad(s.Runs.At, "runs", "hold_s", "hold_s must be at least 5 s, got %g", s.Runs.HoldS)
	}
	for i, h := range s.RideHeight {
		if !(h.NoiseMm > 0) {
			bad(h.At, fmt.Sprintf("ride_height[%d]", i), "noise_mm", "noise_mm must be positive")
		}
		if !(h.NoisePhi >= 0 && h.NoisePhi < 1) {
			bad(h.At, fmt.Sprintf("ride_height[%d]", i), "noise_phi", "noise_phi must lie in [0, 1)")
		}
	}
	if len(ps) > 0 {
		return ps
	}
	return nil
}

// Build parses a spec, writes its campaign into dir and loads it: the
// shortest way from a stated truth to a campaign, for tests and planning.
func Build(spec io.Reader, name, dir string) (*campaign.Campaign, *TruthDoc, error) {
	s, err := Parse(spec, name)
	if err != nil {
		return nil, nil, err
	}
	truth, err := Generate(s, dir)
	if err != nil {
		return nil, nil, err
	}
	c, err := campaign.Load(filepath.Join(dir, "campaign.yaml"), campaign.Options{})
	return c, truth, err
}
