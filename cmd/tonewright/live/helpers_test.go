package live

import (
	"context"
	"net"
	"os"
	"path/filepath"
	"testing"

	"tonewright/networks"
)

// The designs the tests serve: the invented demo board and the invented
// example board of the repository's testdata.
const (
	demoDesign    = "../../../testdata/fixed-board.yaml" // fixed values; the demo design follows the synthesis
	exampleDesign = "../../../testdata/example-board.yaml"
)

// loadModel reads a design file into a Model.
func loadModel(t testing.TB, path string) Model {
	t.Helper()
	d, err := networks.LoadDesign(path)
	if err != nil {
		t.Fatal(err)
	}
	m, err := NewDesignModel(d, "test")
	if err != nil {
		t.Fatal(err)
	}
	return m
}

// copyDesign copies a design file into a fresh directory and returns the
// copy's path.
func copyDesign(t testing.TB, path string) string {
	t.Helper()
	data, err := os.ReadFile(path)
	if err != nil {
		t.Fatal(err)
	}
	dst := filepath.Join(t.TempDir(), filepath.Base(path))
	if err := os.WriteFile(dst, data, 0o644); err != nil {
		t.Fatal(err)
	}
	return dst
}

// serve starts a server for a copy of the demo design (and cfg's other
// settings) on a free loopback port; it stops when the test ends. It
// returns the server, its base URL and the design file it saves.
func serve(t testing.TB, cfg Config) (*Server, string, string) {
	t.Helper()
	path := copyDesign(t, demoDesign)
	if cfg.Design == nil {
		cfg.Design = loadModel(t, path)
	}
	cfg.SavePath = path
	ln, err := net.Listen("tcp", "127.0.0.1:0")
	if err != nil {
		t.Fatal(err)
	}
	s, err := New(cfg, ln.Addr().String())
	if err != nil {
		t.Fatal(err)
	}
	ctx, cancel := context.WithCancel(context.Background())
	done := make(chan error, 1)
	go func() { done <- s.Serve(ctx, ln) }()
	t.Cleanup(func() {
		cancel()
		if err := <-done; err != nil {
			t.Errorf("serve: %v", err)
		}
	})
	return s, "http://" + ln.Addr().String(), path
}
