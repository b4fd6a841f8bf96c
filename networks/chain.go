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
	return assemble(c.Source, func(n *Network, out string) { c.Blend.Build(n, NodeIn, out) }, c.Filters, c.Level, c.Load, circuitOptions{})
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
	gc           gainConsts // GainDB's constants (chainfast.go)
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
	k.prepare()
}

// sourceZ returns the source's series impedance at angular frequency w.
func (k *Compiled) sourceZ(w float64) complex128 {
	z := complex(k.zsR, 0)
	if k.csrc > 0 {
		z += complex(0, -1/(w*k.csrc))
	}
	return z
}

// tail multiplies r by everything after the source, up to and, with load
// set, including the load.
func (k *Compiled) tail(r row, w float64, load bool) row {
	return k.afterBlend(r.mul(k.blend.abcd(w, k.ra, k.rb)), w, load)
}

// afterBlend multiplies r by the filter sections, the level pot and, with
// load set, the load.
func (k *Compiled) afterBlend(r row, w float64, load bool) row {
	for _, f := range k.filters {
		r = r.seriesZ(complex(f.R, 0)).shuntY(complex(0, w*f.C))
	}
	if k.level {
		r = r.seriesZ(complex(k.la, 0)).shuntY(complex(1/k.lb, 0))
	}
	if load {
		r = r.shuntY(complex(k.loadG, w*k.loadC))
	}
	return r
}

// Transfer returns V(out)/V(source) at frequency f (Hz).
func (k *Compiled) Transfer(f float64) complex128 {
	w := 2 * math.Pi * f
	r := k.tail(row{1, k.sourceZ(w)}, w, true)
	return 1 / r.a
}

// GainDB returns 20·log10|V(out)/V(source)| at frequency f. It is the
// search's inner loop, so it skips the blend matrix's common factor −1/y12:
// the row (1, Zs) times the blend matrix scaled by −y12 is
// (y22 + Zs·det Y, 1 + Zs·y11), and |H| = |y12| / |A'|. It is computed in
// real arithmetic with the parts' conductances prepared at compile time,
// and stays finite however far down a long ladder takes the gain (see
// gainDB in chainfast.go).
func (k *Compiled) GainDB(f float64) float64 { return k.gainDB(f) }

// Power returns |V(out)/V(source)|² at frequency f: GainDB without the
// logarithm, for scanning. It may underflow to 0 where GainDB is finite.
func (k *Compiled) Power(f float64) float64 {
	n, d, e := k.powerParts(f)
	if e == 0 {
		return n / d
	}
	return math.Ldexp(n/d, -2*e)
}

// fillPower writes Power(freqs[i]) into out[i].
func (k *Compiled) fillPower(freqs, out []float64) {
	for i, f := range freqs {
		n, d, e := k.powerParts(f)
		if e == 0 {
			out[i] = n / d
		} else {
			out[i] = math.Ldexp(n/d, -2*e)
		}
	}
}

// gainDBComplex is GainDB in the complex two-port arithmetic of Transfer,
// kept as the reference that gainDB is tested against.
func (k *Compiled) gainDBComplex(f float64) float64 {
	w := 2 * math.Pi * f
	zs := k.sourceZ(w)
	y11, y12, y22 := k.blend.admittances(w, k.ra, k.rb)
	r := k.afterBlend(row{y22 + zs*(y11*y22-y12*y12), 1 + zs*y11}, w, true)
	n := real(y12)*real(y12) + imag(y12)*imag(y12)
	d := real(r.a)*real(r.a) + imag(r.a)*imag(r.a)
	return 10 * math.Log10(n/d)
}

// InputImpedance returns the impedance the section presents to the source
// at node "in" (after the source impedance and coupling capacitor), with the
// load connected.
func (k *Compiled) InputImpedance(f float64) complex128 {
	w := 2 * math.Pi * f
	// The cascade after the source, load included, gives V_in/I_in = A/C
	// with the output open. Its top row (A, B) and bottom row (C, D) are
	// each a row times the same matrices.
	t := k.blend.abcd(w, k.ra, k.rb)
	top := k.afterBlend(row{t.a, t.b}, w, true)
	bottom := k.afterBlend(row{t.c, t.d}, w, true)
	return top.a / bottom.a
}

// OutputImpedance returns the Thevenin impedance the load sees at "out":
// the section with the source shorted, without the load.
func (k *Compiled) OutputImpedance(f float64) complex128 {
	w := 2 * math.Pi * f
	r := k.tail(row{1, k.sourceZ(w)}, w, false)
	if r.a == 0 {
		return cmplx.Inf()
	}
	return r.b / r.a
}
