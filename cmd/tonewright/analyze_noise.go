package main

import (
	"fmt"
	"io"
	"math"
	"slices"
	"strings"
	"text/tabwriter"

	"tonewright/networks"
)

// writeNoise prints the thermal noise of the section at each setting.
func writeNoise(w io.Writer, d *networks.Design, an *networks.Analysis, varied []string) {
	if len(an.Positions) == 0 {
		return
	}
	fmt.Fprintf(w, "\nthermal noise over %s–%s (4kT·Re Z_out, %g K), µV rms; referred: through the loss at 1 kHz\n\n",
		hz(d.Band.From), hz(d.Band.To), networks.NoiseTemperature)
	tw := tabwriter.NewWriter(w, 0, 0, 2, ' ', tabwriter.AlignRight)
	head := append(append([]string(nil), varied...), "output", "A-weighted", "referred", "referred A-wtd", "referred A-wtd dBV")
	fmt.Fprintln(tw, strings.Join(head, "\t")+"\t")
	for _, p := range an.Positions {
		var row []string
		for _, k := range varied {
			row = append(row, posLabel(p.Knobs[k]))
		}
		n := p.Noise
		if n == nil {
			row = append(row, "—", "—", "—", "—", "—")
		} else {
			dbv := "—"
			if n.ReferredAV > 0 {
				dbv = fmt.Sprintf("%.1f", 20*math.Log10(n.ReferredAV))
			}
			row = append(row, uv(n.OutputV), uv(n.OutputAV), uv(n.ReferredV), uv(n.ReferredAV), dbv)
		}
		fmt.Fprintln(tw, strings.Join(row, "\t")+"\t")
	}
	tw.Flush()
}

func uv(v float64) string { return fmt.Sprintf("%.3g", v*1e6) }

// writeImpedance prints |Z_in| and |Z_out| at the 1-2-5 frequencies of the
// band at each setting.
func writeImpedance(w io.Writer, d *networks.Design, an *networks.Analysis) {
	ss := make([]networks.Setting, len(an.Impedance))
	for i, z := range an.Impedance {
		ss[i] = z.Knobs
	}
	varied := d.Varied(ss)
	fmt.Fprintln(w, "\nimpedances: |Z_in| into the network after the source, load connected; |Z_out| back into the output, source shorted, load removed")
	for _, z := range an.Impedance {
		fmt.Fprintf(w, "\n%s\n", settingLabel(z.Knobs, varied))
		tw := tabwriter.NewWriter(w, 0, 0, 2, ' ', tabwriter.AlignRight)
		fmt.Fprintln(tw, "frequency\t|Z_in|\t|Z_out|\t")
		for _, p := range z.Points {
			if !oneTwoFive(p.Hz) && p.Hz != d.Band.From && p.Hz != d.Band.To {
				continue
			}
			fmt.Fprintf(tw, "%s\t%s\t%s\t\n", hz(p.Hz), ohm(p.InputOhm), ohm(p.OutputOhm))
		}
		tw.Flush()
	}
}

// oneTwoFive reports whether f is 1, 2 or 5 times a power of ten (to the
// grid's rounding).
func oneTwoFive(f float64) bool {
	e := math.Floor(math.Log10(f))
	m := f / math.Pow(10, e)
	for _, x := range []float64{1, 2, 5, 10} {
		if math.Abs(m-x) < 1e-6*x {
			return true
		}
	}
	return false
}

// impedancePlot draws |Z_in| and |Z_out| against frequency, one line per
// setting.
func impedancePlot(d *networks.Design, an *networks.Analysis) *panels {
	ss := make([]networks.Setting, len(an.Impedance))
	for i, z := range an.Impedance {
		ss[i] = z.Knobs
	}
	varied := d.Varied(ss)
	in := panel{XLabel: "frequency (Hz)", YLabel: "|Z_in|", LogX: true, LogY: true, FreqX: true, OhmY: true, XMin: d.Band.From, XMax: d.Band.To, LegendBottom: true}
	out := in
	out.YLabel, out.LegendBottom, out.LegendRight = "|Z_out|", false, true
	for _, z := range an.Impedance {
		var f, zi, zo []float64
		for _, p := range z.Points {
			f, zi, zo = append(f, p.Hz), append(zi, p.InputOhm), append(zo, p.OutputOhm)
		}
		label := settingLabel(z.Knobs, varied)
		in.Series = append(in.Series, series{Label: label, X: f, Y: zi})
		out.Series = append(out.Series, series{Label: label, X: f, Y: zo})
	}
	in.Series, out.Series = append([]series(nil), in.Series...), append([]series(nil), out.Series...)
	return &panels{
		Title:  fmt.Sprintf("%s: input and output impedance\n%s", designTitle(d), describeDesign(d)),
		Panels: []panel{in, out},
	}
}

// impedanceGrid is where the impedances are computed: 20 points per decade
// over the band and the 1-2-5 frequencies inside it, which the table shows.
func impedanceGrid(b networks.Band) []float64 {
	fs := networks.LogGrid(b.From, b.To, 20)
	for e := math.Floor(math.Log10(b.From)); e <= math.Ceil(math.Log10(b.To)); e++ {
		for _, m := range []float64{1, 2, 5} {
			if f := m * math.Pow(10, e); f > b.From && f < b.To {
				fs = append(fs, f)
			}
		}
	}
	slices.Sort(fs)
	return slices.CompactFunc(fs, func(a, b float64) bool { return math.Abs(a/b-1) < 1e-9 })
}
