package main

import (
	"context"
	"io"
	"testing"

	"liftfuse/methods/logs/logtest"
)

// benchCampaign is the campaign of the log benchmark; it names the log
// logtest.BenchLog writes to /tmp.
const benchCampaign = "../../testdata/bench/campaign-1khz.yaml"

// BenchmarkReduceCommand: `liftfuse reduce testdata/bench/campaign-1khz.yaml -q`
// in the process — loading (the log's header), the adapter's read of the
// log (the only one: its rows checked and the input hash fed on the way),
// the end of validation and the report. Reported as MB/s of log.
func BenchmarkReduceCommand(b *testing.B) {
	if log := logtest.BenchLog(b); log != "/tmp/liftfuse-bench-1khz-30min.csv" {
		b.Skipf("the campaign names /tmp/liftfuse-bench-1khz-30min.csv; the log was written to %s", log)
	}
	b.SetBytes(logtest.BenchLogBytes)
	b.ReportAllocs()
	for b.Loop() {
		if code := run(context.Background(), []string{"reduce", benchCampaign, "-q"}, io.Discard, io.Discard); code != 0 {
			b.Fatalf("exit %d", code)
		}
	}
}
