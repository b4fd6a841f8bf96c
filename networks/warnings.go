package networks

import (
	"fmt"
	"sort"

	"tonewright/eseries"
)

// Warnings returns what in a valid design is allowed but is most likely a
// slip: a resistance below 1 Ω (m is milli, M mega: "1m" for "1M" is the
// usual slip) and, in a netlist, a node that only one part's terminal
// touches (it carries no current, so the part does nothing: usually a
// mistyped node name). Each names the key.
func (d *Design) Warnings() []string {
	var w []string
	low := func(key string, v float64) {
		if v > 0 && v < 1 {
			w = append(w, fmt.Sprintf("%s is %s: is the prefix right? m is milli, M is mega", key, eseries.WithUnit(v, 3, "Ω")))
		}
	}
	low("source.impedance", d.Source.Impedance)
	low("load.r", d.Load.R)
	if d.Level != nil {
		low("level.pot.value", d.Level.Pot.Value)
	}
	for i, f := range d.Filters {
		low(fmt.Sprintf("filters[%d].r", i), f.R)
	}
	switch d.Tone.Network {
	case BlendNetwork:
		low("tone.lowpass.r", d.Tone.Lowpass.R)
		low("tone.highpass.r", d.Tone.Highpass.R)
		low("tone.pot.value", d.Tone.Pot.Value)
		return w
	}
	touches := map[string][]string{}
	for _, p := range d.Tone.Parts {
		if p.Kind == PartResistor || p.Kind == PartPot {
			low("tone.parts."+p.Name, p.Value)
		}
		ends := []string{p.From, p.To}
		if p.Kind == PartPot {
			ends = append(ends, p.Wiper)
		}
		for _, n := range ends {
			touches[n] = append(touches[n], p.Name)
		}
	}
	var lone []string
	for n, parts := range touches {
		if len(parts) == 1 && n != NetIn && n != NetOut && n != NetGnd && !isGround(n) {
			lone = append(lone, n)
		}
	}
	sort.Strings(lone)
	for _, n := range lone {
		w = append(w, fmt.Sprintf("tone.parts.%s: node %s joins nothing else, so %s carries no current there: is the node's name right?", touches[n][0], n, touches[n][0]))
	}
	return w
}
