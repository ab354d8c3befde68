package logs_test

import (
	"bufio"
	"bytes"
	"fmt"
	"io"
	"math"
	"math/rand/v2"
	"os"
	"path/filepath"
	"syscall"
	"testing"

	"liftfuse/methods/logs"
)

// benchLogBytes is the size of the log benchLog writes; a log of another
// size (an older generator's, whose speed ramped down below zero and which
// the reduction refuses) is written again.
const benchLogBytes = 88_246_556

// benchLog writes (once per machine) the 1 kHz, 30-minute, 8-column log
// that methods/height's ReduceLog benchmark reads (same name, same rows),
// and returns its path.
func benchLog(tb testing.TB) string {
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

// benchLogSemicolon is benchLog as a European logger writes it: ';' cells
// and decimal commas (same size, same values).
func benchLogSemicolon(tb testing.TB) string {
	tb.Helper()
	src := benchLog(tb)
	name := filepath.Join(os.TempDir(), "liftfuse-bench-1khz-30min-semicolon.csv")
	if st, err := os.Stat(name); err == nil && st.Size() == benchLogBytes {
		return name
	}
	data, err := os.ReadFile(src)
	if err != nil {
		tb.Fatal(err)
	}
	for i, c := range data {
		switch c {
		case ',':
			data[i] = ';'
		case '.':
			data[i] = ','
		}
	}
	if err := os.WriteFile(name+".tmp", data, 0o644); err != nil {
		tb.Fatal(err)
	}
	if err := os.Rename(name+".tmp", name); err != nil {
		tb.Fatal(err)
	}
	return name
}

// benchCols are the columns the ReduceLog benchmark asks for.
var benchCols = []logs.Column{{Name: "t_s"}, {Name: "v_kmh"}, {Name: "front_pot_v"}, {Name: "dir"}}

// BenchmarkReadLog: the reader alone over the 1 kHz log, four of eight
// columns, every value touched. Reported as MB/s of log.
func BenchmarkReadLog(b *testing.B) { benchRead(b, benchLog(b), 0) }

// BenchmarkReadLogOneWorker: the same with one parsing goroutine.
func BenchmarkReadLogOneWorker(b *testing.B) { benchRead(b, benchLog(b), 1) }

// BenchmarkReadLogSemicolon: the same log with ';' and decimal commas,
// detected.
func BenchmarkReadLogSemicolon(b *testing.B) { benchRead(b, benchLogSemicolon(b), 0) }

func benchRead(b *testing.B, name string, workers int) {
	data, err := os.ReadFile(name)
	if err != nil {
		b.Fatal(err)
	}
	b.SetBytes(int64(len(data)))
	b.ReportAllocs()
	cpu0 := cpuTime()
	for b.Loop() {
		if n := readAll(b, bytes.NewReader(data), workers); n != 1_800_000 {
			b.Fatalf("read %d rows", n)
		}
	}
	// CPU time of all threads per read: steadier than wall time on a
	// shared machine.
	b.ReportMetric(float64(cpuTime()-cpu0)/float64(b.N), "cpu-ns/op")
}

// cpuTime is the process's user and system time in nanoseconds.
func cpuTime() int64 {
	var ru syscall.Rusage
	if syscall.Getrusage(syscall.RUSAGE_SELF, &ru) != nil {
		return 0
	}
	return ru.Utime.Nano() + ru.Stime.Nano()
}

func readAll(b *testing.B, src io.Reader, workers int) int {
	r, err := logs.NewReader(src, "bench.csv", benchCols)
	if err != nil {
		b.Fatal(err)
	}
	r.Increasing = 0
	if workers > 0 {
		r.Workers = workers
	}
	n, sum := 0, 0.0
	for r.Next() {
		n++
		sum += r.Float(1) + r.Float(2) + r.Float(3)
	}
	if err := r.Err(); err != nil || math.IsNaN(sum) {
		b.Fatal(err)
	}
	return n
}
