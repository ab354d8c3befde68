package fuse_test

import (
	"fmt"
	"os"
	"path/filepath"
	"runtime"
	"strings"
	"sync"
	"testing"

	"liftfuse/fuse"
	"liftfuse/methods"
	"liftfuse/methods/logs/logtest"
	"liftfuse/methods/sim"
)

// scaleSizes are the campaign sizes of the scaling benchmarks (issue 15).
var scaleSizes = []int{2, 6, 12, 24, 48}

var (
	scaleMu     sync.Mutex
	scaleInputs = map[int]fuse.Input{}
)

// scaleInput simulates and reduces the n-configuration campaign (once per
// process) and returns the fusion input, as demoInput does for the demo.
func scaleInput(tb testing.TB, n int) fuse.Input {
	tb.Helper()
	scaleMu.Lock()
	defer scaleMu.Unlock()
	if in, ok := scaleInputs[n]; ok {
		return in
	}
	dir := tb.TempDir()
	c, _, err := sim.Build(strings.NewReader(fuse.ScaleSpecText(tb, n)), "scale.yaml", dir)
	if err != nil {
		tb.Fatal(err)
	}
	r, err := methods.Reduce(c, methods.Options{})
	if err != nil {
		tb.Fatal(err)
	}
	var ids []string
	for _, cf := range c.Configurations {
		ids = append(ids, cf.ID)
	}
	in := fuse.Input{Evidence: r.Evidence(), Settings: fuse.Settings{Configs: ids, Seed: 1, Credible: 0.9},
		Reference: "baseline", SpeedsKmh: []float64{100, 150}, Rho: c.Density(), FrontalAreaM2: c.Vehicle.FrontalAreaM2}
	scaleInputs[n] = in
	return in
}

// BenchmarkScale fuses campaigns of 2 to 48 configurations side by side
// (issue 15): go test ./fuse -run XXX -bench Scale -benchtime 3x. Beside
// the wall time it reports the process's CPU time per fusion (cpu-ms/op,
// user + system, getrusage(2), summed over every thread — the chains, the
// agreements two at a time, the collector — so up to twice the wall time
// on two cores; on unix systems, see cpuTime). The heap is collected
// before the clock starts, so the setup's garbage is not charged to it.
func BenchmarkScale(b *testing.B) {
	for _, n := range scaleSizes {
		b.Run(fmt.Sprintf("configs=%d", n), func(b *testing.B) {
			in := scaleInput(b, n)
			b.ReportAllocs()
			runtime.GC()
			cpu0 := logtest.CPUTime()
			for b.Loop() {
				if _, err := fuse.Run(in); err != nil {
					b.Fatal(err)
				}
			}
			if cpu0 >= 0 {
				b.ReportMetric(float64((logtest.CPUTime()-cpu0).Microseconds())/1000/float64(b.N), "cpu-ms/op")
			}
		})
	}
}

// TestScaleSpec checks the generator: the spec of n configurations
// simulates into a campaign of n configurations whose evidence speaks of
// each (common practice (no source): a generator is checked by what it
// makes). With LIFTFUSE_SCALE_SPECS set to a directory it also writes the
// specs there (scale-NN.yaml) for timing the CLI on them.
func TestScaleSpec(t *testing.T) {
	out := os.Getenv("LIFTFUSE_SCALE_SPECS")
	for _, n := range []int{2, 6} {
		t.Run(fmt.Sprintf("configs=%d", n), func(t *testing.T) {
			in := scaleInput(t, n)
			if got := len(in.Settings.Configs); got != n {
				t.Fatalf("%d configurations, want %d", got, n)
			}
			seen := map[string]bool{}
			for _, ev := range in.Evidence {
				for _, q := range ev.Informs {
					seen[q.Config] = true
				}
			}
			if len(seen) != n {
				t.Errorf("evidence speaks of %d configurations, want %d", len(seen), n)
			}
		})
	}
	if out == "" {
		return
	}
	for _, n := range scaleSizes {
		p := filepath.Join(out, fmt.Sprintf("scale-%02d.yaml", n))
		if err := os.WriteFile(p, []byte(fuse.ScaleSpecText(t, n)), 0o644); err != nil {
			t.Fatal(err)
		}
	}
}
