package reality_test

import (
	"bytes"
	"encoding/csv"
	"math"
	"os"
	"path/filepath"
	"strconv"
	"strings"
	"testing"

	"liftfuse/methods/sim/reality"
)

// table reads a CSV written by a day: header → column of numbers (text
// columns are kept as NaN) and the raw records.
func table(t *testing.T, path string) (map[string][]float64, [][]string) {
	t.Helper()
	f, err := os.Open(path)
	if err != nil {
		t.Fatal(err)
	}
	defer f.Close()
	recs, err := csv.NewReader(f).ReadAll()
	if err != nil {
		t.Fatal(err)
	}
	cols := map[string][]float64{}
	for _, r := range recs[1:] {
		for i, h := range recs[0] {
			v, err := strconv.ParseFloat(r[i], 64)
			if err != nil {
				v = math.NaN()
			}
			cols[h] = append(cols[h], v)
		}
	}
	return cols, recs
}

func write(t *testing.T, d *reality.Day, seed int64) (string, *reality.Truth) {
	t.Helper()
	dir := t.TempDir()
	tr, err := d.Write(dir, seed)
	if err != nil {
		t.Fatal(err)
	}
	return dir, tr
}

// TestDeterministic: the same day and seed write the same bytes; another
// seed writes another log.
func TestDeterministic(t *testing.T) {
	d := reality.Default()
	a, _ := write(t, d, 11)
	b, _ := write(t, d, 11)
	c, _ := write(t, d, 12)
	for _, name := range []string{reality.CampaignFile, reality.LogFile, "body-taps-readings.csv", reality.TruthFile} {
		x, _ := os.ReadFile(filepath.Join(a, name))
		y, _ := os.ReadFile(filepath.Join(b, name))
		if !bytes.Equal(x, y) {
			t.Errorf("%s differs between two writes with one seed", name)
		}
	}
	x, _ := os.ReadFile(filepath.Join(a, reality.LogFile))
	z, _ := os.ReadFile(filepath.Join(c, reality.LogFile))
	if bytes.Equal(x, z) {
		t.Error("two seeds wrote the same log")
	}
}

// TestFaults checks that each fault leaves its mark in the files, against
// the same day and seed without it.
func TestFaults(t *testing.T) {
	clean := reality.Default()
	clean.ExactKnowledge = true
	cdir, _ := write(t, clean, 5)
	clog, _ := table(t, filepath.Join(cdir, reality.LogFile))
	ctaps, _ := table(t, filepath.Join(cdir, "body-taps-readings.csv"))
	cases := faultCases(clog, ctaps)
	for _, tc := range cases {
		t.Run(tc.name, func(t *testing.T) {
			d := reality.Default()
			d.ExactKnowledge = true
			d.Faults = tc.fault
			dir, tr := write(t, d, 5)
			if len(tr.Faults) != 1 {
				t.Errorf("truth lists faults %q, want one", tr.Faults)
			}
			tc.check(t, dir, tr)
		})
	}
}

// faultCase is a fault and a check of the files it leaves.
type faultCase struct {
	name  string
	fault reality.Faults
	check func(t *testing.T, dir string, tr *reality.Truth)
}

// faultCases are the cases of TestFaults; clog and ctaps are the clean
// day's log and readings.
func faultCases(clog, ctaps map[string][]float64) []faultCase {
	return []faultCase{
		{"unit slip", reality.Faults{UnitSlip: true}, func(t *testing.T, dir string, _ *reality.Truth) {
			log, _ := table(t, filepath.Join(dir, reality.LogFile))
			for i, v := range log["v_kmh"] {
				if math.Abs(v-clog["v_kmh"][i]/3.6) > 1e-3 {
					t.Fatalf("row %d: speed %g, want %g/3.6", i, v, clog["v_kmh"][i])
				}
			}
		}},
		{"inverted taps", reality.Faults{InvertedTaps: "body-taps"}, func(t *testing.T, dir string, _ *reality.Truth) {
			taps, _ := table(t, filepath.Join(dir, "body-taps-readings.csv"))
			for _, id := range []string{"u1", "u4", "l3"} {
				for i, v := range taps[id] {
					if math.Abs(v+ctaps[id][i]) > 0.011 {
						t.Errorf("tap %s reading %d: %g, want %g", id, i, v, -ctaps[id][i])
					}
				}
			}
		}},
		{"blocked tap", reality.Faults{BlockedTap: &reality.BlockedTap{Entry: "body-taps", Tap: "u4", Config: "spoiler"}},
			func(t *testing.T, dir string, _ *reality.Truth) {
				taps, recs := table(t, filepath.Join(dir, "body-taps-readings.csv"))
				for i, v := range taps["u4"] {
					blocked := recs[i+1][0] == "spoiler"
					// Blocked: noise only, 2.5 Pa sd, so |p| < 5 sd; open: the
					// roof's suction at 110 km/h or more is hundreds of Pa.
					if blocked && math.Abs(v) > 12.5 || !blocked && v > -100 {
						t.Errorf("reading %d (%s): u4 = %g Pa", i, recs[i+1][0], v)
					}
				}
			}},
		{"gain error", reality.Faults{GainError: &reality.GainError{Sensor: "front-pot", Pct: 12}},
			func(t *testing.T, dir string, tr *reality.Truth) {
				s := tr.Nuisances.Sensors[0]
				if math.Abs(s.StatedMmPerUnit/s.MmPerUnit-1.12) > 1e-4 {
					t.Errorf("stated gain %g against true %g, want ×1.12", s.StatedMmPerUnit, s.MmPerUnit)
				}
				b, _ := os.ReadFile(filepath.Join(dir, reality.CampaignFile))
				if !strings.Contains(string(b), "mm_per_unit: 26.88") {
					t.Error("campaign does not state 24 mm/unit × 1.12 = 26.88")
				}
			}},
		{"laser behind the axle", reality.Faults{LaserAt: &reality.LaserAt{Sensor: "rear-laser", XM: 3.25}},
			func(t *testing.T, dir string, tr *reality.Truth) {
				if x := tr.Nuisances.Sensors[2].XM; x != 3.25 {
					t.Errorf("true laser position %g, want 3.25", x)
				}
				b, _ := os.ReadFile(filepath.Join(dir, reality.CampaignFile))
				if strings.Contains(string(b), "x_m: 3.25") || strings.Contains(string(b), "x_m: 2.45") {
					t.Error("the campaign states the laser's position; the fault is that it does not")
				}
			}},
		{"creep", reality.Faults{CreepKmhPerS: 0.75}, func(t *testing.T, dir string, _ *reality.Truth) {
			log, _ := table(t, filepath.Join(dir, reality.LogFile))
			// Within a 16 s hold the speed rises 12 km/h: the logged range
			// near 160 km/h widens from noise to ±6 km/h.
			hi := 0.0
			for _, v := range log["v_kmh"] {
				hi = math.Max(hi, v)
			}
			if hi < 165.5 || hi > 166.5 {
				t.Errorf("top logged speed %g km/h, want 160 + 6", hi)
			}
		}},
		{"bump stop", reality.Faults{BumpStop: &reality.BumpStop{Axle: "rear", GapMm: 0.5, RateNPerMm: 400}},
			func(t *testing.T, dir string, _ *reality.Truth) { checkBumpStop(t, dir, clog) }},
	}
}

