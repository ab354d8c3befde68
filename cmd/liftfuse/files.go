package main

import (
	"errors"
	"fmt"
	"io/fs"
	"os"
	"path/filepath"

	"liftfuse/methods/campaign"
	"liftfuse/report"
)

// errNotRegular: an input is a FIFO, a device, a socket or a folder.
var errNotRegular = errors.New("not a regular file")

// regularFile returns an error unless name is a regular file (or missing,
// which the loader reports in its own words). liftfuse reads only regular
// files: a FIFO would block a run forever, a device would never end.
func regularFile(name string) error {
	st, err := os.Stat(name)
	if errors.Is(err, fs.ErrNotExist) {
		return nil
	}
	if err != nil {
		return err
	}
	if st.Mode().IsRegular() {
		return nil
	}
	kind := "a folder"
	switch m := st.Mode(); {
	case m&fs.ModeNamedPipe != 0:
		kind = "a FIFO"
	case m&fs.ModeDevice != 0:
		kind = "a device"
	case m&fs.ModeSocket != 0:
		kind = "a socket"
	}
	return fmt.Errorf("%s is %s, not a regular file: liftfuse reads only regular files: %w", name, kind, errNotRegular)
}

// loadCampaign checks that file is a regular file, then loads it.
func loadCampaign(file string, opt campaign.Options) (*campaign.Campaign, error) {
	if err := regularFile(file); err != nil {
		return nil, inputError{err}
	}
	return campaign.Load(file, opt)
}

// output is a file a command writes, with the flag that named it.
type output struct{ flag, name string }

// checkOutputs refuses, before a run, outputs that cannot be written (a
// missing folder, a folder, a FIFO or a device), that name the same file
// twice, or that name one of the inputs: the campaign file or, once the
// campaign is loaded (c not nil), any file it reads. Files are compared by
// identity (os.SameFile: hard and symbolic links too) and by cleaned
// absolute path of the file a write would replace.
func checkOutputs(file string, c *campaign.Campaign, outs ...output) error {
	inputs := []string{file}
	if c != nil {
		inputs = c.Files
	}
	for i, o := range outs {
		if err := report.CheckOutput(o.name); err != nil {
			return inputError{fmt.Errorf("%s: %w", o.flag, err)}
		}
		for _, in := range inputs {
			if sameFile(o.name, in) {
				what := "the campaign file"
				if in != file {
					what = "a file the campaign reads"
				}
				if in != o.name {
					what += " " + in
				}
				return badInput("%s %s is %s: refusing to overwrite an input", o.flag, o.name, what)
			}
		}
		for _, p := range outs[:i] {
			if sameFile(o.name, p.name) {
				return badInput("%s and %s name the same file %s", p.flag, o.flag, o.name)
			}
		}
	}
	return nil
}

// sameFile says whether writing out would replace the file in.
func sameFile(out, in string) bool {
	t, err := report.Target(out)
	if err != nil {
		return false
	}
	if a, b := absolute(t), absolute(in); a == b {
		return true
	}
	st, err1 := os.Stat(t)
	si, err2 := os.Stat(in)
	return err1 == nil && err2 == nil && os.SameFile(st, si)
}

// absolute is the cleaned absolute path of name, its symbolic links
// resolved where they exist.
func absolute(name string) string {
	if r, err := filepath.EvalSymlinks(name); err == nil {
		name = r
	}
	if a, err := filepath.Abs(name); err == nil {
		return a
	}
	return filepath.Clean(name)
}
