package sim

import (
	"errors"
	"fmt"
	"strings"
)

// ScaleSpec returns a simulation spec of n ≥ 2
// configurations made from the demo's spec text demo: the demo's own two
// (baseline, ducktail) and n − 2 more, v03 … vNN, whose true lift steps
// through a wing-angle-like sweep (invented values). Every ride-height
// sensor logs every configuration, the taps read each and the tuft watches
// each, as on the demo day. It makes the campaigns of the scaling
// benchmarks (issue 15): go test ./fuse ./cmd/liftfuse -bench Scale.
func ScaleSpec(demo string, n int) (string, error) {
	start := strings.Index(demo, "\nconfigurations:\n")
	end := strings.Index(demo, "\nair:\n")
	if start < 0 || end < start {
		return "", errors.New("demo spec: no configurations block before air")
	}
	var sb strings.Builder
	sb.WriteString("\nconfigurations:\n")
	sb.WriteString("  - {id: baseline, front_cla_m2: 0.120, rear_cla_m2: 0.100}\n")
	sb.WriteString("  - {id: ducktail, front_cla_m2: 0.135, rear_cla_m2: -0.045}\n")
	for i := 3; i <= n; i++ {
		x := float64(i-2) / float64(n)
		fmt.Fprintf(&sb, "  - {id: v%02d, front_cla_m2: %.4f, rear_cla_m2: %.4f}\n", i, 0.12+0.03*x, 0.10-0.2*x)
	}
	return demo[:start] + sb.String() + demo[end:], nil
}
