package main

import (
	"bytes"
	"errors"
	"path/filepath"
	"strings"
	"testing"
)

// fullWriter fails every write, as standard output does on a full disk
// (/dev/full) or a closed pipe.
type fullWriter struct{}

func (fullWriter) Write(p []byte) (int, error) { return 0, errors.New("no space left on device") }

// Every command exits 1 with a message when its output cannot be written,
// whatever form the output takes.
func TestOutputWriteErrorExits1(t *testing.T) {
	dir := t.TempDir()
	targets := filepath.Join("demodata", "targets.yaml")
	for _, args := range [][]string{
		{"analyze", demoFile},
		{"analyze", demoFile, "--json"},
		{"analyze", demoFile, "--csv", "-"},
		{"synth", targets},
		{"sweep", demoFile, "--source", "1k,10k"},
		{"tolerance", demoFile, "--trials", "20"},
		{"sensitivity", demoFile},
		{"snap", "5k"},
		{"netlist", demoFile},
		{"plot", demoFile, "-o", filepath.Join(dir, "p.png")},
		{"parts", demoFile},
		{"parts", demoFile, "--csv"},
		{"parts", demoFile, "--json"},
		{"--help"},
		{"analyze", "--help"},
		{"completion", "bash"},
	} {
		var e bytes.Buffer
		code := run(args, fullWriter{}, &e)
		if code != exitInternal {
			t.Errorf("%v: exit %d, want %d; stderr %q", args, code, exitInternal, e.String())
			continue
		}
		if !strings.Contains(e.String(), "cannot write the output") {
			t.Errorf("%v: stderr %q does not say the output could not be written", args, e.String())
		}
	}
}
