package main

import (
	"bufio"
	"io"
	"net/http"
	"os"
	"os/exec"
	"path/filepath"
	"regexp"
	"strings"
	"syscall"
	"testing"
	"time"
)

func TestLiveBadInput(t *testing.T) {
	design := filepath.Join(top, "demo-design.yaml")
	for _, args := range [][]string{
		{"live"},
		{"live", filepath.Join(t.TempDir(), "none.yaml")},
		{"live", design, "--addr", "localhost"},
		{"live", design, "--port", "70000"},
		{"live", design, "--compare", filepath.Join(t.TempDir(), "none.yaml")},
		{"live", design, "--save-as", t.TempDir()},
		{"live", design, "--save-as", filepath.Join(t.TempDir(), "no", "such", "dir.yaml")},
	} {
		if code, _, e := tw(t, args...); code != exitBadInput || e == "" {
			t.Errorf("%v: exit %d, stderr %q; want exit 2 with a message", args, code, e)
		}
	}
}

// TestLiveHelperProcess is not a test: TestLiveStopsOnInterrupt runs the
// test binary with it to start "tonewright live" in a process of its own.
func TestLiveHelperProcess(t *testing.T) {
	if os.Getenv("TONEWRIGHT_LIVE_HELPER") != "1" {
		t.Skip("helper process for TestLiveStopsOnInterrupt")
	}
	os.Exit(run([]string{"live", os.Getenv("TONEWRIGHT_LIVE_DESIGN")}, os.Stdout, os.Stderr))
}

// Ctrl-C (SIGINT) stops the server cleanly: exit 0, "stopped", and the
// design file untouched.
func TestLiveStopsOnInterrupt(t *testing.T) {
	data, err := os.ReadFile(filepath.Join(top, "demo-design.yaml"))
	if err != nil {
		t.Fatal(err)
	}
	design := filepath.Join(t.TempDir(), "board.yaml")
	os.WriteFile(design, data, 0o644)
	cmd := exec.Command(os.Args[0], "-test.run=^TestLiveHelperProcess$")
	cmd.Env = append(os.Environ(), "TONEWRIGHT_LIVE_HELPER=1", "TONEWRIGHT_LIVE_DESIGN="+design)
	out, err := cmd.StdoutPipe()
	if err != nil {
		t.Fatal(err)
	}
	if err := cmd.Start(); err != nil {
		t.Fatal(err)
	}
	defer cmd.Process.Kill()
	lines := bufio.NewReader(out)
	first, err := lines.ReadString('\n')
	if err != nil {
		t.Fatalf("no address printed: %v", err)
	}
	url := regexp.MustCompile(`http://127\.0\.0\.1:\d+/`).FindString(first)
	if url == "" {
		t.Fatalf("first line %q has no loopback address", first)
	}
	resp, err := http.Get(url + "api/state")
	if err != nil {
		t.Fatal(err)
	}
	resp.Body.Close()
	if resp.StatusCode != 200 {
		t.Errorf("state: %d", resp.StatusCode)
	}
	cmd.Process.Signal(syscall.SIGINT)
	rest, _ := io.ReadAll(lines)
	done := make(chan error, 1)
	go func() { done <- cmd.Wait() }()
	select {
	case err := <-done:
		if err != nil {
			t.Errorf("after Ctrl-C: %v", err)
		}
	case <-time.After(10 * time.Second):
		t.Fatal("still running 10 s after Ctrl-C")
	}
	if !strings.Contains(string(rest), "stopped") {
		t.Errorf("output after Ctrl-C %q does not say it stopped", rest)
	}
	if now, _ := os.ReadFile(design); string(now) != string(data) {
		t.Error("the design file changed")
	}
}
