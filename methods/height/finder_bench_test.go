package height

import (
	"math"
	"os"
	"testing"

	"liftfuse/methods/logs"
	"liftfuse/methods/logs/logtest"
)

// BenchmarkFinder: the steady-window finder alone over the big log's
// samples, read into memory first (time, speed, front height), so that its
// cost per sample shows without the parse running beside it.
func BenchmarkFinder(b *testing.B) {
	name := logtest.BenchLog(b)
	f, err := os.Open(name)
	if err != nil {
		b.Fatal(err)
	}
	defer f.Close()
	r, err := logs.NewReader(f, name, []logs.Column{{Name: "t_s"}, {Name: "v_kmh"}, {Name: "front_pot_v"}})
	if err != nil {
		b.Fatal(err)
	}
	var ss []sample
	for r.Next() {
		ss = append(ss, sample{t: r.Float(0), v: r.Float(1), h: 24 * r.Float(2), qa: math.NaN()})
	}
	if err := r.Err(); err != nil {
		b.Fatal(err)
	}
	b.ResetTimer()
	for b.Loop() {
		fd := finder{tol: 1.5, minDur: 4, rho: 1.2}
		for _, s := range ss {
			fd.add(s, "base", 1)
		}
		fd.close()
		fd.finish()
		if len(fd.windows) < 50 {
			b.Fatalf("only %d windows", len(fd.windows))
		}
	}
}
