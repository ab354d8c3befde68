package height_test

import (
	"bufio"
	"fmt"
	"math"
	"math/rand/v2"
	"os"
	"path/filepath"
	"testing"

	"liftfuse/methods/campaign"
	"liftfuse/methods/height"
)

// benchLogBytes is the size of the log bigLog writes; a log of another
// size (an older generator's, whose speed ramped down below zero and which
// the reduction refuses) is written again. methods/logs' benchLog writes the
// same file, row for row.
const benchLogBytes = 88_246_556

// bigLog writes (once per machine) a 1 kHz, 30-minute log of 8 columns — the
// size of a serious test day, about 100 MB — and returns its path. The
// speed cycles through steady holds so that the reduction finds windows.
func bigLog(tb testing.TB) string {
	tb.Helper()
	name := filepath.Join(os.TempDir(), "liftfuse-bench-1khz-30min.csv")
	if st, err := os.Stat(name); err == nil && st.Size() == benchLogBytes {
		return name
	}
	f, err := os.Create(name + ".tmp")
	if err != nil {
		tb.Fatal(err)
	}
	w := bufio.NewWriterSize(f, 1<<20)
	rng := rand.New(rand.NewPCG(1, 2))
	fmt.Fprintln(w, "t_s,v_kmh,dir,front_pot_v,rear_pot_v,rear_laser_mm,coolant_c,steer_deg")
	for i := range 1_800_000 {
		t := float64(i) / 1000
		phase := math.Mod(t, 60)
		v := 120.0
		switch {
		case phase < 10:
			v = 35
		case phase < 15:
			v = 35 + 17*(phase-10)
		case phase > 50:
			v = 120 - 8.5*(phase-50) // back to 35 km/h: no negative speeds
		}
		v += 0.3 * rng.NormFloat64()
		dir := 1
		if int(t/60)%2 == 1 {
			dir = -1
		}
		fmt.Fprintf(w, "%.3f,%.2f,%d,%.4f,%.4f,%.2f,%.1f,%.2f\n", t, v, dir, 2+0.01*rng.NormFloat64(), 1.6+0.01*rng.NormFloat64(),
			118+0.4*rng.NormFloat64(), 88+rng.Float64(), rng.NormFloat64())
	}
	if err := w.Flush(); err != nil {
		tb.Fatal(err)
	}
	f.Close()
	if err := os.Rename(name+".tmp", name); err != nil {
		tb.Fatal(err)
	}
	return name
}

// benchCampaign is a campaign with n sensors logged in the big log.
func benchCampaign(name string, n int) (*campaign.Campaign, []*campaign.RideHeightEntry) {
	c := &campaign.Campaign{
		Vehicle:        campaign.Vehicle{WheelbaseM: 2.5, Axles: campaign.Axles{Front: campaign.Axle{SpringNPerMm: 30, SpringSDPct: 5, MotionRatio: 0.9, MotionRatioSD: 0.02, TyreNPerMm: 230, TyreSDPct: 8}}},
		Configurations: []campaign.Configuration{{ID: "base"}},
		Air:            campaign.Air{TemperatureC: 20, PressureHPa: 1013, HumidityPct: 50, CO2ppm: 400, WindSDMs: 1},
	}
	var es []*campaign.RideHeightEntry
	for _, signal := range []string{"front_pot_v", "rear_pot_v", "rear_laser_mm"}[:n] {
		es = append(es, &campaign.RideHeightEntry{ID: signal, Axle: "front", Sensor: "pot",
			Calibration: campaign.Calibration{MmPerUnit: 24, SDPct: 1}, Stiffness: campaign.Stiffness{From: "springs"},
			Steady: campaign.Steady{SpeedTolKmh: 1.5, MinDurationS: 4}, FilterTauS: 0.5,
			Logs: []campaign.LogSpec{{File: name, Time: "t_s", SpeedKmh: "v_kmh", Signal: signal, Direction: "dir"}}})
	}
	return c, es
}

// BenchmarkReduceLog: the whole reduction of one entry over the big log —
// parsing, steady windows, filters, evidence. Reported as MB/s of log.
func BenchmarkReduceLog(b *testing.B) { benchReduce(b, 1) }

// BenchmarkReduceLogThreeSensors: three sensors logged in one file share a
// single read of it.
func BenchmarkReduceLogThreeSensors(b *testing.B) { benchReduce(b, 3) }

func benchReduce(b *testing.B, n int) {
	name := bigLog(b)
	st, _ := os.Stat(name)
	c, es := benchCampaign(name, n)
	b.SetBytes(st.Size())
	b.ReportAllocs()
	for b.Loop() {
		rs, err := height.ReduceAll(c, es, height.Options{})
		if err != nil {
			b.Fatal(err)
		}
		if len(rs[0].Windows) < 50 {
			b.Fatalf("only %d windows", len(rs[0].Windows))
		}
	}
}
