package campaign

import (
	"io"
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

// TestHashLater: with Options.HashLater an adapter reads a log as it is
// (Campaign.Read hands back the file itself), the digest then stops short
// of the log, and Hash, asked all the same, reads the files again: byte
// for byte the hash of a whole load's files.
func TestHashLater(t *testing.T) {
	file := "../../examples/ducktail-fastback/campaign.yaml"
	whole, err := Load(file, Options{})
	if err != nil {
		t.Fatal(err)
	}
	c, err := Load(file, Options{Stream: true, HashLater: true})
	if err != nil {
		t.Fatal(err)
	}
	log := c.Path(c.Evidence.RideHeight[0].Logs[0].File)
	f, err := os.Open(log)
	if err != nil {
		t.Fatal(err)
	}
	defer f.Close()
	src, done := c.Read(log, f)
	if src != io.Reader(f) {
		t.Errorf("Campaign.Read wraps %s: it would feed the hash", log)
	}
	if _, err := io.Copy(io.Discard, src); err != nil {
		t.Fatal(err)
	}
	done()
	if err := c.Finish(nil); err != nil {
		t.Fatal(err)
	}
	if _, ok := c.digest.sum(c.Files); ok {
		t.Errorf("the digest covers all %d files without the adapter's read", len(c.Files))
	}
	if h, err := c.Hash(); err != nil || h != logtest.SHA256Files(t, whole.Files) {
		t.Errorf("Hash = %s, %v; want %s", h, err, logtest.SHA256Files(t, whole.Files))
	}
}
