package networks

// abcd is a two-port transmission matrix [[A, B], [C, D]] relating the
// voltage and current entering port 1 to those leaving port 2:
// V1 = A·V2 + B·I2, I1 = C·V2 + D·I2.
type abcd struct{ a, b, c, d complex128 }

func (t abcd) mul(u abcd) abcd {
	return abcd{
		t.a*u.a + t.b*u.c, t.a*u.b + t.b*u.d,
		t.c*u.a + t.d*u.c, t.c*u.b + t.d*u.d,
	}
}

// series is the matrix of an impedance z in the signal path.
func series(z complex128) abcd { return abcd{1, z, 0, 1} }

// shunt is the matrix of an admittance y from the signal path to ground.
func shunt(y complex128) abcd { return abcd{1, 0, y, 1} }

// row is the top row (A, B) of a cascade, all the transfer needs: with the
// output open, V1/V2 = A.
type row struct{ a, b complex128 }

func (r row) mul(u abcd) row { return row{r.a*u.a + r.b*u.c, r.a*u.b + r.b*u.d} }

// seriesZ and shuntY multiply a row by a series impedance or a shunt
// admittance without forming the matrix.
func (r row) seriesZ(z complex128) row { return row{r.a, r.a*z + r.b} }
func (r row) shuntY(y complex128) row  { return row{r.a + r.b*y, r.b} }
