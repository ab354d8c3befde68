package reality

import (
	"bytes"
	"encoding/json"
	"errors"
	"fmt"
	"os"
	"path/filepath"
	"strconv"

	"go.yaml.in/yaml/v3"
)

// ErrDay marks a day that cannot be simulated (a missing or impossible
// value); the error says which.
var ErrDay = errors.New("invalid day")

// Write simulates the day with the given seed and writes its campaign into
// dir: campaign.yaml, logs/day.csv (every ride-height sensor), one
// <entry>-readings.csv per tap entry and truth.json. It returns the truth.
// The same day and seed always write the same bytes. The day itself is not
// changed.
func (d *Day) Write(dir string, seed int64) (*Truth, error) {
	a := d.clone()
	a.defaults()
	if err := a.validate(); err != nil {
		return nil, err
	}
	a, err := a.apply()
	if err != nil {
		return nil, err
	}
	rho := Density(a.Air.TemperatureC, a.Air.PressureHPa, a.Air.HumidityPct)
	tr := buildTrace(a)
	if len(tr.holds) == 0 {
		return nil, fmt.Errorf("%w: the runs have no steady holds", ErrDay)
	}
	st := simulate(a, tr, rho, seed)
	s := knowledge(a, seed)
	vlog := loggedSpeed(a, tr, seed)
	ballast := map[string][]float64{}
	cols := make([][]float64, len(a.Sensors))
	for i, sn := range a.Sensors {
		cols[i] = sn.signals(a, st, seed)
		ballast[sn.ID] = sn.ballast(a, seed)
	}
	files := map[string][]byte{LogFile: logCSV(a, tr, st, vlog, cols, seed)}
	for _, e := range a.Taps {
		if a.logsTaps(e) {
			cols, err := e.series(a, tr, st, seed)
			if err != nil {
				return nil, err
			}
			files[tapLogFile(e.ID)] = tapLogCSV(a, e, tr, vlog, cols)
			continue
		}
		rs, err := e.readings(a, tr, st, vlog, seed)
		if err != nil {
			return nil, err
		}
		files[e.ID+"-readings.csv"] = readingsCSV(e, rs)
	}
	var y bytes.Buffer
	y.WriteString("# Simulated test day (methods/sim/reality); the truth is in truth.json.\n")
	enc := yaml.NewEncoder(&y)
	enc.SetIndent(2)
	if err := enc.Encode(document(a, s, tr, ballast, seed)); err != nil {
		return nil, err
	}
	if err := enc.Close(); err != nil {
		return nil, err
	}
	files[CampaignFile] = y.Bytes()
	t := truth(a, rho, st, s, seed)
	j, err := json.MarshalIndent(t, "", "  ")
	if err != nil {
		return nil, err
	}
	files[TruthFile] = append(j, '\n')
	return t, writeAll(dir, files)
}

// loggedSpeed returns the ground speed the logger saw, km/h: the true
// speed with the sensor's scale error and noise, never negative (a GPS
// speed is a magnitude).
func loggedSpeed(d *Day, tr *trace, seed int64) []float64 {
	r := stream(seed, "speed")
	out := make([]float64, len(tr.v))
	for k, v := range tr.v {
		out[k] = max(0, v*3.6*(1+d.Log.SpeedScalePct/100)+d.Log.SpeedNoiseKmh*r.NormFloat64())
	}
	return out
}

