package main

import (
	"context"
	"crypto/sha256"
	"encoding/hex"
	"encoding/json"
	"io"
	"math"
	"os"
	"path/filepath"
	"reflect"
	"slices"
	"strconv"
	"strings"
	"testing"

	"liftfuse/fuse"
)

// decodeResult reads a result document strictly into fuse.Result.
func decodeResult(t *testing.T, doc string) *fuse.Result {
	t.Helper()
	var r fuse.Result
	decodeStrict(t, doc, &r)
	if r.Format != fuse.ResultFormat {
		t.Errorf("format %q, want %s", r.Format, fuse.ResultFormat)
	}
	return &r
}

// decodeStrict decodes JSON into v, refusing keys v does not have.
func decodeStrict(t *testing.T, doc string, v any) {
	t.Helper()
	dec := json.NewDecoder(strings.NewReader(doc))
	dec.DisallowUnknownFields()
	if err := dec.Decode(v); err != nil {
		t.Fatalf("not a %T: %v\n%s", v, err, doc)
	}
}

// diffResults says how two results differ ("" if they do not).
func diffResults(a, b *fuse.Result) string {
	if reflect.DeepEqual(a, b) {
		return ""
	}
	ja, _ := json.Marshal(a)
	jb, _ := json.Marshal(b)
	var x, y any
	json.Unmarshal(ja, &x)
	json.Unmarshal(jb, &y)
	if d := jsonDiff("", x, y); d != "" {
		return d
	}
	return "values differ"
}

// liftfuseOK runs a command line that must succeed and returns stdout.
func liftfuseOK(t *testing.T, args ...string) string {
	t.Helper()
	code, out, stderr := liftfuse(t, args...)
	if code != 0 {
		t.Fatalf("%v: exit %d: %s", args, code, stderr)
	}
	return out
}

func ids[T any](xs []T, id func(T) string) []string {
	var out []string
	for _, x := range xs {
		out = append(out, id(x))
	}
	return out
}

// demoEntries are the demo campaign's evidence entries, in campaign order
// (examples/ducktail-fastback/campaign.yaml).
var demoEntries = []string{"front-pot", "rear-pot", "rear-laser", "body-taps", "tail-tuft"}

// TestResultDocuments: fuse --json and reduce --json decode into
// fuse.Result (no unknown keys) and hold the demo's configurations and
// entries, its input hash, and forces consistent with C_L·A.
func TestResultDocuments(t *testing.T) {
	c, err := load(demo, true)
	if err != nil {
		t.Fatal(err)
	}
	sum := filesHash(t, c.Files)
	tests := []struct {
		name    string
		args    []string
		configs []string
	}{
		{"fuse", []string{"fuse", demo, "--json", "-q"}, []string{"baseline", "ducktail"}},
		{"reduce", []string{"reduce", demo, "--json", "-q"}, nil},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			r := decodeResult(t, liftfuseOK(t, tt.args...))
			if got := ids(r.Configs, func(c fuse.ConfigResult) string { return c.ID }); !slices.Equal(got, tt.configs) {
				t.Errorf("configs %v, want %v", got, tt.configs)
			}
			if got := ids(r.Methods, func(m fuse.MethodResult) string { return m.ID }); !slices.Equal(got, demoEntries) {
				t.Errorf("methods %v, want %v", got, demoEntries)
			}
			if r.Campaign.SHA256 != sum || r.ToolVersion != Version {
				t.Errorf("campaign %+v, tool %s; want sha256 %s, tool %s", r.Campaign, r.ToolVersion, sum, Version)
			}
			for _, cf := range r.Configs {
				for _, s := range cf.AtSpeeds {
					// F = C_L·A · ½ρV² (SAE J1594 definition of the lift
					// coefficient), V = speed/3.6 m/s.
					q := 0.5 * r.Air.DensityKgM3 * (s.SpeedKmh / 3.6) * (s.SpeedKmh / 3.6)
					if want := cf.Total.CLA.Mean * q; math.Abs(s.TotalN.Mean-want) > 1e-6*math.Max(1, math.Abs(want)) {
						t.Errorf("%s at %g km/h: total %g N, want C_L·A·q = %g N", cf.ID, s.SpeedKmh, s.TotalN.Mean, want)
					}
				}
			}
		})
	}
}

// filesHash is the campaign's input hash as result-format.md defines it:
// SHA-256 over each file read, in order, preceded by its length and a
// newline (written here independently of campaign.Hash).
func filesHash(t *testing.T, files []string) string {
	t.Helper()
	var all []byte
	for _, f := range files {
		b, err := os.ReadFile(f)
		if err != nil {
			t.Fatal(err)
		}
		all = append(all, []byte(strconv.Itoa(len(b))+"\n")...)
		all = append(all, b...)
	}
	s := sha256.Sum256(all)
	return hex.EncodeToString(s[:])
}

