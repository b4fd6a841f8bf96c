package networks

// abcd is a two-port transmission matrix [[A, B], [C, D]] relating the
// voltage and current entering port 1 to those leaving port 2:
// V1 = A·V2 + B·I2, I1 = C·V2 + D·I2. A cascade's matrix is the product of
// its stages' matrices in signal order.
type abcd struct{ a, b, c, d complex128 }

// row is one row of a cascade's matrix. The top row (A, B) is all the
// transfer needs: with the output open, V1/V2 = A.
type row struct{ a, b complex128 }

// mul multiplies a row by a stage's matrix.
func (r row) mul(u abcd) row { return row{r.a*u.a + r.b*u.c, r.a*u.b + r.b*u.d} }

// seriesZ and shuntY multiply a row by the matrix of a series impedance,
// [[1, z], [0, 1]], or of a shunt admittance, [[1, 0], [y, 1]], without
// forming it.
func (r row) seriesZ(z complex128) row { return row{r.a, r.a*z + r.b} }
func (r row) shuntY(y complex128) row  { return row{r.a + r.b*y, r.b} }
