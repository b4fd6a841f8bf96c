package networks

import (
	"bytes"
	"errors"
	"fmt"
	"math"
	"regexp"
	"sort"
	"strconv"
	"strings"

	"gopkg.in/yaml.v3"

	"tonewright/eseries"
)

// Decoder reads YAML files strictly: every key must be known, every value of
// the right kind, and every error names the file, the line and the key path.
// It records the line of each key it reads, so that errors found later (by
// Design.Validate, say) can be placed too. The design file and the targets
// file share it.
type Decoder struct {
	File  string
	lines map[string]int
}

// Key is a mapping key a Decoder accepts and the function that reads its
// value; path is the dotted key path of the value.
type Key struct {
	Name   string
	Decode func(n *yaml.Node, path string) error
}

// Document parses data and returns its top-level mapping.
func (d *Decoder) Document(data []byte) (*yaml.Node, error) {
	if len(strings.TrimSpace(string(data))) == 0 {
		return nil, &FieldError{File: d.File, Err: errors.New("the file is empty")}
	}
	var root yaml.Node
	if err := yaml.Unmarshal(data, &root); err != nil {
		msg := strings.TrimPrefix(err.Error(), "yaml: ")
		line := 0
		if strings.HasPrefix(msg, "line ") {
			rest := strings.TrimPrefix(msg, "line ")
			if k := strings.Index(rest, ":"); k > 0 {
				if l, e := strconv.Atoi(rest[:k]); e == nil {
					line, msg = l, strings.TrimSpace(rest[k+1:])
				}
			}
		}
		return nil, &FieldError{File: d.File, Line: line, Err: fmt.Errorf("not valid YAML: %s", msg)}
	}
	if len(root.Content) == 0 {
		return nil, &FieldError{File: d.File, Err: errors.New("the file is empty")}
	}
	if k := bytes.Index(data, []byte("\n---")); k >= 0 && strings.TrimSpace(string(data[k+4:])) != "" {
		var first, second yaml.Node
		dec := yaml.NewDecoder(bytes.NewReader(data))
		if dec.Decode(&first) == nil && dec.Decode(&second) == nil {
			return nil, &FieldError{File: d.File, Line: second.Line, Err: errors.New("the file holds more than one YAML document (a second ---): keep one design per file")}
		}
	}
	doc := root.Content[0]
	if doc.Kind != yaml.MappingNode {
		return nil, &FieldError{File: d.File, Line: doc.Line, Err: errors.New("the file must be a YAML mapping of keys (name:, source:, tone:, …)")}
	}
	return doc, nil
}

// Errorf returns a FieldError at node n for the key path.
func (d *Decoder) Errorf(n *yaml.Node, path, format string, args ...any) error {
	line := 0
	if n != nil {
		line = n.Line
	}
	return &FieldError{File: d.File, Line: line, Key: path, Err: fmt.Errorf(format, args...)}
}

// Place fills in the file and line of a FieldError from the lines the
// Decoder recorded; other errors are returned unchanged.
func (d *Decoder) Place(err error) error {
	var fe *FieldError
	if errors.As(err, &fe) {
		if fe.File == "" {
			fe.File = d.File
		}
		if fe.Line == 0 {
			fe.Line = d.Line(fe.Key)
		}
	}
	return err
}

// Line returns the line of the value at path, or of its nearest recorded
// parent, or 0.
func (d *Decoder) Line(path string) int {
	for p := path; p != ""; {
		if l, ok := d.lines[p]; ok {
			return l
		}
		k := strings.LastIndexAny(p, ".[")
		if k < 0 {
			break
		}
		p = p[:k]
	}
	return 0
}

func join(path, key string) string {
	if path == "" {
		return key
	}
	return path + "." + key
}

func (d *Decoder) mark(path string, n *yaml.Node) {
	if d.lines == nil {
		d.lines = map[string]int{}
	}
	d.lines[path] = n.Line
}

// Map reads a mapping whose keys must all be among keys.
func (d *Decoder) Map(n *yaml.Node, path string, keys ...Key) error {
	names := make([]string, len(keys))
	for i, k := range keys {
		names[i] = k.Name
	}
	if n.Kind != yaml.MappingNode {
		return d.Errorf(n, path, "must be a mapping with the keys %s, got %s", strings.Join(names, ", "), describe(n))
	}
	d.mark(path, n)
	seen := map[string]bool{}
	for i := 0; i+1 < len(n.Content); i += 2 {
		kn, vn := n.Content[i], n.Content[i+1]
		name := kn.Value
		p := join(path, name)
		if seen[name] {
			return d.Errorf(kn, p, "key given twice")
		}
		seen[name] = true
		var key *Key
		for j := range keys {
			if keys[j].Name == name {
				key = &keys[j]
			}
		}
		if key == nil {
			sorted := append([]string(nil), names...)
			sort.Strings(sorted)
			hint := ""
			if decimalTail.MatchString(name) {
				hint = " (a decimal comma? In a {…} mapping a comma ends the value: write 1.2k or 1k2)"
			}
			return d.Errorf(kn, p, "unknown key %q: accepted keys here are %s%s", name, strings.Join(sorted, ", "), hint)
		}
		d.mark(p, vn)
		if err := key.Decode(vn, p); err != nil {
			return err
		}
	}
	return nil
}

