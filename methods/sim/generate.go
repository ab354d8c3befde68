package sim

import (
	"bufio"
	"encoding/json"
	"fmt"
	"math"
	"math/rand/v2"
	"os"
	"path/filepath"
	"strings"

	"liftfuse/methods/air"
	"liftfuse/methods/campaign"
	"liftfuse/methods/evidence"
	"liftfuse/methods/height"
)

// TruthDoc is truth.json: the true C_L·A of each configuration's axles at
// 100 km/h.
type TruthDoc struct {
	Configs map[string]AxleTruth `json:"configs"`
}

// AxleTruth is one configuration's true lift.
type AxleTruth struct {
	Front float64 `json:"front"`
	Rear  float64 `json:"rear"`
}

// LogName is the file, relative to the campaign, of the simulated log.
const LogName = "logs/simulated.csv"

// Generate writes the campaign of spec into dir (which must exist):
// campaign.yaml, the log, one readings table per pressure entry and
// truth.json. It returns the truth.
func Generate(s *Spec, dir string) (*TruthDoc, error) {
	g := &gen{s: s, rng: rand.New(rand.NewPCG(uint64(s.Seed), 20261014)),
		rho: air.Density(s.Air.TemperatureC, s.Air.PressureHPa*100, s.Air.HumidityPct/100, 0.0004)}
	if err := os.MkdirAll(filepath.Join(dir, "logs"), 0o755); err != nil {
		return nil, err
	}
	if len(s.RideHeight) > 0 {
		if err := g.writeLog(filepath.Join(dir, LogName)); err != nil {
			return nil, err
		}
	}
	for i := range s.Pressure {
		if err := g.writeReadings(filepath.Join(dir, s.Pressure[i].ID+"-readings.csv"), &s.Pressure[i]); err != nil {
			return nil, err
		}
	}
	g.vortex()
	if err := os.WriteFile(filepath.Join(dir, "campaign.yaml"), []byte(g.campaign()), 0o644); err != nil {
		return nil, err
	}
	t := &TruthDoc{Configs: map[string]AxleTruth{}}
	for _, c := range s.Configurations {
		t.Configs[c.ID] = AxleTruth{Front: c.FrontCLAM2, Rear: c.RearCLAM2}
	}
	b, _ := json.MarshalIndent(t, "", "  ")
	if err := os.WriteFile(filepath.Join(dir, "truth.json"), append(b, '\n'), 0o644); err != nil {
		return nil, err
	}
	return t, nil
}

type gen struct {
	s        *Spec
	rng      *rand.Rand
	rho      float64
	segments []segment
	ballast  map[string][][2]float64
	senses   map[string][]sense
}

type segment struct {
	config   string
	from, to float64
}

type sense struct {
	config, sense string
	kmh           float64
}

// lift returns the true C_L·A of a configuration's axle at a speed.
func (g *gen) lift(c Config, axle string, kmh float64) float64 {
	x := (kmh - evidence.RefSpeedKmh) / evidence.RefSpeedKmh
	if axle == evidence.AxleFront {
		return c.FrontCLAM2 + c.FrontSlope*x
	}
	return c.RearCLAM2 + c.RearSlope*x
}

// stiffness returns the true heave stiffness a sensor sees, N/mm.
func (g *gen) stiffness(h Height) float64 {
	ax, scale := g.s.Vehicle.Axles.Front, g.s.Truth.FrontSprings
	if h.Axle == evidence.AxleRear {
		ax, scale = g.s.Vehicle.Axles.Rear, g.s.Truth.RearSprings
	}
	ax.SpringNPerMm *= scale
	return height.SpringStiffness(h.Axle, ax, h.Sensor == campaign.SensorLaser).K
}

// signal converts a true height (mm) to the sensor's signal through its
// true gain, which differs from the declared one by gain_error_pct.
func (h Height) signal(mm float64) float64 {
	return 1.5 + mm/(h.MmPerUnit*(1+h.GainErrPct/100))
}

type ar1 struct{ x, sd, phi float64 }

func (a *ar1) next(rng *rand.Rand) float64 {
	a.x = a.phi*a.x + a.sd*math.Sqrt(1-a.phi*a.phi)*rng.NormFloat64()
	return a.x
}

