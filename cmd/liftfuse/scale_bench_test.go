package main

import (
	"context"
	"fmt"
	"io"
	"os"
	"path/filepath"
	"testing"

	"liftfuse/methods/sim"
)

// BenchmarkScale runs the fuse, report and plan commands end to end (load,
// reduce, check, fuse, and the plan and the PDF) on simulated campaigns of
// 2 to 48 configurations (sim.ScaleSpec), side by side in one run (issue
// 15):
//
//	go test ./cmd/liftfuse -run XXX -bench Scale -benchtime 3x
func BenchmarkScale(b *testing.B) {
	demo, err := os.ReadFile("../../examples/ducktail-fastback/spec.yaml")
	if err != nil {
		b.Fatal(err)
	}
	dir := b.TempDir()
	for _, n := range []int{2, 6, 12, 24, 48} {
		file := ""
		for _, cmd := range []string{"fuse", "report", "plan"} {
			b.Run(fmt.Sprintf("configs=%d/%s", n, cmd), func(b *testing.B) {
				if file == "" {
					file = scaleCampaign(b, string(demo), n, dir)
				}
				args := map[string][]string{
					"fuse":   {"fuse", file, "--json", "-q"},
					"report": {"report", file, "-o", filepath.Join(dir, "r.pdf"), "-q"},
					"plan":   {"plan", file, "--json", "-q"},
				}[cmd]
				for b.Loop() {
					if code := run(context.Background(), args, io.Discard, io.Discard); code != 0 {
						b.Fatalf("%s on %d configurations: exit %d", cmd, n, code)
					}
				}
			})
		}
	}
}

// scaleCampaign simulates the campaign of n configurations under dir and
// returns its campaign file.
func scaleCampaign(b *testing.B, demo string, n int, dir string) string {
	b.Helper()
	spec, err := sim.ScaleSpec(demo, n)
	if err != nil {
		b.Fatal(err)
	}
	name := filepath.Join(dir, fmt.Sprintf("scale-%02d.yaml", n))
	if err := os.WriteFile(name, []byte(spec), 0o644); err != nil {
		b.Fatal(err)
	}
	out := filepath.Join(dir, fmt.Sprintf("scale-%02d", n))
	if code := run(context.Background(), []string{"simulate", name, "-o", out}, io.Discard, io.Discard); code != 0 {
		b.Fatalf("simulate %d configurations: exit %d", n, code)
	}
	return filepath.Join(out, "campaign.yaml")
}
