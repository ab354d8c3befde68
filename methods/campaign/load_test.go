package campaign_test

import (
	"bytes"
	"errors"
	"os"
	"path/filepath"
	"strings"
	"syscall"
	"testing"

	"liftfuse/methods/campaign"
)

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
	const (
		rh0  = "evidence.ride_height[0]"
		log0 = rh0 + ".logs[0]"
		rh1  = "evidence.ride_height[1]"
		pr0  = "evidence.pressure[0]"
	)
	tests := []struct {
		name  string
		edits []edit
		text  *textChange // a change to campaign.yaml's text instead
		log   *textChange // a change to logs/run.csv
		// at is the YAML path whose line the problem must stand on ("" with
		// a text change: the changed line); path is the problem's own.
		at, path string
		wantErr  error
	}{
		{"unknown top-level key", []edit{add("", "colour", "red")}, nil, nil, "colour", "colour", campaign.ErrUnknownKey},
		{"unknown nested key", []edit{rename("vehicle.wheelbase_m", "wheelbase_mm")}, nil, nil, "vehicle.wheelbase_mm", "vehicle.wheelbase_mm", campaign.ErrUnknownKey},
		{"missing required key", []edit{remove("vehicle.wheelbase_m")}, nil, nil, "vehicle", "vehicle.wheelbase_m", campaign.ErrMissing},
		{"duplicate key", []edit{add("vehicle", "mass_kg", "1300")}, nil, nil, "vehicle.mass_kg", "vehicle.mass_kg", campaign.ErrDuplicate},
		{"wrong type", []edit{set("vehicle.mass_kg", "heavy")}, nil, nil, "vehicle.mass_kg", "vehicle.mass_kg", campaign.ErrType},
		{"non-finite number", []edit{set("air.temperature_c", ".inf")}, nil, nil, "air.temperature_c", "air.temperature_c", campaign.ErrRange},
		{"negative length", []edit{set("vehicle.wheelbase_m", "-2.5")}, nil, nil, "vehicle.wheelbase_m", "vehicle.wheelbase_m", campaign.ErrRange},
		{"zero mass", []edit{set("vehicle.mass_kg", "0")}, nil, nil, "vehicle.mass_kg", "vehicle.mass_kg", campaign.ErrRange},
		{"percentage out of range", []edit{set("vehicle.axles.front.spring_sd_pct", "150")}, nil, nil, "vehicle.axles.front.spring_sd_pct", "vehicle.axles.front.spring_sd_pct", campaign.ErrRange},
		{"probability out of range", []edit{add("evidence.vortex[0]", "misread", "0.6")}, nil, nil, "evidence.vortex[0].misread", "evidence.vortex[0].misread", campaign.ErrRange},
		{"credible out of range", []edit{add("report", "credible", "1.5")}, nil, nil, "report.credible", "report.credible", campaign.ErrRange},
		{"bad date", []edit{set("campaign.date", "02/03/2026")}, nil, nil, "campaign.date", "campaign.date", campaign.ErrRange},
		{"wrong format number", []edit{set("liftfuse", "2")}, nil, nil, "liftfuse", "liftfuse", campaign.ErrFormat},
		{"yaml syntax (parser)", nil, &textChange{"as is}", "as is"}, nil, "", "", campaign.ErrSyntax},
		{"yaml syntax (scanner)", nil, &textChange{"pressure_hpa: 1013", "pressure_hpa: 1013: 5"}, nil, "", "", campaign.ErrSyntax},
		{"duplicate configuration id", []edit{set("configurations[1].id", "base")}, nil, nil, "configurations[1].id", "configurations[1].id", campaign.ErrDuplicate},
		{"malformed configuration id", []edit{set("configurations[1].id", "Wing Tip")}, nil, nil, "configurations[1].id", "configurations[1].id", campaign.ErrRange},
		{"duplicate entry id", []edit{set(rh1+".id", "fpot")}, nil, nil, rh1 + ".id", rh1 + ".id", campaign.ErrDuplicate},
		{"unknown configuration in segment", []edit{set(log0+".segments[1].config", "wingg")}, nil, nil, log0 + ".segments[1].config", log0 + ".segments[1].config", campaign.ErrReference},
		{"missing log file", []edit{set(log0+".file", "logs/nope.csv")}, nil, nil, log0 + ".file", log0 + ".file", campaign.ErrFile},
		{"missing log column", []edit{set(log0+".signal", "fpx")}, nil, nil, log0 + ".signal", log0 + ".signal", campaign.ErrColumn},
		{"two speed columns", []edit{add(log0, "speed_ms", "vms")}, nil, nil, log0, log0, campaign.ErrMissing},
		{"overlapping segments", []edit{set(log0+".segments[1].from_s", "20")}, nil, nil, log0 + ".segments[1].from_s", log0 + ".segments[1]", campaign.ErrOverlap},
		{"segment outside the log", []edit{set(log0+".segments[1].to_s", "90")}, nil, nil, log0 + ".segments[1]", log0 + ".segments[1]", campaign.ErrRange},
		{"points with one distinct signal", []edit{set(rh1+".calibration.points", "[[1, 0], [1, 10]]")}, nil, nil, rh1 + ".calibration.points", rh1 + ".calibration.points", campaign.ErrRange},
		{"ballast with one distinct mass", []edit{set(rh1+".stiffness.ballast[1].added_kg", "0")}, nil, nil, rh1 + ".stiffness.ballast", rh1 + ".stiffness.ballast", campaign.ErrRange},
		{"zero tap area", []edit{set(pr0+".taps[0].area_m2", "0")}, nil, nil, pr0 + ".taps[0].area_m2", pr0 + ".taps[0].area_m2", campaign.ErrRange},
		{"tap without reading", []edit{remove(pr0 + ".readings[0].pa.f1")}, nil, nil, pr0 + ".readings[0]", pr0 + ".readings[0]", campaign.ErrMissing},
		{"non-finite tap reading", []edit{set(pr0+".readings[0].pa.r1", ".nan")}, nil, nil, pr0 + ".readings[0].pa.r1", pr0 + ".readings[0].pa.r1", campaign.ErrRange},
		{"reading of an unknown tap", []edit{add(pr0+".readings[1].pa", "x9", "4")}, nil, nil, pr0 + ".readings[1].pa.x9", pr0 + ".readings[1].pa.x9", campaign.ErrReference},
		{"vortex on a wagon", []edit{set("vehicle.body", "wagon")}, nil, nil, "evidence.vortex[0]", "evidence.vortex[0]", campaign.ErrNotApply},
		{"plan cost of an unknown entry", []edit{rename("plan.cost_h.fpot", "fpott")}, nil, nil, "plan.cost_h.fpott", "plan.cost_h.fpott", campaign.ErrReference},
		{"x_m on a potentiometer", []edit{add(rh0, "x_m", "0.1")}, nil, nil, rh0 + ".x_m", rh0 + ".x_m", campaign.ErrNotApply},
		{"laser off the car", []edit{add(rh1, "x_m", "9")}, nil, nil, rh1 + ".x_m", rh1 + ".x_m", campaign.ErrRange},
		{"decimal comma with comma delimiter", []edit{add(log0, "format", "{delimiter: \",\", decimal: \",\"}")}, nil, nil, log0 + ".format.decimal", log0 + ".format.decimal", campaign.ErrRange},
		{"pressure log with a tap not read", []edit{remove(pr0 + ".readings"), add(pr0, "logs", "[{file: logs/run.csv, time: t, speed_kmh: v, taps: {r1: fp}}]")}, nil, nil, pr0 + ".logs[0].taps", pr0 + ".logs[0].taps", campaign.ErrMissing},
		{"overflowing mass", []edit{set("vehicle.mass_kg", "1e308")}, nil, nil, "vehicle.mass_kg", "vehicle.mass_kg", campaign.ErrRange},
		{"overflowing wheelbase", []edit{set("vehicle.wheelbase_m", "1e308")}, nil, nil, "vehicle.wheelbase_m", "vehicle.wheelbase_m", campaign.ErrRange},
		{"overflowing motion ratio", []edit{set("vehicle.axles.rear.motion_ratio", "1e308")}, nil, nil, "vehicle.axles.rear.motion_ratio", "vehicle.axles.rear.motion_ratio", campaign.ErrRange},
		{"overflowing prior sd", []edit{add("", "prior", "{cla_sd_m2: 1e308}")}, nil, nil, "prior.cla_sd_m2", "prior.cla_sd_m2", campaign.ErrRange},
		{"overflowing gain", []edit{set(rh0+".calibration.mm_per_unit", "1e308")}, nil, nil, rh0 + ".calibration.mm_per_unit", rh0 + ".calibration.mm_per_unit", campaign.ErrRange},
		{"overflowing filter time", []edit{add(rh0, "filter_tau_s", "1e308")}, nil, nil, rh0 + ".filter_tau_s", rh0 + ".filter_tau_s", campaign.ErrRange},
		{"overflowing cost", []edit{set("plan.cost_h.tuft", "1e308")}, nil, nil, "plan.cost_h.tuft", "plan.cost_h.tuft", campaign.ErrRange},
		{"empty log file name", []edit{set(log0+".file", `""`)}, nil, nil, log0 + ".file", log0 + ".file", campaign.ErrFile},
		{"too many report speeds", []edit{set("report.speeds_kmh", "["+strings.Repeat("100, ", 60)+"100]")}, nil, nil, "report.speeds_kmh", "report.speeds_kmh", campaign.ErrRange},
		{"title too long", []edit{set("campaign.title", strings.Repeat("x", 3000))}, nil, nil, "campaign.title", "campaign.title", campaign.ErrRange},
		{"non-numeric log cell", nil, nil, &textChange{"\n12.0,100.0", "\n12.0,1OO"}, "", log0, campaign.ErrColumn},
		{"missing log cell", nil, nil, &textChange{"\n13.0,100.0,27.778,1,", "\n13.0,100.0,27.778,1,,"}, "", log0, campaign.ErrColumn},
		{"time not increasing", nil, nil, &textChange{"\n3.0,", "\n1.5,"}, "", log0, campaign.ErrColumn},
		{"direction not ±1", nil, nil, &textChange{"\n14.0,100.0,27.778,1,", "\n14.0,100.0,27.778,0,"}, "", log0 + ".direction", campaign.ErrRange},
		{"unknown configuration in log", nil, nil, &textChange{"0.4861,wing\n41.0", "0.4861,wig\n41.0"}, "", rh1 + ".logs[0].config", campaign.ErrReference},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			path := fixture(t)
			apply(t, path, tt.edits...)
			wantFile, wantLine := "campaign.yaml", 0
			switch {
			case tt.text != nil:
				wantLine = change(t, path, *tt.text)
			case tt.log != nil:
				wantFile = "run.csv"
				wantLine = change(t, filepath.Join(filepath.Dir(path), "logs", "run.csv"), *tt.log)
			default:
				wantLine = lineOf(t, path, tt.at)
			}
			c, err := campaign.Load(path, campaign.Options{})
			if err == nil {
				t.Fatalf("loaded an invalid campaign: %+v", c.Campaign)
			}
			var probs campaign.Problems
			if !errors.As(err, &probs) {
				t.Fatalf("error is %T, want campaign.Problems: %v", err, err)
			}
			for _, p := range probs {
				if strings.HasSuffix(p.File, wantFile) && p.Line == wantLine && p.Path == tt.path && errors.Is(p, tt.wantErr) {
					if !strings.HasPrefix(p.Error(), p.Where.String()+": ") || p.Column == 0 && tt.wantErr != campaign.ErrSyntax {
						t.Errorf("message %q does not start with file:line:column", p.Error())
					}
					return
				}
			}
			t.Errorf("no problem at %s:%d %s wrapping %v; got:\n%v", wantFile, wantLine, tt.path, tt.wantErr, err)
		})
	}
}

