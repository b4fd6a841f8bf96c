package networks

import (
	"bytes"
	"fmt"
	"sort"
	"strings"

	"gopkg.in/yaml.v3"

	"tonewright/eseries"
)

// Topology is a built-in tone network: a name for tone.network, the short
// keys a design file gives it, and the netlist those keys expand to. A
// design that names a topology holds its expansion in Tone.Parts, so the
// circuit, the figures, the SPICE deck and the studies see one netlist, the
// same as the netlist form would give.
type Topology struct {
	Name    string    // the tone.network name, e.g. "treble-cut"
	Summary string    // one line, for new --list
	Keys    []TopoKey // in the order the design file writes them
	// Expand wires the parts that the keys give (by part name) into the
	// netlist. A part of an optional key left out is absent from v.
	Expand func(v TopoValues) []NetPart
}

// KeyForm is how a topology's key is written in the design file.
type KeyForm int

// The forms of a topology's key.
const (
	FormR   KeyForm = iota // a resistance: key: 10k
	FormC                  // a capacitance: key: 22n
	FormPot                // a pot: key: 100k, or {value, taper, midpoint, position}
	FormRC                 // a series R then a C: {r, c}; two parts
	FormCR                 // a series C then an R: {c, r}; two parts
)

// TopoKey is one key of a topology: the part or parts it sets, their
// default values (those new writes) and what they do.
type TopoKey struct {
	Key      string
	Form     KeyForm
	Parts    []string  // the parts' names: one, or for FormRC and FormCR the R's then the C's
	Default  []float64 // one per part (FormCR: the C's, then the R's; FormRC: the R's, then the C's, as in Parts)
	Taper    Law       // pots: the taper new writes
	Optional bool      // the key may be left out (its part is then absent)
	Role     string    // what the part does, for tables; FormRC/FormCR append " R" and " C"
}

// TopoValues are a topology's parts by name, with their values (and a pot's
// taper and position) but no nodes yet.
type TopoValues map[string]NetPart

// Has reports whether the part is given.
func (v TopoValues) Has(name string) bool { _, ok := v[name]; return ok }

// Two returns the named two-terminal part between from and to, or nothing
// when it is absent.
func (v TopoValues) Two(name, from, to string) []NetPart {
	p, ok := v[name]
	if !ok {
		return nil
	}
	p.From, p.To = from, to
	return []NetPart{p}
}

// Pot returns the named pot with its track from from (knob 0) to to and its
// wiper at wiper.
func (v TopoValues) Pot(name, from, to, wiper string) []NetPart {
	p, ok := v[name]
	if !ok {
		return nil
	}
	p.From, p.To, p.Wiper = from, to, wiper
	return []NetPart{p}
}

var topologies = map[string]*Topology{}

// registerTopology adds a built-in; each topology's file calls it from init.
func registerTopology(t *Topology) {
	if _, dup := topologies[t.Name]; dup || t.Name == BlendNetwork || t.Name == NetlistNetwork {
		panic("networks: topology " + t.Name + " registered twice")
	}
	topologies[t.Name] = t
}

// Topologies returns the built-in topologies by name, the blend network
// first (it has its own form and is not in the registry, so it is described
// by BlendTopology).
func Topologies() []*Topology {
	out := []*Topology{BlendTopology()}
	var names []string
	for n := range topologies {
		names = append(names, n)
	}
	sort.Strings(names)
	for _, n := range names {
		out = append(out, topologies[n])
	}
	return out
}

// TopologyByName returns the built-in named name; an unknown name is an
// error that lists the known ones.
func TopologyByName(name string) (*Topology, error) {
	if name == BlendNetwork {
		return BlendTopology(), nil
	}
	if t, ok := topologies[name]; ok {
		return t, nil
	}
	var names []string
	for _, t := range Topologies() {
		names = append(names, t.Name)
	}
	return nil, fmt.Errorf("unknown topology %q: the built-ins are %s", name, strings.Join(names, ", "))
}

// topology returns the registered topology of the tone network, nil for the
// blend and the netlist forms.
func (t *Tone) topology() *Topology { return topologies[t.Network] }

