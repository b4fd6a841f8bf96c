package networks

import (
	"fmt"
	"math"
	"math/rand/v2"
	"runtime"
	"slices"
	"strings"
	"sync"
	"sync/atomic"

	"tonewright/eseries"
)

// This file is the part-tolerance Monte Carlo: every trial draws each part
// within its tolerance and measures the design; the report gives the
// percentiles of the metrics over the trials.

// Distribution is how a trial draws a part's value within its tolerance t.
type Distribution int

const (
	// Uniform draws the value uniformly within ± t of the nominal value.
	Uniform Distribution = iota
	// Normal draws it from a normal distribution about the nominal value
	// with σ = t/3 (the tolerance taken as 3σ), truncated at ± t (a draw
	// beyond it is drawn again).
	Normal
)

// ParseDistribution reads a distribution name: uniform or normal.
func ParseDistribution(s string) (Distribution, error) {
	switch strings.ToLower(strings.TrimSpace(s)) {
	case "uniform":
		return Uniform, nil
	case "normal":
		return Normal, nil
	}
	return 0, fmt.Errorf("unknown distribution %q: use uniform or normal", s)
}

func (d Distribution) String() string {
	if d == Normal {
		return "normal"
	}
	return "uniform"
}

// MarshalText writes the distribution's name.
func (d Distribution) MarshalText() ([]byte, error) { return []byte(d.String()), nil }

// KindTolerance returns the tolerance assumed for a part of kind k whose
// value says nothing finer: 5 % for resistors (metal or carbon film), 10 %
// for capacitors (film and ceramic), 20 % for pots (carbon track). Common
// practice, no published source.
func KindTolerance(k PartKind) float64 {
	switch k {
	case PartResistor:
		return 0.05
	case PartCapacitor:
		return 0.10
	}
	return 0.20
}

// DefaultTolerance returns the tolerance of a part that was not given one:
// the smaller of its kind's (KindTolerance) and the tolerance of the
// coarsest IEC 60063 series that holds its value. A value found only in E96
// (4.99k) is a 1 % part and one found only in E24 (5.1k) a 5 % part; a
// value in E12 or a coarser series, or in none, gets its kind's figure.
// basis says where the figure comes from: "E96 value" or "resistor
// default".
func DefaultTolerance(p Part) (tol float64, basis string) {
	tol, basis = KindTolerance(p.Kind), p.Kind.String()+" default"
	if p.Kind == PartPot {
		// Pots are not sold to E-series tolerances.
		return tol, basis
	}
	for _, name := range eseries.SeriesNames() {
		s, err := eseries.SeriesByName(name)
		if err != nil {
			continue
		}
		if eseries.Contains(s, p.Value) {
			if s.Tolerance < tol {
				return s.Tolerance, name + " value"
			}
			return tol, basis
		}
	}
	return tol, basis
}

// PartTolerance is one part with the tolerance a tolerance study gives it.
type PartTolerance struct {
	Name      string  `json:"name"`
	Role      string  `json:"role"`
	Kind      string  `json:"kind"`
	Value     float64 `json:"value"`
	Tolerance float64 `json:"tolerance"` // a fraction: 0.05 is ± 5 %
	Basis     string  `json:"basis"`     // "E96 value", "resistor default", "given for resistors"
}

// PartTolerances returns every part of d that the studies vary
// (StudyParts) with its tolerance: the figure in given for its kind if
// there is one, else DefaultTolerance.
func PartTolerances(d *Design, given map[PartKind]float64) []PartTolerance {
	var out []PartTolerance
	for _, p := range d.StudyParts() {
		tol, basis := DefaultTolerance(p)
		if t, ok := given[p.Kind]; ok {
			tol, basis = t, "given for "+p.Kind.String()+"s"
		}
		out = append(out, PartTolerance{Name: p.Name, Role: p.Role, Kind: p.Kind.String(), Value: p.Value, Tolerance: tol, Basis: basis})
	}
	return out
}

