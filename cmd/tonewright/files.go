package main

import (
	"fmt"
	"os"
	"path/filepath"
	"strings"

	"tonewright/networks"
)

// loadDesign reads a design file; every failure is bad input. A design
// without a name is named after its file.
func loadDesign(path string) (*networks.Design, error) {
	d, err := networks.LoadDesign(path)
	if err != nil {
		return nil, badInput(err)
	}
	if d.Name == "" {
		d.Name = strings.TrimSuffix(filepath.Base(path), filepath.Ext(path))
	}
	return d, nil
}

// writeFile writes data to path through a temporary file in the same
// directory, renamed into place, so that a failure leaves nothing partly
// written. It refuses a path that is a directory or that names one of the
// command's inputs.
func writeFile(path string, data []byte, inputs ...string) error {
	if err := checkOutput(path, inputs...); err != nil {
		return err
	}
	dir := filepath.Dir(path)
	tmp, err := os.CreateTemp(dir, "."+filepath.Base(path)+".tmp-*")
	if err != nil {
		return badInput(fmt.Errorf("cannot write %s: %w", path, err))
	}
	name := tmp.Name()
	if _, err := tmp.Write(data); err != nil {
		tmp.Close()
		os.Remove(name)
		return fmt.Errorf("writing %s: %w", path, err)
	}
	if err := tmp.Close(); err != nil {
		os.Remove(name)
		return fmt.Errorf("writing %s: %w", path, err)
	}
	if err := os.Chmod(name, 0o644); err != nil {
		os.Remove(name)
		return err
	}
	if err := os.Rename(name, path); err != nil {
		os.Remove(name)
		return fmt.Errorf("writing %s: %w", path, err)
	}
	return nil
}

// checkOutput refuses an output path that is a directory or the same file
// as one of the inputs.
func checkOutput(path string, inputs ...string) error {
	if path == "" {
		return usageErrorf("empty output file name")
	}
	st, err := os.Stat(path)
	if err == nil && st.IsDir() {
		return usageErrorf("output %s is a directory: give a file name", path)
	}
	for _, in := range inputs {
		if in == "" {
			continue
		}
		ist, ierr := os.Stat(in)
		if err == nil && ierr == nil && os.SameFile(st, ist) {
			return usageErrorf("output %s is the input file %s: refusing to write over it", path, in)
		}
		if a, b := filepath.Clean(path), filepath.Clean(in); a == b {
			return usageErrorf("output %s is the input file %s: refusing to write over it", path, in)
		}
	}
	return nil
}