// BlendTopology describes the blend network in the terms of a topology (its
// keys and defaults, for new --list and new); the design file keeps its own
// form for it, and its parts keep their own names (lowpass.r, …).
func BlendTopology() *Topology {
	return &Topology{
		Name:    BlendNetwork,
		Summary: "low-pass and high-pass legs mixed by a pot: scoops the mids at the centre of the knob (knob: blend)",
		Keys: []TopoKey{
			{Key: "lowpass", Form: FormRC, Parts: []string{"lowpass.r", "lowpass.c"}, Default: []float64{47e3, 10e-9}, Role: "blend low-pass leg"},
			{Key: "highpass", Form: FormCR, Parts: []string{"highpass.r", "highpass.c"}, Default: []float64{27e3, 2.2e-9}, Role: "blend high-pass leg"},
			{Key: "pot", Form: FormPot, Parts: []string{"pot"}, Default: []float64{100e3}, Taper: Linear, Role: "blend pot"},
		},
	}
}

// Knobs returns the names of the topology's knobs (its pots), in key order.
func (t *Topology) Knobs() []string {
	var ks []string
	for _, k := range t.Keys {
		if k.Form == FormPot {
			if t.Name == BlendNetwork {
				ks = append(ks, BlendKnob)
			} else {
				ks = append(ks, k.Parts[0])
			}
		}
	}
	return ks
}

// KeyNames returns the topology's keys, for messages.
func (t *Topology) KeyNames() []string {
	var ks []string
	for _, k := range t.Keys {
		ks = append(ks, k.Key)
	}
	return ks
}

// DefaultValues returns the parts the topology's defaults give.
func (t *Topology) DefaultValues() TopoValues {
	v := TopoValues{}
	for _, k := range t.Keys {
		for i, name := range k.Parts {
			if k.Default[i] == 0 {
				continue
			}
			p := NetPart{Name: name, Value: k.Default[i], Kind: k.kind(i)}
			if k.Form == FormPot {
				p.Taper = Taper{Law: k.Taper}
			}
			v[name] = p
		}
	}
	return v
}

// DefaultDesign returns a starting design for the topology: its default
// parts behind a 10 kΩ source into 1 MΩ, over the default band, no filter
// sections, no level pot.
func (t *Topology) DefaultDesign() *Design {
	d := &Design{Name: t.Name + " (invented starting values)", Band: DefaultBand, Source: Source{Impedance: 10e3}, Load: DefaultLoad}
	if t.Name == BlendNetwork {
		v := t.DefaultValues()
		d.Tone = Tone{Network: BlendNetwork,
			Lowpass:  RC{R: v["lowpass.r"].Value, C: v["lowpass.c"].Value},
			Highpass: RC{R: v["highpass.r"].Value, C: v["highpass.c"].Value},
			Pot:      PotPart{Value: v["pot"].Value, Taper: v["pot"].Taper}}
		return d
	}
	d.Tone = Tone{Network: t.Name, Parts: t.Expand(t.DefaultValues())}
	return d
}

// kind returns the kind of the key's i-th part.
func (k TopoKey) kind(i int) PartKind {
	switch k.Form {
	case FormR:
		return PartResistor
	case FormC:
		return PartCapacitor
	case FormPot:
		return PartPot
	}
	if i == 0 {
		return PartResistor
	}
	return PartCapacitor
}

// role returns the role of the key's i-th part.
func (k TopoKey) role(i int) string {
	if k.Form == FormRC || k.Form == FormCR {
		return k.Role + [...]string{" R", " C"}[i]
	}
	return k.Role
}

// partRole returns the role of a built-in's part, or "" when the design's
// tone network is not a built-in or has no such part.
func (t *Tone) partRole(name string) string {
	if tp := t.topology(); tp != nil {
		for _, k := range tp.Keys {
			for i, n := range k.Parts {
				if n == name {
					return k.role(i)
				}
			}
		}
	}
	return ""
}

// partKey returns the design-file key of a part of the tone network, for
// messages: tone.parts.NAME.r for the netlist form, tone.KEY (tone.KEY.r,
// tone.KEY.value) for a built-in.
func (t *Tone) partKey(p NetPart) string {
	if tp := t.topology(); tp != nil {
		for _, k := range tp.Keys {
			for i, n := range k.Parts {
				if n != p.Name {
					continue
				}
				switch k.Form {
				case FormPot:
					return "tone." + k.Key + ".value"
				case FormRC, FormCR:
					return "tone." + k.Key + "." + [...]string{"r", "c"}[i]
				}
				return "tone." + k.Key
			}
		}
	}
	return "tone.parts." + p.Name + "." + p.Kind.key()
}