// TestPlanDocument: plan --json decodes into fuse.Plan: the campaign's
// target, every entry an option ranked by variance removed per hour, and
// detectability for the ride-height entries.
func TestPlanDocument(t *testing.T) {
	var pl fuse.Plan
	decodeStrict(t, liftfuseOK(t, "plan", demo, "--json", "-q"), &pl)
	if pl.Format != fuse.PlanFormat {
		t.Errorf("format %q", pl.Format)
	}
	// plan.target of the demo campaign.
	if tg := pl.Target; tg.Config != "ducktail" || tg.Axle != "rear" || tg.Versus != "baseline" || !(tg.Now.SD > 0) {
		t.Errorf("target %+v, want ducktail rear versus baseline", tg)
	}
	if got := ids(pl.Options, func(o fuse.PlanOption) string { return o.Entry }); !sameSet(got, demoEntries) {
		t.Errorf("options %v, want every entry %v", got, demoEntries)
	}
	for i, o := range pl.Options {
		if i > 0 && o.PerHour > pl.Options[i-1].PerHour {
			t.Errorf("option %d (%s) ranks above a better one", i, o.Entry)
		}
		if math.Abs(o.PerHour-o.RemovedPct/o.CostH) > 1e-12 {
			t.Errorf("%s: per hour %g, want removed/cost = %g", o.Entry, o.PerHour, o.RemovedPct/o.CostH)
		}
	}
	if got := ids(pl.Detectability, func(d fuse.Detectability) string { return d.Entry }); !slices.Equal(got, demoEntries[:3]) {
		t.Errorf("detectability for %v, want the ride-height entries", got)
	}
}

// TestCrosscheckDocument: crosscheck --json decodes into fuse.Crosscheck,
// z and p as defined, the unit as claimed; the text prints m² for a C_L·A.
func TestCrosscheckDocument(t *testing.T) {
	var cc fuse.Crosscheck
	decodeStrict(t, liftfuseOK(t, "crosscheck", demo, "--config", "ducktail", "--axle", "rear", "--speed-kmh", "150",
		"--value", "-12", "--sd", "1", "--unit", "kgf", "--json", "-q"), &cc)
	if cc.Format != fuse.CrosscheckFormat || cc.Claim.Unit != "kgf" || cc.Predictive.Unit != "kgf" {
		t.Errorf("document %+v", cc)
	}
	// z = (claim − predicted)/√(sd_pred² + sd_claim²); p = erfc(|z|/√2),
	// the two-sided normal tail (Abramowitz & Stegun 26.2.2 with 7.1.2).
	z := (cc.Claim.Value - cc.Predictive.Mean) / math.Hypot(cc.Predictive.SD, cc.Claim.SD)
	if math.Abs(cc.Z-z) > 1e-9 || math.Abs(cc.PValue-math.Erfc(math.Abs(z)/math.Sqrt2)) > 1e-12 {
		t.Errorf("z %g p %g, want z %g p %g", cc.Z, cc.PValue, z, math.Erfc(math.Abs(z)/math.Sqrt2))
	}
	// −12 kgf is far beyond what any single modelled error within its
	// physical bounds could explain: surprising, and said so, with no list.
	if cc.PValue > 1e-3 || cc.Verdict != fuse.VerdictUnexplained || len(cc.Explanations) != 0 {
		t.Errorf("a claim far off should be surprising and unexplained: p %g, verdict %q, %d explanations", cc.PValue, cc.Verdict, len(cc.Explanations))
	}
	text := liftfuseOK(t, "crosscheck", demo, "--config", "ducktail", "--axle", "rear", "--speed-kmh", "150", "--value", "-0.1", "--unit", "m2", "-q")
	if !strings.Contains(text, " m²") || strings.Contains(text, "m2") {
		t.Errorf("a C_L·A claim should print m², not m2:\n%s", text)
	}
}

// TestUnitsInText: the plan's detectability is in the campaign's force
// unit (kgf by default), and validate counts in words.
func TestUnitsInText(t *testing.T) {
	tests := []struct {
		name string
		args []string
		want string
	}{
		{"plan's detectability in the force unit", []string{"plan", demo, "-q"}, "smallest load (kgf)"},
		{"validate counts in words", []string{"validate", demo}, "2 configurations, 5 evidence entries, 3 files read, "},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			if out := liftfuseOK(t, tt.args...); !strings.Contains(out, tt.want) {
				t.Errorf("output lacks %q:\n%s", tt.want, out)
			}
		})
	}
}

func sameSet(a, b []string) bool {
	x, y := slices.Clone(a), slices.Clone(b)
	slices.Sort(x)
	slices.Sort(y)
	return slices.Equal(x, y)
}

