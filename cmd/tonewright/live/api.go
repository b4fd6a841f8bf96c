package live

import (
	"bytes"
	"context"
	"encoding/json"
	"errors"
	"fmt"
	"io"
	"math"
	"net/http"
	"path/filepath"
	"strconv"
	"time"

	"tonewright/networks"
)

// The limits of a request: more parts or knobs than any design has are
// refused before any work.
const (
	maxValues = 200
	maxKnobs  = 32
)

// changeRequest is the body of /api/eval, /api/save and /api/play: the
// knob setting and the parts' values as the trade writes them. Parts not
// named keep the saved design's values.
type changeRequest struct {
	Setting Setting           `json:"setting"`
	Values  map[string]string `json:"values"`
	// Sweep names the knob whose ends (0 and 1) are drawn faint behind the
	// curve; empty: the first knob.
	Sweep string `json:"sweep"`
}

// stepRequest is the body of /api/step.
type stepRequest struct {
	Part      string `json:"part"`
	Value     string `json:"value"`
	Series    string `json:"series"`
	Direction int    `json:"direction"` // 1 up, -1 down
}

// partJSON is a part as /api/state sends it, with its value in the trade's
// notation.
type partJSON struct {
	Part
	Value *float64 `json:"value"` // null: an open load
	Text  string   `json:"text"`
}

// stateResponse is /api/state: what the page builds its controls from.
type stateResponse struct {
	Name          string        `json:"name"`
	File          string        `json:"file"` // base name of the file saves write
	Band          networks.Band `json:"band"`
	Knobs         []Knob        `json:"knobs"`
	Parts         []partJSON    `json:"parts"`
	Series        []string      `json:"series"`
	DefaultSeries string        `json:"default_series"`
	Compare       string        `json:"compare,omitempty"` // name of the --compare design
	Audio         bool          `json:"audio"`
}

// curves are the gains in dB on the response's hz grid; null where a gain
// is not finite.
type curves struct {
	Current dbList `json:"current"`
	Low     dbList `json:"low"`  // sweep knob at 0
	High    dbList `json:"high"` // sweep knob at 1
	Saved   dbList `json:"saved"`
	Compare dbList `json:"compare,omitempty"`
}

// evalResponse is /api/eval: the curves and figures at a setting.
type evalResponse struct {
	Hz             dbList            `json:"hz"`
	Sweep          string            `json:"sweep"`
	Curves         curves            `json:"curves"`
	Figures        Figures           `json:"figures"`
	SavedFigures   Figures           `json:"saved_figures"`
	CompareFigures *Figures          `json:"compare_figures,omitempty"`
	Values         map[string]string `json:"values"` // every part, normalised
}

// errorResponse is every refusal: the message the page shows and, when it
// is about one part or knob, its name.
type errorResponse struct {
	Error string `json:"error"`
	Field string `json:"field,omitempty"`
}

// dbList marshals as a JSON array of numbers with 4 decimals, null for a
// value that is not finite.
type dbList []float64

func (l dbList) MarshalJSON() ([]byte, error) {
	if l == nil {
		return []byte("null"), nil
	}
	b := make([]byte, 0, 10*len(l)+2)
	b = append(b, '[')
	for i, v := range l {
		if i > 0 {
			b = append(b, ',')
		}
		if math.IsNaN(v) || math.IsInf(v, 0) {
			b = append(b, "null"...)
			continue
		}
		b = strconv.AppendFloat(b, v, 'g', 7, 64)
	}
	return append(b, ']'), nil
}

func (s *Server) routes() {
	m := http.NewServeMux()
	m.HandleFunc("GET /{$}", s.handlePage)
	m.HandleFunc("GET /page/{name}", s.handleAsset)
	m.HandleFunc("GET /api/state", s.handleState)
	m.HandleFunc("POST /api/eval", s.handleEval)
	m.HandleFunc("POST /api/step", s.handleStep)
	m.HandleFunc("POST /api/save", s.handleSave)
	m.HandleFunc("POST /api/play", s.handlePlay)
	s.mux = m
}

