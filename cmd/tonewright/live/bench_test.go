package live

import (
	"fmt"
	"net/http/httptest"
	"testing"
)

// BenchmarkEval is the server's share of a slider move: one /api/eval
// with a compared design (five curves, three sets of figures, the JSON).
func BenchmarkEval(b *testing.B) {
	path := copyDesign(b, demoDesign)
	const addr = "127.0.0.1:8650"
	s, err := New(Config{Design: loadModel(b, path), Compare: loadModel(b, exampleDesign), SavePath: path}, addr)
	if err != nil {
		b.Fatal(err)
	}
	h := s.Handler()
	b.ReportAllocs()
	i := 0
	for b.Loop() {
		body := fmt.Sprintf(`{"setting":{"blend":%g,"level":1},"values":{"lowpass.r":"120k"}}`, float64(i%101)/100)
		w := httptest.NewRecorder()
		h.ServeHTTP(w, request(s, addr, "POST", "/api/eval", body, nil))
		if w.Code != 200 {
			b.Fatal(w.Body)
		}
		i++
	}
}
