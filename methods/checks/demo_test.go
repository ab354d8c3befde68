package checks_test

import (
	"testing"

	"liftfuse/methods"
	"liftfuse/methods/campaign"
	"liftfuse/methods/checks"
)

// TestDemoIsClean: the bundled demo (examples/ducktail-fastback, simulated
// with no fault planted) trips no check.
func TestDemoIsClean(t *testing.T) {
	c, err := campaign.Load("../../examples/ducktail-fastback/campaign.yaml", campaign.Options{})
	if err != nil {
		t.Fatal(err)
	}
	r, err := methods.Reduce(c, methods.Options{})
	if err != nil {
		t.Fatal(err)
	}
	for _, ch := range checks.Run(c, r) {
		t.Errorf("demo: %+v", ch)
	}
}

// BenchmarkRunDemo times the checks on the reduced demo campaign.
func BenchmarkRunDemo(b *testing.B) {
	c, err := campaign.Load("../../examples/ducktail-fastback/campaign.yaml", campaign.Options{})
	if err != nil {
		b.Fatal(err)
	}
	r, err := methods.Reduce(c, methods.Options{})
	if err != nil {
		b.Fatal(err)
	}
	for b.Loop() {
		checks.Run(c, r)
	}
}
