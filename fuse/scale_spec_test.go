package fuse

import (
	"fmt"
	"os"
	"strings"
	"testing"
)

// ScaleSpec is scaleSpec for the external tests and benchmarks.
var ScaleSpec = scaleSpec

// scaleSpec returns the demo's simulation spec with n configurations: the
// demo's own two (baseline, ducktail) and n−2 more, v03 … vNN, whose true
// lift steps through a wing-angle-like sweep (invented values). Every
// ride-height sensor logs every configuration, the taps read each and the
// tuft watches each, as on the demo day.
func scaleSpec(tb testing.TB, n int) string {
	tb.Helper()
	b, err := os.ReadFile("../examples/ducktail-fastback/spec.yaml")
	if err != nil {
		tb.Fatal(err)
	}
	text := string(b)
	start := strings.Index(text, "\nconfigurations:\n")
	end := strings.Index(text, "\nair:\n")
	if start < 0 || end < start {
		tb.Fatal("demo spec: no configurations block")
	}
	var sb strings.Builder
	sb.WriteString("\nconfigurations:\n")
	sb.WriteString("  - {id: baseline, front_cla_m2: 0.120, rear_cla_m2: 0.100}\n")
	sb.WriteString("  - {id: ducktail, front_cla_m2: 0.135, rear_cla_m2: -0.045}\n")
	for i := 3; i <= n; i++ {
		x := float64(i-2) / float64(n)
		fmt.Fprintf(&sb, "  - {id: v%02d, front_cla_m2: %.4f, rear_cla_m2: %.4f}\n", i, 0.12+0.03*x, 0.10-0.2*x)
	}
	return text[:start] + sb.String() + text[end:]
}
