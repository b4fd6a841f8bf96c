package networks

import (
	"encoding/json"
	"math"
	"math/rand/v2"
	"reflect"
	"slices"
	"strings"
	"sync/atomic"
	"testing"
)

func TestDefaultTolerance(t *testing.T) {
	// The series tolerances are those of IEC 60063 (from memory, as in
	// package eseries); the kind defaults are common practice, no published
	// source.
	for _, tc := range []struct {
		kind  PartKind
		value float64
		tol   float64
		basis string
	}{
		{PartResistor, 4.7e3, 0.05, "resistor default"}, // E3: kind default
		{PartResistor, 5.1e3, 0.05, "resistor default"}, // E24: 5 %, as the default
		{PartResistor, 4.99e3, 0.01, "E96 value"},
		{PartResistor, 1.02e3, 0.01, "E96 value"},
		{PartResistor, 1.01e3, 0.005, "E192 value"},
		{PartResistor, 12.34e3, 0.05, "resistor default"}, // in no series
		{PartResistor, 5.11e3, 0.02, "E48 value"},
		{PartCapacitor, 2.2e-9, 0.10, "capacitor default"},
		{PartCapacitor, 12e-9, 0.10, "capacitor default"}, // E12
		{PartCapacitor, 5.1e-9, 0.05, "E24 value"},
		{PartCapacitor, 4.99e-9, 0.01, "E96 value"},
		{PartPot, 100e3, 0.20, "pot default"},
		{PartPot, 250e3, 0.20, "pot default"},
		{PartPot, 5.1e3, 0.20, "pot default"}, // pots are not sold to E-series tolerances
	} {
		tol, basis := DefaultTolerance(Part{Kind: tc.kind, Value: tc.value})
		if tol != tc.tol || basis != tc.basis {
			t.Errorf("%v %v: %v (%s), want %v (%s)", tc.kind, tc.value, tol, basis, tc.tol, tc.basis)
		}
	}
}

func TestPartTolerancesGiven(t *testing.T) {
	d := studyDesign()
	d.Filters[0].R = 4.99e3
	pts := PartTolerances(d, map[PartKind]float64{PartCapacitor: 0.02})
	if len(pts) != len(d.StudyParts()) {
		t.Fatalf("%d parts, want %d", len(pts), len(d.StudyParts()))
	}
	for _, p := range pts {
		var want float64
		switch {
		case p.Kind == "capacitor":
			want = 0.02
		case p.Name == "filter1.r":
			want = 0.01
		case p.Kind == "resistor":
			want = 0.05
		default:
			want = 0.20
		}
		if p.Tolerance != want {
			t.Errorf("%s (%s): %v from %q, want %v", p.Name, p.Kind, p.Tolerance, p.Basis, want)
		}
	}
}

func TestCheckTolerance(t *testing.T) {
	for _, v := range []float64{0, 0.005, 0.05, 0.999} {
		if err := CheckTolerance(v); err != nil {
			t.Errorf("%v: %v", v, err)
		}
	}
	for _, v := range []float64{-0.01, 1, 1.5, math.NaN(), math.Inf(1)} {
		if err := CheckTolerance(v); err == nil {
			t.Errorf("%v accepted", v)
		}
	}
}

func TestParseDistribution(t *testing.T) {
	for s, want := range map[string]Distribution{"uniform": Uniform, "normal": Normal, " Normal ": Normal} {
		if d, err := ParseDistribution(s); err != nil || d != want {
			t.Errorf("%q: %v %v", s, d, err)
		}
	}
	if _, err := ParseDistribution("gauss"); err == nil || !strings.Contains(err.Error(), "uniform or normal") {
		t.Errorf("gauss: %v", err)
	}
}

// The percentile method is linear interpolation between order statistics
// (Hyndman and Fan, 1996, type 7, the default of R and of NumPy); the
// reference values are worked by hand from h = (n − 1)·p/100.
func TestPercentile(t *testing.T) {
	x := []float64{1, 2, 4, 8, 16}
	for _, tc := range []struct{ p, want float64 }{
		{0, 1}, {100, 16}, {50, 4}, {25, 2}, {5, 1.2}, {95, 14.4}, {90, 12.8},
	} {
		if got := Percentile(x, tc.p); math.Abs(got-tc.want) > 1e-12 {
			t.Errorf("p%v = %v, want %v", tc.p, got, tc.want)
		}
	}
	if got := Percentile([]float64{3}, 95); got != 3 {
		t.Errorf("one value: %v", got)
	}
}

