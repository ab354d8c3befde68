package methods_test

import (
	"fmt"
	"math"
	"os"
	"path/filepath"
	"strings"
	"testing"

	"liftfuse/fuse"
	"liftfuse/methods"
	"liftfuse/methods/campaign"
)

// demoDay copies the demo campaign into a temporary folder, lets edit
// rewrite its log and campaign text, and returns the fused result.
func demoDay(t *testing.T, edit func(log [][]string, yaml string) (newLog string, newYAML string, extra map[string]string)) *fuse.Result {
	t.Helper()
	dir := t.TempDir()
	if err := os.CopyFS(dir, os.DirFS("../examples/ducktail-fastback")); err != nil {
		t.Fatal(err)
	}
	logName := filepath.Join(dir, "logs", "simulated.csv")
	data, err := os.ReadFile(logName)
	if err != nil {
		t.Fatal(err)
	}
	var rows [][]string
	for _, l := range strings.Split(strings.TrimSpace(string(data)), "\n") {
		rows = append(rows, strings.Split(l, ","))
	}
	yamlName := filepath.Join(dir, "campaign.yaml")
	y, err := os.ReadFile(yamlName)
	if err != nil {
		t.Fatal(err)
	}
	newLog, newYAML, extra := edit(rows, string(y))
	for name, text := range map[string]string{logName: newLog, yamlName: newYAML} {
		if err := os.WriteFile(name, []byte(text), 0o644); err != nil {
			t.Fatal(err)
		}
	}
	for name, text := range extra {
		if err := os.WriteFile(filepath.Join(dir, name), []byte(text), 0o644); err != nil {
			t.Fatal(err)
		}
	}
	c, err := campaign.Load(yamlName, campaign.Options{})
	if err != nil {
		t.Fatal(err)
	}
	r, err := methods.Reduce(c, methods.Options{})
	if err != nil {
		t.Fatal(err)
	}
	f, err := fuse.Run(fuse.Input{Evidence: r.Evidence(), Settings: fuse.Settings{Configs: c.ConfigIDs(), Seed: 1, Credible: 0.9},
		Reference: c.Report.ReferenceConfig, SpeedsKmh: c.Report.SpeedsKmh, Rho: c.Density()})
	if err != nil {
		t.Fatal(err)
	}
	return f.Result
}

func joinRows(rows [][]string, sep string) string {
	var b strings.Builder
	for _, r := range rows {
		b.WriteString(strings.Join(r, sep) + "\n")
	}
	return b.String()
}

// clock writes seconds after 10:15:00 as hh:mm:ss.fff.
func clock(s string) string {
	var x float64
	fmt.Sscan(s, &x)
	ms := int(math.Round(x*1000)) + (10*3600+15*60)*1000
	return fmt.Sprintf("%02d:%02d:%02d.%03d", ms/3600000, ms/60000%60, ms/1000%60, ms%1000)
}

// thinSpeed returns an edit that keeps the demo log's speed (a 10 Hz file)
// on every n-th row only, as a slower GPS channel logged into it: the other
// cells are left empty and read with empty: hold (blank), or hold the last
// kept value written out (!blank).
func thinSpeed(n int, blank bool) func(rows [][]string, y string) (string, string, map[string]string) {
	return func(rows [][]string, y string) (string, string, map[string]string) {
		for i := 2; i < len(rows); i++ {
			if (i-1)%n != 0 {
				rows[i][1] = rows[i-1][1]
				if blank {
					rows[i][1] = ""
				}
			}
		}
		if blank {
			y = strings.ReplaceAll(y, "        - file: logs/simulated.csv\n", "        - file: logs/simulated.csv\n          format: {empty: hold}\n")
		}
		return joinRows(rows, ","), y, nil
	}
}

