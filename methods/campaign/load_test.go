package campaign_test

import (
	"errors"
	"os"
	"path/filepath"
	"strings"
	"testing"

	"liftfuse/methods/campaign"
)

// fixture copies testdata/mini into a temporary folder and returns the
// campaign path.
func fixture(t *testing.T) string {
	t.Helper()
	dir := t.TempDir()
	if err := os.CopyFS(dir, os.DirFS("../../testdata/mini")); err != nil {
		t.Fatal(err)
	}
	return filepath.Join(dir, "campaign.yaml")
}

// edit changes a fixture file: on 1-based line n, old becomes new (n < 0
// inserts new as a line after line -n; old "" with n > 0 deletes the line).
type edit struct {
	file     string // relative to the campaign folder; "" is campaign.yaml
	n        int
	old, new string
}

func apply(t *testing.T, campaign string, edits []edit) {
	t.Helper()
	for _, e := range edits {
		name := filepath.Join(filepath.Dir(campaign), e.file)
		if e.file == "" {
			name = campaign
		}
		data, err := os.ReadFile(name)
		if err != nil {
			t.Fatal(err)
		}
		lines := strings.Split(string(data), "\n")
		switch {
		case e.n < 0:
			at := -e.n
			lines = append(lines[:at], append([]string{e.new}, lines[at:]...)...)
		case e.old == "":
			lines = append(lines[:e.n-1], lines[e.n:]...)
		default:
			if !strings.Contains(lines[e.n-1], e.old) {
				t.Fatalf("fixture drift: line %d of %s is %q, no %q in it", e.n, e.file, lines[e.n-1], e.old)
			}
			lines[e.n-1] = strings.Replace(lines[e.n-1], e.old, e.new, 1)
		}
		if err := os.WriteFile(name, []byte(strings.Join(lines, "\n")), 0o644); err != nil {
			t.Fatal(err)
		}
	}
}

func TestLoadValidFixture(t *testing.T) {
	c, err := campaign.Load(fixture(t), campaign.Options{})
	if err != nil {
		t.Fatalf("fixture should be valid: %v", err)
	}
	// Defaults of campaign-format.md, applied in one place.
	if got := c.Evidence.Vortex[0].Misread; got != 0.05 {
		t.Errorf("fastback misread default = %g, want 0.05", got)
	}
	if got := c.Evidence.Pressure[0].ModelSDPct; got != 25 {
		t.Errorf("model_sd_pct default = %g, want 25", got)
	}
	if c.Report.Credible != 0.9 || c.Report.Seed != 1 || c.Report.ReferenceConfig != "base" || c.Air.CO2ppm != 400 || c.Air.WindSDMs != 1 {
		t.Errorf("report/air defaults not applied: %+v %+v", c.Report, c.Air)
	}
	if got := c.CostH("rlaser"); got != 1 {
		t.Errorf("default cost = %g, want 1", got)
	}
	if got := c.CostH("tuft"); got != 0.25 {
		t.Errorf("cost of tuft = %g, want 0.25", got)
	}
	if len(c.Files) != 2 {
		t.Errorf("files read = %v, want the campaign and its one log", c.Files)
	}
}

