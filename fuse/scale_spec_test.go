package fuse

import (
	"os"
	"testing"

	"liftfuse/methods/sim"
)

// scaleSpec returns sim.ScaleSpec of the demo's spec with n configurations.
func scaleSpec(tb testing.TB, n int) string {
	tb.Helper()
	b, err := os.ReadFile("../examples/ducktail-fastback/spec.yaml")
	if err != nil {
		tb.Fatal(err)
	}
	s, err := sim.ScaleSpec(string(b), n)
	if err != nil {
		tb.Fatal(err)
	}
	return s
}
