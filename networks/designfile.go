package networks

import (
	"bytes"
	"errors"
	"fmt"
	"math"
	"os"
	"strings"

	"gopkg.in/yaml.v3"

	"tonewright/eseries"
)

// LoadDesign reads and checks a design file.
func LoadDesign(path string) (*Design, error) {
	data, err := os.ReadFile(path)
	if err != nil {
		return nil, fmt.Errorf("cannot read design file: %w", err)
	}
	return ParseDesign(data, path)
}

// ParseDesign reads a design file's contents strictly (file names it in
// errors) and validates the design.
func ParseDesign(data []byte, file string) (*Design, error) {
	dec := &Decoder{File: file}
	doc, err := dec.Document(data)
	if err != nil {
		return nil, err
	}
	d := &Design{Band: DefaultBand, Load: DefaultLoad}
	haveTone := false
	err = dec.Map(doc, "",
		Key{"name", func(n *yaml.Node, p string) (err error) { d.Name, err = dec.String(n, p); return }},
		Key{"band", func(n *yaml.Node, p string) error { return dec.Band(n, p, &d.Band) }},
		Key{"source", func(n *yaml.Node, p string) error { return dec.Source(n, p, &d.Source) }},
		Key{"tone", func(n *yaml.Node, p string) error { haveTone = true; return dec.tone(n, p, &d.Tone) }},
		Key{"filters", func(n *yaml.Node, p string) error {
			if n.Tag == "!!null" {
				return nil
			}
			return dec.List(n, p, func(c *yaml.Node, q string) error {
				var rc RC
				err := dec.RC(c, q, &rc)
				d.Filters = append(d.Filters, rc)
				return err
			})
		}},
		Key{"level", func(n *yaml.Node, p string) error {
			d.Level = &LevelSetting{}
			return dec.Level(n, p, d.Level)
		}},
		Key{"load", func(n *yaml.Node, p string) error { return dec.Load(n, p, &d.Load) }},
	)
	if err != nil {
		return nil, err
	}
	if !haveTone {
		return nil, &FieldError{File: file, Key: "tone", Err: errors.New("missing: a design needs its tone network (tone: {network: blend, lowpass: …, highpass: …, pot: …})")}
	}
	if err := d.Validate(); err != nil {
		return nil, dec.Place(err)
	}
	return d, nil
}

func (dec *Decoder) tone(n *yaml.Node, path string, t *Tone) error {
	t.Network = BlendNetwork
	if n.Kind == yaml.MappingNode {
		for i := 0; i+1 < len(n.Content); i += 2 {
			if n.Content[i].Value == "network" {
				s, err := dec.String(n.Content[i+1], join(path, "network"))
				if err != nil {
					return err
				}
				t.Network = s
			}
		}
	}
	keep := func(n *yaml.Node, p string) error { return nil } // network, read above
	switch t.Network {
	case BlendNetwork:
		seen := map[string]bool{}
		mark := func(k string, f func(*yaml.Node, string) error) Key {
			return Key{k, func(n *yaml.Node, p string) error { seen[k] = true; return f(n, p) }}
		}
		err := dec.Map(n, path,
			Key{"network", keep},
			mark("lowpass", func(n *yaml.Node, p string) error { return dec.RC(n, p, &t.Lowpass) }),
			mark("highpass", func(n *yaml.Node, p string) error { return dec.RC(n, p, &t.Highpass) }),
			mark("pot", func(n *yaml.Node, p string) error { return dec.Pot(n, p, &t.Pot) }),
		)
		if err != nil {
			return err
		}
		for _, k := range []string{"lowpass", "highpass", "pot"} {
			if !seen[k] {
				return dec.Errorf(n, path, "missing key %s: the blend network needs lowpass {r, c}, highpass {c, r} and pot", k)
			}
		}
		return nil
	case NetlistNetwork:
		have := false
		err := dec.Map(n, path,
			Key{"network", keep},
			Key{"parts", func(n *yaml.Node, p string) error { have = true; return dec.netParts(n, p, &t.Parts) }},
		)
		if err == nil && !have {
			err = dec.Errorf(n, path, "missing key parts: the netlist form lists its parts, e.g. parts: {R1: {r: 10k, from: in, to: out}, C1: {c: 10n, from: out, to: gnd}}")
		}
		return err
	}
	if tp := t.topology(); tp != nil {
		return dec.topoTone(n, path, tp, t)
	}
	return dec.Errorf(n, join(path, "network"), "unknown network %q: use %s", t.Network, strings.Join(ToneNetworks(), ", "))
}

