package pressure_test

import (
	"errors"
	"fmt"
	"math"
	"math/rand/v2"
	"os"
	"path/filepath"
	"strings"
	"testing"

	"liftfuse/methods/air"
	"liftfuse/methods/campaign"
	"liftfuse/methods/pressure"
)

// tapLog is a synthetic 10 Hz pressure log: per configuration a stretch at
// rest (when standstill), then steady at each speed, joined by ramps that
// break the steady windows. Each tap reads p = Cp·q + offset + noise, the
// noise AR(1) with coefficient phi and marginal sd noiseSD.
type tapLog struct {
	taps       []campaign.Tap
	cp         map[string]map[string]float64 // config → tap → Cp
	offset     map[string]float64            // tap → tube offset, Pa
	standstill bool
	speeds     []float64 // km/h, steady stretches of 30 s
	noiseSD    float64
	phi        float64
}

const (
	logHz     = 10.0
	steadyS   = 30.0
	rampS     = 5.0
	restS     = 20.0
	configGap = 10.0
)

// write writes the log to dir and returns its segments.
func (g tapLog) write(t testing.TB, dir string, rho float64) []campaign.Segment {
	t.Helper()
	rng := rand.New(rand.NewPCG(13, 1946))
	var b strings.Builder
	b.WriteString("t,v_kmh")
	for _, tp := range g.taps {
		b.WriteString(",p_" + tp.ID)
	}
	b.WriteString("\n")
	noise := make([]float64, len(g.taps))
	innov := g.noiseSD * math.Sqrt(1-g.phi*g.phi)
	tm := 0.0
	var segs []campaign.Segment
	row := func(v float64, config string) {
		fmt.Fprintf(&b, "%.2f,%.4f", tm, v)
		q := air.DynamicPressure(rho, air.KmhToMs(v))
		for k, tp := range g.taps {
			noise[k] = g.phi*noise[k] + innov*rng.NormFloat64()
			fmt.Fprintf(&b, ",%.4f", g.cp[config][tp.ID]*q+g.offset[tp.ID]+noise[k])
		}
		b.WriteString("\n")
		tm += 1 / logHz
	}
	hold := func(v, dur float64, config string) {
		for range int(dur * logHz) {
			row(v+0.2*(rng.Float64()-0.5), config)
		}
	}
	ramp := func(v0, v1 float64, config string) {
		n := int(rampS * logHz)
		for i := range n {
			row(v0+(v1-v0)*float64(i)/float64(n), config)
		}
	}
	for _, config := range []string{"a", "b"} {
		from := tm
		v := 0.0
		if g.standstill {
			hold(0, restS, config)
		} else {
			v = g.speeds[0]
		}
		for _, s := range g.speeds {
			ramp(v, s, config)
			hold(s, steadyS, config)
			v = s
		}
		ramp(v, 0, config)
		segs = append(segs, campaign.Segment{Config: config, FromS: from, ToS: tm - 0.5/logHz, Direction: 1})
		tm += configGap
	}
	if err := os.WriteFile(filepath.Join(dir, "taps.csv"), []byte(b.String()), 0o644); err != nil {
		t.Fatal(err)
	}
	return segs
}

// loggedCampaign is a two-configuration car with a closed body of taps.
func loggedCampaign(dir string) *campaign.Campaign {
	return &campaign.Campaign{
		Dir:            dir,
		Vehicle:        campaign.Vehicle{WheelbaseM: 2.5, Body: campaign.BodyFastback},
		Configurations: []campaign.Configuration{{ID: "a"}, {ID: "b"}},
		Air:            campaign.Air{TemperatureC: 20, PressureHPa: 1013.25, HumidityPct: 50, CO2ppm: 400, WindSDMs: 1},
	}
}

