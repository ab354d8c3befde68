package height_test

import (
	"bufio"
	"fmt"
	"math"
	"math/rand/v2"
	"os"
	"path/filepath"
	"strconv"
	"testing"

	"liftfuse/methods/campaign"
)

// bigDayEnv names the folder TestWriteBigDay writes its campaign to; the
// test is skipped when it is unset. bigDayRowsEnv, when set, is the number
// of rows instead of bigDayRows (to see how memory grows with windows).
// The campaign is the memory case of the reliability promise (a 1 GB log
// with 2 000+ windows reduces in ≤ 48 MiB); measure it with
//
//	LIFTFUSE_BIG_DAY=/tmp/big go test ./methods/height -run TestWriteBigDay
//	/usr/bin/time -v liftfuse reduce /tmp/big/campaign.yaml -q
const (
	bigDayEnv     = "LIFTFUSE_BIG_DAY"
	bigDayRowsEnv = "LIFTFUSE_BIG_DAY_ROWS"
)

// Big day plan: cycles of steady holds at each speed (long enough for a
// window of min_duration_s 4), 1.2 s ramps between them and a 4 s
// deceleration to the first, in alternating directions, so each cycle is a
// run of its own wind deviation.
var bigDaySpeeds = []float64{80, 100, 120, 140, 160} // km/h

const (
	bigDayRows = 13_500_000 // 1 kHz: 3 h 45 min

	bigDayHoldS, bigDayRampS, bigDayBackS = 4.6, 1.2, 4.0
	bigDayCLA                             = 0.12 // m², both configurations (memory, not physics, is the point)
	bigDayWheelRate                       = 48.6 // N/mm, the front axle's 2·30·0.9²
	bigDayRho                             = 1.2  // kg/m³, near the campaign's air
)

// TestWriteBigDay writes, when LIFTFUSE_BIG_DAY names a folder, a campaign
// and its 1 kHz log of about 1.1 GB: time, speed, direction, a front pot
// and five padding channels a logger would carry, a run-to-run wind of
// 1 m/s sd and 0.25 mm of pot noise. A generator for the memory
// measurement, kept beside the adapter it measures; it checks only that
// the campaign it wrote loads.
func TestWriteBigDay(t *testing.T) {
	dir := os.Getenv(bigDayEnv)
	if dir == "" {
		t.Skip(bigDayEnv + " not set")
	}
	var err error
	if err = os.MkdirAll(dir, 0o755); err != nil {
		t.Fatal(err)
	}
	rows := bigDayRows
	if s := os.Getenv(bigDayRowsEnv); s != "" {
		if rows, err = strconv.Atoi(s); err != nil || rows < 1000 {
			t.Fatalf("%s=%q: want a number of rows ≥ 1000", bigDayRowsEnv, s)
		}
	}
	end, err := writeBigLog(filepath.Join(dir, "big.csv"), rows)
	if err != nil {
		t.Fatal(err)
	}
	yaml := fmt.Sprintf(bigDayCampaign, end/2, end/2+0.001, end)
	name := filepath.Join(dir, "campaign.yaml")
	if err := os.WriteFile(name, []byte(yaml), 0o644); err != nil {
		t.Fatal(err)
	}
	if _, err := campaign.Load(name, campaign.Options{}); err != nil {
		t.Fatal(err)
	}
}

// bigDayCampaign is the campaign of the big day: one front pot, the first
// half of the log baseline and the second wing.
const bigDayCampaign = `liftfuse: 1
campaign: {title: Memory case, date: 2026-03-02}
vehicle:
  label: Generated car
  body: fastback
  wheelbase_m: 2.5
  mass_kg: 1200
  axles:
    front: {spring_n_per_mm: 30, spring_sd_pct: 5, motion_ratio: 0.9, motion_ratio_sd: 0.02, tyre_n_per_mm: 220, tyre_sd_pct: 10}
    rear: {spring_n_per_mm: 35, spring_sd_pct: 5, motion_ratio: 0.8, motion_ratio_sd: 0.02, tyre_n_per_mm: 220, tyre_sd_pct: 10}
configurations:
  - {id: base}
  - {id: wing}
air: {temperature_c: 20, pressure_hpa: 1013, humidity_pct: 50, wind_sd_ms: 1.5, gust_sd_ms: 1.5}
evidence:
  ride_height:
    - id: fpot
      axle: front
      sensor: pot
      calibration: {mm_per_unit: 24}
      stiffness: {from: springs}
      logs:
        - file: big.csv
          time: t_s
          speed_kmh: v_kmh
          signal: front_pot_v
          direction: dir
          segments:
            - {config: base, from_s: 0, to_s: %.3f}
            - {config: wing, from_s: %.3f, to_s: %.3f}
report: {speeds_kmh: [100, 150], force_unit: N}
`

// writeBigLog writes the big day's log and returns its last time (s).
func writeBigLog(name string, rows int) (float64, error) {
	f, err := os.Create(name)
	if err != nil {
		return 0, err
	}
	w := bufio.NewWriterSize(f, 1<<20)
	rng := rand.New(rand.NewPCG(16, 1))
	w.WriteString("t_s,v_kmh,dir,front_pot_v,coolant_c,steer_deg,lat_g,engine_rpm,throttle_pct\n")
	cycle := float64(len(bigDaySpeeds))*bigDayHoldS + float64(len(bigDaySpeeds)-1)*bigDayRampS + bigDayBackS
	var row []byte
	gust, lastCycle := 0.0, -1
	var t float64
	for i := range rows {
		t = float64(i) / 1000
		k := int(t / cycle)
		if k != lastCycle {
			gust, lastCycle = rng.NormFloat64(), k
		}
		dir := 1 - 2*(k%2)
		v := bigDaySpeed(t-float64(k)*cycle) + 0.3*rng.NormFloat64()
		air := v/3.6 + float64(dir)*1.0 + gust
		mm := 0.5*bigDayRho*air*air*bigDayCLA/bigDayWheelRate + 0.25*rng.NormFloat64()
		row = strconv.AppendFloat(row[:0], t, 'f', 3, 64)
		row = append(row, ',')
		row = strconv.AppendFloat(row, v, 'f', 2, 64)
		row = append(row, ',')
		row = strconv.AppendInt(row, int64(dir), 10)
		row = append(row, ',')
		row = strconv.AppendFloat(row, 1.5+mm/24, 'f', 5, 64)
		for _, x := range [...]float64{88 + rng.Float64(), 10 * rng.NormFloat64(), 0.3 * rng.NormFloat64(), 3000 + 2000*rng.Float64(), 100 * rng.Float64()} {
			row = append(row, ',')
			row = strconv.AppendFloat(row, x, 'f', 7, 64)
		}
		row = append(row, '\n')
		if _, err := w.Write(row); err != nil {
			f.Close()
			return 0, err
		}
	}
	if err := w.Flush(); err != nil {
		f.Close()
		return 0, err
	}
	return t, f.Close()
}

// bigDaySpeed is the planned speed (km/h) at time s into a cycle.
func bigDaySpeed(s float64) float64 {
	for j, v := range bigDaySpeeds {
		if s < bigDayHoldS {
			return v
		}
		s -= bigDayHoldS
		if j == len(bigDaySpeeds)-1 {
			break
		}
		if s < bigDayRampS {
			return v + (bigDaySpeeds[j+1]-v)*s/bigDayRampS
		}
		s -= bigDayRampS
	}
	last := bigDaySpeeds[len(bigDaySpeeds)-1]
	return last + (bigDaySpeeds[0]-last)*math.Min(s/bigDayBackS, 1)
}
