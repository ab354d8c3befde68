package fuse_test

import (
	"testing"

	"liftfuse/fuse"
	"liftfuse/methods"
	"liftfuse/methods/campaign"
)

// demoInput reduces the bundled demo campaign.
func demoInput(tb testing.TB) fuse.Input {
	tb.Helper()
	c, err := campaign.Load("../examples/ducktail-fastback/campaign.yaml", campaign.Options{})
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
	return fuse.Input{Evidence: r.Evidence(), Settings: fuse.Settings{Configs: ids, Seed: 1, Credible: 0.9},
		Reference: "baseline", SpeedsKmh: []float64{100, 150}, Rho: c.Density(), FrontalAreaM2: c.Vehicle.FrontalAreaM2}
}

// BenchmarkRunDemo: the whole fusion of the demo campaign (joint posterior,
// standalone and leave-one-out posteriors, robust layer).
func BenchmarkRunDemo(b *testing.B) {
	in := demoInput(b)
	b.ReportAllocs()
	for b.Loop() {
		if _, err := fuse.Run(in); err != nil {
			b.Fatal(err)
		}
	}
}
