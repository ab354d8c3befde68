// Package logtest holds what the benchmarks of the log reader, the
// adapters and the fusion share: the logs they read (written once, so that
// they read the same file) and the process's CPU time (CPUTime).
package logtest

import (
	"bufio"
	"fmt"
	"math"
	"math/rand/v2"
	"os"
	"path/filepath"
	"testing"
)

// BenchLogBytes is the size of the log BenchLog writes; a log of another
// size (an older generator's, whose speed ramped down below zero and which
// the reduction refuses) is written again.
const BenchLogBytes = 88_246_556

// BenchLog writes (once per machine, in the temporary directory) the 1 kHz,
// 30-minute, 8-column log of the reading and reduction benchmarks — the
// size of a serious test day, about 88 MB — and returns its path. The speed
// cycles through steady holds so that the reduction finds windows.
func BenchLog(tb testing.TB) string {
	tb.Helper()
	name := filepath.Join(os.TempDir(), "liftfuse-bench-1khz-30min.csv")
	if st, err := os.Stat(name); err == nil && st.Size() == BenchLogBytes {
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
