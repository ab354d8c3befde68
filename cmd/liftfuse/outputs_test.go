package main

import (
	"os"
	"path/filepath"
	"strings"
	"testing"
)

// demoCopy writes the demo campaign into a new folder (liftfuse init) and
// returns the campaign's path.
func demoCopy(t *testing.T) string {
	t.Helper()
	dir := filepath.Join(t.TempDir(), "day")
	if code, _, stderr := liftfuse(t, "init", dir); code != 0 {
		t.Fatalf("init: %s", stderr)
	}
	return filepath.Join(dir, "campaign.yaml")
}

// TestOutputIsInput: report refuses, before any work, an output that is
// the campaign or a file it reads — by path, through a symbolic link, or
// as a hard link — or two outputs that are one file; and an output it
// cannot write (a missing folder, named). Nothing is overwritten.
func TestOutputIsInput(t *testing.T) {
	file := demoCopy(t)
	dir := filepath.Dir(file)
	log := filepath.Join(dir, "logs", "simulated.csv")
	must(t, os.Symlink(file, filepath.Join(dir, "link.yaml")))
	must(t, os.Link(file, filepath.Join(dir, "hard.yaml")))
	must(t, os.Symlink(log, filepath.Join(dir, "log-link.csv")))
	if err := mkfifo(filepath.Join(dir, "fifo.pdf")); err != nil {
		t.Skip(err)
	}
	before := snapshot(t, file, log)
	tests := []struct {
		name     string
		args     []string
		inStderr string
	}{
		{"-o the campaign", []string{"-o", file}, "-o " + file + " is the campaign file"},
		{"--json-out the campaign", []string{"-o", filepath.Join(dir, "r.pdf"), "--json-out", file}, "--json-out " + file + " is the campaign file"},
		{"the campaign by another path", []string{"-o", filepath.Join(dir, "logs", "..", "campaign.yaml")}, "is the campaign file"},
		{"a symbolic link to the campaign", []string{"-o", filepath.Join(dir, "link.yaml")}, "is the campaign file"},
		{"a hard link to the campaign", []string{"-o", filepath.Join(dir, "hard.yaml")}, "is the campaign file"},
		{"-o a log the campaign reads", []string{"-o", log}, "is a file the campaign reads"},
		{"--json-out a link to a log", []string{"-o", filepath.Join(dir, "r.pdf"), "--json-out", filepath.Join(dir, "log-link.csv")}, "is a file the campaign reads"},
		{"both outputs one file", []string{"-o", filepath.Join(dir, "r.pdf"), "--json-out", filepath.Join(dir, "r.pdf")}, "-o and --json-out name the same file"},
		{"a missing folder is named", []string{"-o", filepath.Join(dir, "missing", "r.pdf")}, "folder " + filepath.Join(dir, "missing") + " does not exist"},
		{"a FIFO as output", []string{"-o", filepath.Join(dir, "fifo.pdf")}, "not a regular file (a FIFO)"},
		{"a folder as output", []string{"-o", filepath.Join(dir, "logs")}, "it is a folder"},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			code, _, stderr := liftfuse(t, append([]string{"report", file, "-q"}, tt.args...)...)
			if code != exitInput || !strings.Contains(stderr, tt.inStderr) {
				t.Errorf("exit %d, stderr %q; want exit 2 with %q", code, stderr, tt.inStderr)
			}
			if strings.Contains(stderr, ".tmp-") {
				t.Errorf("a temporary name in %q", stderr)
			}
			if after := snapshot(t, file, log); after != before {
				t.Error("an input changed")
			}
			if _, err := os.Stat(filepath.Join(dir, "r.pdf")); err == nil {
				t.Error("a refused run wrote r.pdf")
			}
		})
	}
}

// TestReportOutputs: one full report run over existing outputs: a PDF
// output given as a symbolic link stays a link and its target is replaced;
// each output keeps its mode; the JSON file and --json on stdout are the
// result document fuse --json prints.
func TestReportOutputs(t *testing.T) {
	dir := t.TempDir()
	real, link, js := filepath.Join(dir, "real.pdf"), filepath.Join(dir, "r.pdf"), filepath.Join(dir, "r.json")
	must(t, os.WriteFile(real, []byte("old"), 0o600))
	must(t, os.Chmod(real, 0o600))
	must(t, os.Symlink("real.pdf", link))
	must(t, os.WriteFile(js, []byte("old"), 0o640))
	must(t, os.Chmod(js, 0o640))
	code, out, stderr := liftfuse(t, "report", demo, "-o", link, "--json-out", js, "--json", "-q")
	if code != 0 {
		t.Fatalf("exit %d: %s", code, stderr)
	}
	if st, err := os.Lstat(link); err != nil || st.Mode()&os.ModeSymlink == 0 {
		t.Errorf("the -o link was replaced by a file")
	}
	b, _ := os.ReadFile(real)
	if !strings.HasPrefix(string(b), "%PDF-") {
		t.Error("the link's target was not replaced by the PDF")
	}
	for name, mode := range map[string]os.FileMode{real: 0o600, js: 0o640} {
		if st, err := os.Stat(name); err != nil || st.Mode().Perm() != mode {
			t.Errorf("%s: mode %v, want %v kept", name, st.Mode().Perm(), mode)
		}
	}
	file, _ := os.ReadFile(js)
	fused := decodeResult(t, liftfuseOK(t, "fuse", demo, "--json", "-q"))
	for what, doc := range map[string]string{"--json-out file": string(file), "--json on stdout": out} {
		if d := diffResults(decodeResult(t, doc), fused); d != "" {
			t.Errorf("%s differs from fuse --json: %s", what, d)
		}
	}
	if left, _ := filepath.Glob(filepath.Join(dir, ".*tmp*")); len(left) > 0 {
		t.Errorf("temporary files left: %v", left)
	}
}

func must(t *testing.T, err error) {
	t.Helper()
	if err != nil {
		t.Fatal(err)
	}
}

// snapshot is the content of files, to see that none changed.
func snapshot(t *testing.T, names ...string) string {
	t.Helper()
	var b strings.Builder
	for _, n := range names {
		c, err := os.ReadFile(n)
		if err != nil {
			t.Fatal(err)
		}
		b.Write(c)
	}
	return b.String()
}