// The draws have the moments of their distributions: a uniform on [−1, 1]
// has mean 0 and variance 1/3; a normal with σ = 1/3 truncated at ±3σ has
// variance σ²·(1 − 2·3·φ(3)/(2Φ(3) − 1)) (the textbook variance of a
// truncated normal), σ·0.98661 as standard deviation. No draw lies outside
// [−1, 1].
func TestUnitDrawMoments(t *testing.T) {
	phi3 := math.Exp(-4.5) / math.Sqrt(2*math.Pi)
	truncSD := math.Sqrt(1-6*phi3/math.Erf(3/math.Sqrt2)) / 3
	for _, tc := range []struct {
		dist Distribution
		sd   float64
	}{
		{Uniform, 1 / math.Sqrt(3)},
		{Normal, truncSD},
	} {
		var pcg rand.PCG
		rng := rand.New(&pcg)
		const n = 200000
		var sum, sum2 float64
		for i := 0; i < n; i++ {
			u := unitDraw(&pcg, rng, 7, i, 3, tc.dist)
			if !(u >= -1 && u <= 1) {
				t.Fatalf("%v draw %v outside [-1, 1]", tc.dist, u)
			}
			sum += u
			sum2 += u * u
		}
		mean := sum / n
		sd := math.Sqrt(sum2/n - mean*mean)
		// Sampling error of the mean is sd/√n ≈ 1.3e-3; allow 4 of them.
		if math.Abs(mean) > 4*tc.sd/math.Sqrt(n) {
			t.Errorf("%v: mean %v, want 0", tc.dist, mean)
		}
		if relErr(sd, tc.sd) > 0.005 {
			t.Errorf("%v: standard deviation %v, want %v", tc.dist, sd, tc.sd)
		}
	}
}

// With every tolerance zero, every trial is the nominal design: no spread.
func TestToleranceZeroSpread(t *testing.T) {
	d := studyDesign()
	parts := PartTolerances(d, map[PartKind]float64{PartResistor: 0, PartCapacitor: 0, PartPot: 0})
	for _, dist := range []Distribution{Uniform, Normal} {
		rep, err := Tolerance(d, ToleranceSpec{Parts: parts, Dist: dist, Trials: 200, Seed: 1, At: Setting{BlendKnob: 0.5}, CurveHz: []float64{100, 1000}})
		if err != nil {
			t.Fatal(err)
		}
		nom := rep.Nominal
		if nom.Scoop == nil || nom.CornerHz == nil {
			t.Fatal("the study design should have a scoop and a corner")
		}
		for _, c := range []struct {
			name string
			s    *Spread
			want float64
		}{
			{"gain", &rep.Gain1kDB, nom.Gain1kDB},
			{"scoop hz", rep.ScoopHz, nom.Scoop.Hz},
			{"depth", rep.DepthDB, nom.Scoop.DepthDB},
			{"balance", rep.BalanceDB, nom.Scoop.BalanceDB},
			{"corner", rep.CornerHz, *nom.CornerHz},
		} {
			if c.s.P5 != c.want || c.s.P50 != c.want || c.s.P95 != c.want || c.s.Trials != 200 {
				t.Errorf("%v %s: %+v, want all %v", dist, c.name, *c.s, c.want)
			}
		}
		if rep.NoScoopShare != 0 || rep.NoCornerShare != 0 {
			t.Errorf("no-scoop share %v, no-corner share %v", rep.NoScoopShare, rep.NoCornerShare)
		}
		for _, cs := range rep.Curve {
			if cs.P5 != cs.P95 {
				t.Errorf("curve at %v Hz spreads: %+v", cs.Hz, cs)
			}
		}
	}
}

// The same seed gives the same report on one worker and on two (and on
// seven); another seed gives another report.
func TestToleranceWorkersAgree(t *testing.T) {
	d := studyDesign()
	spec := ToleranceSpec{Parts: PartTolerances(d, nil), Dist: Normal, Trials: 333, Seed: 42, At: Setting{BlendKnob: 0.5}, CurveHz: []float64{50, 500, 5000}}
	var reports []*ToleranceReport
	for _, w := range []int{1, 2, 7} {
		spec.Workers = w
		var done atomic.Int64
		spec.Progress = func(n int) { done.Add(int64(n)) }
		rep, err := Tolerance(d, spec)
		if err != nil {
			t.Fatal(err)
		}
		if done.Load() != int64(spec.Trials) {
			t.Errorf("%d workers: progress counted %d trials, want %d", w, done.Load(), spec.Trials)
		}
		reports = append(reports, rep)
	}
	for i := 1; i < len(reports); i++ {
		if !reflect.DeepEqual(reports[0], reports[i]) {
			a, _ := json.Marshal(reports[0])
			b, _ := json.Marshal(reports[i])
			t.Errorf("reports differ between worker counts:\n%s\n%s", a, b)
		}
	}
	spec.Seed = 43
	other, err := Tolerance(d, spec)
	if err != nil {
		t.Fatal(err)
	}
	if other.ScoopHz.P50 == reports[0].ScoopHz.P50 {
		t.Error("seeds 42 and 43 gave the same median scoop frequency")
	}
	if reports[0].ScoopHz.P5 >= reports[0].ScoopHz.P95 {
		t.Errorf("scoop spread %+v", *reports[0].ScoopHz)
	}
}

