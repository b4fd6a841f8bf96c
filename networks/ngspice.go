package networks

import (
	"bufio"
	"bytes"
	"fmt"
	"os"
	"os/exec"
	"path/filepath"
	"strconv"
	"strings"
)

// SpicePoint is one frequency of an ngspice AC analysis: V(out) as a complex
// number.
type SpicePoint struct {
	Hz float64
	V  complex128
}

// NgspiceAvailable reports whether the ngspice program is on PATH.
func NgspiceAvailable() bool {
	_, err := exec.LookPath("ngspice")
	return err == nil
}

// RunNgspice runs a deck written by WriteSPICE through ngspice in batch mode
// and returns V(node) at every frequency of its .ac line. ngspice exits 1
// after a batch run whose only analysis is in a control block, so the
// result is judged by the data it wrote, not by its exit status.
func RunNgspice(deck, node string) ([]SpicePoint, error) {
	dir, err := os.MkdirTemp("", "tonewright-ngspice-")
	if err != nil {
		return nil, err
	}
	defer os.RemoveAll(dir)
	data := filepath.Join(dir, "out.txt")
	k := strings.LastIndex(deck, ".end")
	if k < 0 {
		return nil, fmt.Errorf("deck has no .end line")
	}
	control := fmt.Sprintf(".control\nset wr_singlescale\nset numdgt=12\nrun\nwrdata %s v(%s)\n.endc\n", data, node)
	cir := filepath.Join(dir, "deck.cir")
	if err := os.WriteFile(cir, []byte(deck[:k]+control+deck[k:]), 0o644); err != nil {
		return nil, err
	}
	cmd := exec.Command("ngspice", "-b", cir)
	cmd.Dir = dir
	var out bytes.Buffer
	cmd.Stdout, cmd.Stderr = &out, &out
	runErr := cmd.Run()
	f, err := os.Open(data)
	if err != nil {
		return nil, fmt.Errorf("ngspice wrote no data (%v): %s", runErr, lastLines(out.String(), 10))
	}
	defer f.Close()
	var pts []SpicePoint
	sc := bufio.NewScanner(f)
	for sc.Scan() {
		fs := strings.Fields(sc.Text())
		if len(fs) < 3 {
			continue
		}
		var v [3]float64
		for i := range v {
			if v[i], err = strconv.ParseFloat(fs[i], 64); err != nil {
				return nil, fmt.Errorf("ngspice data line %q: %v", sc.Text(), err)
			}
		}
		pts = append(pts, SpicePoint{Hz: v[0], V: complex(v[1], v[2])})
	}
	if len(pts) == 0 {
		return nil, fmt.Errorf("ngspice wrote no points: %s", lastLines(out.String(), 10))
	}
	return pts, sc.Err()
}

func lastLines(s string, n int) string {
	lines := strings.Split(strings.TrimSpace(s), "\n")
	if len(lines) > n {
		lines = lines[len(lines)-n:]
	}
	return strings.Join(lines, " | ")
}

// TB is the part of testing.TB that RequireNgspice uses.
type TB interface {
	Helper()
	Fatal(args ...any)
	Skip(args ...any)
}

// RequireNgspice is for tests that compare with the ngspice simulator: it
// skips the test when ngspice is not on PATH, saying how to install it,
// unless TONEWRIGHT_REQUIRE_NGSPICE=1 (as .ci/run sets), when it fails the
// test instead.
func RequireNgspice(t TB) {
	t.Helper()
	if NgspiceAvailable() {
		return
	}
	if os.Getenv("TONEWRIGHT_REQUIRE_NGSPICE") == "1" {
		t.Fatal("ngspice is required (TONEWRIGHT_REQUIRE_NGSPICE=1) but not on PATH")
	}
	t.Skip("ngspice not found: install it (Debian: apt-get install ngspice) to run the comparisons with the reference simulator")
}