// partForms is how a netlist part is written, for error messages.
const partForms = "{r: 10k, from: a, to: b}, {c: 22n, from: a, to: b}, {l: 500m, from: a, to: b} or {pot: 250k, taper: audio, from: a, to: b, wiper: c}"

// netParts reads the netlist's parts: a mapping from each part's name to
// its kind and value, its nodes and, for a pot, its wiper, taper and knob.
func (dec *Decoder) netParts(n *yaml.Node, path string, parts *[]NetPart) error {
	if n.Kind != yaml.MappingNode {
		return dec.Errorf(n, path, "must be a mapping from part names to parts such as %s, got %s", partForms, describe(n))
	}
	dec.mark(path, n)
	seen := map[string]bool{}
	for i := 0; i+1 < len(n.Content); i += 2 {
		kn, vn := n.Content[i], n.Content[i+1]
		p := join(path, kn.Value)
		if seen[kn.Value] {
			return dec.Errorf(kn, p, "part name given twice")
		}
		seen[kn.Value] = true
		if !nodeName.MatchString(kn.Value) {
			return dec.Errorf(kn, p, "part name %q: use letters, digits and _", kn.Value)
		}
		dec.mark(p, vn)
		part, err := dec.netPart(vn, p, kn.Value)
		if err != nil {
			return err
		}
		*parts = append(*parts, part)
	}
	return nil
}

func (dec *Decoder) netPart(n *yaml.Node, path, name string) (NetPart, error) {
	part := NetPart{Name: name, Taper: Taper{Law: Linear}}
	var kinds []string
	kind := func(k PartKind, unit string) Key {
		return Key{k.key(), func(n *yaml.Node, p string) (err error) {
			kinds = append(kinds, k.key())
			part.Kind = k
			part.Value, err = dec.ValueIn(n, p, unit)
			return
		}}
	}
	node := func(dst *string) func(*yaml.Node, string) error {
		return func(n *yaml.Node, p string) (err error) { *dst, err = dec.String(n, p); return }
	}
	var potOnly []string
	only := func(k string, f func(*yaml.Node, string) error) Key {
		return Key{k, func(n *yaml.Node, p string) error { potOnly = append(potOnly, k); return f(n, p) }}
	}
	var mid float64
	haveMid := false
	err := dec.Map(n, path,
		kind(PartResistor, "Ω"), kind(PartCapacitor, "F"), kind(PartInductor, "H"), kind(PartPot, "Ω"),
		Key{"from", node(&part.From)}, Key{"to", node(&part.To)},
		only("wiper", node(&part.Wiper)),
		only("taper", dec.law(&part.Taper.Law)),
		only("midpoint", func(n *yaml.Node, p string) (err error) { haveMid = true; mid, err = dec.Number(n, p); return }),
		only("knob", node(&part.Knob)),
		only("position", func(n *yaml.Node, p string) error {
			v, err := dec.Number(n, p)
			part.Position = &v
			return err
		}),
	)
	if err != nil {
		return part, err
	}
	switch len(kinds) {
	case 0:
		return part, dec.Errorf(n, path, "no kind: a part has one of r, c, l or pot, as in %s", partForms)
	case 1:
	default:
		return part, dec.Errorf(n, path, "two kinds (%s): a part has exactly one of r, c, l or pot", strings.Join(kinds, " and "))
	}
	for _, k := range []string{"from", "to"} {
		if !hasKey(n, k) {
			return part, dec.Errorf(n, path, "missing key %s: a part joins two nodes, as in %s", k, partForms)
		}
	}
	if part.Kind != PartPot {
		if len(potOnly) > 0 {
			return part, dec.Errorf(n, join(path, potOnly[0]), "only a pot has %s: this part is %s %s", potOnly[0], article(part.Kind), part.Kind)
		}
		return part, nil
	}
	if !hasKey(n, "wiper") {
		return part, dec.Errorf(n, path, "missing key wiper: a pot names its wiper's node (the same as from or to for a pot wired as a variable resistor)")
	}
	if haveMid {
		if part.Taper.Law == Linear {
			return part, dec.Errorf(n, join(path, "midpoint"), "a linear taper has no midpoint: give taper: audio or reverse-audio, or drop midpoint")
		}
		part.Taper.Midpoint = mid
	}
	return part, nil
}