func TestLoadInvalid(t *testing.T) {
	const log = "logs/run.csv"
	tests := []struct {
		name     string
		edits    []edit
		wantFile string // suffix; "" means campaign.yaml
		wantLine int
		wantPath string
		wantErr  error
	}{
		{"unknown top-level key", []edit{{n: -80, new: "colour: red"}}, "", 81, "colour", campaign.ErrUnknownKey},
		{"unknown nested key", []edit{{n: 11, old: "wheelbase_m", new: "wheelbase_mm"}}, "", 11, "vehicle.wheelbase_mm", campaign.ErrUnknownKey},
		{"missing required key", []edit{{n: 11}}, "", 9, "vehicle.wheelbase_m", campaign.ErrMissing},
		{"duplicate key", []edit{{n: -12, new: "  mass_kg: 1300"}}, "", 13, "vehicle.mass_kg", campaign.ErrDuplicate},
		{"wrong type", []edit{{n: 12, old: "1200", new: "heavy"}}, "", 12, "vehicle.mass_kg", campaign.ErrType},
		{"non-finite number", []edit{{n: 20, old: "20", new: ".inf"}}, "", 20, "air.temperature_c", campaign.ErrRange},
		{"negative length", []edit{{n: 11, old: "2.5", new: "-2.5"}}, "", 11, "vehicle.wheelbase_m", campaign.ErrRange},
		{"zero mass", []edit{{n: 12, old: "1200", new: "0"}}, "", 12, "vehicle.mass_kg", campaign.ErrRange},
		{"percentage out of range", []edit{{n: 14, old: "spring_sd_pct: 5", new: "spring_sd_pct: 150"}}, "", 14, "vehicle.axles.front.spring_sd_pct", campaign.ErrRange},
		{"probability out of range", []edit{{n: -71, new: "      misread: 0.6"}}, "", 72, "evidence.vortex[0].misread", campaign.ErrRange},
		{"credible out of range", []edit{{n: -77, new: "  credible: 1.5"}}, "", 78, "report.credible", campaign.ErrRange},
		{"bad date", []edit{{n: 7, old: "2026-03-02", new: "02/03/2026"}}, "", 7, "campaign.date", campaign.ErrRange},
		{"wrong format number", []edit{{n: 4, old: "1", new: "2"}}, "", 4, "liftfuse", campaign.ErrFormat},
		{"yaml syntax (parser)", []edit{{n: 17, old: "as is}", new: "as is"}}, "", 17, "", campaign.ErrSyntax},
		{"yaml syntax (scanner)", []edit{{n: 21, old: "pressure_hpa: 1013", new: "pressure_hpa: 1013: 5"}}, "", 21, "", campaign.ErrSyntax},
		{"duplicate configuration id", []edit{{n: 18, old: "wing", new: "base"}}, "", 18, "configurations[1].id", campaign.ErrDuplicate},
		{"malformed configuration id", []edit{{n: 18, old: "wing", new: "Wing Tip"}}, "", 18, "configurations[1].id", campaign.ErrRange},
		{"duplicate entry id", []edit{{n: 39, old: "rlaser", new: "fpot"}}, "", 39, "evidence.ride_height[1].id", campaign.ErrDuplicate},
		{"unknown configuration in segment", []edit{{n: 38, old: "wing", new: "wingg"}}, "", 38, "evidence.ride_height[0].logs[0].segments[1].config", campaign.ErrReference},
		{"missing log file", []edit{{n: 31, old: "run.csv", new: "nope.csv"}}, "", 31, "evidence.ride_height[0].logs[0].file", campaign.ErrFile},
		{"missing log column", []edit{{n: 34, old: "fp", new: "fpx"}}, "", 34, "evidence.ride_height[0].logs[0].signal", campaign.ErrColumn},
		{"two speed columns", []edit{{n: -33, new: "          speed_ms: vms"}}, "", 31, "evidence.ride_height[0].logs[0]", campaign.ErrMissing},
		{"overlapping segments", []edit{{n: 38, old: "from_s: 5", new: "from_s: 3"}}, "", 38, "evidence.ride_height[0].logs[0].segments[1]", campaign.ErrOverlap},
		{"segment outside the log", []edit{{n: 38, old: "to_s: 9", new: "to_s: 20"}}, "", 38, "evidence.ride_height[0].logs[0].segments[1]", campaign.ErrRange},
		{"points with one distinct signal", []edit{{n: 43, old: "[[0, 0]", new: "[[1, 0]"}}, "", 43, "evidence.ride_height[1].calibration.points", campaign.ErrRange},
		{"ballast with one distinct mass", []edit{{n: 48, old: "added_kg: 50", new: "added_kg: 0"}}, "", 47, "evidence.ride_height[1].stiffness.ballast", campaign.ErrRange},
		{"zero tap area", []edit{{n: 62, old: "area_m2: 0.5", new: "area_m2: 0"}}, "", 62, "evidence.pressure[0].taps[0].area_m2", campaign.ErrRange},
		{"tap without reading", []edit{{n: 67, old: ", f1: -80", new: ""}}, "", 67, "evidence.pressure[0].readings[0]", campaign.ErrMissing},
		{"non-finite tap reading", []edit{{n: 67, old: "r1: -300", new: "r1: .nan"}}, "", 67, "evidence.pressure[0].readings[0].pa.r1", campaign.ErrRange},
		{"reading of an unknown tap", []edit{{n: 68, old: "f1: -90", new: "f1: -90, x9: 4"}}, "", 68, "evidence.pressure[0].readings[1].pa.x9", campaign.ErrReference},
		{"vortex on a wagon", []edit{{n: 10, old: "fastback", new: "wagon"}}, "", 70, "evidence.vortex[0]", campaign.ErrNotApply},
		{"plan cost of an unknown entry", []edit{{n: 80, old: "fpot:", new: "fpott:"}}, "", 80, "plan.cost_h.fpott", campaign.ErrReference},
		{"non-numeric log cell", []edit{{file: log, n: 4, old: "100.0,27.778", new: "1OO,27.778"}}, log, 4, "evidence.ride_height[0].logs[0]", campaign.ErrColumn},
		{"missing log cell", []edit{{file: log, n: 6, old: "1.040", new: ""}}, log, 6, "evidence.ride_height[0].logs[0]", campaign.ErrColumn},
		{"time not increasing", []edit{{file: log, n: 5, old: "3.0,", new: "1.5,"}}, log, 5, "evidence.ride_height[0].logs[0]", campaign.ErrColumn},
		{"direction not ±1", []edit{{file: log, n: 4, old: ",1,1.020", new: ",0,1.020"}}, log, 4, "evidence.ride_height[0].logs[0].direction", campaign.ErrRange},
		{"unknown configuration in log", []edit{{file: log, n: 8, old: "wing", new: "wig"}}, log, 8, "evidence.ride_height[1].logs[0].config", campaign.ErrReference},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			path := fixture(t)
			apply(t, path, tt.edits)
			c, err := campaign.Load(path, campaign.Options{})
			if err == nil {
				t.Fatalf("loaded an invalid campaign: %+v", c.Campaign)
			}
			var probs campaign.Problems
			if !errors.As(err, &probs) {
				t.Fatalf("error is %T, want campaign.Problems: %v", err, err)
			}
			wantFile := tt.wantFile
			if wantFile == "" {
				wantFile = "campaign.yaml"
			}
			for _, p := range probs {
				if strings.HasSuffix(p.File, wantFile) && p.Line == tt.wantLine && p.Path == tt.wantPath && errors.Is(p, tt.wantErr) {
					if !strings.HasPrefix(p.Error(), p.Where.String()+": ") || p.Column == 0 && tt.wantErr != campaign.ErrSyntax {
						t.Errorf("message %q does not start with file:line:column", p.Error())
					}
					return
				}
			}
			t.Errorf("no problem at %s:%d %s wrapping %v; got:\n%v", wantFile, tt.wantLine, tt.wantPath, tt.wantErr, err)
		})
	}
}