// checkBumpStop: in the spoiler configuration the rear pushes down: at 160
// km/h the clean rear pot drops by q·0.06/(2·k_w) ≈ 1.7 mm; the stop holds
// it near its 0.5 mm gap. The spoiler runs are the log's second half; the
// pot reads 1.5 V at static.
func checkBumpStop(t *testing.T, dir string, clog map[string][]float64) {
	log, _ := table(t, filepath.Join(dir, reality.LogFile))
	drop := func(sig []float64) float64 {
		lo := math.Inf(1)
		for i, v := range sig {
			if i > len(sig)/2 && log["v_kmh"][i] > 150 {
				lo = math.Min(lo, v)
			}
		}
		return (1.5 - lo) * 23.5
	}
	if c, b := drop(clog["rear-pot"]), drop(log["rear-pot"]); !(b < c-0.5) {
		t.Errorf("rear drop with the stop %.2f mm, clean %.2f mm: the stop should hold it", b, c)
	}
}

// TestProbe: with still air and exact speeds, a probe whose factor is
// k = 0.21 reads V/√(1 + k) = V/1.1 (q_true = q_meas·(1 + k), model.md,
// "Measured airspeed").
func TestProbe(t *testing.T) {
	d := reality.Default()
	d.Air.WindMs, d.Air.GustSDMs = 0, 0
	d.Log.SpeedNoiseKmh = 0
	d.Log.Probe = &reality.Probe{FactorK: 0.21}
	dir, tr := write(t, d, 2)
	log, _ := table(t, filepath.Join(dir, reality.LogFile))
	for i, v := range log["v_kmh"] {
		near := math.Abs(log["airspeed_kmh"][i]-v/1.1) <= 1e-3
		if !near {
			t.Fatalf("row %d: airspeed %g, want %g/1.1", i, log["airspeed_kmh"][i], v)
		}
	}
	if tr.Nuisances.ProbeFactorK != 0.21 {
		t.Errorf("truth probe factor %g, want 0.21", tr.Nuisances.ProbeFactorK)
	}
}

// TestLoggedTaps: with v2 keys a logged tap entry is a time series named
// in the campaign; with v1 keys it falls back to readings.
func TestLoggedTaps(t *testing.T) {
	cases := []struct {
		name string
		keys reality.Keys
		file string
	}{
		{"v2 time series", reality.KeysV2, "logs/body-taps.csv"},
		{"v1 readings", reality.KeysV1, "body-taps-readings.csv"},
	}
	for _, tc := range cases {
		t.Run(tc.name, func(t *testing.T) {
			d := reality.Default()
			d.Keys = tc.keys
			d.Taps[0].Logged = true
			dir, _ := write(t, d, 4)
			b, err := os.ReadFile(filepath.Join(dir, reality.CampaignFile))
			if err != nil {
				t.Fatal(err)
			}
			if !strings.Contains(string(b), tc.file) {
				t.Errorf("campaign does not name %s", tc.file)
			}
			cols, _ := table(t, filepath.Join(dir, filepath.FromSlash(tc.file)))
			if len(cols["u4"]) == 0 {
				t.Errorf("%s has no column u4", tc.file)
			}
		})
	}
}
