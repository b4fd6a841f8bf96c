package main

import (
	"errors"
	"fmt"
	"io"
	"os"
	"path/filepath"
	"strings"

	"tonewright/networks"
)

// warnings is where commands print warnings: run sets it to its standard
// error.
var warnings io.Writer = os.Stderr

// loadDesign reads a design file; every failure is bad input. A design
// without a name is named after its file. What is allowed but most likely
// a slip (networks.Design.Warnings) is printed as a warning.
func loadDesign(path string) (*networks.Design, error) {
	d, err := networks.LoadDesign(path)
	if err != nil {
		return nil, badInput(err)
	}
	for _, w := range d.Warnings() {
		fmt.Fprintf(warnings, "warning: %s: %s\n", path, w)
	}
	if d.Name == "" {
		d.Name = strings.TrimSuffix(filepath.Base(path), filepath.Ext(path))
	}
	return d, nil
}

// writeFile writes data to path through a temporary file in the same
// directory, renamed into place, so that a failure leaves nothing partly
// written. It refuses a path that is a directory or that names one of the
// command's inputs. A symbolic link is followed (the file it points to is
// replaced, the link kept), and a path that is not a regular file, such as
// /dev/stdout, is written directly.
func writeFile(path string, data []byte, inputs ...string) error {
	if err := checkOutput(path, inputs...); err != nil {
		return err
	}
	if st, err := os.Stat(path); err == nil && !st.Mode().IsRegular() {
		f, err := os.OpenFile(path, os.O_WRONLY|os.O_TRUNC, 0)
		if err == nil {
			_, err = f.Write(data)
			if cerr := f.Close(); err == nil {
				err = cerr
			}
		}
		if err != nil {
			return fmt.Errorf("writing %s: %w", path, err)
		}
		return nil
	}
	return replaceFile(path, func(f *os.File) error {
		if _, err := f.Write(data); err != nil {
			return fmt.Errorf("writing %s: %w", path, err)
		}
		return nil
	})
}

// writeStream writes a file too large to hold in memory: fill writes it
// to a temporary file in path's directory, which is renamed into place only
// when fill succeeds, so a failure leaves nothing partly written. The output
// must be a regular file (or not exist yet): fill may seek.
func writeStream(path string, fill func(f *os.File) error, inputs ...string) error {
	if err := checkOutput(path, inputs...); err != nil {
		return err
	}
	if st, err := os.Stat(path); err == nil && !st.Mode().IsRegular() {
		return usageErrorf("output %s is not a regular file: give a file name", path)
	}
	return replaceFile(path, fill)
}

// replaceFile has fill write a temporary file in path's directory (path
// resolved through a symbolic link) and renames it into place only when fill
// succeeds; a failure removes it and leaves the old file whole.
func replaceFile(path string, fill func(f *os.File) error) error {
	if real, err := filepath.EvalSymlinks(path); err == nil {
		path = real
	}
	tmp, err := os.CreateTemp(filepath.Dir(path), "."+filepath.Base(path)+".tmp-*")
	if err != nil {
		return badInput(fmt.Errorf("cannot write %s: %w", path, errors.Unwrap(err)))
	}
	name := tmp.Name()
	fail := func(err error) error {
		tmp.Close()
		os.Remove(name)
		return err
	}
	if err := fill(tmp); err != nil {
		return fail(err)
	}
	if err := tmp.Chmod(0o644); err != nil {
		return fail(fmt.Errorf("writing %s: %w", path, err))
	}
	if err := tmp.Close(); err != nil {
		os.Remove(name)
		return fmt.Errorf("writing %s: %w", path, err)
	}
	if err := os.Rename(name, path); err != nil {
		os.Remove(name)
		return fmt.Errorf("writing %s: %w", path, err)
	}
	return nil
}

// checkOutput refuses, before any work is done, an output path that is a
// directory, lies in a directory that does not exist, or is the same file
// as one of the inputs, or the same file as another output of the command
// (give the other outputs as inputs).
func checkOutput(path string, inputs ...string) error {
	if path == "" {
		return usageErrorf("empty output file name")
	}
	st, err := os.Stat(path)
	if err == nil && st.IsDir() {
		return usageErrorf("output %s is a directory: give a file name", path)
	}
	if dst, derr := os.Stat(filepath.Dir(path)); derr != nil || !dst.IsDir() {
		return usageErrorf("output %s: the directory %s does not exist", path, filepath.Dir(path))
	}
	for _, in := range inputs {
		if in == "" {
			continue
		}
		ist, ierr := os.Stat(in)
		if (err == nil && ierr == nil && os.SameFile(st, ist)) || filepath.Clean(path) == filepath.Clean(in) {
			return usageErrorf("output %s is the same file as %s (an input file or another output): refusing to write over it", path, in)
		}
	}
	return nil
}
