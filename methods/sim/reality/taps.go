package reality

import (
	"fmt"
	"math"
	"math/rand/v2"
)

// panelForce returns the vertical force of a flat panel per unit dynamic
// pressure, m² (upward positive): the pressure p = Cp·q pushes along the
// inward normal, so F/q = −Cp·A·n_z.
func panelForce(cp, area, nz float64) float64 { return -cp * area * nz }

// split returns the shares of a vertical force at x carried by the front
// and rear axles (moments about the front axle): F·(1 − x/L), F·x/L.
func split(f, x, L float64) (front, rear float64) { return f * (1 - x/L), f * x / L }

// integrate returns the vertical pressure force of the panels with the
// given Cp and of the patches with their true Cp, split to the axles, per
// unit dynamic pressure (m²).
func (e TapEntry) integrate(cp []float64, L float64) (front, rear float64) {
	for i, p := range e.Panels {
		f, r := split(panelForce(cp[i], p.AreaM2, p.Nz), p.XM, L)
		front, rear = front+f, rear+r
	}
	for _, p := range e.Uncovered {
		f, r := split(panelForce(p.CpTrue, p.AreaM2, p.Nz), p.XM, L)
		front, rear = front+f, rear+r
	}
	return front, rear
}

// field returns the Cp of each tapped panel at the configuration's β and
// the change of Cp per unit of (V − V_ref)/V_ref. The pressure part of the
// axle lift is β_f − m and β_r + m, m = C_D·A·h_D/L the drag pitch. The
// panels' base Cp is corrected by ΔCp_k = −sgn(n_z)·(a·(1 − ξ_k) + b·ξ_k),
// ξ = x/L, with (a, b) solved from the 2×2 normal system so the integral
// matches exactly.
func (e TapEntry) field(c Config, m, L float64) (cp0, cp1 []float64, err error) {
	base := make([]float64, len(e.Panels))
	for i, p := range e.Panels {
		base[i] = p.Cp
	}
	bf, br := e.integrate(base, L)
	cp0, err = e.correct(base, c.Front-m-bf, c.Rear+m-br, L)
	if err != nil {
		return nil, nil, err
	}
	cp1, err = e.correct(make([]float64, len(base)), c.FrontSlope, c.RearSlope, L)
	return cp0, cp1, err
}

// correct returns cp plus the smooth correction that adds rf to the front
// force and rr to the rear.
func (e TapEntry) correct(cp []float64, rf, rr, L float64) ([]float64, error) {
	var s11, s12, s22 float64
	for _, p := range e.Panels {
		w, xi := p.AreaM2*math.Abs(p.Nz), p.XM/L
		s11 += w * (1 - xi) * (1 - xi)
		s12 += w * xi * (1 - xi)
		s22 += w * xi * xi
	}
	det := s11*s22 - s12*s12
	if !(math.Abs(det) > 1e-12*(s11*s22+1e-300)) {
		return nil, fmt.Errorf("%w: tap entry %q: its panels cannot carry a front/rear split (spread them along x)", ErrDay, e.ID)
	}
	a := (rf*s22 - rr*s12) / det
	b := (s11*rr - s12*rf) / det
	out := make([]float64, len(cp))
	for i, p := range e.Panels {
		xi := p.XM / L
		out[i] = cp[i] - math.Copysign(1, p.Nz)*(a*(1-xi)+b*xi)
	}
	return out, nil
}

// reading is one pressure reading: a hold's mean of each tap.
type reading struct {
	Config   string
	SpeedKmh float64
	Dir      int
	Pa       []float64
}

// fields returns each configuration's Cp field: at β, and per unit of
// (V − V_ref)/V_ref.
func (e TapEntry) fields(d *Day) ([][2][]float64, error) {
	L := d.Car.WheelbaseM
	m := DragPitch(d.Car.CdAM2, d.Car.DragHeightM, L)
	fields := make([][2][]float64, len(d.Configs))
	for i, c := range d.Configs {
		cp0, cp1, err := e.field(c, m, L)
		if err != nil {
			return nil, err
		}
		fields[i] = [2][]float64{cp0, cp1}
	}
	return fields, nil
}

