package live

import (
	"bytes"
	"context"
	"encoding/json"
	"errors"
	"fmt"
	"io"
	"net/http"
	"net/http/httptest"
	"os"
	"path/filepath"
	"runtime"
	"strings"
	"sync"
	"testing"
	"time"

	"tonewright/networks"
)

// request builds a request to s as the page sends it; tweak changes it.
func request(s *Server, addr, method, path, body string, tweak func(*http.Request)) *http.Request {
	r := httptest.NewRequest(method, "http://"+addr+path, strings.NewReader(body))
	if method == http.MethodPost {
		r.Header.Set("Content-Type", "application/json")
		r.Header.Set(TokenHeader, s.Token())
	}
	if tweak != nil {
		tweak(r)
	}
	return r
}

func newTestServer(t testing.TB) (*Server, string, string) {
	t.Helper()
	path := copyDesign(t, demoDesign)
	const addr = "127.0.0.1:8650"
	s, err := New(Config{Design: loadModel(t, path), SavePath: path}, addr)
	if err != nil {
		t.Fatal(err)
	}
	return s, addr, path
}

func TestGuardRefuses(t *testing.T) {
	s, addr, path := newTestServer(t)
	before, _ := os.ReadFile(path)
	eval := `{"setting":{"blend":0.5},"values":{"lowpass.r":"4k7"}}`
	for _, c := range []struct {
		name   string
		method string
		path   string
		body   string
		tweak  func(*http.Request)
		code   int
	}{
		{"the page", "GET", "/", "", nil, 200},
		{"the script", "GET", "/page/app.js", "", nil, 200},
		{"state", "GET", "/api/state", "", nil, 200},
		{"eval", "POST", "/api/eval", eval, nil, 200},
		{"another host", "GET", "/api/state", "", func(r *http.Request) { r.Host = "rebound.example:8650" }, 403},
		{"localhost by name", "GET", "/", "", func(r *http.Request) { r.Host = "localhost:8650" }, 403},
		{"another port", "GET", "/", "", func(r *http.Request) { r.Host = "127.0.0.1:9999" }, 403},
		{"another origin", "POST", "/api/eval", eval, func(r *http.Request) { r.Header.Set("Origin", "http://elsewhere.example") }, 403},
		{"cross-site fetch", "POST", "/api/eval", eval, func(r *http.Request) { r.Header.Set("Sec-Fetch-Site", "cross-site") }, 403},
		{"no token", "POST", "/api/save", eval, func(r *http.Request) { r.Header.Del(TokenHeader) }, 403},
		{"wrong token", "POST", "/api/save", eval, func(r *http.Request) { r.Header.Set(TokenHeader, "0") }, 403},
		{"a form post", "POST", "/api/save", eval, func(r *http.Request) { r.Header.Set("Content-Type", "application/x-www-form-urlencoded") }, 415},
		{"body too large", "POST", "/api/eval", `{"values":{"x":"` + strings.Repeat("1", MaxBody) + `"}}`, nil, 413},
		{"unknown key", "POST", "/api/save", `{"setting":{},"path":"/etc/passwd"}`, nil, 400},
		{"two values", "POST", "/api/eval", eval + eval, nil, 400},
		{"a key twice", "POST", "/api/save", `{"values":{"lowpass.r":"1k","lowpass.r":"2k"}}`, nil, 400},
		{"a top key twice", "POST", "/api/eval", `{"setting":{},"setting":{}}`, nil, 400},
		{"not JSON", "POST", "/api/eval", `{`, nil, 400},
		{"bad value", "POST", "/api/save", `{"values":{"lowpass.r":"4k7k"}}`, nil, 400},
		{"wrong unit", "POST", "/api/eval", `{"values":{"lowpass.r":"4n7F"}}`, nil, 400},
		{"unknown part", "POST", "/api/save", `{"values":{"../x":"1k"}}`, nil, 400},
		{"knob out of range", "POST", "/api/eval", `{"setting":{"blend":1.5}}`, nil, 400},
		{"unknown knob", "POST", "/api/eval", `{"setting":{"bass":0.5}}`, nil, 400},
		{"GET a changing route", "GET", "/api/save", "", nil, 405},
		{"unknown route", "GET", "/api/nothing", "", nil, 404},
		{"play without audio", "POST", "/api/play", eval, nil, 501},
	} {
		w := httptest.NewRecorder()
		s.Handler().ServeHTTP(w, request(s, addr, c.method, c.path, c.body, c.tweak))
		if w.Code != c.code {
			t.Errorf("%s: status %d, want %d: %s", c.name, w.Code, c.code, w.Body.String())
			continue
		}
		if c.code >= 400 && c.code != 404 && c.code != 405 {
			var e errorResponse
			if err := json.Unmarshal(w.Body.Bytes(), &e); err != nil || e.Error == "" {
				t.Errorf("%s: the refusal %q is not an errorResponse", c.name, w.Body.String())
			}
		}
	}
	after, _ := os.ReadFile(path)
	if !bytes.Equal(before, after) {
		t.Error("a refused request changed the design file")
	}
	if m, _ := filepath.Glob(filepath.Join(filepath.Dir(path), "*")); len(m) != 1 {
		t.Errorf("files beside the design after refused requests: %v", m)
	}
}

