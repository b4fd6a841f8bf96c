package audio

import (
	"io"
	"os"
	"path/filepath"
	"strings"
	"testing"

	"tonewright/networks"
)

// benchDesign is the demo design (an invented board) with three RC filter
// sections instead of two: the "three-section design".
func benchDesign(b *testing.B) *networks.Design {
	d, err := networks.LoadDesign("../../testdata/demo-design.yaml")
	if err != nil {
		b.Fatal(err)
	}
	d.Filters = append(d.Filters, networks.RC{R: 10e3, C: 1e-9})
	return d
}

func benchSetting(d *networks.Design) Setting {
	return func(pos float64) (Response, []complex128, error) {
		c := d.Chain(pos)
		p, err := c.Network().Poles()
		return c.Compile(), p, err
	}
}

func BenchmarkFit(b *testing.B) {
	h, poles, err := benchSetting(benchDesign(b))(0.5)
	if err != nil {
		b.Fatal(err)
	}
	for b.Loop() {
		if _, err := Fit(h, poles, 48000); err != nil {
			b.Fatal(err)
		}
	}
}

// BenchmarkRender renders ten seconds of stereo at 48 kHz through the
// three-section design, at one setting and while the blend knob turns, and
// reports how many times faster than real time it runs (one core; the
// filters are fitted before the timer starts). One pass is Render's
// measuring pass (filters, peak and BS.1770 loudness); "turn, both passes"
// is what listen does in memory: the measuring pass, then the pass with the
// gains.
func BenchmarkRender(b *testing.B) {
	const rate, seconds = 48000, 10.0
	d := benchDesign(b)
	x := PinkNoise(int(rate*seconds), 3)
	src := &Samples{SampleRate: rate, Data: x}
	one, err := func() (*Filter, error) {
		h, p, err := benchSetting(d)(0.5)
		if err != nil {
			return nil, err
		}
		return Fit(h, p, rate)
	}()
	if err != nil {
		b.Fatal(err)
	}
	turn, _, err := TurnFilters(benchSetting(d), rate)
	if err != nil {
		b.Fatal(err)
	}
	for _, c := range []struct {
		name string
		part Part
	}{
		{"setting", Part{Source: src, Filters: []*Filter{one}}},
		{"turn", Part{Source: src, Filters: turn, TurnFrames: int64(rate * seconds)}},
		{"turn, both passes", Part{Source: src, Filters: turn, TurnFrames: int64(rate * seconds)}},
	} {
		b.Run(c.name, func(b *testing.B) {
			both := strings.HasSuffix(c.name, "both passes")
			for b.Loop() {
				m, err := Render([]Part{c.part}, 2, nil, nil)
				if err != nil {
					b.Fatal(err)
				}
				if both {
					if _, err := Render([]Part{c.part}, 2, Gains(m, false, Makeup{Auto: true}), nil); err != nil {
						b.Fatal(err)
					}
				}
			}
			b.ReportMetric(seconds*float64(b.N)/b.Elapsed().Seconds(), "x_realtime")
		})
	}
}

// BenchmarkRenderWAV is the whole path for a file: a 24-bit stereo WAV at
// 48 kHz read, rendered while the knob turns, and written as 24-bit PCM.
func BenchmarkRenderWAV(b *testing.B) {
	const rate, seconds = 48000, 10.0
	dir := b.TempDir()
	in := filepath.Join(dir, "in.wav")
	x := PinkNoise(int(rate*seconds), 4)
	f, _ := os.Create(in)
	w := NewWAVWriter(f, rate, 2, false)
	w.Write([][]float64{x, x})
	w.Close()
	f.Close()
	src, err := NewWAVFile(in)
	if err != nil {
		b.Fatal(err)
	}
	turn, _, err := TurnFilters(benchSetting(benchDesign(b)), rate)
	if err != nil {
		b.Fatal(err)
	}
	part := Part{Source: src, Filters: turn, TurnFrames: int64(rate * seconds)}
	for b.Loop() {
		out, _ := os.Create(filepath.Join(dir, "out.wav"))
		w := NewWAVWriter(out, rate, 2, false)
		if _, err := Render([]Part{part}, 2, nil, w.Write); err != nil {
			b.Fatal(err)
		}
		w.Close()
		out.Seek(0, io.SeekStart)
		out.Close()
	}
	b.ReportMetric(seconds*float64(b.N)/b.Elapsed().Seconds(), "x_realtime")
}