// CheckTolerance reports a tolerance that is not a fraction in [0, 1).
func CheckTolerance(t float64) error {
	if !(t >= 0 && t < 1) {
		return fmt.Errorf("tolerance %v%% must be at least 0 %% and below 100 %%", 100*t)
	}
	return nil
}

// MaxTrials is the most trials a tolerance study runs.
const MaxTrials = 10_000_000

// ToleranceSpec says how to run a tolerance study.
type ToleranceSpec struct {
	// Parts are the parts to vary with their tolerances (PartTolerances
	// gives every part); the study takes each part's nominal value from the
	// design, and holds a part not listed at its value.
	Parts  []PartTolerance
	Dist   Distribution
	Trials int
	Seed   uint64
	At     Setting // the knob setting for the gain and the scoop (knobs it leaves out at their positions)
	// Tapers is the taper tolerance, a fraction: each knob's share of
	// the track at its rotation varies by up to ± Tapers of itself (see
	// DefaultTaperTolerance); 0 holds the tapers exact.
	Tapers  float64
	Workers int // goroutines; 0 means runtime.GOMAXPROCS(0)

	// CurveHz, if set, asks for the percentiles of the gain at these
	// frequencies, at the setting At (a band around the curve).
	CurveHz []float64

	// Progress, if set, is called from the workers, concurrently, with the
	// number of trials just finished.
	Progress func(done int)
}

// Percentiles are the levels a Spread reports, in percent.
var Percentiles = [3]float64{5, 50, 95}

// Spread is the 5th, 50th and 95th percentile of a metric over the trials
// that have it (see Percentile for the method).
type Spread struct {
	P5     float64 `json:"p5"`
	P50    float64 `json:"p50"`
	P95    float64 `json:"p95"`
	Trials int     `json:"trials"` // how many trials had the metric
}

// CurveSpread is the spread of the gain at one frequency.
type CurveSpread struct {
	Hz float64 `json:"hz"`
	Spread
}

// ToleranceReport is the result of a tolerance study.
type ToleranceReport struct {
	Trials  int             `json:"trials"`
	Seed    uint64          `json:"seed"`
	Dist    Distribution    `json:"dist"`
	Tapers  float64         `json:"taper_tolerance"` // a fraction: 0.2 is ± 20 % of the track share
	Blend   *float64        `json:"blend,omitempty"` // the blend knob, for a blend design
	Knobs   Setting         `json:"knobs"`
	Parts   []PartTolerance `json:"parts"`
	Nominal StudyMetrics    `json:"nominal"`

	Gain1kDB  Spread  `json:"gain_1k_db"`
	ScoopHz   *Spread `json:"scoop_hz"`   // nil when no trial has a scoop
	DepthDB   *Spread `json:"depth_db"`   // over the trials with a scoop
	BalanceDB *Spread `json:"balance_db"` // over the trials with a scoop
	CornerHz  *Spread `json:"corner_hz"`  // over the trials with a corner

	NoScoopShare  float64 `json:"no_scoop_share"`  // share of trials without a scoop, 0..1
	NoCornerShare float64 `json:"no_corner_share"` // share of trials without a corner, 0..1

	Curve []CurveSpread `json:"curve,omitempty"` // at spec.CurveHz
}