func TestLoadListsEveryProblem(t *testing.T) {
	path := fixture(t)
	at := []string{"vehicle.wheelbase_m", "evidence.ride_height[0].logs[0].segments[1].config", "plan.cost_h.fpott"}
	apply(t, path, set(at[0], "-2.5"), set(at[1], "wingg"), rename("plan.cost_h.fpot", "fpott"))
	_, err := campaign.Load(path, campaign.Options{})
	var probs campaign.Problems
	if !errors.As(err, &probs) || len(probs) != 3 {
		t.Fatalf("want exactly 3 problems in file order, got %v", err)
	}
	for i, p := range at {
		if want := lineOf(t, path, p); probs[i].Line != want {
			t.Errorf("problem %d at line %d, want %d (%s)", i, probs[i].Line, want, p)
		}
	}
}

// TestLoadListsEveryKind: a key typo does not hide a rule the validator
// checks elsewhere (issue: a configuration typo was hidden by a key typo).
func TestLoadListsEveryKind(t *testing.T) {
	path := fixture(t)
	seg := "evidence.ride_height[0].logs[0].segments[1].config"
	apply(t, path, rename("vehicle.wheelbase_m", "wheelbase_mm"), set(seg, "wingg"))
	_, err := campaign.Load(path, campaign.Options{})
	var probs campaign.Problems
	if !errors.As(err, &probs) {
		t.Fatalf("want problems, got %v", err)
	}
	var key, ref bool
	for _, p := range probs {
		key = key || errors.Is(p, campaign.ErrUnknownKey) && p.Path == "vehicle.wheelbase_mm"
		ref = ref || errors.Is(p, campaign.ErrReference) && p.Path == seg
	}
	if !key || !ref {
		t.Errorf("want both the unknown key and the unknown configuration, got:\n%v", err)
	}
}