// topoTone reads a built-in's keys and expands them into t.Parts.
func (dec *Decoder) topoTone(n *yaml.Node, path string, tp *Topology, t *Tone) error {
	v := TopoValues{}
	seen := map[string]bool{}
	keys := []Key{{"network", func(*yaml.Node, string) error { return nil }}}
	for _, k := range tp.Keys {
		k := k
		keys = append(keys, Key{k.Key, func(n *yaml.Node, p string) error {
			seen[k.Key] = true
			return dec.topoKey(n, p, k, v)
		}})
	}
	if err := dec.Map(n, path, keys...); err != nil {
		return err
	}
	for _, k := range tp.Keys {
		if !seen[k.Key] && !k.Optional {
			return dec.Errorf(n, path, "missing key %s: the %s network's keys are %s (tonewright new %s writes them all)", k.Key, tp.Name, strings.Join(tp.KeyNames(), ", "), tp.Name)
		}
	}
	t.Parts = tp.Expand(v)
	return nil
}

// topoKey reads one key of a built-in into v.
func (dec *Decoder) topoKey(n *yaml.Node, path string, k TopoKey, v TopoValues) error {
	switch k.Form {
	case FormR, FormC:
		unit := map[KeyForm]string{FormR: "Ω", FormC: "F"}[k.Form]
		x, err := dec.ValueIn(n, path, unit)
		if err != nil {
			return err
		}
		if k.Optional && x == 0 {
			return nil // 0: the optional part is left out
		}
		v[k.Parts[0]] = NetPart{Name: k.Parts[0], Kind: k.kind(0), Value: x}
		return nil
	case FormRC, FormCR:
		var rc RC
		if err := dec.RC(n, path, &rc); err != nil {
			return err
		}
		v[k.Parts[0]] = NetPart{Name: k.Parts[0], Kind: PartResistor, Value: rc.R}
		v[k.Parts[1]] = NetPart{Name: k.Parts[1], Kind: PartCapacitor, Value: rc.C}
		return nil
	}
	p := NetPart{Name: k.Parts[0], Kind: PartPot, Taper: Taper{Law: Linear}}
	if n.Kind == yaml.ScalarNode {
		x, err := dec.ValueIn(n, path, "Ω")
		p.Value = x
		v[p.Name] = p
		return err
	}
	var pp PotPart
	var pos *float64
	var rest []*yaml.Node // value, taper and midpoint go to dec.Pot
	for i := 0; i+1 < len(n.Content); i += 2 {
		if n.Content[i].Value == "position" {
			x, err := dec.Number(n.Content[i+1], join(path, "position"))
			if err != nil {
				return err
			}
			if !(x >= 0 && x <= 1) {
				return dec.Errorf(n.Content[i+1], join(path, "position"), "%v is outside 0..1", x)
			}
			pos = &x
			continue
		}
		rest = append(rest, n.Content[i], n.Content[i+1])
	}
	m := *n
	m.Content = rest
	if err := dec.Map(&m, path,
		Key{"value", func(*yaml.Node, string) error { return nil }},
		Key{"taper", func(*yaml.Node, string) error { return nil }},
		Key{"midpoint", func(*yaml.Node, string) error { return nil }},
		Key{"position", nil}); err != nil {
		return err
	}
	if err := dec.Pot(&m, path, &pp); err != nil {
		return err
	}
	p.Value, p.Taper, p.Position = pp.Value, pp.Taper, pos
	v[p.Name] = p
	return nil
}

// topoYAML writes a built-in's keys from its parts, as topoTone reads them.
func (t *Tone) topoYAML(b *bytes.Buffer, tp *Topology) {
	parts := map[string]NetPart{}
	for _, p := range t.Parts {
		parts[p.Name] = p
	}
	f := eseries.Format
	for _, k := range tp.Keys {
		p, ok := parts[k.Parts[0]]
		if !ok {
			continue
		}
		switch k.Form {
		case FormR, FormC:
			fmt.Fprintf(b, "  %s: %s\n", k.Key, f(p.Value))
		case FormRC:
			fmt.Fprintf(b, "  %s: {r: %s, c: %s}\n", k.Key, f(p.Value), f(parts[k.Parts[1]].Value))
		case FormCR:
			fmt.Fprintf(b, "  %s: {c: %s, r: %s}\n", k.Key, f(parts[k.Parts[1]].Value), f(p.Value))
		case FormPot:
			s := fmt.Sprintf("{value: %s, taper: %s", f(p.Value), p.Taper)
			if p.Taper.Midpoint > 0 {
				s += ", midpoint: " + trimFloat(p.Taper.Midpoint)
			}
			if p.Position != nil {
				s += ", position: " + trimFloat(*p.Position)
			}
			fmt.Fprintf(b, "  %s: %s}\n", k.Key, s)
		}
	}
}