// TestLoggerFormatsGiveTheSameDay: the demo day written the ways real
// loggers write it gives the same fused figures as the clean CSV (issue:
// |Δmean| ≤ 0.25 sd for every configuration's front and rear). A speed
// held at a lower rate is a little less information (the last 0.1–0.4 s
// of a ramp's edge is not seen), not a different day.
func TestLoggerFormatsGiveTheSameDay(t *testing.T) {
	if testing.Short() {
		t.Skip("five fusions of the demo")
	}
	clean := demoDay(t, func(rows [][]string, y string) (string, string, map[string]string) {
		return joinRows(rows, ","), y, nil
	})
	tests := []struct {
		name string
		edit func(rows [][]string, y string) (string, string, map[string]string)
	}{
		{"BOM, preamble, units row, ';', decimal comma, clock time", func(rows [][]string, y string) (string, string, map[string]string) {
			var b strings.Builder
			b.WriteString("\ufeffexported by a data logger\nsession;ducktail trial\n")
			for i, r := range rows {
				out := make([]string, len(r))
				for k, c := range r {
					out[k] = strings.ReplaceAll(c, ".", ",")
					if k == 0 && i > 0 {
						out[k] = strings.ReplaceAll(clock(c), ".", ",")
					}
				}
				b.WriteString(strings.Join(out, ";") + "\n")
				if i == 0 {
					b.WriteString("hh:mm:ss;km/h;-;V;V;mm\n")
				}
			}
			return b.String(), y, nil
		}},
		{"speed from a separate GPS file, clock 1.5 s behind", func(rows [][]string, y string) (string, string, map[string]string) {
			gps := [][]string{{"t", "v"}}
			for i, r := range rows[1:] {
				var s float64
				fmt.Sscan(r[0], &s)
				gps = append(gps, []string{fmt.Sprintf("%.4f", s-1.5), r[1]})
				rows[i+1] = append(r[:1:1], r[2:]...)
			}
			rows[0] = append(rows[0][:1:1], rows[0][2:]...)
			y = strings.ReplaceAll(y, "          speed_kmh: v_kmh\n", "          speed_file: {file: logs/gps.csv, time: t, speed_kmh: v, offset_s: 1.5}\n")
			return joinRows(rows, ","), y, map[string]string{"logs/gps.csv": joinRows(gps, ",")}
		}},
		{"mixed rate: speed at 5 Hz in the 10 Hz file, empty cells held", thinSpeed(2, true)},
		{"mixed rate: speed at 2 Hz in the 10 Hz file, empty cells held", thinSpeed(5, true)},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			got := demoDay(t, tt.edit)
			worst, at := 0.0, ""
			defer func() { t.Logf("largest |Δ| %.3f sd (%s)", worst, at) }()
			for i, c := range clean.Configs {
				for _, ax := range []struct {
					name string
					a, b fuse.Estimate
				}{{"front", c.Front.CLA, got.Configs[i].Front.CLA}, {"rear", c.Rear.CLA, got.Configs[i].Rear.CLA}} {
					d := math.Abs(ax.b.Mean - ax.a.Mean)
					if d/ax.a.SD > worst {
						worst, at = d/ax.a.SD, c.ID+" "+ax.name
					}
					if d > 0.25*ax.a.SD {
						t.Errorf("%s %s: %.4f against the clean log's %.4f ± %.4f (|Δ| = %.2f sd)", c.ID, ax.name, ax.b.Mean, ax.a.Mean, ax.a.SD, d/ax.a.SD)
					}
				}
			}
		})
	}
}

// TestHeldCellsReadAsWritten: a mixed-rate log (speed at 5 Hz in a 10 Hz
// file, the cells between left empty) read with empty: hold gives exactly
// the figures of the same log with the held values written out.
func TestHeldCellsReadAsWritten(t *testing.T) {
	if testing.Short() {
		t.Skip("two fusions of the demo")
	}
	written, held := demoDay(t, thinSpeed(2, false)), demoDay(t, thinSpeed(2, true))
	for i, c := range written.Configs {
		if a, b := c.Rear.CLA, held.Configs[i].Rear.CLA; a != b {
			t.Errorf("%s rear: held %+v, written out %+v", c.ID, b, a)
		}
		if a, b := c.Front.CLA, held.Configs[i].Front.CLA; a != b {
			t.Errorf("%s front: held %+v, written out %+v", c.ID, b, a)
		}
	}
}
