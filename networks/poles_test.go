package networks

import (
	"math"
	"math/cmplx"
	"testing"
)

// quadRoots returns the roots of a·s² + b·s + c (the textbook quadratic
// formula, in the cancellation-free form for the smaller root).
func quadRoots(a, b, c float64) [2]complex128 {
	d := b*b - 4*a*c
	if d >= 0 {
		q := -0.5 * (b + math.Copysign(math.Sqrt(d), b))
		return [2]complex128{complex(q/a, 0), complex(c/q, 0)}
	}
	re, im := -b/(2*a), math.Sqrt(-d)/(2*a)
	return [2]complex128{complex(re, -im), complex(re, im)}
}

// matchRoots reports the largest relative distance between got and want,
// each root of want matched to its nearest unused root of got.
func matchRoots(got, want []complex128) float64 {
	if len(got) != len(want) {
		return math.Inf(1)
	}
	used := make([]bool, len(got))
	var worst float64
	for _, w := range want {
		best, bi := math.Inf(1), -1
		for i, g := range got {
			if !used[i] {
				if d := cmplx.Abs(g-w) / cmplx.Abs(w); d < best {
					best, bi = d, i
				}
			}
		}
		used[bi] = true
		worst = math.Max(worst, best)
	}
	return worst
}

func TestPolesClosedForm(t *testing.T) {
	for _, tc := range []struct {
		name  string
		build func(n *Network)
		want  []complex128
	}{
		{
			// Single RC low-pass from an ideal source: H = 1/(1 + sRC), so the
			// pole is −1/(RC) (circuit theory).
			name: "RC",
			build: func(n *Network) {
				n.SetSource("in", 0)
				n.Resistor("R", "in", "out", 10e3)
				n.Capacitor("C", "out", Ground, 10e-9)
			},
			want: []complex128{-1 / (10e3 * 10e-9)},
		},
		{
			// The same RC behind a 2.2 kΩ source resistance: the source's
			// resistance adds in series, pole −1/((R_s + R)C).
			name: "RC behind source resistance",
			build: func(n *Network) {
				n.SetSource("in", 2.2e3)
				n.Resistor("R", "in", "out", 10e3)
				n.Capacitor("C", "out", Ground, 10e-9)
			},
			want: []complex128{-1 / (12.2e3 * 10e-9)},
		},
		{
			// Two-section RC ladder (R1 into node a, C1 a to ground, R2 a to
			// out, C2 out to ground) from an ideal source. Nodal analysis
			// (derived here): at out, (Vo − Va)/R2 + sC2·Vo = 0 gives
			// Va = Vo(1 + sR2C2); at a, (Va − u)/R1 + sC1·Va + (Va − Vo)/R2 = 0;
			// substituting, u = Vo·[1 + s(R1C1 + R2C2 + R1C2) + s²R1R2C1C2],
			// so the poles are the roots of that quadratic.
			name: "two-section ladder",
			build: func(n *Network) {
				n.SetSource("in", 0)
				n.Resistor("R1", "in", "a", 10e3)
				n.Capacitor("C1", "a", Ground, 22e-9)
				n.Resistor("R2", "a", "out", 47e3)
				n.Capacitor("C2", "out", Ground, 1e-9)
			},
			want: func() []complex128 {
				r1, c1, r2, c2 := 10e3, 22e-9, 47e3, 1e-9
				q := quadRoots(r1*r2*c1*c2, r1*c1+r2*c2+r1*c2, 1)
				return q[:]
			}(),
		},
		{
			// Series RLC from an ideal source, output across C:
			// H = 1/(s²LC + sRC + 1) (circuit theory); underdamped here.
			name: "series RLC underdamped",
			build: func(n *Network) {
				n.SetSource("in", 0)
				n.Resistor("R", "in", "a", 100)
				n.Inductor("L", "a", "out", 0.5)
				n.Capacitor("C", "out", Ground, 100e-9)
			},
			want: func() []complex128 {
				q := quadRoots(0.5*100e-9, 100*100e-9, 1)
				return q[:]
			}(),
		},
		{
			// The same, overdamped (R > 2√(L/C)).
			name: "series RLC overdamped",
			build: func(n *Network) {
				n.SetSource("in", 0)
				n.Resistor("R", "in", "a", 20e3)
				n.Inductor("L", "a", "out", 0.5)
				n.Capacitor("C", "out", Ground, 100e-9)
			},
			want: func() []complex128 {
				q := quadRoots(0.5*100e-9, 20e3*100e-9, 1)
				return q[:]
			}(),
		},
	} {
		t.Run(tc.name, func(t *testing.T) {
			var n Network
			tc.build(&n)
			n.SetOutput("out")
			got, err := n.Poles()
			if err != nil {
				t.Fatal(err)
			}
			if d := matchRoots(got, tc.want); d > 1e-12 {
				t.Errorf("poles %v, closed form %v (relative error %g)", got, tc.want, d)
			}
		})
	}
}