// TestLoggedTaps: an entry whose taps are logged in time gives the same
// integrated forces as the equivalent averaged readings (p = Cp·q at the
// window's mean speed, offsets removed), within 4 standard errors of the
// windows' means; tube offsets are removed by the standstill windows; and a
// log without a standstill warns and keeps the offsets. The truth is the
// synthetic log's own Cp·q (constructed, not from the adapter); the
// n_eff = n(1 − r)/(1 + r) error of an AR(1) mean is Bayley & Hammersley
// 1946 (from memory).
func TestLoggedTaps(t *testing.T) {
	taps := closedBody()
	cp := map[string]map[string]float64{"a": {}, "b": {}}
	offset := map[string]float64{}
	for j, tp := range taps {
		cp["a"][tp.ID] = -0.3 + 0.2*math.Sin(float64(3*j))
		cp["b"][tp.ID] = -0.5 + 0.2*math.Cos(float64(2*j))
		// Tubes differ, upper and lower by 50 Pa: the offsets do not cancel.
		offset[tp.ID] = 10 * math.Sin(float64(5*j+1))
		if tp.Surface == campaign.SurfaceUpper {
			offset[tp.ID] += 25
		} else {
			offset[tp.ID] -= 25
		}
	}
	for _, tc := range []struct {
		name       string
		standstill bool
		offsets    bool
		wantWarn   bool
	}{
		{"standstill pins the tube offsets", true, true, false},
		{"no offsets, standstill logged", true, false, false},
		{"no standstill warns and keeps the offsets", false, true, true},
	} {
		t.Run(tc.name, func(t *testing.T) {
			dir := t.TempDir()
			c := loggedCampaign(dir)
			g := tapLog{taps: taps, cp: cp, offset: map[string]float64{}, standstill: tc.standstill, speeds: []float64{100, 150}, noiseSD: 6, phi: 0.8}
			if tc.offsets {
				g.offset = offset
			}
			segs := g.write(t, dir, c.Density())
			l := campaign.LogSpec{File: "taps.csv", Time: "t", SpeedKmh: "v_kmh", Segments: segs}
			for _, tp := range taps {
				l.Taps = append(l.Taps, campaign.Name{Key: tp.ID, V: "p_" + tp.ID})
			}
			e := &campaign.PressureEntry{ID: "logged", Mode: campaign.ModePanels, SensorSDPa: 0.5, ReferenceSDPa: 3, Taps: taps,
				Logs: []campaign.LogSpec{l}, Steady: campaign.Steady{SpeedTolKmh: 2, MinDurationS: 10}}
			checkLogged(t, c, e, g, tc.offsets && !tc.standstill, tc.wantWarn)
		})
	}
}

// checkLogged compares the logged entry's readings with the truth.
func checkLogged(t *testing.T, c *campaign.Campaign, e *campaign.PressureEntry, g tapLog, keepsOffset, wantWarn bool) {
	t.Helper()
	lg, err := pressure.FromLogs(c, e)
	if err != nil {
		t.Fatal(err)
	}
	if got, want := len(lg.Readings), 2*len(g.speeds); got != want {
		t.Fatalf("%d readings, want %d (one per configuration and speed)", got, want)
	}
	warned := strings.Contains(strings.Join(lg.Warnings, "\n"), "no standstill window")
	if warned != wantWarn {
		t.Errorf("standstill warning %v, want %v: %q", warned, wantWarn, lg.Warnings)
	}
	res, err := pressure.Reduce(c, e, "")
	if err != nil {
		t.Fatal(err)
	}
	panels, err := pressure.Panels(e)
	if err != nil {
		t.Fatal(err)
	}
	worst := 0.0
	defer func() {
		t.Logf("sensor sd estimate %.3f Pa (AR(1) theory 6/√(300·0.2/1.8) = %.3f Pa before the zero's share); worst force deviation %.2f SE",
			lg.SensorSDPa, 6/math.Sqrt(300*0.2/1.8), worst)
	}()
	var offF pressure.Forces
	if keepsOffset {
		offF = pressure.Integrate(panels, func(id string) float64 { return g.offset[id] }, c.Vehicle.WheelbaseM)
	}
	for i, rd := range lg.Readings {
		// The equivalent averaged reading: p = Cp·q at the window's mean speed.
		q := air.DynamicPressure(c.Density(), air.KmhToMs(rd.SpeedKmh))
		want := pressure.Integrate(panels, func(id string) float64 { return g.cp[rd.Config][id] * q }, c.Vehicle.WheelbaseM)
		got := res.Readings[i].Forces
		seF := forceSE(panels, rd, lg.SE[i], c.Vehicle.WheelbaseM)
		for _, ax := range []struct {
			name           string
			got, want, off float64
		}{{"front", got.Front, want.Front, offF.Front}, {"rear", got.Rear, want.Rear, offF.Rear}, {"total", got.Total, want.Total, offF.Total}} {
			d := ax.got - ax.want - ax.off
			worst = math.Max(worst, math.Abs(d)/seF)
			if math.Abs(d) > 4*seF {
				t.Errorf("reading %d (%s, %.1f km/h) %s: %.2f N, want %.2f N (offset %.2f N), off by %.1f SE (SE %.2f N)",
					i+1, rd.Config, rd.SpeedKmh, ax.name, ax.got, ax.want, ax.off, d/seF, seF)
			}
		}
		if keepsOffset && math.Abs(offF.Total) < 10*seF {
			t.Fatalf("the tube offsets move the total by only %.2f N, SE %.2f N: the check cannot fail", offF.Total, seF)
		}
	}
	// The estimated sensor sd: the RMS of the readings' SE, above the stated 0.5 Pa.
	if lg.SensorSDPa <= e.SensorSDPa || res.Entry.SensorSDPa != lg.SensorSDPa {
		t.Errorf("sensor sd %.3f Pa (entry copy %.3f), want the estimate above the stated %.1f", lg.SensorSDPa, res.Entry.SensorSDPa, e.SensorSDPa)
	}
}