func article(k PartKind) string {
	if k == PartInductor {
		return "an"
	}
	return "a"
}

// YAML returns the design in the design-file schema, values in the short
// engineering form (4.7k, 2.2n).
func (d *Design) YAML() []byte {
	var b bytes.Buffer
	v := eseries.Format
	if d.Name != "" {
		name, _ := yaml.Marshal(d.Name)
		fmt.Fprintf(&b, "name: %s", name)
	}
	fmt.Fprintf(&b, "band: {from: %s, to: %s}\n", v(d.Band.From), v(d.Band.To))
	fmt.Fprintf(&b, "source: {impedance: %s", v(d.Source.Impedance))
	if d.Source.SeriesC > 0 {
		fmt.Fprintf(&b, ", series_c: %s", v(d.Source.SeriesC))
	}
	b.WriteString("}\n")
	fmt.Fprintf(&b, "tone:\n  network: %s\n", d.Tone.Network)
	if tp := d.Tone.topology(); tp != nil {
		d.Tone.topoYAML(&b, tp)
	} else if d.Tone.Network == NetlistNetwork {
		b.WriteString("  parts:\n")
		for _, p := range d.Tone.Parts {
			fmt.Fprintf(&b, "    %s: %s\n", p.Name, netPartYAML(p))
		}
	} else {
		fmt.Fprintf(&b, "  lowpass:  {r: %s, c: %s}\n", v(d.Tone.Lowpass.R), v(d.Tone.Lowpass.C))
		fmt.Fprintf(&b, "  highpass: {c: %s, r: %s}\n", v(d.Tone.Highpass.C), v(d.Tone.Highpass.R))
		fmt.Fprintf(&b, "  pot: %s\n", potYAML(d.Tone.Pot))
	}
	if len(d.Filters) == 0 {
		b.WriteString("filters: []\n")
	} else {
		b.WriteString("filters:\n")
		for _, f := range d.Filters {
			fmt.Fprintf(&b, "  - {r: %s, c: %s}\n", v(f.R), v(f.C))
		}
	}
	if d.Level != nil {
		fmt.Fprintf(&b, "level: {pot: %s, position: %s}\n", potYAML(d.Level.Pot), trimFloat(d.Level.Position))
	}
	r := "open"
	if !math.IsInf(d.Load.R, 1) {
		r = v(d.Load.R)
	}
	fmt.Fprintf(&b, "load: {r: %s, c: %s}\n", r, v(d.Load.C))
	return b.Bytes()
}

// netPartYAML writes one netlist part in its flow form.
func netPartYAML(p NetPart) string {
	s := fmt.Sprintf("{%s: %s", p.Kind.key(), eseries.Format(p.Value))
	if p.Kind == PartPot {
		s += ", taper: " + p.Taper.String()
		if p.Taper.Midpoint > 0 {
			s += ", midpoint: " + trimFloat(p.Taper.Midpoint)
		}
	}
	s += fmt.Sprintf(", from: %s, to: %s", p.From, p.To)
	if p.Kind == PartPot {
		s += ", wiper: " + p.Wiper
		if p.Knob != "" && p.Knob != p.Name {
			s += ", knob: " + p.Knob
		}
		if p.Position != nil {
			s += ", position: " + trimFloat(*p.Position)
		}
	}
	return s + "}"
}

func potYAML(p PotPart) string {
	s := fmt.Sprintf("{value: %s, taper: %s", eseries.Format(p.Value), p.Taper)
	if p.Taper.Midpoint > 0 {
		s += ", midpoint: " + trimFloat(p.Taper.Midpoint)
	}
	return s + "}"
}

func trimFloat(x float64) string {
	s := fmt.Sprintf("%.6f", x)
	s = strings.TrimRight(strings.TrimRight(s, "0"), ".")
	if !strings.Contains(s, ".") {
		s += ".0"
	}
	return s
}
