package networks

import (
	"math"
	"math/cmplx"
)

// Chain is the tone-and-level section in signal order: the driving Source,
// the Blend tone network, an RC low-pass ladder, an optional Level pot, and
// the Load.
type Chain struct {
	Source  Source
	Blend   Blend
	Filters []RC
	Level   *Level // nil: no level pot
	Load    Load
}

// The names of a chain's nodes in its Network: the source drives "drive"
// (only with a coupling capacitor) or "in"; the blend's legs end at "lp"
// and "hp", its wiper is "tone"; filter sections end at "f1", "f2", …; the
// last node is always "out".
const (
	NodeIn   = "in"
	NodeTone = "tone"
	NodeOut  = "out"
)

// Network returns the chain as a general network, for the nodal solver and
// for SPICE decks.
func (c *Chain) Network() *Network {
	n := &Network{}
	drive := c.Source.build(n, NodeIn)
	n.SetSource(drive, c.Source.Impedance)
	wiper := NodeTone
	if len(c.Filters) == 0 && c.Level == nil {
		wiper = NodeOut
	}
	c.Blend.Build(n, NodeIn, wiper)
	last := wiper
	if len(c.Filters) > 0 {
		end := NodeOut
		if c.Level != nil {
			end = "filtered"
		}
		BuildLadder(n, c.Filters, wiper, end)
		last = end
	}
	if c.Level != nil {
		c.Level.Build(n, last, NodeOut)
	}
	c.Load.Build(n, NodeOut)
	n.SetOutput(NodeOut)
	return n
}

// Compiled is a chain reduced to the numbers its two-port cascade needs:
// conductances, capacitances and the pots' segments for their positions. It
// evaluates a frequency with a few dozen complex multiply-adds and no
// allocation. Build it with Compile or, reusing its storage, CompileInto.
type Compiled struct {
	zsR, csrc    float64 // source resistance and coupling capacitor (0: none)
	blend        Blend
	ra, rb       float64 // blend pot segments
	filters      []RC
	level        bool
	la, lb       float64 // level pot: series (wiper to top) and shunt (wiper to ground)
	loadG, loadC float64
}

// Compile returns the chain's fast evaluator. The chain's values are not
// checked here; Design.Validate and Network.Compile check them.
func (c *Chain) Compile() *Compiled {
	var k Compiled
	c.CompileInto(&k)
	return &k
}

// CompileInto compiles the chain into k, reusing k's filter storage.
func (c *Chain) CompileInto(k *Compiled) {
	k.zsR, k.csrc = c.Source.Impedance, c.Source.SeriesC
	k.blend = c.Blend
	k.ra, k.rb = c.Blend.Pot.Segments()
	k.filters = append(k.filters[:0], c.Filters...)
	k.level = c.Level != nil
	if k.level {
		k.lb, k.la = c.Level.Pot.Segments()
	}
	k.loadG, k.loadC = 0, c.Load.C
	if !math.IsInf(c.Load.R, 1) {
		k.loadG = 1 / c.Load.R
	}
}

// sourceZ returns the source's series impedance at s.
func (k *Compiled) sourceZ(s complex128) complex128 {
	z := complex(k.zsR, 0)
	if k.csrc > 0 {
		z += 1 / (s * complex(k.csrc, 0))
	}
	return z
}

// tail multiplies r by everything after the source, up to and, with load
// set, including the load.
func (k *Compiled) tail(r row, s complex128, load bool) row {
	r = r.mul(k.blend.abcd(s, k.ra, k.rb))
	for _, f := range k.filters {
		r = r.seriesZ(complex(f.R, 0)).shuntY(s * complex(f.C, 0))
	}
	if k.level {
		r = r.seriesZ(complex(k.la, 0)).shuntY(complex(1/k.lb, 0))
	}
	if load {
		r = r.shuntY(complex(k.loadG, 0) + s*complex(k.loadC, 0))
	}
	return r
}

// Transfer returns V(out)/V(source) at frequency f (Hz).
func (k *Compiled) Transfer(f float64) complex128 {
	s := complex(0, 2*math.Pi*f)
	r := k.tail(row{1, k.sourceZ(s)}, s, true)
	return 1 / r.a
}

// GainDB returns 20·log10|V(out)/V(source)| at frequency f.
func (k *Compiled) GainDB(f float64) float64 {
	s := complex(0, 2*math.Pi*f)
	r := k.tail(row{1, k.sourceZ(s)}, s, true)
	return -10 * math.Log10(real(r.a)*real(r.a)+imag(r.a)*imag(r.a))
}

// InputImpedance returns the impedance the section presents to the source
// at node "in" (after the source impedance and coupling capacitor), with the
// load connected.
func (k *Compiled) InputImpedance(f float64) complex128 {
	s := complex(0, 2*math.Pi*f)
	// The full matrix's first column of the cascade after the source gives
	// V_in/I_in = A/C with the output open; the load is inside the cascade.
	t := abcd{1, 0, 0, 1}.mul(k.blend.abcd(s, k.ra, k.rb))
	for _, fl := range k.filters {
		t = t.mul(series(complex(fl.R, 0))).mul(shunt(s * complex(fl.C, 0)))
	}
	if k.level {
		t = t.mul(series(complex(k.la, 0))).mul(shunt(complex(1/k.lb, 0)))
	}
	t = t.mul(shunt(complex(k.loadG, 0) + s*complex(k.loadC, 0)))
	return t.a / t.c
}

// OutputImpedance returns the Thevenin impedance the load sees at "out":
// the section with the source shorted, without the load.
func (k *Compiled) OutputImpedance(f float64) complex128 {
	s := complex(0, 2*math.Pi*f)
	r := k.tail(row{1, k.sourceZ(s)}, s, false)
	if r.a == 0 {
		return cmplx.Inf()
	}
	return r.b / r.a
}