func TestLoadNamesOtherDocuments(t *testing.T) {
	tests := []struct {
		name, text, want string
	}{
		{"simulation spec", "liftfuse_simulate: 1\nvehicle: {}\n", "simulation spec"},
		{"result document", `{"format": "liftfuse.result/1", "configs": []}`, "output document"},
		{"other format number", "liftfuse: 2\n", "format \"2\""},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			_, err := campaign.Parse(strings.NewReader(tt.text), "x.yaml", ".", campaign.Options{})
			var probs campaign.Problems
			if !errors.As(err, &probs) || len(probs) != 1 || !errors.Is(probs[0], campaign.ErrFormat) || !strings.Contains(err.Error(), tt.want) {
				t.Errorf("want one format problem saying %q, got %v", tt.want, err)
			}
		})
	}
}

func TestLoadWarnings(t *testing.T) {
	path := fixture(t)
	apply(t, path, remove("evidence.ride_height[1].tyre_growth"), remove("evidence.pressure[0].uncovered"))
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
	const pr0 = "evidence.pressure[0]"
	apply(t, path, remove(pr0+".taps"), add(pr0, "taps_file", "taps.csv"), remove(pr0+".readings"), add(pr0, "readings_file", "readings.csv"))
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

func TestLoadRefusesTrailingDocument(t *testing.T) {
	path := fixture(t)
	data, err := os.ReadFile(path)
	if err != nil {
		t.Fatal(err)
	}
	lines := strings.Count(string(data), "\n")
	if err := os.WriteFile(path, append(data, "---\ncolour: red\n"...), 0o644); err != nil {
		t.Fatal(err)
	}
	_, err = campaign.Load(path, campaign.Options{})
	var probs campaign.Problems
	if !errors.As(err, &probs) || len(probs) != 1 || probs[0].Line != lines+1 || !errors.Is(probs[0], campaign.ErrSyntax) {
		t.Fatalf("want one syntax problem at line %d (the second document's ---), got %v", lines+1, err)
	}
}

func TestLoadRefusesOversizedCampaign(t *testing.T) {
	path := filepath.Join(t.TempDir(), "big.yaml")
	big := append([]byte("liftfuse: 1\n# "), bytes.Repeat([]byte("x"), campaign.MaxDocumentBytes)...)
	if err := os.WriteFile(path, big, 0o644); err != nil {
		t.Fatal(err)
	}
	_, err := campaign.Load(path, campaign.Options{})
	if !errors.Is(err, campaign.ErrRange) || !strings.Contains(err.Error(), "larger than 64 MiB") {
		t.Fatalf("want a size error, got %v", err)
	}
}

// TestLoadRefusesFIFO: reading a named pipe would block forever; it must be
// refused by name, whether it is the campaign or a log.
func TestLoadRefusesFIFO(t *testing.T) {
	path := fixture(t)
	fifo := filepath.Join(filepath.Dir(path), "pipe.csv")
	if err := syscall.Mkfifo(fifo, 0o644); err != nil {
		t.Skipf("no FIFOs here: %v", err)
	}
	apply(t, path, set("evidence.ride_height[0].logs[0].file", "pipe.csv"))
	_, err := campaign.Load(path, campaign.Options{})
	if !errors.Is(err, campaign.ErrFile) || !strings.Contains(err.Error(), "named pipe") {
		t.Fatalf("log: want a not-a-regular-file error, got %v", err)
	}
	_, err = campaign.Load(fifo, campaign.Options{})
	if !errors.Is(err, campaign.ErrFile) || !strings.Contains(err.Error(), "named pipe") {
		t.Fatalf("campaign: want a not-a-regular-file error, got %v", err)
	}
}

// TestLoadDefaultTarget: without plan.target, the target is the rear of the
// last configuration versus the reference (campaign-format.md, plan).
func TestLoadDefaultTarget(t *testing.T) {
	tests := []struct {
		name  string
		edits []edit
		want  campaign.Target
	}{
		{"last versus the reference", []edit{remove("plan.target")}, campaign.Target{Config: "wing", Axle: "rear", Versus: "base"}},
		{"the last is the reference", []edit{remove("plan.target"), add("report", "reference_config", "wing")}, campaign.Target{Config: "wing", Axle: "rear"}},
		{"given", nil, campaign.Target{Config: "wing", Axle: "rear", Versus: "base"}},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			path := fixture(t)
			apply(t, path, tt.edits...)
			c, err := campaign.Load(path, campaign.Options{})
			if err != nil {
				t.Fatal(err)
			}
			got := c.Plan.Target
			if got.Config != tt.want.Config || got.Axle != tt.want.Axle || got.Versus != tt.want.Versus {
				t.Errorf("target = %+v, want %+v", got, tt.want)
			}
		})
	}
}