func TestLoadListsEveryProblem(t *testing.T) {
	path := fixture(t)
	apply(t, path, []edit{
		{n: 11, old: "2.5", new: "-2.5"},
		{n: 38, old: "wing", new: "wingg"},
		{n: 80, old: "fpot:", new: "fpott:"},
	})
	_, err := campaign.Load(path, campaign.Options{})
	var probs campaign.Problems
	if !errors.As(err, &probs) || len(probs) != 3 {
		t.Fatalf("want exactly 3 problems in file order, got %v", err)
	}
	for i, want := range []int{11, 38, 80} {
		if probs[i].Line != want {
			t.Errorf("problem %d at line %d, want %d", i, probs[i].Line, want)
		}
	}
}

func TestLoadWarnings(t *testing.T) {
	path := fixture(t)
	apply(t, path, []edit{
		{n: 49},          // the laser loses its tyre-growth prior
		{n: 63}, {n: 63}, // the pressure entry loses its uncovered patches
	})
	c, err := campaign.Load(path, campaign.Options{})
	if err != nil {
		t.Fatal(err)
	}
	var text []string
	for _, w := range c.Warnings {
		text = append(text, w.Error())
	}
	all := strings.Join(text, "\n")
	for _, want := range []string{"no tyre_growth prior", "no uncovered patches"} {
		if !strings.Contains(all, want) {
			t.Errorf("warnings lack %q:\n%s", want, all)
		}
	}
}

func TestLoadTables(t *testing.T) {
	path := fixture(t)
	dir := filepath.Dir(path)
	write := func(name, text string) {
		if err := os.WriteFile(filepath.Join(dir, name), []byte(text), 0o644); err != nil {
			t.Fatal(err)
		}
	}
	write("taps.csv", "id,x_m,surface,area_m2,nz\nr1,1.0,upper,0.5,1\nf1,1.0,lower,0.5,-1\n")
	write("readings.csv", "config,speed_kmh,direction,r1,f1\nbase,100,1,-300,-80\nwing,100,-1,-280,\n")
	apply(t, path, []edit{
		{n: 61, old: "taps:", new: "taps_file: taps.csv"}, {n: 62}, {n: 62},
		{n: 64, old: "readings:", new: "readings_file: readings.csv"}, {n: 65}, {n: 65},
	})
	_, err := campaign.Load(path, campaign.Options{})
	var probs campaign.Problems
	if !errors.As(err, &probs) {
		t.Fatalf("want the missing reading reported, got %v", err)
	}
	// The gap in the readings table is an error at that table's row, not a zero.
	if len(probs) != 1 || !strings.HasSuffix(probs[0].File, "readings.csv") || probs[0].Line != 3 || !errors.Is(probs[0], campaign.ErrMissing) {
		t.Fatalf("want one problem at readings.csv:3, got %v", err)
	}
	write("readings.csv", "config,speed_kmh,direction,r1,f1\nbase,100,1,-300,-80\nwing,100,-1,-280,-90\n")
	c, err := campaign.Load(path, campaign.Options{})
	if err != nil {
		t.Fatal(err)
	}
	if got, _ := c.Evidence.Pressure[0].Readings[1].Pa.Get("f1"); got != -90 || c.Evidence.Pressure[0].Taps[1].Nz != -1 {
		t.Errorf("tables not loaded: %+v", c.Evidence.Pressure[0])
	}
}
