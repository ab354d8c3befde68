package main

import (
	"bytes"
	"context"
	"strings"
	"testing"

	"github.com/spf13/cobra"
)

// parse runs the command line `name args…` with the command built by mk
// given a runF that records the options instead of running: flag parsing
// is tested without loading, reducing or fusing anything.
func parse[O any](t *testing.T, mk func(func(*O) error) *cobra.Command, args ...string) (got O, called bool, code int, stderr string) {
	t.Helper()
	sub := mk(func(o *O) error { got, called = *o, true; return nil })
	cmds := commands()
	for i, c := range cmds {
		if c.Name() == sub.Name() {
			cmds[i] = sub
		}
	}
	var out, errb bytes.Buffer
	code = execute(context.Background(), newRoot(&out, &errb, cmds...), append([]string{sub.Name()}, args...), &errb)
	return got, called, code, errb.String()
}

// wantParse checks the outcome of parse: a call with the options, or an
// exit code and a message.
func wantParse(t *testing.T, called bool, code int, stderr string, wantCode int, inStderr string) {
	t.Helper()
	if wantCode == 0 && !called {
		t.Fatalf("run not reached: exit %d, %s", code, stderr)
	}
	if code != wantCode || !strings.Contains(stderr, inStderr) {
		t.Errorf("exit %d, stderr %q; want exit %d with %q", code, stderr, wantCode, inStderr)
	}
	if wantCode != 0 && called {
		t.Error("run reached despite bad flags")
	}
}

func TestReportFlags(t *testing.T) {
	tests := []struct {
		name     string
		args     []string
		code     int
		inStderr string
		want     reportOptions
	}{
		{"defaults", []string{"c.yaml", "-o", "r.pdf"}, 0, "", reportOptions{file: "c.yaml", out: "r.pdf", paper: "A4"}},
		{"paper in lower case", []string{"c.yaml", "-o", "r.pdf", "--paper", "letter"}, 0, "", reportOptions{file: "c.yaml", out: "r.pdf", paper: "Letter"}},
		{"paper in upper case", []string{"c.yaml", "-o", "r.pdf", "--paper", "LETTER"}, 0, "", reportOptions{file: "c.yaml", out: "r.pdf", paper: "Letter"}},
		{"paper a4", []string{"c.yaml", "-o", "r.pdf", "--paper", "a4"}, 0, "", reportOptions{file: "c.yaml", out: "r.pdf", paper: "A4"}},
		{"--json is a switch", []string{"c.yaml", "-o", "r.pdf", "--json"}, 0, "", reportOptions{file: "c.yaml", out: "r.pdf", paper: "A4", json: true}},
		{"--json-out names the file", []string{"c.yaml", "-o", "r.pdf", "--json-out", "r.json"}, 0, "", reportOptions{file: "c.yaml", out: "r.pdf", jsonOut: "r.json", paper: "A4"}},
		{"--json FILE gets a hint", []string{"c.yaml", "-o", "r.pdf", "--json", "r.json"}, 2, "use --json-out r.json", reportOptions{}},
		{"missing -o", []string{"c.yaml"}, 2, "missing required flag -o", reportOptions{}},
		{"unknown paper", []string{"c.yaml", "-o", "r.pdf", "--paper", "A3"}, 2, `--paper must be A4 or Letter, got "A3"`, reportOptions{}},
		{"two campaigns", []string{"a.yaml", "b.yaml", "-o", "r.pdf"}, 2, "want one campaign file, got 2 arguments", reportOptions{}},
		{"no campaign", []string{"-o", "r.pdf"}, 2, "want one campaign file, got 0 arguments", reportOptions{}},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			got, called, code, stderr := parse(t, newReportCmd, tt.args...)
			wantParse(t, called, code, stderr, tt.code, tt.inStderr)
			if tt.code == 0 && got != tt.want {
				t.Errorf("options %+v, want %+v", got, tt.want)
			}
		})
	}
}