// decimalTail is what is left of a value such as 1,2k after a flow
// mapping's comma: digits and perhaps a prefix or unit.
var decimalTail = regexp.MustCompile(`^[0-9]+[a-zA-Zµ]*$`)

func describe(n *yaml.Node) string {
	switch n.Kind {
	case yaml.MappingNode:
		return "a mapping"
	case yaml.SequenceNode:
		return "a list"
	case yaml.AliasNode:
		return "an alias"
	}
	if n.Tag == "!!null" {
		return "nothing"
	}
	return fmt.Sprintf("%q", n.Value)
}

func (d *Decoder) scalar(n *yaml.Node, path, what string) (string, error) {
	if n.Kind != yaml.ScalarNode || n.Tag == "!!null" {
		return "", d.Errorf(n, path, "must be %s, got %s", what, describe(n))
	}
	return strings.TrimSpace(n.Value), nil
}

// Value reads a part value: a number, an SI-prefixed value or an RKM code
// (see eseries.Parse). It must be finite; sign checks are the caller's. A
// unit in Hz is refused: a part value is not a frequency.
func (d *Decoder) Value(n *yaml.Node, path string) (float64, error) {
	s, err := d.scalar(n, path, "a value such as 4.7k, 100n or 4k7")
	if err != nil {
		return 0, err
	}
	v, unit, err := eseries.ParseUnit(s)
	if err != nil {
		return 0, d.Errorf(n, path, "%v", err)
	}
	if unit == "Hz" {
		return 0, d.Errorf(n, path, "%q is in Hz, but %s is a part value: write it in Ω or F, or without a unit", s, path)
	}
	return v, nil
}

// ValueIn reads a part value like Value, and if it is written with a unit,
// the unit must be want (Ω for resistances, F for capacitances, Hz for
// frequencies).
func (d *Decoder) ValueIn(n *yaml.Node, path, want string) (float64, error) {
	s, err := d.scalar(n, path, "a value such as 4.7k, 100n or 4k7")
	if err != nil {
		return 0, err
	}
	v, unit, err := eseries.ParseUnit(s)
	if err != nil {
		return 0, d.Errorf(n, path, "%v", err)
	}
	if unit != "" && unit != want {
		kind := map[string]string{"Ω": "a resistance", "F": "a capacitance", "Hz": "a frequency"}[want]
		return 0, d.Errorf(n, path, "%q is in %s, but %s is %s: write it in %s or without a unit", s, unit, path, kind, want)
	}
	return v, nil
}

// Number reads a plain finite number.
func (d *Decoder) Number(n *yaml.Node, path string) (float64, error) {
	s, err := d.scalar(n, path, "a number")
	if err != nil {
		return 0, err
	}
	v, err := strconv.ParseFloat(s, 64)
	if err != nil || math.IsNaN(v) || math.IsInf(v, 0) {
		return 0, d.Errorf(n, path, "%q is not a finite plain number (such as 0.5)", s)
	}
	return v, nil
}

// Int reads a whole number.
func (d *Decoder) Int(n *yaml.Node, path string) (int, error) {
	s, err := d.scalar(n, path, "a whole number")
	if err != nil {
		return 0, err
	}
	v, err := strconv.Atoi(s)
	if err != nil {
		return 0, d.Errorf(n, path, "%q is not a whole number", s)
	}
	return v, nil
}

// String reads a string.
func (d *Decoder) String(n *yaml.Node, path string) (string, error) {
	return d.scalar(n, path, "a string")
}

// List reads a sequence, calling item for each element with its path
// (path[i]).
func (d *Decoder) List(n *yaml.Node, path string, item func(n *yaml.Node, path string) error) error {
	if n.Kind != yaml.SequenceNode {
		return d.Errorf(n, path, "must be a list, got %s", describe(n))
	}
	d.mark(path, n)
	for i, c := range n.Content {
		p := fmt.Sprintf("%s[%d]", path, i)
		d.mark(p, c)
		if err := item(c, p); err != nil {
			return err
		}
	}
	return nil
}

// Values reads a list of part values.
func (d *Decoder) Values(n *yaml.Node, path string) ([]float64, error) {
	var out []float64
	err := d.List(n, path, func(c *yaml.Node, p string) error {
		v, err := d.Value(c, p)
		out = append(out, v)
		return err
	})
	return out, err
}