// readings returns the entry's readings, one per hold at its speeds.
func (e TapEntry) readings(d *Day, tr *trace, st *state, vlog []float64, seed int64) ([]reading, error) {
	fields, err := e.fields(d)
	if err != nil {
		return nil, err
	}
	r := stream(seed, "taps/"+e.ID)
	var out []reading
	for _, h := range tr.holds {
		if len(e.SpeedsKmh) > 0 && !containsSpeed(e.SpeedsKmh, h.SpeedKmh) {
			continue
		}
		out = append(out, e.read(d, h, fields[h.Cfg], st, vlog, r))
	}
	return out, nil
}

// read averages each tap over a hold and adds the sensor noise, the
// reference-port offset and the faults.
func (e TapEntry) read(d *Day, h hold, f [2][]float64, st *state, vlog []float64, r *rand.Rand) reading {
	cfg := d.Configs[h.Cfg].ID
	rd := reading{Config: cfg, Dir: h.Dir, Pa: make([]float64, len(e.Panels))}
	n := float64(h.To - h.From)
	for k := h.From; k < h.To; k++ {
		s := (st.vAir[k] - refSpeed) / refSpeed
		for i := range e.Panels {
			rd.Pa[i] += st.q[k] * (f[0][i] + s*f[1][i]) / n
		}
		rd.SpeedKmh += vlog[k] / n
	}
	rd.SpeedKmh = math.Round(rd.SpeedKmh*10) / 10
	offset := e.ReferenceSDPa * r.NormFloat64()
	for i, p := range e.Panels {
		noise := e.SensorSDPa * r.NormFloat64()
		if d.blocked(e.ID, p.ID, cfg) {
			rd.Pa[i] = noise // the tube holds the reference pressure
		} else {
			rd.Pa[i] += offset + noise
		}
		if d.Faults.InvertedTaps == e.ID {
			rd.Pa[i] = -rd.Pa[i]
		}
	}
	return rd
}

// blocked reports whether a tap of an entry is blocked in a configuration.
func (d *Day) blocked(entry, tap, cfg string) bool {
	b := d.Faults.BlockedTap
	return b != nil && b.Entry == entry && b.Tap == tap && (b.Config == "" || b.Config == cfg)
}

// series returns each tap's logged pressure at every sample, Pa relative
// to the reference port: q·Cp plus a reference offset wandering as an
// AR(1) of sd ReferenceSDPa and 30 s time constant, plus per-sample noise
// of sd SampleSDPa; a blocked tap logs noise only; inverted taps the
// negative.
func (e TapEntry) series(d *Day, tr *trace, st *state, seed int64) ([][]float64, error) {
	fields, err := e.fields(d)
	if err != nil {
		return nil, err
	}
	r := stream(seed, "taps-logged/"+e.ID)
	ref := newAR1(stream(seed, "taps-reference/"+e.ID), e.ReferenceSDPa, math.Exp(-1/(30*d.Log.RateHz)))
	sign := 1.0
	if d.Faults.InvertedTaps == e.ID {
		sign = -1
	}
	out := make([][]float64, len(e.Panels))
	for i := range out {
		out[i] = make([]float64, len(tr.t))
	}
	for k := range tr.t {
		f, cfg := fields[tr.cfg[k]], d.Configs[tr.cfg[k]].ID
		s := (st.vAir[k] - refSpeed) / refSpeed
		off := ref.next()
		for i, p := range e.Panels {
			v := e.SampleSDPa * r.NormFloat64()
			if !d.blocked(e.ID, p.ID, cfg) {
				v += st.q[k]*(f[0][i]+s*f[1][i]) + off
			}
			out[i][k] = sign * v
		}
	}
	return out, nil
}

func containsSpeed(list []float64, v float64) bool {
	for _, s := range list {
		if math.Abs(s-v) < 1e-9 {
			return true
		}
	}
	return false
}