func (s *Server) handlePage(w http.ResponseWriter, r *http.Request) {
	w.Header().Set("Content-Type", "text/html; charset=utf-8")
	w.Write(s.page)
}

func (s *Server) current() (Model, Setting) {
	s.mu.RLock()
	defer s.mu.RUnlock()
	return s.saved, s.knobs
}

func (s *Server) handleState(w http.ResponseWriter, r *http.Request) {
	m, knobs := s.current()
	st := stateResponse{
		Name: m.Name(), File: filepath.Base(s.cfg.SavePath), Band: m.Band(),
		Series: stepSeries, DefaultSeries: "E24", Audio: s.cfg.Renderer != nil,
	}
	for _, k := range m.Knobs() {
		if v, ok := knobs[k.Name]; ok {
			k.Saved = v
		}
		st.Knobs = append(st.Knobs, k)
	}
	for _, p := range m.Parts() {
		pj := partJSON{Part: p, Text: formatValue(p, p.Value)}
		if !math.IsInf(p.Value, 0) {
			v := p.Value
			pj.Value = &v
		}
		st.Parts = append(st.Parts, pj)
	}
	if s.cfg.Compare != nil {
		st.Compare = s.cfg.Compare.Name()
	}
	writeJSON(w, http.StatusOK, st)
}

// decode reads a JSON body strictly: one value, known keys only, no key
// twice in an object.
func decode(r *http.Request, v any) error {
	data, err := io.ReadAll(r.Body)
	if err != nil {
		var mbe *http.MaxBytesError
		if errors.As(err, &mbe) {
			return fmt.Errorf("request body over %d bytes", MaxBody)
		}
		return fmt.Errorf("reading the request: %v", err)
	}
	if err := noDuplicateKeys(data); err != nil {
		return fmt.Errorf("not valid JSON for this request: %v", err)
	}
	dec := json.NewDecoder(bytes.NewReader(data))
	dec.DisallowUnknownFields()
	if err := dec.Decode(v); err != nil {
		return fmt.Errorf("not valid JSON for this request: %v", err)
	}
	if _, err := dec.Token(); err != io.EOF {
		return errors.New("not valid JSON for this request: more than one value in the body")
	}
	return nil
}

// noDuplicateKeys reports a key given twice in one JSON object (which
// encoding/json would let the last one win). Syntax errors are left to
// the decoder.
func noDuplicateKeys(data []byte) error {
	dec := json.NewDecoder(bytes.NewReader(data))
	type frame struct {
		keys   map[string]bool
		object bool
		key    bool // the next string token is a key
	}
	var stack []frame
	for {
		tok, err := dec.Token()
		if err != nil {
			return nil
		}
		var top *frame
		if len(stack) > 0 {
			top = &stack[len(stack)-1]
		}
		if d, ok := tok.(json.Delim); ok {
			switch d {
			case '{', '[':
				if top != nil && top.object {
					top.key = true
				}
				stack = append(stack, frame{keys: map[string]bool{}, object: d == '{', key: d == '{'})
			default:
				stack = stack[:len(stack)-1]
			}
			continue
		}
		if top == nil || !top.object {
			continue
		}
		if top.key {
			k, _ := tok.(string)
			if top.keys[k] {
				return fmt.Errorf("key %.40q given twice", k)
			}
			top.keys[k] = true
			top.key = false
			continue
		}
		top.key = true
	}
}

