package networks

import (
	"fmt"
	"math"
	"math/cmplx"
)

// ToneNetworks returns the names tone.network accepts.
func ToneNetworks() []string {
	names := []string{BlendNetwork, NetlistNetwork}
	for _, t := range Topologies()[1:] {
		names = append(names, t.Name)
	}
	return names
}

// The chain around any tone network, in the nodes of the circuit a design
// becomes: the source drives "drive" through its impedance (when there is
// a coupling capacitor, which joins "drive" to "in"; else "in" directly);
// the tone network runs from "in" to its output, which is "tone" when
// filter sections or a level pot follow and "out" otherwise; the sections
// end at f1, f2, … (the last at "filtered" when a level pot follows, else
// at "out"); the level pot's wiper is "out"; the load hangs on "out".

// circuitOptions leave parts of the chain out, to measure impedances.
type circuitOptions struct {
	noSource bool // the ideal source drives "in" directly: no impedance, no coupling capacitor
	noLoad   bool // the load is left off
}

// Network returns the design as one circuit at the knob setting s (knobs
// s does not name sit at their positions): the one model that the nodal
// solver, SPICE decks and every compiled evaluator are made from.
func (d *Design) Network(s Setting) *Network {
	return d.circuit(d.complete(s), circuitOptions{})
}

// complete fills in the knobs s does not name.
func (d *Design) complete(s Setting) Setting {
	full, _ := d.Setting(nil)
	for k, v := range s {
		full[k] = v
	}
	return full
}

func (d *Design) circuit(s Setting, opt circuitOptions) *Network {
	n := &Network{}
	if opt.noSource {
		n.SetSource(NodeIn, 0)
	} else {
		drive := d.Source.build(n, NodeIn)
		n.SetSource(drive, d.Source.Impedance)
	}
	toneOut := NodeTone
	if len(d.Filters) == 0 && d.Level == nil {
		toneOut = NodeOut
	}
	buildParts(n, d.ToneParts(), s, func(node string) string {
		switch {
		case node == NetOut:
			return toneOut
		case node == NetGnd || isGround(node):
			return Ground
		}
		return node
	})
	last := toneOut
	if len(d.Filters) > 0 {
		end := NodeOut
		if d.Level != nil {
			end = "filtered"
		}
		BuildLadder(n, d.Filters, toneOut, end)
		last = end
	}
	if d.Level != nil {
		Level{Pot: Pot{Value: d.Level.Pot.Value, Taper: d.Level.Pot.Taper, Position: s[LevelKnob]}}.Build(n, last, NodeOut)
	}
	if !opt.noLoad {
		d.Load.Build(n, NodeOut)
	}
	n.SetOutput(NodeOut)
	return n
}

// Evaluator is a design compiled at one knob setting: its exact transfer
// V(out)/V(source) and gain in dB at any frequency.
type Evaluator interface {
	Response
	Transfer(f float64) complex128
}

// Compile returns the design's evaluator at the knob setting s: for the
// blend form the chain's two-port cascade (Compiled), for any other the
// nodal solver of its circuit.
func (d *Design) Compile(s Setting) (Evaluator, error) {
	s = d.complete(s)
	if d.Tone.Network == BlendNetwork {
		c := d.ChainAt(s)
		return c.Compile(), nil
	}
	return d.circuit(s, circuitOptions{}).Compile()
}

// Impedances returns the magnitudes of the input and output impedances at
// frequency f and setting s: |Z| looking into node "in" after the source's
// impedance and coupling capacitor, with the load connected; and |Z|
// looking back into "out" with the source's voltage set to zero (its
// impedance and coupling capacitor in place) and the load removed.
func (d *Design) Impedances(s Setting, f float64) (in, out float64, err error) {
	s = d.complete(s)
	si, err := d.circuit(s, circuitOptions{noSource: true}).Compile()
	if err != nil {
		return 0, 0, err
	}
	if err := si.Solve(f); err != nil {
		return 0, 0, err
	}
	in = cmplx.Abs(1 / si.SourceCurrent())
	so, err := d.circuit(s, circuitOptions{noLoad: true}).Compile()
	if err != nil {
		return 0, 0, err
	}
	z, err := so.OutputImpedance(f)
	if err != nil {
		return 0, 0, err
	}
	out = cmplx.Abs(z)
	if math.IsNaN(in) || math.IsInf(in, 0) || math.IsNaN(out) || math.IsInf(out, 0) {
		return 0, 0, fmt.Errorf("the impedances at %g Hz are not finite: a part value is at the edge of its range", f)
	}
	return in, out, nil
}