// into returns a Decode that reads a value into *v.
func (d *Decoder) into(v *float64) func(*yaml.Node, string) error {
	return func(n *yaml.Node, p string) (err error) { *v, err = d.Value(n, p); return }
}

// ohms and farads return a Decode that reads a resistance or a capacitance
// into *v, refusing the other kinds of unit.
func (d *Decoder) ohms(v *float64) func(*yaml.Node, string) error {
	return func(n *yaml.Node, p string) (err error) { *v, err = d.ValueIn(n, p, "Ω"); return }
}

func (d *Decoder) farads(v *float64) func(*yaml.Node, string) error {
	return func(n *yaml.Node, p string) (err error) { *v, err = d.ValueIn(n, p, "F"); return }
}

// Band reads {from, to}.
func (d *Decoder) Band(n *yaml.Node, path string, b *Band) error {
	hertz := func(v *float64) func(*yaml.Node, string) error {
		return func(n *yaml.Node, p string) (err error) { *v, err = d.ValueIn(n, p, "Hz"); return }
	}
	return d.Map(n, path, Key{"from", hertz(&b.From)}, Key{"to", hertz(&b.To)})
}

// Source reads {impedance, series_c}.
func (d *Decoder) Source(n *yaml.Node, path string, s *Source) error {
	return d.Map(n, path, Key{"impedance", d.ohms(&s.Impedance)}, Key{"series_c", d.farads(&s.SeriesC)})
}

// Load reads {r, c}; r may be the word open.
func (d *Decoder) Load(n *yaml.Node, path string, l *Load) error {
	return d.Map(n, path,
		Key{"r", func(n *yaml.Node, p string) (err error) {
			if n.Kind == yaml.ScalarNode && strings.EqualFold(strings.TrimSpace(n.Value), "open") {
				l.R = math.Inf(1)
				return nil
			}
			l.R, err = d.ValueIn(n, p, "Ω")
			return
		}},
		Key{"c", d.farads(&l.C)})
}

// law returns a Decode that reads a taper's name (ParseTaper) into *l.
func (d *Decoder) law(l *Law) func(*yaml.Node, string) error {
	return func(n *yaml.Node, k string) error {
		s, err := d.String(n, k)
		if err != nil {
			return err
		}
		t, err := ParseTaper(s)
		if err != nil {
			return d.Errorf(n, k, "%v", err)
		}
		*l = t.Law
		return nil
	}
}

// Pot reads a pot part: a bare value (linear taper) or {value, taper,
// midpoint}.
func (d *Decoder) Pot(n *yaml.Node, path string, p *PotPart) error {
	*p = PotPart{Taper: Taper{Law: Linear}}
	if n.Kind == yaml.ScalarNode {
		v, err := d.ValueIn(n, path, "Ω")
		p.Value = v
		return err
	}
	var mid float64
	var haveMid bool
	err := d.Map(n, path,
		Key{"value", d.ohms(&p.Value)},
		Key{"taper", d.law(&p.Taper.Law)},
		Key{"midpoint", func(n *yaml.Node, k string) (err error) {
			haveMid = true
			mid, err = d.Number(n, k)
			return
		}})
	if err != nil {
		return err
	}
	if haveMid {
		if p.Taper.Law == Linear {
			return d.Errorf(n, join(path, "midpoint"), "a linear taper has no midpoint: give taper: audio or reverse-audio, or drop midpoint")
		}
		p.Taper.Midpoint = mid
	}
	if p.Value == 0 && !hasKey(n, "value") {
		return d.Errorf(n, path, "a pot needs its value, e.g. {value: 100k, taper: audio}")
	}
	return nil
}

// Level reads {pot, position}.
func (d *Decoder) Level(n *yaml.Node, path string, l *LevelSetting) error {
	l.Position = 1
	havePot := false
	err := d.Map(n, path,
		Key{"pot", func(n *yaml.Node, p string) error { havePot = true; return d.Pot(n, p, &l.Pot) }},
		Key{"position", func(n *yaml.Node, p string) (err error) { l.Position, err = d.Number(n, p); return }})
	if err == nil && !havePot {
		err = d.Errorf(n, path, "a level needs its pot, e.g. {pot: {value: 100k, taper: audio}, position: 1.0}")
	}
	return err
}

// RC reads {r, c}.
func (d *Decoder) RC(n *yaml.Node, path string, rc *RC) error {
	err := d.Map(n, path, Key{"r", d.ohms(&rc.R)}, Key{"c", d.farads(&rc.C)})
	if err == nil {
		for _, k := range []string{"r", "c"} {
			if !hasKey(n, k) {
				return d.Errorf(n, path, "missing key %s: write {r: 10k, c: 1n}", k)
			}
		}
	}
	return err
}

func hasKey(n *yaml.Node, key string) bool {
	for i := 0; i+1 < len(n.Content); i += 2 {
		if n.Content[i].Value == key {
			return true
		}
	}
	return false
}