// europeanLog rewrites the fixture's log as many European loggers export:
// a byte-order mark, a preamble, ';' between cells, decimal commas and a
// units row under the header.
func europeanLog(t *testing.T, campaignPath string) {
	t.Helper()
	name := filepath.Join(filepath.Dir(campaignPath), "logs", "run.csv")
	data, err := os.ReadFile(name)
	if err != nil {
		t.Fatal(err)
	}
	lines := strings.Split(strings.TrimSpace(string(data)), "\n")
	var b strings.Builder
	b.WriteString("\ufeffLogger X2 export\nsession;7\n")
	for i, l := range lines {
		cells := strings.Split(l, ",")
		for k := range cells {
			cells[k] = strings.ReplaceAll(cells[k], ".", ",")
		}
		b.WriteString(strings.Join(cells, ";") + "\n")
		if i == 0 {
			b.WriteString("s;km/h;m/s;-;V;V;-\n")
		}
	}
	if err := os.WriteFile(name, []byte(b.String()), 0o644); err != nil {
		t.Fatal(err)
	}
}

// TestLoadDetectsLoggerFormat: the same log written the European way loads
// without format keys, and what was detected is told.
func TestLoadDetectsLoggerFormat(t *testing.T) {
	path := fixture(t)
	europeanLog(t, path)
	c, err := campaign.Load(path, campaign.Options{})
	if err != nil {
		t.Fatal(err)
	}
	got := strings.Join(c.DetectedFormats(), "\n")
	for _, want := range []string{`delimiter ";"`, `decimal ","`, "header on line 3", "units row"} {
		if !strings.Contains(got, want) {
			t.Errorf("detected %q lacks %q", got, want)
		}
	}
}