// apply returns the saved design with the request's values and the
// request's setting, checked.
func (s *Server) apply(req *changeRequest) (Model, error) {
	base, _ := s.current()
	if len(req.Values) > maxValues {
		return nil, fmt.Errorf("%d values: a design has at most %d", len(req.Values), maxValues)
	}
	if len(req.Setting) > maxKnobs {
		return nil, fmt.Errorf("%d knobs: a design has at most %d", len(req.Setting), maxKnobs)
	}
	parts := map[string]Part{}
	for _, p := range base.Parts() {
		parts[p.Name] = p
	}
	values := make(map[string]float64, len(req.Values))
	for name, text := range req.Values {
		p, ok := parts[name]
		if !ok {
			return nil, &ValueError{Field: name, Err: fmt.Errorf("this design has no part %.40q", name)}
		}
		v, err := parseValue(p, text)
		if err != nil {
			return nil, &ValueError{Field: name, Err: err}
		}
		values[name] = v
	}
	knobs := map[string]bool{}
	for _, k := range base.Knobs() {
		knobs[k.Name] = true
	}
	for name, v := range req.Setting {
		if !knobs[name] {
			return nil, &ValueError{Field: name, Err: fmt.Errorf("this design has no knob %.40q", name)}
		}
		if !(v >= 0 && v <= 1) {
			return nil, &ValueError{Field: name, Err: fmt.Errorf("knob position %v is outside 0..1", v)}
		}
	}
	if req.Sweep != "" && !knobs[req.Sweep] {
		return nil, &ValueError{Field: "sweep", Err: fmt.Errorf("this design has no knob %.40q", req.Sweep)}
	}
	return base.With(values)
}

func (s *Server) readChange(w http.ResponseWriter, r *http.Request) (*changeRequest, Model, bool) {
	var req changeRequest
	if err := decode(r, &req); err != nil {
		writeError(w, http.StatusBadRequest, "", err.Error())
		return nil, nil, false
	}
	m, err := s.apply(&req)
	if err != nil {
		refuse(w, err)
		return nil, nil, false
	}
	return &req, m, true
}

func refuse(w http.ResponseWriter, err error) {
	var ve *ValueError
	if errors.As(err, &ve) {
		writeError(w, http.StatusBadRequest, ve.Field, ve.Err.Error())
		return
	}
	writeError(w, http.StatusBadRequest, "", err.Error())
}

func (s *Server) handleEval(w http.ResponseWriter, r *http.Request) {
	req, m, ok := s.readChange(w, r)
	if !ok {
		return
	}
	resp, err := s.evaluate(m, req)
	if err != nil {
		refuse(w, err)
		return
	}
	writeJSON(w, http.StatusOK, resp)
}

// evaluate computes everything the page draws for m at the request's
// setting.
func (s *Server) evaluate(m Model, req *changeRequest) (*evalResponse, error) {
	saved, _ := s.current()
	set := req.Setting
	sweep := req.Sweep
	if ks := m.Knobs(); sweep == "" && len(ks) > 0 {
		sweep = ks[0].Name
	}
	n := len(s.hz)
	resp := &evalResponse{Hz: s.hz, Sweep: sweep, Values: map[string]string{}}
	curve := func(mm Model, st Setting) (dbList, error) {
		out := make(dbList, n)
		return out, mm.Curve(st, s.hz, out)
	}
	var err error
	if resp.Curves.Current, err = curve(m, set); err != nil {
		return nil, err
	}
	for i, end := range []float64{0, 1} {
		if sweep == "" {
			break
		}
		st := Setting{}
		for k, v := range set {
			st[k] = v
		}
		st[sweep] = end
		c, err := curve(m, st)
		if err != nil {
			return nil, err
		}
		if i == 0 {
			resp.Curves.Low = c
		} else {
			resp.Curves.High = c
		}
	}
	if resp.Curves.Saved, err = curve(saved, set); err != nil {
		return nil, err
	}
	if resp.Figures, err = m.Figures(set); err != nil {
		return nil, err
	}
	if resp.SavedFigures, err = saved.Figures(set); err != nil {
		return nil, err
	}
	if c := s.cfg.Compare; c != nil {
		cs := Common(c, set)
		if resp.Curves.Compare, err = curve(c, cs); err != nil {
			return nil, err
		}
		f, err := c.Figures(cs)
		if err != nil {
			return nil, err
		}
		resp.CompareFigures = &f
	}
	for _, p := range m.Parts() {
		resp.Values[p.Name] = formatValue(p, p.Value)
	}
	return resp, nil
}

