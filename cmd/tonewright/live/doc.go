// Package live serves the live voicing page of "tonewright live": a local
// web server, bound to the loopback address by default, with one embedded
// page (plain JavaScript on a canvas, no network fetches) where knobs are
// sliders and parts are fields in the trade's notation, and every change
// redraws the curve and the figures at once.
//
// Everything the server knows about a design goes through the Model
// interface; NewDesignModel implements it over a networks.Design with its
// blend and level knobs. The server computes every curve point and figure
// with the networks package (the same Meter the analyze command uses); the
// page only draws what it receives. Playing goes through a Renderer, which
// a build may leave out: the page then says that playing is not available.
//
// Safety: the server answers only requests whose Host (and Origin, when
// given) is the address it serves, changing requests must carry the token
// of the run, request bodies are size-limited and parsed strictly, and the
// only file it writes is the one it was started with (or a save-as path
// given on the command line), through a temporary file and a rename, the
// previous version kept beside it as NAME.bak.
package live
