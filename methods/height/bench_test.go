package height_test

import (
	"os"
	"testing"

	"liftfuse/methods/campaign"
	"liftfuse/methods/height"
	"liftfuse/methods/logs/logtest"
)

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
	name := logtest.BenchLog(b)
	st, _ := os.Stat(name)
	c, es := benchCampaign(name, n)
	b.SetBytes(st.Size())
	b.ReportAllocs()
	cpu0 := logtest.CPUTime()
	for b.Loop() {
		rs, err := height.ReduceAll(c, es, height.Options{})
		if err != nil {
			b.Fatal(err)
		}
		if len(rs[0].Windows) < 50 {
			b.Fatalf("only %d windows", len(rs[0].Windows))
		}
	}
	if cpu0 >= 0 {
		b.ReportMetric(float64(logtest.CPUTime()-cpu0)/float64(b.N), "cpu-ns/op")
	}
}
