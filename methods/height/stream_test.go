package height_test

import (
	"fmt"
	"os"
	"path/filepath"
	"slices"
	"strings"
	"testing"

	"liftfuse/methods/campaign"
	"liftfuse/methods/height"
	"liftfuse/methods/logs/logtest"
)

// streamAndLoad loads the campaign at path both ways — streamed, its logs
// read by the ride-height adapter alone, then Finish; and whole — and
// fails the test unless they end alike: the same problems, or the same
// files, warnings and input hash (that of hashing the files again).
// later sets Options.HashLater on the streamed load.
func streamAndLoad(t *testing.T, path string, later bool) {
	t.Helper()
	full, wantErr := campaign.Load(path, campaign.Options{})
	c, err := campaign.Load(path, campaign.Options{Stream: true, HashLater: later})
	if err != nil {
		if fmt.Sprint(err) != fmt.Sprint(wantErr) {
			t.Fatalf("streamed load:\n%v\nloaded whole:\n%v", err, wantErr)
		}
		return
	}
	es := make([]*campaign.RideHeightEntry, len(c.Evidence.RideHeight))
	for i := range es {
		es[i] = &c.Evidence.RideHeight[i]
	}
	_, err = height.ReduceAll(c, es, height.Options{})
	adapterErr := err
	if err = c.Finish(err); wantErr != nil || err != nil {
		if wantErr == nil {
			if err != adapterErr {
				t.Fatalf("streamed: %v; the adapter: %v; loaded whole: fine", err, adapterErr)
			}
			return // the adapter's own fault, on a campaign validation takes
		}
		if fmt.Sprint(err) != fmt.Sprint(wantErr) {
			t.Fatalf("streamed:\n%v\nloaded whole:\n%v", err, wantErr)
		}
		return
	}
	if !slices.Equal(c.Files, full.Files) {
		t.Errorf("files %v, loaded whole %v", c.Files, full.Files)
	}
	if fmt.Sprint(c.Warnings) != fmt.Sprint(full.Warnings) {
		t.Errorf("warnings:\n%v\nloaded whole:\n%v", c.Warnings, full.Warnings)
	}
	got, err := c.Hash()
	if want := logtest.SHA256Files(t, full.Files); err != nil || got != want {
		t.Errorf("hash %s, %v; want %s", got, err, want)
	}
}

// miniCopy copies testdata/mini to a temporary folder, replacing in the
// campaign and its log each pair of edits (old, new), and returns the
// campaign's path.
func miniCopy(t *testing.T, yamlEdits, logEdits []string) string {
	t.Helper()
	dir := t.TempDir()
	for _, f := range []struct {
		name  string
		edits []string
	}{{"campaign.yaml", yamlEdits}, {"logs/run.csv", logEdits}} {
		data, err := os.ReadFile(filepath.Join("../../testdata/mini", f.name))
		if err != nil {
			t.Fatal(err)
		}
		s := string(data)
		for i := 0; i+1 < len(f.edits); i += 2 {
			if !strings.Contains(s, f.edits[i]) {
				t.Fatalf("%s holds no %q", f.name, f.edits[i])
			}
			s = strings.Replace(s, f.edits[i], f.edits[i+1], 1)
		}
		name := filepath.Join(dir, f.name)
		if err := os.MkdirAll(filepath.Dir(name), 0o755); err != nil {
			t.Fatal(err)
		}
		if err := os.WriteFile(name, []byte(s), 0o644); err != nil {
			t.Fatal(err)
		}
	}
	return filepath.Join(dir, "campaign.yaml")
}

// TestStreamLikeLoad: a campaign loaded with Options.Stream, whose logs
// the ride-height adapter alone reads, ends (Finish) as a campaign loaded
// with every log read by validation: the same problems, listed the same
// way, on bad logs; on a clean one the same files, warnings and input
// hash, the latter equal to hashing the files again with the standard
// library; and so with Options.HashLater, whose hash is read afterwards.
func TestStreamLikeLoad(t *testing.T) {
	const first, second = "5.0,20.0,5.556,1,", "9.0,20.0,5.556,1,"
	for _, tc := range []struct {
		name            string
		yamlEdits, logs []string
	}{
		{"clean", nil, nil},
		{"a configuration informed by no method", []string{"- {id: wing}", "- {id: wing}\n  - {id: third}"}, nil},
		{"unknown configuration ids", nil, []string{"1.0036,0.5014,base", "1.0036,0.5014,wig", "0.4994,base", "0.4994,foo"}},
		{"direction not ±1", nil, []string{first, "5.0,20.0,5.556,0,"}},
		{"direction and unknown id", nil, []string{second, "9.0,20.0,5.556,-2,", "1.0036,0.5014,base", "1.0036,0.5014,zz"}},
		{"segment outside the log", []string{"to_s: 59}", "to_s: 99}"}, nil},
		{"cell not a number", nil, []string{first, "5.0,20.0x,5.556,1,"}},
	} {
		for _, later := range []bool{false, true} {
			t.Run(fmt.Sprintf("%s/later=%v", tc.name, later), func(t *testing.T) {
				streamAndLoad(t, miniCopy(t, tc.yamlEdits, tc.logs), later)
			})
		}
	}
}

// FuzzStreamLikeLoad: whatever testdata/mini's log holds, a streamed load
// (the adapter's read the only one) ends as a whole load does (see
// streamAndLoad): same problems, or same files, warnings and hash.
func FuzzStreamLikeLoad(f *testing.F) {
	log, err := os.ReadFile("../../testdata/mini/logs/run.csv")
	if err != nil {
		f.Fatal(err)
	}
	f.Add(log)
	for _, tc := range [][2]string{{"5.0,20.0,5.556,1,", "5.0,20.0,5.556,0,"}, {",base\n", ",wig\n"}, {"7.0,", "4.5,"}, {"\n9.0", "\n\n9.0"}} {
		f.Add([]byte(strings.Replace(string(log), tc[0], tc[1], 1)))
	}
	f.Add([]byte("t,v,vms,d,fp,rl,cfg\n"))
	f.Fuzz(func(t *testing.T, log []byte) {
		path := miniCopy(t, nil, nil)
		if err := os.WriteFile(filepath.Join(filepath.Dir(path), "logs", "run.csv"), log, 0o644); err != nil {
			t.Fatal(err)
		}
		streamAndLoad(t, path, false)
	})
}
