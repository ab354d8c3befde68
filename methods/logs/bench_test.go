package logs_test

import (
	"bytes"
	"io"
	"math"
	"os"
	"path/filepath"
	"testing"

	"liftfuse/methods/logs"
	"liftfuse/methods/logs/logtest"
)

// benchLogSemicolon is logtest.BenchLog as a European logger writes it: ';' cells
// and decimal commas (same size, same values).
func benchLogSemicolon(tb testing.TB) string {
	tb.Helper()
	src := logtest.BenchLog(tb)
	name := filepath.Join(os.TempDir(), "liftfuse-bench-1khz-30min-semicolon.csv")
	if st, err := os.Stat(name); err == nil && st.Size() == logtest.BenchLogBytes {
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
func BenchmarkReadLog(b *testing.B) { benchRead(b, logtest.BenchLog(b), 0) }

// BenchmarkReadLogOneWorker: the same with one parsing goroutine.
func BenchmarkReadLogOneWorker(b *testing.B) { benchRead(b, logtest.BenchLog(b), 1) }

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
	cpu0 := logtest.CPUTime()
	for b.Loop() {
		if n := readAll(b, bytes.NewReader(data), workers); n != 1_800_000 {
			b.Fatalf("read %d rows", n)
		}
	}
	// CPU time of all threads per read: steadier than wall time on a
	// shared machine.
	if cpu0 >= 0 {
		b.ReportMetric(float64(logtest.CPUTime()-cpu0)/float64(b.N), "cpu-ns/op")
	}
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