func TestCrosscheckFlags(t *testing.T) {
	base := []string{"c.yaml", "--config", "ducktail", "--speed-kmh", "150", "--value", "-12"}
	tests := []struct {
		name     string
		args     []string
		code     int
		inStderr string
		axle     string
		unit     string
		newtons  float64
	}{
		// 9.80665 N/kgf: standard gravity, 3rd CGPM (1901), exact.
		{"axle and unit in any case", append(base, "--axle", "REAR", "--unit", "KGF"), 0, "", "rear", "kgf", 9.80665},
		{"newtons by default", append(base, "--axle", "Front"), 0, "", "front", "N", 1},
		// 4.4482216152605 N/lbf: 0.45359237 kg (international pound, 1959) × g_n.
		{"pound-force", append(base, "--axle", "total", "--unit", "LBF"), 0, "", "total", "lbf", 4.4482216152605},
		{"m2 for a C_L·A", append(base, "--axle", "rear", "--unit", "M2"), 0, "", "rear", "m2", 0},
		{"m² as printed", append(base, "--axle", "rear", "--unit", "m²"), 0, "", "rear", "m2", 0},
		{"unknown unit", append(base, "--axle", "rear", "--unit", "kN"), 2, `--unit must be N, kgf, lbf or m2, got "kN"`, "", "", 0},
		{"unknown axle", append(base, "--axle", "middle"), 2, `--axle must be front, rear or total, got "middle"`, "", "", 0},
		{"every missing flag at once", []string{"c.yaml"}, 2, "missing required flags --config, --axle, --speed-kmh and --value", "", "", 0},
		{"two missing flags", []string{"c.yaml", "--config", "x", "--axle", "rear"}, 2, "missing required flags --speed-kmh and --value", "", "", 0},
		{"negative sd", append(base, "--axle", "rear", "--sd", "-1"), 2, "--sd must not be negative", "", "", 0},
		{"speed out of range", []string{"c.yaml", "--config", "x", "--axle", "rear", "--speed-kmh", "900", "--value", "1"}, 2, "(0, 500) km/h", "", "", 0},
		{"value not a number", []string{"c.yaml", "--config", "x", "--axle", "rear", "--speed-kmh", "150", "--value", "NaN"}, 2, "--value must be a finite number", "", "", 0},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			got, called, code, stderr := parse(t, newCrosscheckCmd, tt.args...)
			wantParse(t, called, code, stderr, tt.code, tt.inStderr)
			if tt.code != 0 {
				return
			}
			c := got.claim
			if c.Axle != tt.axle || c.Unit != tt.unit || abs(c.NewtonsPerUnit-tt.newtons) > 1e-12 || c.Config != "ducktail" || c.SpeedKmh != 150 || c.Value != -12 {
				t.Errorf("claim %+v, want axle %s, unit %s, %g N per unit", c, tt.axle, tt.unit, tt.newtons)
			}
		})
	}
}

func TestPlanFlags(t *testing.T) {
	tests := []struct {
		name     string
		args     []string
		code     int
		inStderr string
		want     planOptions
	}{
		{"no flags", []string{"c.yaml"}, 0, "", planOptions{file: "c.yaml"}},
		{"axle in any case", []string{"c.yaml", "--target-axle", "Front", "--target-config", "ducktail", "--versus", "baseline", "--json"}, 0, "",
			planOptions{file: "c.yaml", axle: "front", config: "ducktail", versus: "baseline", json: true}},
		{"unknown axle", []string{"c.yaml", "--target-axle", "left"}, 2, `--target-axle must be front, rear or total, got "left"`, planOptions{}},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			got, called, code, stderr := parse(t, newPlanCmd, tt.args...)
			wantParse(t, called, code, stderr, tt.code, tt.inStderr)
			if tt.code == 0 && got != tt.want {
				t.Errorf("options %+v, want %+v", got, tt.want)
			}
		})
	}
}

func TestAirFlags(t *testing.T) {
	tests := []struct {
		name     string
		args     []string
		code     int
		inStderr string
	}{
		{"all given", []string{"--temperature-c", "20", "--pressure-hpa", "1013", "--humidity-pct", "50", "--json"}, 0, ""},
		{"every missing flag at once", nil, 2, "missing required flags --temperature-c, --pressure-hpa and --humidity-pct"},
		{"one missing flag", []string{"--temperature-c", "20", "--humidity-pct", "50"}, 2, "missing required flag --pressure-hpa"},
		{"--json takes no value", []string{"--temperature-c", "20", "--pressure-hpa", "1013", "--humidity-pct", "50", "--json", "x.json"}, 2, "want no arguments"},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			got, called, code, stderr := parse(t, newAirCmd, tt.args...)
			wantParse(t, called, code, stderr, tt.code, tt.inStderr)
			if tt.code == 0 && (!got.json || got.temperatureC != 20 || !isNaN(got.speedKmh)) {
				t.Errorf("options %+v", got)
			}
		})
	}
}

// TestJSONIsASwitch: --json is a switch on every command that has it.
func TestJSONIsASwitch(t *testing.T) {
	for _, c := range commands() {
		t.Run(c.Name(), func(t *testing.T) {
			f := c.Flags().Lookup("json")
			if f == nil {
				t.Skip("no --json")
			}
			if f.Value.Type() != "bool" {
				t.Errorf("--json of %s is a %s, want a switch", c.Name(), f.Value.Type())
			}
		})
	}
}

func TestSimulateFlags(t *testing.T) {
	tests := []struct {
		name     string
		args     []string
		code     int
		inStderr string
	}{
		{"with -o", []string{"spec.yaml", "-o", "day", "--force"}, 0, ""},
		{"missing -o", []string{"spec.yaml"}, 2, "missing required flag -o"},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			got, called, code, stderr := parse(t, newSimulateCmd, tt.args...)
			wantParse(t, called, code, stderr, tt.code, tt.inStderr)
			if tt.code == 0 && got != (simulateOptions{spec: "spec.yaml", out: "day", force: true}) {
				t.Errorf("options %+v", got)
			}
		})
	}
}

func abs(x float64) float64 {
	if x < 0 {
		return -x
	}
	return x
}

func isNaN(x float64) bool { return x != x }
