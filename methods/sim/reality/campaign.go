package reality

import (
	"fmt"
	"math"
)

// File names inside a written day.
const (
	CampaignFile = "campaign.yaml"
	TruthFile    = "truth.json"
	LogFile      = "logs/day.csv"
)

// stated is what the campaign says about the car where it may differ from
// the truth.
type stated struct {
	front, rear docAxle
	cda, dragH  float64
	cg          float64
	growth      float64
	gains       map[string]float64
}

// knowledge returns the stated values: the true ones with ExactKnowledge,
// otherwise each drawn around the true value with its stated uncertainty;
// a gain fault overrides one sensor's gain.
func knowledge(d *Day, seed int64) stated {
	r := stream(seed, "stated")
	exact := d.ExactKnowledge
	ln := func(pct float64) float64 {
		if exact {
			return 1
		}
		return logNormal(r, pct)
	}
	nrm := func(sd float64) float64 {
		if exact {
			return 0
		}
		return sd * r.NormFloat64()
	}
	axle := func(a Axle) docAxle {
		return docAxle{SpringNPerMm: sig(a.SpringNPerMm * ln(a.SpringSDPct)), SpringSDPct: a.SpringSDPct,
			MotionRatio: sig(a.MotionRatio + nrm(a.MotionRatioSD)), MotionRatioSD: a.MotionRatioSD,
			TyreNPerMm: sig(a.TyreNPerMm * ln(a.TyreSDPct)), TyreSDPct: a.TyreSDPct}
	}
	c := d.Car
	s := stated{front: axle(c.Front), rear: axle(c.Rear), cda: sig(c.CdAM2 * ln(c.DragSDPct)), dragH: c.DragHeightM,
		cg: sig(c.CGHeightM + nrm(c.CGHeightSDM)), growth: sig(c.TyreGrowthMm + nrm(c.GrowthSDMm)), gains: map[string]float64{}}
	for _, sn := range d.Sensors {
		s.gains[sn.ID] = sig(sn.MmPerUnit * ln(sn.GainSDPct))
	}
	if g := d.Faults.GainError; g != nil {
		s.gains[g.Sensor] = sig(d.sensor(g.Sensor).MmPerUnit * (1 + g.Pct/100))
	}
	return s
}

// sig rounds to 5 significant digits, as a person would write a value.
func sig(x float64) float64 {
	if x == 0 || math.IsInf(x, 0) || math.IsNaN(x) {
		return x
	}
	p := math.Pow(10, 4-math.Floor(math.Log10(math.Abs(x))))
	return math.Round(x*p) / p
}

// document builds the campaign file.
func document(d *Day, s stated, tr *trace, ballast map[string][]float64, seed int64) *doc {
	c := d.Car
	v2 := d.Keys == KeysV2
	out := &doc{Liftfuse: 1,
		Campaign: docInfo{Title: d.Title, Date: d.Date, Site: d.Site,
			Notes: fmt.Sprintf("Simulated by methods/sim/reality, seed %d; the truth is in %s.", seed, TruthFile)},
		Vehicle: docVehicle{Label: c.Label, Body: c.Body, WheelbaseM: c.WheelbaseM, MassKg: c.MassKg,
			FrontStaticKg: c.FrontStaticKg, FrontalAreaM2: c.FrontalAreaM2,
			Drag: &docDrag{CdAM2: s.cda, CentreHeightM: s.dragH, SDPct: c.DragSDPct}},
		Air: docAir{TemperatureC: d.Air.TemperatureC, PressureHPa: d.Air.PressureHPa, HumidityPct: d.Air.HumidityPct,
			WindSDMs: d.Air.WindSDMs},
		Report: docReport{SpeedsKmh: d.ReportSpeedsKmh, Credible: 0.9, ReferenceConfig: d.Configs[0].ID, Seed: 1},
	}
	out.Vehicle.Axles.Front, out.Vehicle.Axles.Rear = s.front, s.rear
	if v2 {
		out.Vehicle.CGHeightM, out.Vehicle.CGHeightSDM = s.cg, c.CGHeightSDM
		out.Air.GustSDMs = d.Air.GustStatedSDMs
		if d.Log.Probe != nil {
			out.Air.ProbeSDPct = d.Log.Probe.SDPct
		}
	}
	for _, cf := range d.Configs {
		out.Configurations = append(out.Configurations, docConfig{ID: cf.ID, Note: cf.Note})
		if cf.FrontSlope != 0 || cf.RearSlope != 0 {
			out.Prior = &docPrior{SpeedModel: "linear"}
		}
	}
	for _, sn := range d.Sensors {
		out.Evidence.RideHeight = append(out.Evidence.RideHeight, heightEntry(d, sn, s, tr, ballast[sn.ID]))
	}
	for _, e := range d.Taps {
		out.Evidence.Pressure = append(out.Evidence.Pressure, pressureEntry(d, tr, e))
	}
	return out
}

