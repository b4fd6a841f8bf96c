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
	seen := map[string]bool{}
	mark := func(k string, f func(*yaml.Node, string) error) Key {
		return Key{k, func(n *yaml.Node, p string) error { seen[k] = true; return f(n, p) }}
	}
	err := dec.Map(n, path,
		mark("network", func(n *yaml.Node, p string) (err error) { t.Network, err = dec.String(n, p); return }),
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
	fmt.Fprintf(&b, "  lowpass:  {r: %s, c: %s}\n", v(d.Tone.Lowpass.R), v(d.Tone.Lowpass.C))
	fmt.Fprintf(&b, "  highpass: {c: %s, r: %s}\n", v(d.Tone.Highpass.C), v(d.Tone.Highpass.R))
	fmt.Fprintf(&b, "  pot: %s\n", potYAML(d.Tone.Pot))
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
