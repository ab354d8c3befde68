package main

import (
	"encoding/json"
	"flag"
	"fmt"
	"math"
	"os"
	"testing"
)

var update = flag.Bool("update", false, "rewrite the golden files under testdata/golden")

// TestGoldenResult: the demo's result document, compared as values with the
// golden file (numbers to 1e-9 relative). A deliberate change of the
// numbers is recorded with `go test ./cmd/liftfuse -run Golden -update`.
func TestGoldenResult(t *testing.T) {
	const golden = "../../testdata/golden/demo-result.json"
	code, out, stderr := liftfuse(t, "fuse", demo, "--json", "-q")
	if code != 0 {
		t.Fatalf("exit %d: %s", code, stderr)
	}
	if *update {
		if err := os.WriteFile(golden, []byte(out), 0o644); err != nil {
			t.Fatal(err)
		}
		return
	}
	want, err := os.ReadFile(golden)
	if err != nil {
		t.Fatalf("%v (run with -update to create it)", err)
	}
	var a, b any
	if err := json.Unmarshal([]byte(out), &a); err != nil {
		t.Fatal(err)
	}
	if err := json.Unmarshal(want, &b); err != nil {
		t.Fatal(err)
	}
	if diff := jsonDiff("", a, b); diff != "" {
		t.Errorf("result differs from %s: %s", golden, diff)
	}
}

// jsonDiff returns the first difference between two decoded JSON values.
func jsonDiff(path string, a, b any) string {
	switch x := a.(type) {
	case map[string]any:
		y, ok := b.(map[string]any)
		if !ok || len(x) != len(y) {
			return fmt.Sprintf("%s: %v vs %v", path, a, b)
		}
		for k := range x {
			if d := jsonDiff(path+"."+k, x[k], y[k]); d != "" {
				return d
			}
		}
	case []any:
		y, ok := b.([]any)
		if !ok || len(x) != len(y) {
			return fmt.Sprintf("%s: %d vs %d items", path, len(x), len(y))
		}
		for i := range x {
			if d := jsonDiff(fmt.Sprintf("%s[%d]", path, i), x[i], y[i]); d != "" {
				return d
			}
		}
	case float64:
		y, ok := b.(float64)
		if !ok || math.Abs(x-y) > 1e-9*math.Max(1, math.Abs(y)) {
			return fmt.Sprintf("%s: %v vs %v", path, a, b)
		}
	default:
		if a != b {
			return fmt.Sprintf("%s: %v vs %v", path, a, b)
		}
	}
	return ""
}
