package main

import (
	"context"
	"io"
	"os"
	"testing"
)

// benchCampaign is the campaign of the log benchmark; its log is written by
// go test ./methods/logs -bench ReadLog (or ./methods/height -bench ReduceLog).
const benchCampaign = "../../testdata/bench/campaign-1khz.yaml"

// BenchmarkReduceCommand: `liftfuse reduce testdata/bench/campaign-1khz.yaml -q`
// in the process — loading (validation's read of the log and the input
// hash), the adapters and the report. Reported as MB/s of log.
func BenchmarkReduceCommand(b *testing.B) {
	st, err := os.Stat("/tmp/liftfuse-bench-1khz-30min.csv")
	if err != nil || st.Size() != 88_246_556 {
		b.Skip("the 1 kHz benchmark log is missing: go test ./methods/logs -run XXX -bench ReadLog writes it")
	}
	b.SetBytes(st.Size())
	b.ReportAllocs()
	for b.Loop() {
		if code := run(context.Background(), []string{"reduce", benchCampaign, "-q"}, io.Discard, io.Discard); code != 0 {
			b.Fatalf("exit %d", code)
		}
	}
}
