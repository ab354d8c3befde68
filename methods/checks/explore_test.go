package checks_test

import (
	"testing"

	"liftfuse/methods/checks"
)

func TestExplore(t *testing.T) {
	for seed := 1; seed <= 60; seed++ {
		c, r := simulate(t, day(t, seed, ""), nil)
		for _, ch := range checks.Run(c, r) {
			t.Logf("seed %d: %s", seed, ch)
		}
	}
}
