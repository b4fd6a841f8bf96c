package main

import (
	"context"
	"math"
	"os"
	"path/filepath"
	"testing"

	"tonewright/cmd/tonewright/live"
	"tonewright/networks"
	"tonewright/networks/audio"
)

// The page plays the current design at the saved design's loudness (ITU-R
// BS.1770, measured here with the audio package's meter): the saved design
// itself comes back peaking pageHeadroom below the makeup target, and a design changed so
// that it loses several dB more comes back as loud as the saved one.
func TestPagePlaysAtSavedLoudness(t *testing.T) {
	d, err := networks.LoadDesign(demoFile)
	if err != nil {
		t.Fatal(err)
	}
	saved, err := live.NewDesignModel(d, "demo")
	if err != nil {
		t.Fatal(err)
	}
	quiet, err := saved.With(map[string]float64{"highpass.r": 1.5e3}) // much quieter at this setting
	if err != nil {
		t.Fatal(err)
	}
	set := live.Setting{"blend": 0.3}
	loud := func(m live.Model, s live.Setting) (lufs, peak float64) {
		b, err := pageRenderer{}.Render(context.Background(), m, s, saved)
		if err != nil {
			t.Fatal(err)
		}
		p := filepath.Join(t.TempDir(), "play.wav")
		if err := os.WriteFile(p, b, 0o644); err != nil {
			t.Fatal(err)
		}
		r, err := audio.OpenWAV(p)
		if err != nil {
			t.Fatal(err)
		}
		defer r.Close()
		meter := audio.NewLoudnessMeter(float64(r.Rate), 1)
		blk := [][]float64{make([]float64, 4096)}
		for {
			n, err := r.Read(blk)
			if n > 0 {
				meter.Add([][]float64{blk[0][:n]})
				for _, v := range blk[0][:n] {
					peak = math.Max(peak, math.Abs(v))
				}
			}
			if err != nil {
				break
			}
		}
		return meter.Loudness(), 20 * math.Log10(peak)
	}
	l0, p0 := loud(saved, set)
	if want := audio.PeakTarget - pageHeadroom; math.Abs(p0-want) > 0.05 {
		t.Errorf("the saved design peaks at %.2f dBFS, want %.1f", p0, want)
	}
	l1, p1 := loud(quiet, set)
	if math.Abs(l1-l0) > 0.1 {
		t.Errorf("a quieter design: %.2f LUFS (peak %.2f dBFS), the saved design %.2f LUFS", l1, p1, l0)
	}
}