func TestReportCommand(t *testing.T) {
	dir := t.TempDir()
	pdf := filepath.Join(dir, "r.pdf")
	out := liftfuseOK(t, "report", demo, "-o", pdf, "-q")
	if out != "wrote "+pdf+"\n" {
		t.Errorf("stdout %q", out)
	}
	b, err := os.ReadFile(pdf)
	if err != nil || !strings.HasPrefix(string(b), "%PDF-") {
		t.Fatalf("no PDF written: %v", err)
	}
	if st, _ := os.Stat(pdf); st.Mode().Perm() != 0o644 {
		t.Errorf("a new PDF has mode %v, want 0644", st.Mode().Perm())
	}
	// An invalid campaign exits 2 and writes nothing.
	broken := filepath.Join(dir, "broken.yaml")
	os.WriteFile(broken, []byte("liftfuse: 1\ncampaign: {title: x}\n"), 0o644)
	never := filepath.Join(dir, "never.pdf")
	if code, _, _ := liftfuse(t, "report", broken, "-o", never, "-q"); code != 2 {
		t.Errorf("invalid campaign: exit %d, want 2", code)
	}
	if _, err := os.Stat(never); err == nil {
		t.Error("a failed run left a PDF behind")
	}
	left, _ := filepath.Glob(filepath.Join(dir, ".*tmp*"))
	if len(left) > 0 {
		t.Errorf("temporary files left: %v", left)
	}
}

func TestSimulateCommand(t *testing.T) {
	dir := filepath.Join(t.TempDir(), "sim")
	code, _, stderr := liftfuse(t, "simulate", "../../examples/ducktail-fastback/spec.yaml", "-o", dir)
	if code != 0 {
		t.Fatalf("exit %d: %s", code, stderr)
	}
	for _, f := range []string{"campaign.yaml", "truth.json", "logs/simulated.csv", "body-taps-readings.csv"} {
		if _, err := os.Stat(filepath.Join(dir, f)); err != nil {
			t.Errorf("simulate did not write %s", f)
		}
	}
	// The bundled demo is exactly what its spec simulates.
	for _, f := range []string{"campaign.yaml", "logs/simulated.csv", "body-taps-readings.csv", "truth.json"} {
		a, _ := os.ReadFile(filepath.Join(dir, f))
		b, _ := os.ReadFile(filepath.Join("../../examples/ducktail-fastback", f))
		if string(a) != string(b) {
			t.Errorf("%s differs from the bundled demo: regenerate it with simulate --force", f)
		}
	}
	if code, _, _ := liftfuse(t, "simulate", "../../examples/ducktail-fastback/spec.yaml", "-o", dir); code != 2 {
		t.Error("simulate overwrote a folder without --force")
	}
	if code, _, stderr := liftfuse(t, "plan", filepath.Join(dir, "campaign.yaml"), "-q"); code != 0 {
		t.Errorf("plan on a simulated campaign: exit %d: %s", code, stderr)
	}
}

// BenchmarkReport: the example report end to end (load, reduce, fuse,
// plan, lay out, write).
func BenchmarkReport(b *testing.B) {
	out := filepath.Join(b.TempDir(), "r.pdf")
	for b.Loop() {
		if code := run(context.Background(), []string{"report", demo, "-o", out, "-q"}, io.Discard, io.Discard); code != 0 {
			b.Fatal("report failed")
		}
	}
}

// TestFlaggedEntryExplained: the demo with the laser's tyres really growing
// 2.2 mm (prior 0.5 ± 0.5, so +3.4 sd: within the 4-sd bound of a plausible
// explanation): the laser is flagged, and its own tyre growth explains it —
// at about the planted value.
func TestFlaggedEntryExplained(t *testing.T) {
	spec, err := os.ReadFile("../../examples/ducktail-fastback/spec.yaml")
	if err != nil {
		t.Fatal(err)
	}
	planted := strings.Replace(string(spec), "tyre_growth_mm: 0.6", "tyre_growth_mm: 2.2", 1)
	dir := t.TempDir()
	name := filepath.Join(dir, "spec.yaml")
	os.WriteFile(name, []byte(planted), 0o644)
	out := filepath.Join(dir, "day")
	if code, _, stderr := liftfuse(t, "simulate", name, "-o", out); code != 0 {
		t.Fatal(stderr)
	}
	a, err := analyse(filepath.Join(out, "campaign.yaml"), true, io.Discard)
	if err != nil {
		t.Fatal(err)
	}
	ex, err := explanations(a)
	if err != nil {
		t.Fatal(err)
	}
	cc, ok := ex["rear-laser"]
	if !ok || len(ex) != 1 {
		t.Fatalf("want the laser alone explained, got %v", ex)
	}
	if cc.Verdict != fuse.VerdictExplained || len(cc.Explanations) == 0 {
		t.Fatalf("verdict %q with %d explanations, want explained", cc.Verdict, len(cc.Explanations))
	}
	first := cc.Explanations[0]
	if !strings.Contains(first.Nuisance, "tyre growth") || first.ShiftSD < 2 || first.ShiftSD > 4 || math.Abs(first.Value-2.2) > 0.4 {
		t.Errorf("first explanation %+v, want the rear tyre growth near the planted 2.2 mm", first)
	}
}
