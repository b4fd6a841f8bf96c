package live

import (
	"context"
	"crypto/rand"
	"encoding/hex"
	"errors"
	"fmt"
	"net"
	"net/http"
	"strings"
	"sync"
	"time"

	"tonewright/networks"
)

// Config is what a Server serves.
type Config struct {
	// Design is the design the page starts from and saves.
	Design Model
	// Compare, when not nil, is drawn over the curve at the same knobs.
	Compare Model
	// SavePath is the one file "save" writes; the server never writes a
	// path a request names.
	SavePath string
	// Renderer plays designs; nil in a build without audio rendering.
	Renderer Renderer
	// Token is the per-run secret changing requests carry; empty: a random
	// one.
	Token string
}

// Server is the live page's HTTP server. Its handler is safe for
// concurrent use.
type Server struct {
	cfg     Config
	token   string
	hosts   map[string]bool // the Host values served
	anyIP   string          // with an unspecified bind address: the port any IP literal may use
	page    []byte          // index.html with the token in it
	hz      []float64       // the curve grid
	mux     *http.ServeMux
	saveMu  sync.Mutex // one save at a time
	playSem chan struct{}

	mu    sync.RWMutex
	saved Model   // the design as last saved (or as started)
	knobs Setting // the knob positions last saved
}

// CurvePointsPerDecade is the density of the curves the page draws.
const CurvePointsPerDecade = 80

// MaxBody is the largest request body the server reads.
const MaxBody = 64 << 10

// New returns a server for cfg that answers requests addressed to addr,
// the listener's address (host:port).
func New(cfg Config, addr string) (*Server, error) {
	if cfg.Design == nil {
		return nil, errors.New("live: no design to serve")
	}
	if cfg.SavePath == "" {
		return nil, errors.New("live: no file to save to")
	}
	host, port, err := net.SplitHostPort(addr)
	if err != nil {
		return nil, fmt.Errorf("live: address %q: %w", addr, err)
	}
	s := &Server{cfg: cfg, token: cfg.Token, hosts: map[string]bool{}, saved: cfg.Design, playSem: make(chan struct{}, 1)}
	if s.token == "" {
		var b [24]byte
		if _, err := rand.Read(b[:]); err != nil {
			return nil, err
		}
		s.token = hex.EncodeToString(b[:])
	}
	ip := net.ParseIP(host)
	switch {
	case ip != nil && ip.IsUnspecified():
		s.anyIP = port
	default:
		s.hosts[net.JoinHostPort(host, port)] = true
	}
	s.knobs = Setting{}
	for _, k := range cfg.Design.Knobs() {
		s.knobs[k.Name] = k.Saved
	}
	b := cfg.Design.Band()
	s.hz = networks.LogGrid(b.From, b.To, CurvePointsPerDecade)
	s.page = []byte(strings.Replace(string(indexHTML), "{{TOKEN}}", s.token, 1))
	s.routes()
	return s, nil
}

// Token returns the run's token (the page carries it in a meta tag).
func (s *Server) Token() string { return s.token }

// Handler returns the server's request handler, guard included.
func (s *Server) Handler() http.Handler { return s.guard(s.mux) }

// Serve answers requests on ln until ctx is done, then shuts down: it
// stops accepting, lets requests in flight (a save, say) finish for up to
// five seconds, and returns.
func (s *Server) Serve(ctx context.Context, ln net.Listener) error {
	hs := &http.Server{
		Handler:           s.Handler(),
		ReadHeaderTimeout: 5 * time.Second,
		ReadTimeout:       10 * time.Second,
		WriteTimeout:      60 * time.Second,
		IdleTimeout:       60 * time.Second,
		MaxHeaderBytes:    16 << 10,
	}
	done := make(chan error, 1)
	go func() { done <- hs.Serve(ln) }()
	select {
	case err := <-done:
		return err
	case <-ctx.Done():
	}
	sctx, cancel := context.WithTimeout(context.Background(), 5*time.Second)
	defer cancel()
	err := hs.Shutdown(sctx)
	<-done
	return err
}
