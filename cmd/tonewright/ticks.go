package main

import (
	"math"
	"strconv"

	"gonum.org/v1/plot"
)

// Tick markers of the plots' axes. Each gives an axis enough labels to be
// read (at least three) at round values, and no more than fit without
// running together.

// labelGap is the least distance between the centres of two labels of a
// log axis, as a fraction of the axis: a horizontal axis of the Bode and
// panel figures is wide enough for 0.04, a vertical panel axis (about
// 200 points high, labels 11 points high) needs verticalGap.
const (
	labelGap    = 0.04
	verticalGap = 0.075
)

// logLabels labels ts (ticks of a log axis from min to max) greedily: the
// candidates are tried in turn, the more important first, and each is
// labelled when it is at least gap (a fraction of the axis) from every
// label already placed and lies within the axis.
type logLabels struct {
	min, max, gap float64
	ts            []plot.Tick
}

func (l *logLabels) span() float64 { return math.Log10(l.max / l.min) }

// fits reports whether a label at v keeps its distance from the others.
func (l *logLabels) fits(v float64) bool {
	if v < l.min*(1-1e-9) || v > l.max*(1+1e-9) {
		return false
	}
	for _, t := range l.ts {
		if t.Label != "" && math.Abs(math.Log10(v/t.Value)) < l.gap*l.span() {
			return false
		}
	}
	return true
}

// label labels the tick at v (adding it when there is none) if it fits.
func (l *logLabels) label(v float64, name string) bool {
	if !l.fits(v) {
		return false
	}
	for i, t := range l.ts {
		if math.Abs(t.Value/v-1) < 1e-9 {
			l.ts[i].Label = name
			return true
		}
	}
	l.ts = append(l.ts, plot.Tick{Value: v, Label: name})
	return true
}

func (l *logLabels) count() int {
	n := 0
	for _, t := range l.ts {
		if t.Label != "" {
			n++
		}
	}
	return n
}

// steps puts an unlabelled tick at every 1..9 step from min to max.
func (l *logLabels) steps() {
	for d := math.Floor(math.Log10(l.min)); d <= math.Ceil(math.Log10(l.max)); d++ {
		for m := 1; m < 10; m++ {
			if v := float64(m) * math.Pow(10, d); v >= l.min*(1-1e-9) && v <= l.max*(1+1e-9) {
				l.ts = append(l.ts, plot.Tick{Value: v})
			}
		}
	}
}

// mantissas tries to label the steps with these leading digits, in turn.
func (l *logLabels) mantissas(name func(float64) string, ms ...int) {
	for _, m := range ms {
		for d := math.Floor(math.Log10(l.min)); d <= math.Ceil(math.Log10(l.max)); d++ {
			v := float64(m) * math.Pow(10, d)
			l.label(v, name(v))
		}
	}
}

// The order in which the steps of a decade are labelled when there is room.
var (
	stepsDecade     = []int{1}
	stepsOneTwoFive = []int{1, 2, 5}
	stepsOther      = []int{3, 4, 8, 6, 7, 9}
)

// freqTicks labels a log frequency axis so that the labels neither run
// together nor leave the band unlabelled: at 1-2-5 steps over up to four
// decades, at the decades only over more, and over about a decade or less
// at the other steps and the band's edges too, where they fit. Gap is the
// least distance between labels as a fraction of the axis (0: labelGap).
type freqTicks struct{ Gap float64 }

func (f freqTicks) Ticks(min, max float64) []plot.Tick {
	l := &logLabels{min: min, max: max, gap: f.Gap}
	if l.gap == 0 {
		l.gap = labelGap
	}
	l.steps()
	decades := l.span()
	switch {
	case decades > 4:
		l.mantissas(freqLabel, stepsDecade...)
	case decades > 1.3:
		l.mantissas(freqLabel, stepsOneTwoFive...)
	default:
		l.mantissas(freqLabel, stepsOneTwoFive...)
		l.mantissas(freqLabel, stepsOther...)
		// Label the band's edges unless a labelled tick is close by.
		for _, e := range []float64{min, max} {
			near := false
			for _, t := range l.ts {
				if t.Label != "" && math.Abs(math.Log10(t.Value/e)) < decades/12 {
					near = true
				}
			}
			if !near {
				l.label(e, freqLabel(e))
			}
		}
	}
	return l.ts
}

