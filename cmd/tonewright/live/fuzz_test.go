package live

import (
	"encoding/json"
	"net/http"
	"net/http/httptest"
	"strings"
	"testing"
)

// FuzzRequest sends malformed requests to the handler, as the page (right
// host and token) or as another page: it must never panic nor fail with
// 500, every refusal must be an errorResponse, and a save must never touch
// any file but the design file.
func FuzzRequest(f *testing.F) {
	for _, s := range []struct {
		method, path, body string
		token              bool
	}{
		{"POST", "/api/eval", `{"setting":{"blend":0.5},"values":{"lowpass.r":"4k7"}}`, true},
		{"POST", "/api/eval", `{"setting":{"blend":1e308,"level":-0},"values":{"load.r":"open","load.c":"none"},"sweep":"level"}`, true},
		{"POST", "/api/eval", `{"values":{"filter1.c":"1e-30"}}`, true},
		{"POST", "/api/eval", `{"values":{"lowpass.r":"4k7"},"values":{}}`, true},
		{"POST", "/api/eval", `{"setting":null,"values":null}`, true},
		{"POST", "/api/eval", `[1,2,3]`, true},
		{"POST", "/api/step", `{"part":"pot","value":"50k","series":"E96","direction":-1}`, true},
		{"POST", "/api/step", `{"part":"load.r","value":"open","series":"E12","direction":1}`, true},
		{"POST", "/api/save", `{"setting":{"level":0.25},"values":{"highpass.c":"2n2"}}`, true},
		{"POST", "/api/play", `{}`, true},
		{"POST", "/api/save", `{"values":{"lowpass.r":"1k"}}`, false},
		{"GET", "/api/state", ``, false},
		{"GET", "/page/../../etc/passwd", ``, false},
		{"PUT", "/api/eval", `{}`, true},
	} {
		f.Add(s.method, s.path, []byte(s.body), s.token)
	}
	path := copyDesign(f, demoDesign)
	const addr = "127.0.0.1:8650"
	s, err := New(Config{Design: loadModel(f, path), SavePath: path}, addr)
	if err != nil {
		f.Fatal(err)
	}
	h := s.Handler()
	f.Fuzz(func(t *testing.T, method, target string, body []byte, token bool) {
		if !validMethod(method) || !strings.HasPrefix(target, "/") || strings.ContainsAny(target, " \r\n\t#") {
			return // not a request line net/http would hand to a handler
		}
		r, err := http.NewRequest(method, "http://"+addr+target, strings.NewReader(string(body)))
		if err != nil {
			return
		}
		r.Header.Set("Content-Type", "application/json")
		if token {
			r.Header.Set(TokenHeader, s.Token())
		}
		w := httptest.NewRecorder()
		h.ServeHTTP(w, r)
		if w.Code >= 500 && w.Code != http.StatusNotImplemented {
			t.Fatalf("%s %s %q: status %d: %s", method, target, body, w.Code, w.Body)
		}
		if w.Code == http.StatusBadRequest || w.Code == http.StatusForbidden {
			var e errorResponse
			if err := json.Unmarshal(w.Body.Bytes(), &e); err != nil || e.Error == "" {
				t.Fatalf("%s %s %q: refusal %q is not an errorResponse", method, target, body, w.Body)
			}
		}
	})
}

func validMethod(m string) bool {
	if m == "" {
		return false
	}
	for _, c := range m {
		if !(c >= 'A' && c <= 'Z') {
			return false
		}
	}
	return true
}
