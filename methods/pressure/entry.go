package pressure

import (
	"fmt"
	"math"

	"gonum.org/v1/gonum/mat"

	"liftfuse/methods/air"
	"liftfuse/methods/campaign"
	"liftfuse/methods/evidence"
)

// Reading is one integrated reading, for the report.
type Reading struct {
	Config    string
	SpeedKmh  float64
	Direction int
	Q         float64            // ½ρV² at the ground speed, Pa
	Forces    Forces             // from the taps alone, N
	Cp        map[string]float64 // p/q per tap
}

// ImpliedCLA returns the reading's front, rear and total force divided by q:
// the raw C_L·A the taps imply, without drag pitch or uncovered patches.
func (r Reading) ImpliedCLA() Forces {
	return Forces{Front: r.Forces.Front / r.Q, Rear: r.Forces.Rear / r.Q, Total: r.Forces.Total / r.Q}
}

// Result is what one pressure entry yields.
type Result struct {
	Entry    *campaign.PressureEntry
	Panels   []Panel
	Readings []Reading
	Evidence evidence.Evidence
	Warnings []string
}

// DragPitchName is the nuisance name of m = C_D·A·h_D/L, shared by every
// pressure entry of the car.
const DragPitchName = "drag-pitch"

// Reduce integrates every reading of a pressure entry and builds its
// evidence. wind names the campaign's wind nuisance ("" for none).
func Reduce(c *campaign.Campaign, e *campaign.PressureEntry, wind string) (*Result, error) {
	panels, err := Panels(e)
	if err != nil {
		return nil, fmt.Errorf("%s: %w", e.ID, err)
	}
	L := c.Vehicle.WheelbaseM
	rho := c.Density()
	res := &Result{Entry: e, Panels: panels}
	ev := evidence.Evidence{Entry: e.ID, Kind: evidence.KindPressure}
	if e.ModelSDPct > 0 {
		ev.Scales = append(ev.Scales, evidence.ScaleGroup{Name: e.ID + "/integration", Label: e.ID + " integration scale", SD: e.ModelSDPct / 100})
	}
	var scales []evidence.ScaleRef
	if e.ModelSDPct > 0 {
		scales = []evidence.ScaleRef{{Name: e.ID + "/integration", Pow: 1}}
	}
	if wind != "" {
		ev.Nuisances = append(ev.Nuisances, evidence.Nuisance{Name: wind, Label: "along-road wind", Unit: "m/s", SD: c.Air.WindSDMs, PerRun: true})
	}
	drag := c.Vehicle.Drag
	if drag != nil {
		mm := drag.CdAM2 * drag.CentreHeightM / L
		ev.Nuisances = append(ev.Nuisances, evidence.Nuisance{Name: DragPitchName, Label: "pitch of drag C_D·A·h/L", Unit: "m²",
			Mean: mm, SD: mm * drag.SDPct / 100})
	} else {
		res.Warnings = append(res.Warnings, fmt.Sprintf("%s: no vehicle.drag given: the pressure axle split leaves out the pitch of drag (the total is unaffected)", e.ID))
	}
	for j, u := range e.Uncovered {
		ev.Nuisances = append(ev.Nuisances, evidence.Nuisance{Name: fmt.Sprintf("%s/uncovered[%d]", e.ID, j),
			Label: fmt.Sprintf("%s uncovered %s patch at x = %.2f m (Cp)", e.ID, u.Surface, u.XM), Mean: u.CpMean, SD: math.Max(u.CpSD, 1e-6)})
	}
	informs := map[string]bool{}
	for ri, r := range e.Readings {
		V := air.KmhToMs(r.SpeedKmh)
		q := air.DynamicPressure(rho, V)
		get := func(id string) float64 { v, _ := r.Pa.Get(id); return v }
		rd := Reading{Config: r.Config, SpeedKmh: r.SpeedKmh, Direction: r.Direction, Q: q, Forces: Integrate(panels, get, L), Cp: map[string]float64{}}
		for _, pn := range panels {
			cp := get(pn.ID) / q
			rd.Cp[pn.ID] = cp
			if math.Abs(cp) > 3 || cp > 1.05 {
				res.Warnings = append(res.Warnings, fmt.Sprintf("%s: reading %d (%s, %g km/h): tap %s has Cp = %.2f, which is physically odd (|Cp| > 3 or Cp > 1.05): check the tube and the reference port",
					e.ID, ri+1, r.Config, r.SpeedKmh, pn.ID, cp))
			}
		}
		res.Readings = append(res.Readings, rd)

		// Error covariance of (F_f, F_r): independent sensor noise plus the
		// reference offset δ, common to the reading, along
		// u = (−Σ A n (1 − x/L), −Σ A n x/L).
		cov := mat.NewSymDense(2, nil)
		var u [2]float64
		for _, pn := range panels {
			an := pn.A * pn.Nz
			g := [2]float64{an * (1 - pn.X/L), an * pn.X / L}
			u[0] -= g[0]
			u[1] -= g[1]
			s2 := e.SensorSDPa * e.SensorSDPa
			cov.SetSym(0, 0, cov.At(0, 0)+s2*g[0]*g[0])
			cov.SetSym(1, 1, cov.At(1, 1)+s2*g[1]*g[1])
			cov.SetSym(0, 1, cov.At(0, 1)+s2*g[0]*g[1])
		}
		r2 := e.ReferenceSDPa * e.ReferenceSDPa
		cov.SetSym(0, 0, cov.At(0, 0)+r2*u[0]*u[0]+1e-9)
		cov.SetSym(1, 1, cov.At(1, 1)+r2*u[1]*u[1]+1e-9)
		cov.SetSym(0, 1, cov.At(0, 1)+r2*u[0]*u[1])

		as := evidence.Airspeed{Q: q, V: V, Rho: rho, Dir: float64(r.Direction), Wind: wind}
		var obs [2]evidence.Obs
		for k, axle := range []string{evidence.AxleFront, evidence.AxleRear} {
			o := evidence.Obs{
				Y:      [2]float64{rd.Forces.Front, rd.Forces.Rear}[k],
				Terms:  []evidence.Term{{Config: r.Config, Axle: axle, W: 1}},
				Air:    as,
				Scales: scales,
				Label:  fmt.Sprintf("reading %d, %s, %g km/h, %s", ri+1, r.Config, r.SpeedKmh, axle),
			}
			if drag != nil {
				sgn := -1.0
				if axle == evidence.AxleRear {
					sgn = 1
				}
				o.Nuis = append(o.Nuis, evidence.Coef{Name: DragPitchName, C: sgn * q, PerQ: true})
			}
			for j, up := range e.Uncovered {
				share := 1 - up.XM/L
				if axle == evidence.AxleRear {
					share = up.XM / L
				}
				// taps = total − uncovered, and the uncovered force is −Cp·q·A·n.
				o.Nuis = append(o.Nuis, evidence.Coef{Name: fmt.Sprintf("%s/uncovered[%d]", e.ID, j), C: q * up.AreaM2 * up.Nz * share, PerQ: true})
			}
			obs[k] = o
		}
		b, err := evidence.NewBlock(obs[:], cov)
		if err != nil {
			return nil, fmt.Errorf("%s: reading %d: %w", e.ID, ri+1, err)
		}
		ev.Blocks = append(ev.Blocks, b)
		informs[r.Config] = true
	}
	for _, cf := range c.Configurations {
		if informs[cf.ID] {
			ev.Informs = append(ev.Informs, evidence.Quantity{Config: cf.ID, Axle: evidence.AxleFront}, evidence.Quantity{Config: cf.ID, Axle: evidence.AxleRear})
		}
	}
	ev.Warnings = res.Warnings
	res.Evidence = ev
	return res, ev.Check()
}