// heightEntry is the campaign's entry of one ride-height sensor.
func heightEntry(d *Day, sn Sensor, s stated, tr *trace, ballast []float64) docHeight {
	v2 := d.Keys == KeysV2
	h := docHeight{ID: sn.ID, Axle: sn.Axle, Sensor: "pot", Calibration: docCal{MmPerUnit: s.gains[sn.ID], SDPct: sn.GainSDPct},
		Stiffness: docStiff{From: "springs"}, FrictionMm: d.Car.Front.StictionMm}
	if sn.Axle == "rear" {
		h.FrictionMm = d.Car.Rear.StictionMm
	}
	if sn.Laser {
		h.Sensor = "laser"
		h.TyreGrowth = &docGrowth{MmAt100kmh: s.growth, SDMm: d.Car.GrowthSDMm}
		hidden := d.Faults.LaserAt != nil && d.Faults.LaserAt.Sensor == sn.ID
		if x := sn.position(d.Car.WheelbaseM); v2 && !hidden {
			h.XM = &x
		}
	}
	if v2 {
		h.MaxSpeedKmh = sn.MaxSpeedKmh
	}
	if len(sn.BallastKg) > 0 {
		h.Stiffness.From = "ballast"
		for i, m := range sn.BallastKg {
			h.Stiffness.Ballast = append(h.Stiffness.Ballast,
				docBallast{AddedKg: m, XM: sn.BallastXM, Signal: math.Round(ballast[i]*1e5) / 1e5})
		}
	}
	h.Logs = []docLog{logEntry(d, tr, sn.ID)}
	return h
}

// logEntry names the log's columns and its configuration spans.
func logEntry(d *Day, tr *trace, column string) docLog {
	l := docLog{File: LogFile, Time: "t_s", SpeedKmh: "v_kmh", Signal: column}
	if d.Log.Probe != nil && d.Keys == KeysV2 {
		l.AirspeedKmh = "airspeed_kmh"
	}
	if !d.Log.NoDirection {
		l.Direction = "dir"
	}
	if d.Log.ConfigColumn {
		l.Config = "cfg"
	} else {
		l.Segments = segments(d, tr)
	}
	return l
}

// segments are the configurations' time spans: one per configuration, or
// one per pass carrying its direction when no direction is logged.
func segments(d *Day, tr *trace) []docSeg {
	var out []docSeg
	if d.Log.NoDirection {
		for _, p := range tr.passes {
			out = append(out, segment(d, tr, p, p.Dir))
		}
		return out
	}
	for _, b := range tr.blocks {
		out = append(out, segment(d, tr, b, 0))
	}
	return out
}

func segment(d *Day, tr *trace, s span, dir int) docSeg {
	return docSeg{Config: d.Configs[s.Cfg].ID, FromS: round3(tr.t[s.From]), ToS: round3(tr.t[s.To-1]), Direction: dir}
}

func round3(x float64) float64 { return math.Round(x*1000) / 1000 }

// tapLogFile is the file of a tap entry logged in time.
func tapLogFile(id string) string { return "logs/" + id + ".csv" }

// logsTaps reports whether a tap entry is written as a time series.
func (d *Day) logsTaps(e TapEntry) bool { return e.Logged && d.Keys == KeysV2 }

// pressureEntry is the campaign's entry of one tap entry.
func pressureEntry(d *Day, tr *trace, e TapEntry) docPressure {
	p := docPressure{ID: e.ID, Mode: "panels", SensorSDPa: e.SensorSDPa, ReferenceSDPa: e.ReferenceSDPa,
		ModelSDPct: e.ModelSDPct, ReadingsFile: e.ID + "-readings.csv"}
	if d.logsTaps(e) {
		l := docTapLog{File: tapLogFile(e.ID), Time: "t_s", SpeedKmh: "v_kmh", Segments: segments(d, tr), Taps: map[string]string{}}
		if !d.Log.NoDirection {
			l.Direction = "dir"
		}
		for _, t := range e.Panels {
			l.Taps[t.ID] = t.ID
		}
		p.ReadingsFile, p.Logs = "", []docTapLog{l}
	}
	for _, t := range e.Panels {
		p.Taps = append(p.Taps, docTap{ID: t.ID, XM: t.XM, Surface: t.Surface, AreaM2: t.AreaM2, Nz: t.Nz})
	}
	for _, u := range e.Uncovered {
		p.Uncovered = append(p.Uncovered, docPatch{Surface: u.Surface, XM: u.XM, AreaM2: u.AreaM2, Nz: u.Nz,
			CpMean: u.CpMean, CpSD: u.CpSD})
	}
	return p
}