// Tolerance runs the Monte Carlo study of d that spec describes.
//
// Trial i draws part j of spec.Parts from its own random stream, a PCG
// generator seeded with a hash of (spec.Seed, i, j), so a trial's draws do
// not depend on which worker runs it or on the other parts' tolerances;
// the results are written by trial index and the percentiles computed
// afterwards, so the report depends on the seed only, never on the number
// of workers.
func Tolerance(d *Design, spec ToleranceSpec) (*ToleranceReport, error) {
	if err := d.Validate(); err != nil {
		return nil, err
	}
	if spec.Trials < 1 || spec.Trials > MaxTrials {
		return nil, fmt.Errorf("%d trials: give a whole number from 1 to %d", spec.Trials, MaxTrials)
	}
	at, err := d.Setting(spec.At)
	if err != nil {
		return nil, err
	}
	if spec.Dist != Uniform && spec.Dist != Normal {
		return nil, fmt.Errorf("unknown distribution %d", spec.Dist)
	}
	if err := CheckTolerance(spec.Tapers); err != nil {
		return nil, fmt.Errorf("taper %w", err)
	}
	if spec.Workers < 0 {
		return nil, fmt.Errorf("%d workers: give 0 (all cores) or more", spec.Workers)
	}
	for _, f := range spec.CurveHz {
		if !positive(f) {
			return nil, fmt.Errorf("curve frequency %v Hz must be positive and finite", f)
		}
	}
	if nf := len(spec.CurveHz); nf > 0 && spec.Trials > 50_000_000/nf {
		return nil, fmt.Errorf("%d trials × %d curve frequencies is too many to keep: use fewer trials", spec.Trials, nf)
	}
	nominal := make([]float64, len(spec.Parts))
	tols := make([]float64, len(spec.Parts))
	for j, p := range spec.Parts {
		v, err := d.PartValue(p.Name)
		if err != nil {
			return nil, err
		}
		if err := CheckTolerance(p.Tolerance); err != nil {
			return nil, fmt.Errorf("part %s: %w", p.Name, err)
		}
		nominal[j], tols[j] = v, p.Tolerance
	}

	knobs := at.sortedKnobs()
	tapers := make([]Taper, len(knobs))
	for k, name := range knobs {
		tapers[k] = d.knobTaper(name)
	}
	n, nf := spec.Trials, len(spec.CurveHz)
	samples := make([]sample, n)
	curve := make([]float64, n*nf)
	newTrial := func() func(i int) {
		w := d.Clone()
		ptrs := make([]*float64, len(spec.Parts))
		for j, p := range spec.Parts {
			ptrs[j] = w.PartRef(p.Name)
		}
		pr := newProbe(w, at)
		var pcg rand.PCG
		rng := rand.New(&pcg)
		return func(i int) {
			for j := range ptrs {
				*ptrs[j] = nominal[j] * (1 + tols[j]*unitDraw(&pcg, rng, spec.Seed, i, j, spec.Dist))
			}
			if spec.Tapers > 0 {
				// Each knob's draw is the stream after the parts', so the
				// parts' draws do not depend on the taper tolerance.
				for k, name := range knobs {
					dev := unitDraw(&pcg, rng, spec.Seed, i, len(ptrs)+k, spec.Dist)
					pr.setKnob(name, tapers[k].shiftShare(at[name], spec.Tapers, dev))
				}
			}
			samples[i] = pr.measure(w)
			if nf > 0 {
				row := curve[i*nf : (i+1)*nf]
				for q, f := range spec.CurveHz {
					row[q] = pr.e0.GainDB(f)
				}
			}
		}
	}
	runTrials(n, spec.Workers, spec.Progress, newTrial)

	rep := &ToleranceReport{Trials: n, Seed: spec.Seed, Dist: spec.Dist, Tapers: spec.Tapers, Blend: blendOf(at), Knobs: at, Parts: spec.Parts}
	pr := newProbe(d, at)
	rep.Nominal = pr.measure(d).metrics()
	vals := make([]float64, 0, n)
	collect := func(get func(s *sample) (float64, bool)) *Spread {
		vals = vals[:0]
		for i := range samples {
			if v, ok := get(&samples[i]); ok {
				vals = append(vals, v)
			}
		}
		return spreadOf(vals)
	}
	rep.Gain1kDB = *collect(func(s *sample) (float64, bool) { return s.gain, true })
	rep.ScoopHz = collect(func(s *sample) (float64, bool) { return s.scoop.Hz, s.hasScoop })
	rep.DepthDB = collect(func(s *sample) (float64, bool) { return s.scoop.DepthDB, s.hasScoop })
	rep.BalanceDB = collect(func(s *sample) (float64, bool) { return s.scoop.BalanceDB, s.hasScoop })
	rep.CornerHz = collect(func(s *sample) (float64, bool) { return s.corner, s.hasCorner })
	scoops, corners := 0, 0
	if rep.ScoopHz != nil {
		scoops = rep.ScoopHz.Trials
	}
	if rep.CornerHz != nil {
		corners = rep.CornerHz.Trials
	}
	rep.NoScoopShare = float64(n-scoops) / float64(n)
	rep.NoCornerShare = float64(n-corners) / float64(n)
	for q, f := range spec.CurveHz {
		vals = vals[:0]
		for i := 0; i < n; i++ {
			vals = append(vals, curve[i*nf+q])
		}
		rep.Curve = append(rep.Curve, CurveSpread{Hz: f, Spread: *spreadOf(vals)})
	}
	return rep, nil
}

