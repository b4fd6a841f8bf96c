package audio

import (
	"fmt"
	"os"
	"os/exec"
	"regexp"
	"strconv"

	"tonewright/networks"
)

// SoxAvailable reports whether the sox program is on PATH.
func SoxAvailable() bool {
	_, err := exec.LookPath("sox")
	return err == nil
}

// RequireSox is for tests that measure sound with sox: it skips the test
// when sox is not on PATH, saying how to install it, unless
// TONEWRIGHT_REQUIRE_SOX=1 (as .ci/run sets), when it fails the test
// instead.
func RequireSox(t networks.TB) {
	t.Helper()
	if SoxAvailable() {
		return
	}
	if os.Getenv("TONEWRIGHT_REQUIRE_SOX") == "1" {
		t.Fatal("sox is required (TONEWRIGHT_REQUIRE_SOX=1) but not on PATH")
	}
	t.Skip("sox not found: install it (Debian: apt-get install sox) to check levels with an outside meter")
}

// SoxStat runs `sox FILE -n stat` and returns its figures by name (for
// example "RMS     amplitude" as "RMS amplitude", "Maximum amplitude").
func SoxStat(path string) (map[string]float64, error) {
	out, err := exec.Command("sox", path, "-n", "stat").CombinedOutput()
	if err != nil {
		return nil, fmt.Errorf("sox %s -n stat: %v: %s", path, err, out)
	}
	m := map[string]float64{}
	re := regexp.MustCompile(`(?m)^([A-Za-z][A-Za-z() ]*?)\s*:\s*(\S+)`)
	space := regexp.MustCompile(`\s+`)
	for _, g := range re.FindAllStringSubmatch(string(out), -1) {
		if v, err := strconv.ParseFloat(g[2], 64); err == nil {
			m[space.ReplaceAllString(g[1], " ")] = v
		}
	}
	return m, nil
}
