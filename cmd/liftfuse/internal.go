package main

import (
	"crypto/sha256"
	"encoding/hex"
	"fmt"
	"io"
	"os"
	"runtime"
	"runtime/debug"
)

// internalError reports a recovered panic: a bug of ours, never the
// user's input, so it exits 1 (not 2), with what a bug report needs — the
// version, the input file's SHA-256 and the stack.
func internalError(stderr io.Writer, p any, input string) int {
	fmt.Fprintf(stderr, "liftfuse: internal error, please report: %v\n", p)
	fmt.Fprintf(stderr, "liftfuse: version %s, %s %s/%s\n", Version, runtime.Version(), runtime.GOOS, runtime.GOARCH)
	if sum, err := fileSHA256(input); err == nil {
		fmt.Fprintf(stderr, "liftfuse: input %s sha256 %s\n", input, sum)
	} else if input != "" {
		fmt.Fprintf(stderr, "liftfuse: input %s (no hash: %v)\n", input, err)
	}
	fmt.Fprintf(stderr, "liftfuse: stack:\n%s", debug.Stack())
	return exitFailure
}

// fileSHA256 returns the hex SHA-256 of a regular file (nothing else is
// opened: a FIFO would block).
func fileSHA256(name string) (string, error) {
	if err := regularFile(name); err != nil {
		return "", err
	}
	f, err := os.Open(name)
	if err != nil {
		return "", err
	}
	defer f.Close()
	h := sha256.New()
	if _, err := io.Copy(h, f); err != nil {
		return "", err
	}
	return hex.EncodeToString(h.Sum(nil)), nil
}