// writeLog drives the test plan and writes one log with every height
// sensor's signal.
func (g *gen) writeLog(name string) error {
	f, err := os.Create(name)
	if err != nil {
		return err
	}
	w := bufio.NewWriter(f)
	s := g.s
	cols := []string{"t_s", "v_kmh", "dir"}
	noise := make([]*ar1, len(s.RideHeight))
	for i, h := range s.RideHeight {
		cols = append(cols, h.ID)
		noise[i] = &ar1{sd: h.NoiseMm, phi: h.NoisePhi}
	}
	fmt.Fprintln(w, strings.Join(cols, ","))
	speedN := &ar1{sd: s.Runs.SpeedSD, phi: 0.9}
	dt := 1 / s.Runs.RateHz
	t, v := 0.0, 0.0
	stick := make([]float64, len(s.RideHeight))
	row := make([]string, len(cols))
	sample := func(c Config, dir float64) {
		ground := 0.0
		if v > 0 {
			ground = math.Max(0, v+speedN.next(g.rng))
		}
		vAir := 0.0
		if ground > 0 {
			vAir = air.KmhToMs(ground) + dir*s.Air.WindMs
		}
		q := air.DynamicPressure(g.rho, vAir)
		row[0], row[1], row[2] = fmt.Sprintf("%.4f", t), fmt.Sprintf("%.3f", ground), fmt.Sprintf("%d", int(dir))
		for i, h := range s.RideHeight {
			mm := q*g.lift(c, h.Axle, ground)/g.stiffness(h) + stick[i] + noise[i].next(g.rng) + h.DriftMmPerH*t/3600
			if h.Sensor == campaign.SensorLaser {
				vr := ground / evidence.RefSpeedKmh
				mm += 120 + s.Truth.TyreGrowthMm*vr*vr
			}
			row[3+i] = fmt.Sprintf("%.5f", h.signal(mm))
		}
		fmt.Fprintln(w, strings.Join(row, ","))
		t += dt
	}
	for ci, c := range s.Configurations {
		if ci > 0 {
			t += 120 // configuration change in the pits; the log pauses
		}
		start := t
		dir := 1.0
		for range s.Runs.Repeats {
			for _, kmh := range s.Runs.SpeedsKmh {
				for i, h := range s.RideHeight {
					stick[i] = h.FrictionMm * (2*g.rng.Float64() - 1)
				}
				for _, hold := range []struct{ kmh, secs float64 }{{s.Runs.LowKmh, 8}, {kmh, s.Runs.HoldS}, {s.Runs.LowKmh, 8}, {0, 6}} {
					for math.Abs(v-hold.kmh) > 0.5 {
						v += math.Copysign(math.Min(8*dt, math.Abs(hold.kmh-v)), hold.kmh-v)
						sample(c, dir)
					}
					v = hold.kmh
					for range int(hold.secs / dt) {
						sample(c, dir)
					}
				}
				dir = -dir
			}
		}
		g.segments = append(g.segments, segment{c.ID, math.Floor(start), math.Floor(t - 1)})
	}
	g.ballastReadings()
	if err := w.Flush(); err != nil {
		f.Close()
		return err
	}
	return f.Close()
}

// ballastReadings draws, for each entry calibrated by ballast, its signal
// with 0, 40 and 80 kg added at the entry's ballast position: the static
// deflection −m·g·share/K (share of the load on the sensor's axle, by
// moments about the other axle) plus 0.03 mm of reading noise. It draws
// from the generator after the log, so the log's samples do not depend on it.
func (g *gen) ballastReadings() {
	s := g.s
	g.ballast = map[string][][2]float64{}
	for _, h := range s.RideHeight {
		if h.Stiffness != campaign.FromBallast {
			continue
		}
		K := g.stiffness(h)
		for _, kg := range []float64{0, 40, 80} {
			share := h.BallastXM / s.Vehicle.WheelbaseM
			if h.Axle == evidence.AxleFront {
				share = 1 - share
			}
			mm := -kg*air.StandardGravity*share/K + 0.03*g.rng.NormFloat64()
			g.ballast[h.ID] = append(g.ballast[h.ID], [2]float64{kg, h.signal(mm)})
		}
	}
}

