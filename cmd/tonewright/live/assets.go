package live

import (
	_ "embed"
	"net/http"
)

// The page: its HTML, script and style, embedded so that the server needs
// no files and fetches nothing from the network.
var (
	//go:embed page/index.html
	indexHTML []byte
	//go:embed page/app.js
	appJS []byte
	//go:embed page/style.css
	styleCSS []byte
)

// pageFiles are the files the page loads besides itself, by name under
// /page/, with their content types.
var pageFiles = map[string]struct {
	data  []byte
	ctype string
}{
	"app.js":    {appJS, "text/javascript; charset=utf-8"},
	"style.css": {styleCSS, "text/css; charset=utf-8"},
}

func (s *Server) handleAsset(w http.ResponseWriter, r *http.Request) {
	f, ok := pageFiles[r.PathValue("name")]
	if !ok {
		writeError(w, http.StatusNotFound, "", "no such file")
		return
	}
	w.Header().Set("Content-Type", f.ctype)
	w.Write(f.data)
}