func TestBadValueNamesThePart(t *testing.T) {
	s, addr, _ := newTestServer(t)
	w := httptest.NewRecorder()
	s.Handler().ServeHTTP(w, request(s, addr, "POST", "/api/eval", `{"values":{"filter2.c":"22"}}`, nil))
	var e errorResponse
	json.Unmarshal(w.Body.Bytes(), &e)
	if w.Code != 400 || e.Field != "filter2.c" || !strings.Contains(e.Error, "F") {
		t.Errorf("a 22 F filter capacitor: %d %+v", w.Code, e)
	}
}

// With --addr 0.0.0.0 any IP literal with the port is served, never a
// name.
func TestUnspecifiedAddress(t *testing.T) {
	path := copyDesign(t, demoDesign)
	s, err := New(Config{Design: loadModel(t, path), SavePath: path}, "0.0.0.0:8650")
	if err != nil {
		t.Fatal(err)
	}
	for host, want := range map[string]bool{"192.168.1.20:8650": true, "[::1]:8650": true, "box.example:8650": false, "192.168.1.20:80": false} {
		if got := s.hostServed(host); got != want {
			t.Errorf("hostServed(%q) = %v, want %v", host, got, want)
		}
	}
}

func TestSaveKeepsBackup(t *testing.T) {
	s, addr, path := newTestServer(t)
	old, _ := os.ReadFile(path)
	w := httptest.NewRecorder()
	s.Handler().ServeHTTP(w, request(s, addr, "POST", "/api/save", `{"setting":{"blend":0.3,"level":0.8},"values":{"lowpass.r":"10k","filter1.c":"1n5"}}`, nil))
	if w.Code != 200 {
		t.Fatalf("save: %d %s", w.Code, w.Body)
	}
	bak, err := os.ReadFile(path + BackupSuffix)
	if err != nil || !bytes.Equal(bak, old) {
		t.Errorf("the backup does not hold the previous version: %v", err)
	}
	d, err := networks.LoadDesign(path)
	if err != nil {
		t.Fatal(err)
	}
	if d.Tone.Lowpass.R != 10e3 || d.Filters[0].C != 1.5e-9 || d.Level.Position != 0.8 {
		t.Errorf("saved design: lowpass.r %v, filter1.c %v, level %v", d.Tone.Lowpass.R, d.Filters[0].C, d.Level.Position)
	}
	// The saved design is the new reference: its curve is the dashed one.
	w = httptest.NewRecorder()
	s.Handler().ServeHTTP(w, request(s, addr, "POST", "/api/eval", `{"setting":{"blend":0.3,"level":0.8},"values":{}}`, nil))
	var resp struct {
		Figures      Figures `json:"figures"`
		SavedFigures Figures `json:"saved_figures"`
	}
	json.Unmarshal(w.Body.Bytes(), &resp)
	an, _ := networks.Analyze(d, []float64{0.3})
	if *resp.SavedFigures.Gain1kDB != an.Positions[0].Gain1kDB || *resp.Figures.Gain1kDB != an.Positions[0].Gain1kDB {
		t.Errorf("after saving, figures %v and saved figures %v, analyze of the file %v", *resp.Figures.Gain1kDB, *resp.SavedFigures.Gain1kDB, an.Positions[0].Gain1kDB)
	}
}

// A save stopped after the new version is written but before it replaces
// the old leaves the old file whole and no temporary file behind.
func TestInterruptedSaveKeepsOldFile(t *testing.T) {
	s, addr, path := newTestServer(t)
	old, _ := os.ReadFile(path)
	beforeRename = func(tmp string) error {
		if _, err := os.Stat(tmp); err != nil {
			t.Errorf("no temporary file at the interruption: %v", err)
		}
		return errors.New("interrupted")
	}
	defer func() { beforeRename = nil }()
	w := httptest.NewRecorder()
	s.Handler().ServeHTTP(w, request(s, addr, "POST", "/api/save", `{"values":{"lowpass.r":"10k"}}`, nil))
	if w.Code != 500 {
		t.Errorf("interrupted save answered %d", w.Code)
	}
	now, _ := os.ReadFile(path)
	if !bytes.Equal(now, old) {
		t.Error("the design file changed in an interrupted save")
	}
	m, _ := filepath.Glob(filepath.Join(filepath.Dir(path), ".*tmp*"))
	if len(m) > 0 {
		t.Errorf("temporary files left: %v", m)
	}
}

