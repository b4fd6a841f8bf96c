package live

import (
	"crypto/subtle"
	"net"
	"net/http"
	"strings"
)

// TokenHeader is the request header that carries the run's token.
const TokenHeader = "X-Tonewright-Token"

// guard refuses what the server must not answer: a Host or Origin other
// than the address served (another page in the browser, or a DNS name
// rebound to this machine, must not drive it), a changing request without
// the run's token or not in JSON, and bodies over MaxBody.
func (s *Server) guard(next http.Handler) http.Handler {
	return http.HandlerFunc(func(w http.ResponseWriter, r *http.Request) {
		h := w.Header()
		h.Set("X-Content-Type-Options", "nosniff")
		h.Set("Referrer-Policy", "no-referrer")
		h.Set("X-Frame-Options", "DENY")
		h.Set("Content-Security-Policy", "default-src 'self'; connect-src 'self'; media-src 'self' blob:; img-src 'self' data:; style-src 'self'; script-src 'self'; frame-ancestors 'none'; base-uri 'none'; form-action 'none'")
		h.Set("Cache-Control", "no-store")
		if !s.hostServed(r.Host) {
			writeError(w, http.StatusForbidden, "", s.servedHint())
			return
		}
		if o := r.Header.Get("Origin"); o != "" && !(strings.HasPrefix(o, "http://") && s.hostServed(o[len("http://"):])) {
			writeError(w, http.StatusForbidden, "", "requests from other pages are refused")
			return
		}
		if r.Header.Get("Sec-Fetch-Site") == "cross-site" {
			writeError(w, http.StatusForbidden, "", "requests from other sites are refused")
			return
		}
		if r.Method != http.MethodGet && r.Method != http.MethodHead {
			got := r.Header.Get(TokenHeader)
			if subtle.ConstantTimeCompare([]byte(got), []byte(s.token)) != 1 {
				writeError(w, http.StatusForbidden, "", "missing or wrong token: reload the page")
				return
			}
			if ct := r.Header.Get("Content-Type"); !strings.HasPrefix(ct, "application/json") {
				writeError(w, http.StatusUnsupportedMediaType, "", "send JSON (Content-Type: application/json)")
				return
			}
			if r.ContentLength > MaxBody {
				writeError(w, http.StatusRequestEntityTooLarge, "", "request body too large")
				return
			}
			r.Body = http.MaxBytesReader(w, r.Body, MaxBody)
		}
		next.ServeHTTP(w, r)
	})
}

// servedHint says which address to open instead.
func (s *Server) servedHint() string {
	for h := range s.hosts {
		return "this server answers only requests addressed to http://" + h + "/ (the address it printed): open that"
	}
	return "this server answers only requests addressed to one of this machine's IP addresses with port " + s.anyIP + ", not to a name"
}

// hostServed reports whether a Host header (host:port) is the address
// served. With an unspecified bind address (0.0.0.0, ::) any IP literal
// with the served port is, but never a name, so that a DNS name rebound to
// this machine is still refused.
func (s *Server) hostServed(hostport string) bool {
	if s.hosts[hostport] {
		return true
	}
	if s.anyIP == "" {
		return false
	}
	host, port, err := net.SplitHostPort(hostport)
	return err == nil && port == s.anyIP && net.ParseIP(host) != nil
}
