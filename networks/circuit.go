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
	var level *Level
	if d.Level != nil {
		level = &Level{Pot: Pot{Value: d.Level.Pot.Value, Taper: d.Level.Pot.Taper, Position: s[LevelKnob]}}
	}
	return assemble(d.Source, func(n *Network, out string) {
		buildParts(n, d.ToneParts(), s, func(node string) string {
			switch {
			case node == NetOut:
				return out
			case node == NetGnd || isGround(node):
				return Ground
			}
			return node
		})
	}, d.Filters, level, d.Load, opt)
}

// assemble builds the chain around a tone network, which tone adds
// between NodeIn and its output node out: the source ahead of it, the
// filter sections, the level pot and the load after it, as the comment
// above says.
func assemble(src Source, tone func(n *Network, out string), filters []RC, level *Level, load Load, opt circuitOptions) *Network {
	n := &Network{}
	if opt.noSource {
		n.SetSource(NodeIn, 0)
	} else {
		drive := src.build(n, NodeIn)
		n.SetSource(drive, src.Impedance)
	}
	toneOut := NodeTone
	if len(filters) == 0 && level == nil {
		toneOut = NodeOut
	}
	tone(n, toneOut)
	last := toneOut
	if len(filters) > 0 {
		end := NodeOut
		if level != nil {
			end = "filtered"
		}
		BuildLadder(n, filters, toneOut, end)
		last = end
	}
	if level != nil {
		level.Build(n, last, NodeOut)
	}
	if !opt.noLoad {
		load.Build(n, NodeOut)
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
// blend form the chain's two-port cascade (Compiled), for any other its
// circuit compiled to poles, zeros and gain (ZPK). Both are held to the
// nodal solver by tests.
func (d *Design) Compile(s Setting) (Evaluator, error) {
	s = d.complete(s)
	if d.Tone.Network == BlendNetwork {
		c := d.ChainAt(s)
		return c.Compile(), nil
	}
	n := d.circuit(s, circuitOptions{})
	solver, err := n.Compile()
	if err != nil {
		return nil, err
	}
	z, err := n.CompileZPK()
	if err != nil || !agrees(z, solver, d.Band) {
		return solver, nil
	}
	return z, nil
}

// ZPKTolerance is how closely, relative, a compiled ZPK must agree with the
// nodal solver at the check frequencies for Design.Compile to use it.
const ZPKTolerance = 1e-9

// agrees reports whether z equals the nodal solver within ZPKTolerance,
// relative, at 13 frequencies spread in log f from band low / 10 to
// 10 × band high (the range the figures search). Where the poles and zeros
// found by eigenvalues are not accurate enough (a few networks with parts
// many decades apart), Design.Compile falls back to the solver, which is
// exact and slower.
func agrees(z *ZPK, s *Solver, b Band) bool {
	lo, hi := math.Log(b.From/10), math.Log(10*b.To)
	for i := 0; i <= 12; i++ {
		f := math.Exp(lo + (hi-lo)*float64(i)/12)
		h, ref := z.Transfer(f), s.Transfer(f)
		if !(cmplx.Abs(h-ref) <= ZPKTolerance*cmplx.Abs(ref)) {
			return false
		}
	}
	return true
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
