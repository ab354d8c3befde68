package campaign

import (
	"os"
	"path/filepath"
	"slices"
	"testing"

	"liftfuse/methods/logs/logtest"
)

// TestHashFromLoadingRead: the hash Load gathers while validation reads the
// files is byte for byte the hash of reading them again, and it covers
// every file (the second read is not needed). Cases: the demo (a log and a
// readings table) and testdata/mini (two entries on one log).
func TestHashFromLoadingRead(t *testing.T) {
	for _, tc := range []struct{ name, file string }{
		{"demo", "../../examples/ducktail-fastback/campaign.yaml"},
		{"mini", "../../testdata/mini/campaign.yaml"},
	} {
		t.Run(tc.name, func(t *testing.T) {
			c, err := Load(tc.file, Options{})
			if err != nil {
				t.Fatal(err)
			}
			if len(c.Files) < 2 {
				t.Fatalf("files read = %v, want the campaign and its logs", c.Files)
			}
			got, ok := c.digest.sum(c.Files)
			if !ok {
				t.Fatalf("the digest covers %d of %d files", c.digest.fed, len(c.Files))
			}
			if want := logtest.SHA256Files(t, c.Files); got != want {
				t.Errorf("digest while loading = %s, reading again = %s", got, want)
			}
			if h, err := c.Hash(); err != nil || h != got {
				t.Errorf("Hash = %s, %v; want %s", h, err, got)
			}
		})
	}
}

// TestHashWithoutLoad: a campaign from Parse (no file behind its source)
// hashes its files by reading them, as before.
func TestHashWithoutLoad(t *testing.T) {
	file := "../../testdata/mini/campaign.yaml"
	f, err := os.Open(file)
	if err != nil {
		t.Fatal(err)
	}
	defer f.Close()
	c, err := Parse(f, file, filepath.Dir(file), Options{})
	if err != nil {
		t.Fatal(err)
	}
	if _, ok := c.digest.sum(c.Files); ok {
		t.Fatal("Parse gathered a digest; its source need not be the file named")
	}
	if h, err := c.Hash(); err != nil || h != logtest.SHA256Files(t, c.Files) {
		t.Errorf("Hash = %s, %v; want %s", h, err, logtest.SHA256Files(t, c.Files))
	}
}

// TestHashStreamNoAdapter: with Options.Stream, a log that no adapter
// reads is read by Finish, and the hash still covers every file, byte for
// byte the hash of reading them again; the files are those of a whole
// load. Cases: the demo (a log and a readings table after it) and
// testdata/mini.
func TestHashStreamNoAdapter(t *testing.T) {
	for _, tc := range []struct{ name, file string }{
		{"demo", "../../examples/ducktail-fastback/campaign.yaml"},
		{"mini", "../../testdata/mini/campaign.yaml"},
	} {
		t.Run(tc.name, func(t *testing.T) {
			whole, err := Load(tc.file, Options{})
			if err != nil {
				t.Fatal(err)
			}
			c, err := Load(tc.file, Options{Stream: true})
			if err != nil {
				t.Fatal(err)
			}
			if err := c.Finish(nil); err != nil {
				t.Fatal(err)
			}
			if !slices.Equal(c.Files, whole.Files) {
				t.Errorf("files %v, loaded whole %v", c.Files, whole.Files)
			}
			if h, err := c.Hash(); err != nil || h != logtest.SHA256Files(t, whole.Files) {
				t.Errorf("Hash = %s, %v; want %s", h, err, logtest.SHA256Files(t, whole.Files))
			}
		})
	}
}
