package logs

import (
	"bytes"
	"os"
	"path/filepath"
	"runtime"
	"syscall"
	"testing"
)

// BenchmarkParseBlock: the parser's hot path alone — one goroutine
// parsing the first 512 KiB (in cache) of the 1 kHz benchmark log (written by
// BenchmarkReadLog; skipped when it is absent), cut into blocks as the
// reader cuts them, with the reduction's four columns. cpu-ns/op is the
// thread's own CPU time, a steadier figure than wall time on a machine
// shared with other work.
func BenchmarkParseBlock(b *testing.B) { benchParse(b, "liftfuse-bench-1khz-30min.csv") }

// BenchmarkParseBlockSemicolon: the same rows with ';' and decimal commas.
func BenchmarkParseBlockSemicolon(b *testing.B) {
	benchParse(b, "liftfuse-bench-1khz-30min-semicolon.csv")
}

func benchParse(b *testing.B, file string) {
	f, err := os.Open(filepath.Join(os.TempDir(), file))
	if err != nil {
		b.Skip("run BenchmarkReadLog first to write the log")
	}
	defer f.Close()
	head := make([]byte, 512<<10)
	n, _ := f.Read(head)
	head = head[:n]
	cols := []Column{{Name: "t_s"}, {Name: "v_kmh"}, {Name: "front_pot_v"}, {Name: "dir"}}
	r, err := NewReader(bytes.NewReader(head), file, cols)
	if err != nil {
		b.Fatal(err)
	}
	data := head[bytes.IndexByte(head, '\n')+1 : bytes.LastIndexByte(head, '\n')+1]
	var chunks [][]byte
	for len(data) > 0 {
		end := len(data)
		if end > chunkSize {
			end = bytes.LastIndexByte(data[:chunkSize], '\n') + 1
		}
		chunks, data = append(chunks, data[:end]), data[end:]
	}
	b.SetBytes(int64(len(head)))
	blk := getBlock(0)
	runtime.LockOSThread()
	defer runtime.UnlockOSThread()
	cpu0 := threadCPU()
	for b.Loop() {
		for _, c := range chunks {
			blk.rows, blk.vals = 0, blk.vals[:0]
			if r.parse(blk, c); blk.err != nil {
				b.Fatal(blk.err)
			}
		}
	}
	b.ReportMetric(float64(threadCPU()-cpu0)/float64(b.N), "cpu-ns/op")
}

// threadCPU is the calling thread's user and system time in nanoseconds
// (Linux RUSAGE_THREAD).
func threadCPU() int64 {
	var ru syscall.Rusage
	if syscall.Getrusage(1, &ru) != nil {
		return 0
	}
	return ru.Utime.Nano() + ru.Stime.Nano()
}