// tapCp returns each tap's Cp for a configuration: the base shape plus two
// smooth modes on the upper surface, scaled so that taps and uncovered
// patches together carry β_f − m and β_r + m (m the pitch of drag).
func (g *gen) tapCp(p *Pressure, c Config, kmh float64) []float64 {
	L := g.s.Vehicle.WheelbaseM
	m := 0.0
	if d := g.s.Vehicle.Drag; d != nil {
		m = d.CdAM2 * d.CentreHeightM / L * g.s.Truth.DragScale
	}
	phiA := func(x float64) float64 { return math.Max(0, 1-x/L) }
	phiB := func(x float64) float64 { return math.Min(1, math.Max(0, x/L)) }
	split := func(cp func(i int) float64, withPatches bool) (float64, float64) {
		var tot, mom float64
		for i, t := range p.Taps {
			f := -cp(i) * t.AreaM2 * t.Nz
			tot += f
			mom += f * t.XM
		}
		if withPatches {
			for _, u := range p.Uncovered {
				f := -u.TrueCp * u.AreaM2 * u.Nz
				tot += f
				mom += f * u.XM
			}
		}
		return tot - mom/L, mom / L
	}
	upper := func(fn func(float64) float64) func(int) float64 {
		return func(i int) float64 {
			if p.Taps[i].Surface == campaign.SurfaceUpper {
				return fn(p.Taps[i].XM)
			}
			return 0
		}
	}
	f0, r0 := split(func(i int) float64 { return p.Taps[i].Cp }, true)
	fa, ra := split(upper(phiA), false)
	fb, rb := split(upper(phiB), false)
	// The pressure field carries s·β: a true integration scale other than 1
	// plants an error that the method's scale factor must absorb.
	k := g.s.Truth.PressureScale
	tf := k*g.lift(c, evidence.AxleFront, kmh) - m - f0
	tr := k*g.lift(c, evidence.AxleRear, kmh) + m - r0
	det := fa*rb - fb*ra
	a := (tf*rb - fb*tr) / det
	b := (fa*tr - tf*ra) / det
	cp := make([]float64, len(p.Taps))
	for i, t := range p.Taps {
		cp[i] = t.Cp
		if t.Surface == campaign.SurfaceUpper {
			cp[i] += a*phiA(t.XM) + b*phiB(t.XM)
		}
	}
	return cp
}

func (g *gen) writeReadings(name string, p *Pressure) error {
	var b strings.Builder
	b.WriteString("config,speed_kmh,direction")
	for _, t := range p.Taps {
		b.WriteString("," + t.ID)
	}
	b.WriteString("\n")
	for _, c := range g.s.Configurations {
		for _, kmh := range p.SpeedsKmh {
			cp := g.tapCp(p, c, kmh)
			for _, dir := range []float64{1, -1} {
				q := air.DynamicPressure(g.rho, air.KmhToMs(kmh)+dir*g.s.Air.WindMs)
				ref := p.ReferenceSDPa * g.rng.NormFloat64()
				fmt.Fprintf(&b, "%s,%g,%d", c.ID, kmh, int(dir))
				for i := range p.Taps {
					fmt.Fprintf(&b, ",%.2f", cp[i]*q+ref+p.SensorSDPa*g.rng.NormFloat64())
				}
				b.WriteString("\n")
			}
		}
	}
	return os.WriteFile(name, []byte(b.String()), 0o644)
}

// vortex draws each observer's senses: the lift sense when the informed
// C_L·A is positive at that speed, misread at the stated rate.
func (g *gen) vortex() {
	g.senses = map[string][]sense{}
	for _, o := range g.s.Vortex {
		for _, c := range g.s.Configurations {
			for _, kmh := range o.SpeedsKmh {
				x := g.lift(c, evidence.AxleRear, kmh)
				if o.Informs != evidence.AxleRear {
					x += g.lift(c, evidence.AxleFront, kmh)
				}
				lift := x > 0
				if g.rng.Float64() < o.Misread {
					lift = !lift
				}
				sn := campaign.SenseCCW // lift, right side, seen from behind
				if o.Side == campaign.SideLeft {
					sn = campaign.SenseCW
				}
				if !lift {
					sn = map[string]string{campaign.SenseCW: campaign.SenseCCW, campaign.SenseCCW: campaign.SenseCW}[sn]
				}
				g.senses[o.ID] = append(g.senses[o.ID], sense{c.ID, sn, kmh})
			}
		}
	}
}