// Ten thousand requests from concurrent clients on the loopback address,
// good and bad mixed: every one is answered as it should be, and neither
// the heap nor the goroutines grow.
func TestManyClients(t *testing.T) {
	if testing.Short() {
		t.Skip("10 000 requests: not in -short")
	}
	s, base, _ := serve(t, Config{})
	const clients, total = 8, 10000
	tr := &http.Transport{MaxIdleConnsPerHost: clients}
	defer tr.CloseIdleConnections()
	client := &http.Client{Transport: tr, Timeout: 30 * time.Second}
	do := func(i int) error {
		var req *http.Request
		want := 200
		switch i % 5 {
		case 0, 1:
			body := fmt.Sprintf(`{"setting":{"blend":%g,"level":%g},"values":{"lowpass.r":"%dk"}}`, float64(i%101)/100, float64(i%7)/6, 10+i%90)
			req, _ = http.NewRequest("POST", base+"/api/eval", strings.NewReader(body))
		case 2:
			req, _ = http.NewRequest("POST", base+"/api/eval", strings.NewReader(`{"values":{"lowpass.c":"12x"}}`))
			want = 400
		case 3:
			req, _ = http.NewRequest("POST", base+"/api/step", strings.NewReader(`{"part":"highpass.c","value":"3n3","series":"E24","direction":1}`))
		case 4:
			req, _ = http.NewRequest("GET", base+"/api/state", nil)
		}
		if req.Method == "POST" {
			req.Header.Set("Content-Type", "application/json")
			req.Header.Set(TokenHeader, s.Token())
		}
		resp, err := client.Do(req)
		if err != nil {
			return err
		}
		defer resp.Body.Close()
		if _, err := io.Copy(io.Discard, resp.Body); err != nil {
			return err
		}
		if resp.StatusCode != want {
			return fmt.Errorf("request %d: status %d, want %d", i, resp.StatusCode, want)
		}
		return nil
	}
	run := func(from, to int) error {
		var wg sync.WaitGroup
		errs := make(chan error, clients)
		for c := range clients {
			wg.Add(1)
			go func() {
				defer wg.Done()
				for i := from + c; i < to; i += clients {
					if err := do(i); err != nil {
						errs <- err
						return
					}
				}
			}()
		}
		wg.Wait()
		close(errs)
		return <-errs
	}
	heap := func() uint64 {
		runtime.GC()
		runtime.GC()
		var ms runtime.MemStats
		runtime.ReadMemStats(&ms)
		return ms.HeapAlloc
	}
	const warm = 1000
	if err := run(0, warm); err != nil {
		t.Fatal(err)
	}
	h0, g0 := heap(), runtime.NumGoroutine()
	if err := run(warm, total); err != nil {
		t.Fatal(err)
	}
	tr.CloseIdleConnections()
	time.Sleep(100 * time.Millisecond)
	h1, g1 := heap(), runtime.NumGoroutine()
	t.Logf("heap %d → %d bytes, goroutines %d → %d over %d requests", h0, h1, g0, g1, total-warm)
	if h1 > h0+4<<20 {
		t.Errorf("the heap grew by %d bytes over %d requests", h1-h0, total-warm)
	}
	if g1 > g0+2 {
		t.Errorf("goroutines grew from %d to %d", g0, g1)
	}
}

// fakeRenderer records what it is asked to play; its "sound" is not one.
type fakeRenderer struct {
	cur, ref Model
	setting  Setting
}

func (f *fakeRenderer) Render(ctx context.Context, cur Model, s Setting, ref Model) ([]byte, error) {
	f.cur, f.setting, f.ref = cur, s, ref
	return []byte("RIFF-not-a-sound"), nil
}

// /api/play hands the renderer the design with the request's values at
// the request's setting, and the saved design as the loudness reference.
func TestPlayHandsTheSettingToTheRenderer(t *testing.T) {
	path := copyDesign(t, demoDesign)
	const addr = "127.0.0.1:8650"
	fr := &fakeRenderer{}
	saved := loadModel(t, path)
	s, err := New(Config{Design: saved, SavePath: path, Renderer: fr}, addr)
	if err != nil {
		t.Fatal(err)
	}
	w := httptest.NewRecorder()
	s.Handler().ServeHTTP(w, request(s, addr, "POST", "/api/play", `{"setting":{"blend":0.2},"values":{"lowpass.r":"4k7"}}`, nil))
	if w.Code != 200 || w.Header().Get("Content-Type") != "audio/wav" || w.Body.String() != "RIFF-not-a-sound" {
		t.Fatalf("play: %d %s %q", w.Code, w.Header().Get("Content-Type"), w.Body)
	}
	if fr.setting[KnobBlend] != 0.2 || fr.ref != saved || DesignOf(fr.cur).Tone.Lowpass.R != 4700 {
		t.Errorf("renderer got setting %v, ref %v, lowpass.r %v", fr.setting, fr.ref == saved, DesignOf(fr.cur).Tone.Lowpass.R)
	}
}

func TestNoDuplicateKeys(t *testing.T) {
	for in, ok := range map[string]bool{
		`{"a":1,"b":2}`:                           true,
		`{"a":[{"x":1},{"x":2}],"b":{"x":{}}}`:    true,
		`{"a":["a","a"],"b":"a"}`:                 true,
		`{"a":{"b":1},"a":2}`:                     false,
		`{"a":[1,{"c":1,"c":2}]}`:                 false,
		`{"s":{"blend":0.5,"level":1,"blend":0}}`: false,
		`[{"k":1},{"k":1}]`:                       true,
	} {
		if err := noDuplicateKeys([]byte(in)); (err == nil) != ok {
			t.Errorf("noDuplicateKeys(%s) = %v", in, err)
		}
	}
}