// forceSE is the standard error of a reading's total force from its taps'
// standard errors, independent taps: √Σ (A·n·SE)².
func forceSE(panels []pressure.Panel, rd campaign.Reading, se []float64, L float64) float64 {
	var v float64
	for k, pv := range rd.Pa {
		for _, pn := range panels {
			if pn.ID == pv.Key {
				v += math.Pow(pn.A*pn.Nz*se[k], 2)
			}
		}
	}
	return math.Sqrt(v)
}

// TestLoggedTapsErrors: logs that cannot give readings are errors that
// say why, never an empty entry.
func TestLoggedTapsErrors(t *testing.T) {
	taps := closedBody()[:2]
	for _, tc := range []struct {
		name, csv string
		want      error
		wantText  string
	}{
		{"no steady window at speed", "t,v,u0,l0\n0,0,1,2\n0.1,50,1,2\n0.2,100,1,2\n0.3,150,1,2\n", pressure.ErrNoWindows, "no steady window"},
		{"negative speed", "t,v,u0,l0\n0,0,1,2\n0.1,-20,1,2\n", campaign.ErrRange, "taps.csv:3:"},
	} {
		t.Run(tc.name, func(t *testing.T) {
			dir := t.TempDir()
			if err := os.WriteFile(filepath.Join(dir, "taps.csv"), []byte(tc.csv), 0o644); err != nil {
				t.Fatal(err)
			}
			c := loggedCampaign(dir)
			c.Configurations = c.Configurations[:1]
			l := campaign.LogSpec{File: "taps.csv", Time: "t", SpeedKmh: "v", Taps: campaign.Names{{Key: "u0", V: "u0"}, {Key: "l0", V: "l0"}}}
			e := &campaign.PressureEntry{ID: "logged", Mode: campaign.ModePanels, SensorSDPa: 1, Taps: taps,
				Logs: []campaign.LogSpec{l}, Steady: campaign.Steady{SpeedTolKmh: 2, MinDurationS: 0.05}}
			_, err := pressure.Reduce(c, e, "")
			t.Log(err)
			if !errors.Is(err, tc.want) || !strings.Contains(err.Error(), tc.wantText) || !strings.HasPrefix(err.Error(), "logged: ") {
				t.Errorf("error %v, want %v naming %q after the entry id", err, tc.want, tc.wantText)
			}
		})
	}
}

// BenchmarkFromLogs reads a two-configuration 10 Hz log of ten taps
// (about 3,000 rows) into readings.
func BenchmarkFromLogs(b *testing.B) {
	taps := closedBody()
	cp := map[string]map[string]float64{"a": {}, "b": {}}
	for _, tp := range taps {
		cp["a"][tp.ID], cp["b"][tp.ID] = -0.3, -0.4
	}
	dir := b.TempDir()
	c := loggedCampaign(dir)
	g := tapLog{taps: taps, cp: cp, offset: map[string]float64{}, standstill: true, speeds: []float64{100, 150}, noiseSD: 6, phi: 0.8}
	l := campaign.LogSpec{File: "taps.csv", Time: "t", SpeedKmh: "v_kmh", Segments: g.write(b, dir, c.Density())}
	for _, tp := range taps {
		l.Taps = append(l.Taps, campaign.Name{Key: tp.ID, V: "p_" + tp.ID})
	}
	e := &campaign.PressureEntry{ID: "logged", Mode: campaign.ModePanels, SensorSDPa: 0.5, Taps: taps,
		Logs: []campaign.LogSpec{l}, Steady: campaign.Steady{SpeedTolKmh: 2, MinDurationS: 10}}
	for b.Loop() {
		if _, err := pressure.FromLogs(c, e); err != nil {
			b.Fatal(err)
		}
	}
}