// ohmTicks labels a log axis of resistances at 1-2-5 steps (10 kΩ, 20 kΩ,
// …); when the range holds fewer than three of them, at the other steps
// too, and then at its ends, so that at least three values are labelled.
// Gap is as freqTicks'.
type ohmTicks struct{ Gap float64 }

func (o ohmTicks) Ticks(min, max float64) []plot.Tick {
	l := &logLabels{min: min, max: max, gap: o.Gap}
	if l.gap == 0 {
		l.gap = labelGap
	}
	l.steps()
	l.mantissas(ohm, stepsOneTwoFive...)
	if l.count() < 3 {
		l.mantissas(ohm, stepsOther...)
	}
	if l.count() < 3 {
		for _, e := range []float64{min, max, math.Sqrt(min * max)} {
			l.label(e, ohm(e))
		}
	}
	return l.ts
}

// linearTicks labels a linear axis at a round step from steps (ascending)
// that gives at least three and at most about most labels; -0 is written 0.
func linearTicks(min, max float64, most int, steps []float64) []plot.Tick {
	count := func(s float64) int { return int(math.Floor(max/s+1e-9) - math.Ceil(min/s-1e-9) + 1) }
	// The smallest step that gives no more than most labels; the one
	// before it if that gives fewer than three.
	i := 0
	for i < len(steps)-1 && count(steps[i]) > most {
		i++
	}
	if count(steps[i]) < 3 && i > 0 {
		i--
	}
	step := steps[i]
	var ts []plot.Tick
	for k := math.Ceil(min/step - 1e-9); k*step <= max+1e-9*math.Max(1, math.Abs(max)); k++ {
		v := k * step
		if k == 0 {
			v = 0 // not -0
		}
		ts = append(ts, plot.Tick{Value: v, Label: strconv.FormatFloat(roundTo(v, step), 'f', -1, 64)})
	}
	return ts
}

// roundTo rounds v to the decimals of step (0.1 → one decimal).
func roundTo(v, step float64) float64 {
	p := math.Pow(10, math.Max(0, -math.Floor(math.Log10(step))))
	r := math.Round(v*p) / p
	if r == 0 {
		return 0
	}
	return r
}

// degTicks labels a phase axis at 45° or 90° over a wide range, at a
// smaller round step (30, 15, 10, 5, 2, 1, 0.5, … degrees) over a small
// one, with three to ten labels.
type degTicks struct{}

var degSteps = []float64{0.01, 0.02, 0.05, 0.1, 0.2, 0.5, 1, 2, 5, 10, 15, 30, 45, 90, 180}

func (degTicks) Ticks(min, max float64) []plot.Tick { return linearTicks(min, max, 10, degSteps) }

// dbTicks labels a level axis at a round step that gives four to ten
// labels.
type dbTicks struct{}

var dbSteps = []float64{0.01, 0.02, 0.05, 0.1, 0.2, 0.5, 1, 2, 5, 10, 20, 50, 100}

func (dbTicks) Ticks(min, max float64) []plot.Tick { return linearTicks(min, max, 10, dbSteps) }

// tenths labels a 0..1 axis at every tenth.
type tenths struct{}

func (tenths) Ticks(min, max float64) []plot.Tick {
	var ts []plot.Tick
	for i := 0; i <= 10; i++ {
		x := float64(i) / 10
		if x >= min-1e-9 && x <= max+1e-9 {
			ts = append(ts, plot.Tick{Value: x, Label: strconv.FormatFloat(x, 'f', -1, 64)})
		}
	}
	return ts
}
