package checks_test

import (
	"strings"
	"testing"

	"liftfuse/methods"
	"liftfuse/methods/campaign"
	"liftfuse/methods/checks"
)

func TestDiagNoNoise(t *testing.T) {
	checks.DiagReduced = func(seed int) (*campaign.Campaign, *methods.Reduced) {
		text := strings.ReplaceAll(day(t, seed, ""), "noise_mm: 0.", "noise_mm: 0.00")
		text = strings.Replace(text, "runs: {", "runs: {speed_sd_kmh: 0, ", 1)
		return simulate(t, text, nil)
	}
	t.Run("z", checks.TestDiagZ)
}
