package methods_test

import (
	"errors"
	"os"
	"path/filepath"
	"strings"
	"testing"

	"liftfuse/methods"
	"liftfuse/methods/campaign"
)

// TestReduceBadData: faults the loader cannot see (found by the adapters
// while reducing) are errors at their cell or key, never a panic or a
// silent result (issue: hardening).
func TestReduceBadData(t *testing.T) {
	tests := []struct {
		name      string
		file, old string // a text change to a fixture file
		new       string
		wantAt    string // suffix of the problem's position: file:line
		wantErr   error  // nil: any error with wantAt, or success when wantAt is ""
	}{
		{"first time step 1e-15 s", "logs/run.csv", "\n1.0,20.0,", "\n1e-15,20.0,", "", nil},
		{"a cell of 1e150 in a window", "logs/run.csv", "\n15.0,100.0,27.778,1,0.9907,", "\n15.0,100.0,27.778,1,1e150,", "run.csv:17", campaign.ErrData},
		{"a negative logged speed", "logs/run.csv", "\n16.0,100.0,", "\n16.0,-90.0,", "run.csv:18", campaign.ErrRange},
		{"ballast that does not sink", "campaign.yaml", "{added_kg: 50, x_m: 2.2, signal: 0.95}", "{added_kg: 50, x_m: 2.2, signal: 1.05}", "campaign.yaml:", campaign.ErrData},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			dir := t.TempDir()
			if err := os.CopyFS(dir, os.DirFS("../testdata/mini")); err != nil {
				t.Fatal(err)
			}
			name := filepath.Join(dir, tt.file)
			data, err := os.ReadFile(name)
			if err != nil {
				t.Fatal(err)
			}
			if strings.Count(string(data), tt.old) != 1 {
				t.Fatalf("fixture drift: %q", tt.old)
			}
			os.WriteFile(name, []byte(strings.Replace(string(data), tt.old, tt.new, 1)), 0o644)
			c, err := campaign.Load(filepath.Join(dir, "campaign.yaml"), campaign.Options{})
			if err == nil {
				_, err = methods.Reduce(c, methods.Options{})
			}
			switch {
			case tt.wantAt == "" && err != nil:
				t.Fatalf("want success, got %v", err)
			case tt.wantAt == "":
				return
			case err == nil:
				t.Fatal("bad data accepted")
			case !strings.Contains(err.Error(), tt.wantAt) || tt.wantErr != nil && !errors.Is(err, tt.wantErr):
				t.Errorf("error %q, want it at %s wrapping %v", err, tt.wantAt, tt.wantErr)
			}
		})
	}
}