// logCSV writes the ride-height log: time, speed (m/s under the km/h
// header with the unit-slip fault), direction, configuration, airspeed
// and one column per sensor.
func logCSV(d *Day, tr *trace, st *state, vlog []float64, cols [][]float64, seed int64) []byte {
	var b bytes.Buffer
	b.WriteString("t_s,v_kmh")
	if !d.Log.NoDirection {
		b.WriteString(",dir")
	}
	if d.Log.ConfigColumn {
		b.WriteString(",cfg")
	}
	p := d.Log.Probe
	var pr = stream(seed, "probe")
	if p != nil {
		b.WriteString(",airspeed_kmh")
	}
	for _, sn := range d.Sensors {
		b.WriteString("," + sn.ID)
	}
	b.WriteByte('\n')
	var buf []byte
	num := func(x float64, prec int) {
		buf = strconv.AppendFloat(buf[:0], x, 'f', prec, 64)
		b.WriteByte(',')
		b.Write(buf)
	}
	for k, t := range tr.t {
		b.WriteString(strconv.FormatFloat(t, 'f', 3, 64))
		v := vlog[k]
		if d.Faults.UnitSlip {
			v /= 3.6
		}
		num(v, 3)
		if !d.Log.NoDirection {
			b.WriteString("," + strconv.Itoa(tr.dir[k]))
		}
		if d.Log.ConfigColumn {
			b.WriteString("," + d.Configs[tr.cfg[k]].ID)
		}
		if p != nil {
			// q_true = q_meas·(1 + k): the probe reads V_air/√(1 + k).
			num(st.vAir[k]*3.6/sqrt1p(p.FactorK)+p.NoiseKmh*pr.NormFloat64(), 3)
		}
		for i := range cols {
			num(cols[i][k], 5)
		}
		b.WriteByte('\n')
	}
	return b.Bytes()
}

// readingsCSV writes a tap entry's readings: config, speed, direction and
// one column per tap, Pa.
func readingsCSV(e TapEntry, rs []reading) []byte {
	var b bytes.Buffer
	b.WriteString("config,speed_kmh,direction")
	for _, p := range e.Panels {
		b.WriteString("," + p.ID)
	}
	b.WriteByte('\n')
	for _, r := range rs {
		fmt.Fprintf(&b, "%s,%s,%d", r.Config, strconv.FormatFloat(r.SpeedKmh, 'f', -1, 64), r.Dir)
		for _, v := range r.Pa {
			b.WriteString("," + strconv.FormatFloat(v, 'f', 2, 64))
		}
		b.WriteByte('\n')
	}
	return b.Bytes()
}

// tapLogCSV writes a tap entry's time series: time, speed, direction and
// one column per tap, Pa relative to the reference port.
func tapLogCSV(d *Day, e TapEntry, tr *trace, vlog []float64, cols [][]float64) []byte {
	var b bytes.Buffer
	b.WriteString("t_s,v_kmh")
	if !d.Log.NoDirection {
		b.WriteString(",dir")
	}
	for _, p := range e.Panels {
		b.WriteString("," + p.ID)
	}
	b.WriteByte('\n')
	for k, t := range tr.t {
		b.WriteString(strconv.FormatFloat(t, 'f', 3, 64) + "," + strconv.FormatFloat(vlog[k], 'f', 3, 64))
		if !d.Log.NoDirection {
			b.WriteString("," + strconv.Itoa(tr.dir[k]))
		}
		for i := range cols {
			b.WriteString("," + strconv.FormatFloat(cols[i][k], 'f', 2, 64))
		}
		b.WriteByte('\n')
	}
	return b.Bytes()
}

// writeAll writes every file under dir, each through a temporary file and
// a rename so a reader never sees half a file.
func writeAll(dir string, files map[string][]byte) error {
	for name, data := range files {
		path := filepath.Join(dir, filepath.FromSlash(name))
		if err := os.MkdirAll(filepath.Dir(path), 0o755); err != nil {
			return err
		}
		f, err := os.CreateTemp(filepath.Dir(path), ".reality-*")
		if err != nil {
			return err
		}
		_, werr := f.Write(data)
		werr = errors.Join(werr, f.Chmod(0o644))
		cerr := f.Close()
		if err := errors.Join(werr, cerr); err != nil {
			os.Remove(f.Name())
			return err
		}
		if err := os.Rename(f.Name(), path); err != nil {
			os.Remove(f.Name())
			return err
		}
	}
	return nil
}