// TestLoadMissingColumnsHelp: every missing column once, at its key, with
// the header's columns and the closest name.
func TestLoadMissingColumnsHelp(t *testing.T) {
	path := fixture(t)
	log0 := "evidence.ride_height[0].logs[0]"
	apply(t, path, set(log0+".signal", "FP"), set(log0+".direction", "dir"))
	_, err := campaign.Load(path, campaign.Options{})
	var probs campaign.Problems
	if !errors.As(err, &probs) {
		t.Fatalf("want problems, got %v", err)
	}
	var signal, direction int
	for _, p := range probs {
		switch p.Path {
		case log0 + ".signal":
			signal++
			if !strings.Contains(p.Error(), `did you mean "fp"`) || !strings.Contains(p.Error(), "columns: t, v") || p.Line != lineOf(t, path, log0+".signal") {
				t.Errorf("signal problem %q lacks the header or the closest name, or stands elsewhere", p.Error())
			}
		case log0 + ".direction":
			direction++
		}
	}
	if signal != 1 || direction != 1 {
		t.Errorf("want one problem per missing column, got:\n%v", err)
	}
}

// TestLoadNoCascades: a part that fails to decode is reported once, not
// again through every rule that refers to it.
func TestLoadNoCascades(t *testing.T) {
	tests := []struct {
		name, notWant string
		edits         []edit
	}{
		{"configurations not a list", "unknown configuration", []edit{set("configurations", "5")}},
		{"vehicle not a mapping", "does not apply", []edit{set("vehicle", "x")}},
		{"taps not a list", "not among the taps", []edit{set("evidence.pressure[0].taps", "4")}},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			path := fixture(t)
			apply(t, path, tt.edits...)
			_, err := campaign.Load(path, campaign.Options{})
			if err == nil {
				t.Fatal("loaded")
			}
			if !errors.Is(err, campaign.ErrType) || strings.Contains(err.Error(), tt.notWant) {
				t.Errorf("want the type problem alone, without %q; got:\n%v", tt.notWant, err)
			}
		})
	}
}

// TestLoadEmptyColumnName: a column key with an empty name is refused at
// that key (it would otherwise count as given and read nothing).
func TestLoadEmptyColumnName(t *testing.T) {
	log0 := "evidence.ride_height[0].logs[0]"
	for _, key := range []string{"speed_kmh", "direction", "signal"} {
		t.Run(key, func(t *testing.T) {
			path := fixture(t)
			apply(t, path, set(log0+"."+key, `""`))
			_, err := campaign.Load(path, campaign.Options{})
			var probs campaign.Problems
			if !errors.As(err, &probs) {
				t.Fatalf("want problems, got %v", err)
			}
			for _, p := range probs {
				if p.Path == log0+"."+key && errors.Is(p, campaign.ErrRange) && p.Line == lineOf(t, path, log0+"."+key) {
					return
				}
			}
			t.Errorf("no problem at %s.%s; got:\n%v", log0, key, err)
		})
	}
}
