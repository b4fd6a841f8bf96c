package networks

import "math"

// gainConsts are the per-compile constants of Compiled.GainDB: the
// conductances and their products, which would otherwise cost a division
// or a multiplication at every frequency.
type gainConsts struct {
	g1, ga, gb   float64 // low-pass leg R, pot segments, as conductances
	pa, pb       float64 // real parts of the legs' output-node admittances
	g1sq, g1ga   float64
	gasq, gbsq   float64
	c1, c2       float64 // low-pass and high-pass leg capacitors
	invCsrc      float64 // 1/C of the coupling capacitor, 0 for none
	levelG       float64 // 1/(level pot's shunt segment)
	loadG, loadC float64
}

// prepare fills the constants from the compiled parts.
func (k *Compiled) prepare() {
	b := &k.blend
	c := &k.gc
	c.g1 = 1 / b.Lowpass.R
	g2 := 1 / b.Highpass.R
	c.ga, c.gb = 1/k.ra, 1/k.rb
	c.pa, c.pb = c.g1+c.ga, g2+c.gb
	c.g1sq, c.g1ga = c.g1*c.g1, c.g1*c.ga
	c.gasq, c.gbsq = c.ga*c.ga, c.gb*c.gb
	c.c1, c.c2 = b.Lowpass.C, b.Highpass.C
	c.invCsrc = 0
	if k.csrc > 0 {
		c.invCsrc = 1 / k.csrc
	}
	c.levelG = 0
	if k.level {
		c.levelG = 1 / k.lb
	}
	c.loadG, c.loadC = k.loadG, k.loadC
}

// rescaleAbove is where gainDB's running row is scaled down by 2^-256,
// keeping its squares finite however far a long ladder attenuates.
const rescaleAbove = 0x1p256

// gainDB is GainDB in real arithmetic: the same formulas as
// Blend.admittances, row.seriesZ and row.shuntY written out on real and
// imaginary parts, with the constants of gainConsts, and with no division
// but the final ratio. The legs' node reciprocals ia = conj(Pa)/da and
// ib = conj(Pb)/db (Pa = pa + j·qa, da = |Pa|², likewise b) are replaced by
// S·ia = db·conj(Pa) and S·ib = da·conj(Pb) with S = da·db, which scales
// every Y parameter by S; the row is scaled by W = ω·S², which turns the
// coupling capacitor's impedance into ω·Zs = ω·R − j/C. A common positive
// factor of the row leaves |H| = |y12|/|A'| unchanged once undone:
// |H|² = |S·y12|²·ω²·S²/|W·A'|². The row is rescaled by powers of two when
// it grows past rescaleAbove, so the result is finite for any parts a
// design accepts.
func (k *Compiled) gainDB(f float64) float64 {
	c := &k.gc
	w := 2 * math.Pi * f
	qa, qb := w*c.c1, w*c.c2
	da, db := c.pa*c.pa+qa*qa, c.pb*c.pb+qb*qb
	sc := da * db
	iar, iai := db*c.pa, -db*qa // S·ia
	ibr, ibi := da*c.pb, -da*qb // S·ib
	// S times the Y parameters, y2 = j·qb being the high-pass capacitor's
	// admittance: y11 = g1 + y2 − g1²·ia − y2²·ib,
	// y12 = −g1·ga·ia − y2·gb·ib, y22 = ga + gb − ga²·ia − gb²·ib.
	qb2 := qb * qb
	y11r := sc*c.g1 - c.g1sq*iar + qb2*ibr
	y11i := sc*qb - c.g1sq*iai + qb2*ibi
	qgb := qb * c.gb
	y12r := -c.g1ga*iar + qgb*ibi
	y12i := -c.g1ga*iai - qgb*ibr
	y22r := sc*(c.ga+c.gb) - c.gasq*iar - c.gbsq*ibr
	y22i := -c.gasq*iai - c.gbsq*ibi
	// W times the row (y22 + Zs·det Y, 1 + Zs·y11):
	// (ω·S·(S·y22) + ω·Zs·(S²·det Y), ω·S² + ω·Zs·S·(S·y11)).
	detr := y11r*y22r - y11i*y22i - (y12r*y12r - y12i*y12i)
	deti := y11r*y22i + y11i*y22r - 2*y12r*y12i
	zr, zi := w*k.zsR, -c.invCsrc
	ws := w * sc
	ar := ws*y22r + zr*detr - zi*deti
	ai := ws*y22i + zr*deti + zi*detr
	br := ws*sc + sc*(zr*y11r-zi*y11i)
	bi := sc * (zr*y11i + zi*y11r)
	e := 0
	for _, s := range k.filters {
		br += s.R * ar
		bi += s.R * ai
		q := w * s.C
		ar -= q * bi
		ai += q * br
		if math.Abs(ar)+math.Abs(br) > rescaleAbove {
			ar, ai, br, bi = ar*0x1p-256, ai*0x1p-256, br*0x1p-256, bi*0x1p-256
			e += 256
		}
	}
	if k.level {
		br += k.la * ar
		bi += k.la * ai
		ar += c.levelG * br
		ai += c.levelG * bi
	}
	q := w * c.loadC
	ar, ai = ar+c.loadG*br-q*bi, ai+c.loadG*bi+q*br
	n := (y12r*y12r + y12i*y12i) * (ws * ws)
	d := ar*ar + ai*ai
	if !(n > 0x1p-900 && d > 0x1p-900 && d < 0x1p900) {
		// Far outside the usual range: take the logarithms apart.
		return 10*(math.Log10(n)-math.Log10(d)) - float64(e)*db2
	}
	return 10*math.Log10(n/d) - float64(e)*db2
}

// db2 is 20·log10(2), the decibels of a factor of two in amplitude.
var db2 = 20 * math.Log10(2)
