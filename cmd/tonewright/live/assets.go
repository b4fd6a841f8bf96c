package live

import (
	"embed"
	"io/fs"
	"net/http"
)

// The page: its HTML, script and style, embedded so that the server needs
// no files and fetches nothing from the network.
//
//go:embed page/app.js page/style.css
var pageFS embed.FS

//go:embed page/index.html
var indexHTML []byte

func assets() http.Handler {
	sub, err := fs.Sub(pageFS, "page")
	if err != nil {
		panic(err)
	}
	return http.FileServerFS(sub)
}
