package checks_test

import (
	"testing"

	"liftfuse/methods"
	"liftfuse/methods/campaign"
	"liftfuse/methods/checks"
)

func TestDiagSetup(t *testing.T) {
	checks.DiagReduced = func(seed int) (*campaign.Campaign, *methods.Reduced) { return simulate(t, day(t, seed, ""), nil) }
	t.Run("z", checks.TestDiagZ)
}