// productCDF is the distribution function of X = U·V for independent U, V
// uniform on [a, b] (0 < a < b), derived here by integrating the uniform
// densities (probability theory): for a² ≤ z ≤ ab,
// F(z) = (z·ln(z/a²) − z + a²)/(b − a)², and for ab ≤ z ≤ b²,
// F(z) = 1 − (b² − z − z·ln(b²/z))/(b − a)².
func productCDF(z, a, b float64) float64 {
	w := (b - a) * (b - a)
	switch {
	case z <= a*a:
		return 0
	case z >= b*b:
		return 1
	case z <= a*b:
		return (z*math.Log(z/(a*a)) - z + a*a) / w
	}
	return 1 - (b*b-z-z*math.Log(b*b/z))/w
}

// rcCornerPercentile is the p-th percentile of fc = f0/X with X the product
// of (1 + t·u) and (1 + t·v), u and v uniform on [−1, 1]: since fc falls as
// X rises, it is f0 over the (100 − p)-th percentile of X, found by
// bisection on productCDF.
func rcCornerPercentile(f0, tol, p float64) float64 {
	a, b := 1-tol, 1+tol
	lo, hi := a*a, b*b
	for i := 0; i < 200; i++ {
		m := (lo + hi) / 2
		if productCDF(m, a, b) < 1-p/100 {
			lo = m
		} else {
			hi = m
		}
	}
	return f0 / ((lo + hi) / 2)
}

// The sampler and the percentiles converge to the closed form for a single
// RC corner 1/(2πRC) with R and C uniform within ± 10 %.
func TestUniformRCCornerClosedForm(t *testing.T) {
	const r, c, tol, n = 10e3, 10e-9, 0.10, 400000
	f0 := 1 / (2 * math.Pi * r * c)
	fs := make([]float64, n)
	runTrials(n, 2, nil, func() func(int) {
		var pcg rand.PCG
		rng := rand.New(&pcg)
		return func(i int) {
			ri := r * (1 + tol*unitDraw(&pcg, rng, 1, i, 0, Uniform))
			ci := c * (1 + tol*unitDraw(&pcg, rng, 1, i, 1, Uniform))
			fs[i] = 1 / (2 * math.Pi * ri * ci)
		}
	})
	slices.Sort(fs)
	for _, p := range []float64{5, 50, 95} {
		got, want := Percentile(fs, p), rcCornerPercentile(f0, tol, p)
		// The sample percentile's standard error here is about 1e-4
		// relative; allow 5e-4.
		if e := relErr(got, want); e > 5e-4 {
			t.Errorf("p%v: %v Hz, closed form %v Hz (rel. error %.2g)", p, got, want, e)
		}
	}
}

