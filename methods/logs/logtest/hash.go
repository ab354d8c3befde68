package logtest

import (
	"crypto/sha256"
	"encoding/hex"
	"fmt"
	"os"
	"testing"
)

// SHA256Files is the campaign's input hash (result-format.md, "sha256")
// computed directly with the standard library's SHA-256 (FIPS 180-4):
// each file's size in decimal and a newline, then its bytes, in the order
// of files — the reference the loaders' hash, fed from their reads, is
// tested against.
func SHA256Files(tb testing.TB, files []string) string {
	tb.Helper()
	h := sha256.New()
	for _, name := range files {
		data, err := os.ReadFile(name)
		if err != nil {
			tb.Fatal(err)
		}
		fmt.Fprintf(h, "%d\n", len(data))
		h.Write(data)
	}
	return hex.EncodeToString(h.Sum(nil))
}