// spreadOf sorts vals and returns their percentiles, nil for no values.
func spreadOf(vals []float64) *Spread {
	if len(vals) == 0 {
		return nil
	}
	slices.Sort(vals)
	return &Spread{
		P5:     Percentile(vals, Percentiles[0]),
		P50:    Percentile(vals, Percentiles[1]),
		P95:    Percentile(vals, Percentiles[2]),
		Trials: len(vals),
	}
}

// Percentile returns the p-th percentile (0 ≤ p ≤ 100) of sorted, an
// ascending non-empty slice, by linear interpolation between order
// statistics: with h = (n − 1)·p/100, x[⌊h⌋] + (h − ⌊h⌋)·(x[⌊h⌋+1] − x[⌊h⌋])
// (zero-based; the method numbered 7 by Hyndman and Fan, 1996).
func Percentile(sorted []float64, p float64) float64 {
	n := len(sorted)
	h := float64(n-1) * p / 100
	lo := math.Floor(h)
	i := int(lo)
	if i >= n-1 {
		return sorted[n-1]
	}
	if i < 0 {
		return sorted[0]
	}
	return sorted[i] + (h-lo)*(sorted[i+1]-sorted[i])
}

// splitmix64 is the SplitMix64 finaliser (Steele, Lea and Flood, 2014), a
// bijective hash of 64 bits used to derive independent seeds.
func splitmix64(x uint64) uint64 {
	x += 0x9e3779b97f4a7c15
	x = (x ^ (x >> 30)) * 0xbf58476d1ce4e5b9
	x = (x ^ (x >> 27)) * 0x94d049bb133111eb
	return x ^ (x >> 31)
}

// unitDraw reseeds pcg for (seed, trial, part) and draws a relative
// deviation in [−1, 1] in units of the tolerance: uniform, or a normal
// with σ = 1/3 truncated at ±1. rng must read from pcg.
func unitDraw(pcg *rand.PCG, rng *rand.Rand, seed uint64, trial, part int, dist Distribution) float64 {
	hi := splitmix64(seed ^ splitmix64(uint64(trial)))
	lo := splitmix64(hi ^ splitmix64(^uint64(part)))
	pcg.Seed(hi, lo)
	if dist == Normal {
		for {
			if z := rng.NormFloat64(); math.Abs(z) <= 3 {
				return z / 3
			}
		}
	}
	return 2*rng.Float64() - 1
}

// trialChunk is how many trials a worker takes at a time.
const trialChunk = 16

// runTrials runs trials 0..n−1 on workers goroutines (0: GOMAXPROCS). Each
// worker calls newTrial once for its own state and then the returned
// function for every trial it takes; trials are handed out in chunks, so
// which worker runs a trial depends on scheduling, and a trial must depend
// only on its index. progress, if set, hears of every finished chunk.
func runTrials(n, workers int, progress func(int), newTrial func() func(i int)) {
	if workers <= 0 {
		workers = runtime.GOMAXPROCS(0)
	}
	workers = min(workers, (n+trialChunk-1)/trialChunk)
	var next atomic.Int64
	var wg sync.WaitGroup
	for w := 0; w < workers; w++ {
		wg.Add(1)
		go func() {
			defer wg.Done()
			trial := newTrial()
			for {
				start := int(next.Add(trialChunk)) - trialChunk
				if start >= n {
					return
				}
				end := min(start+trialChunk, n)
				for i := start; i < end; i++ {
					trial(i)
				}
				if progress != nil {
					progress(end - start)
				}
			}
		}()
	}
	wg.Wait()
}