func (s *Server) handleStep(w http.ResponseWriter, r *http.Request) {
	var req stepRequest
	if err := decode(r, &req); err != nil {
		writeError(w, http.StatusBadRequest, "", err.Error())
		return
	}
	base, _ := s.current()
	var part *Part
	for _, p := range base.Parts() {
		if p.Name == req.Part {
			part = &p
			break
		}
	}
	if part == nil {
		writeError(w, http.StatusBadRequest, "part", fmt.Sprintf("this design has no part %.40q", req.Part))
		return
	}
	v, err := parseValue(*part, req.Value)
	if err != nil {
		writeError(w, http.StatusBadRequest, part.Name, err.Error())
		return
	}
	next, err := step(*part, v, req.Series, req.Direction)
	if err != nil {
		writeError(w, http.StatusBadRequest, part.Name, err.Error())
		return
	}
	writeJSON(w, http.StatusOK, map[string]string{"part": part.Name, "value": formatValue(*part, next)})
}

// saveResponse is /api/save's answer.
type saveResponse struct {
	File   string `json:"file"`   // base name of the file written
	Backup string `json:"backup"` // base name of the previous version, empty if there was none
}

func (s *Server) handleSave(w http.ResponseWriter, r *http.Request) {
	req, m, ok := s.readChange(w, r)
	if !ok {
		return
	}
	data, err := m.Encode(req.Setting)
	if err != nil {
		refuse(w, err)
		return
	}
	s.saveMu.Lock()
	defer s.saveMu.Unlock()
	backup, err := saveFile(s.cfg.SavePath, data)
	if err != nil {
		writeError(w, http.StatusInternalServerError, "", err.Error())
		return
	}
	s.mu.Lock()
	knobs := Setting{}
	for k, v := range s.knobs {
		knobs[k] = v
	}
	for k, v := range req.Setting {
		knobs[k] = v
	}
	s.saved, s.knobs = m, knobs // a new map: readers hold the old one
	s.mu.Unlock()
	resp := saveResponse{File: filepath.Base(s.cfg.SavePath)}
	if backup != "" {
		resp.Backup = filepath.Base(backup)
	}
	writeJSON(w, http.StatusOK, resp)
}

func (s *Server) handlePlay(w http.ResponseWriter, r *http.Request) {
	req, m, ok := s.readChange(w, r)
	if !ok {
		return
	}
	if s.cfg.Renderer == nil {
		writeError(w, http.StatusNotImplemented, "", ErrNoAudio.Error())
		return
	}
	select {
	case s.playSem <- struct{}{}:
		defer func() { <-s.playSem }()
	default:
		writeError(w, http.StatusServiceUnavailable, "", "still rendering the last phrase: try again in a moment")
		return
	}
	ctx, cancel := context.WithTimeout(r.Context(), 30*time.Second)
	defer cancel()
	saved, _ := s.current()
	wav, err := s.cfg.Renderer.Render(ctx, m, req.Setting, saved)
	if err != nil {
		writeError(w, http.StatusInternalServerError, "", "playing: "+err.Error())
		return
	}
	w.Header().Set("Content-Type", "audio/wav")
	w.Header().Set("Content-Length", strconv.Itoa(len(wav)))
	w.Write(wav)
}

func writeJSON(w http.ResponseWriter, code int, v any) {
	var b bytes.Buffer
	if err := json.NewEncoder(&b).Encode(v); err != nil {
		writeError(w, http.StatusInternalServerError, "", "encoding the answer: "+err.Error())
		return
	}
	w.Header().Set("Content-Type", "application/json")
	w.WriteHeader(code)
	w.Write(b.Bytes())
}

func writeError(w http.ResponseWriter, code int, field, msg string) {
	b, _ := json.Marshal(errorResponse{Error: msg, Field: field})
	w.Header().Set("Content-Type", "application/json")
	w.WriteHeader(code)
	w.Write(append(b, '\n'))
}