// Through the design path: the corner of the single RC section (rcDesign)
// with its R and C uniform within ± 10 %. Trial by trial the report must
// equal the corner that circuit theory gives for the very same draws
// (rcCorner of 1/(2π(R + EndResistance)C)); and its percentiles must lie
// near the closed form for the product of two uniforms.
func TestToleranceRCCorner(t *testing.T) {
	const r, c, tol, n = 100e3, 2.2e-9, 0.10, 4000
	d := rcDesign(0, r, c)
	spec := ToleranceSpec{
		Parts:  []PartTolerance{{Name: "filter1.r", Tolerance: tol}, {Name: "filter1.c", Tolerance: tol}},
		Trials: n, Seed: 9, At: Setting{BlendKnob: 1},
	}
	rep, err := Tolerance(d, spec)
	if err != nil {
		t.Fatal(err)
	}
	ref := make([]float64, n)
	var pcg rand.PCG
	rng := rand.New(&pcg)
	for i := range ref {
		ri := r * (1 + tol*unitDraw(&pcg, rng, spec.Seed, i, 0, Uniform))
		ci := c * (1 + tol*unitDraw(&pcg, rng, spec.Seed, i, 1, Uniform))
		ref[i] = rcCorner(1/(2*math.Pi*(ri+EndResistance)*ci), d.Band.From)
	}
	slices.Sort(ref)
	if rep.CornerHz == nil || rep.NoCornerShare != 0 {
		t.Fatalf("corner %+v, no-corner share %v", rep.CornerHz, rep.NoCornerShare)
	}
	for k, got := range []float64{rep.CornerHz.P5, rep.CornerHz.P50, rep.CornerHz.P95} {
		p := Percentiles[k]
		if e := relErr(got, Percentile(ref, p)); e > 1e-6 {
			t.Errorf("p%v: %v Hz, circuit theory on the same draws %v Hz (rel. error %.2g)", p, got, Percentile(ref, p), e)
		}
		// Closed form: the measured corner is rcCorner of the pole, a
		// monotone map, so percentiles carry over. With 4000 trials the
		// sampling error is about 1e-3 relative; allow 4e-3.
		want := rcCorner(rcCornerPercentile(1/(2*math.Pi*r*c), tol, p), d.Band.From)
		if e := relErr(got, want); e > 4e-3 {
			t.Errorf("p%v: %v Hz, closed form %v Hz (rel. error %.2g)", p, got, want, e)
		}
	}
}

func TestToleranceErrors(t *testing.T) {
	d := studyDesign()
	parts := PartTolerances(d, nil)
	neg := slices.Clone(parts)
	neg[0].Tolerance = -0.05
	for _, tc := range []struct {
		name string
		spec ToleranceSpec
		want string
	}{
		{"zero trials", ToleranceSpec{Parts: parts, Trials: 0}, "0 trials"},
		{"negative trials", ToleranceSpec{Parts: parts, Trials: -3}, "-3 trials"},
		{"negative tolerance", ToleranceSpec{Parts: neg, Trials: 10}, "part source.series_c: tolerance -5%"},
		{"unknown part", ToleranceSpec{Parts: []PartTolerance{{Name: "filter9.r"}}, Trials: 10}, `unknown part "filter9.r"`},
		{"blend", ToleranceSpec{Parts: parts, Trials: 10, At: Setting{BlendKnob: -1}}, "knob blend: position -1 is outside 0..1"},
		{"workers", ToleranceSpec{Parts: parts, Trials: 10, Workers: -1}, "-1 workers"},
		{"curve", ToleranceSpec{Parts: parts, Trials: 10, CurveHz: []float64{0}}, "curve frequency 0"},
	} {
		_, err := Tolerance(d, tc.spec)
		if err == nil || !strings.Contains(err.Error(), tc.want) {
			t.Errorf("%s: error %v, want one containing %q", tc.name, err, tc.want)
		}
	}
}

// The no-scoop share counts the trials without a scoop: all of them with
// the blend at the low-pass end (knob 0), where the study design's curve
// has no interior minimum, and some of them near the knob position where
// the scoop appears.
func TestToleranceNoScoopShare(t *testing.T) {
	d := studyDesign()
	for _, tc := range []struct {
		blend   float64
		lo, hi  float64 // bounds of the share
		nominal bool    // whether the nominal curve has a scoop
	}{
		{0, 1, 1, false},
		{0.44, 0.01, 0.99, true},
		{0.5, 0, 0, true},
	} {
		rep, err := Tolerance(d, ToleranceSpec{Parts: PartTolerances(d, nil), Trials: 200, Seed: 1, At: Setting{BlendKnob: tc.blend}})
		if err != nil {
			t.Fatal(err)
		}
		if (rep.Nominal.Scoop != nil) != tc.nominal {
			t.Errorf("blend %v: nominal scoop %+v", tc.blend, rep.Nominal.Scoop)
		}
		if rep.NoScoopShare < tc.lo || rep.NoScoopShare > tc.hi {
			t.Errorf("blend %v: no-scoop share %v, want %v..%v", tc.blend, rep.NoScoopShare, tc.lo, tc.hi)
		}
		scoops := 0
		if rep.ScoopHz != nil {
			scoops = rep.ScoopHz.Trials
		}
		if want := int(math.Round((1 - rep.NoScoopShare) * 200)); scoops != want {
			t.Errorf("blend %v: scoop spread over %d trials, want %d", tc.blend, scoops, want)
		}
	}
}
