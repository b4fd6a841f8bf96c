package main

import (
	"context"
	"fmt"
	"math"
	"os"

	"tonewright/cmd/tonewright/live"
	"tonewright/networks/audio"
)

// pageRenderer plays the live page's current setting: the built-in plucked
// phrase (the same as listen's) through the current design, at the
// loudness (ITU-R BS.1770, as listen --match-loudness measures it) of the
// saved design at the same knobs, the saved design's peak put pageHeadroom
// below audio.PeakTarget so that a change with a larger crest factor still
// plays at the same loudness; the current design is lowered further only
// if it would clip. It returns a 24-bit WAV file.
type pageRenderer struct{}

// pageHeadroom is how far below audio.PeakTarget the saved design peaks on
// the page, dB.
const pageHeadroom = 6.0

// pageSeconds is the length of the phrase the page plays.
const pageSeconds = listenSeconds

func (pageRenderer) Render(ctx context.Context, cur live.Model, s live.Setting, ref live.Model) ([]byte, error) {
	dc, dr := live.DesignOf(cur), live.DesignOf(ref)
	if dc == nil || dr == nil {
		return nil, fmt.Errorf("playing needs designs made by live.NewDesignModel")
	}
	x, err := audio.Signal("pluck", listenRate, pageSeconds)
	if err != nil {
		return nil, err
	}
	src := &audio.Samples{SampleRate: listenRate, Data: x}
	var parts []audio.Part
	for _, m := range []live.Model{cur, ref} {
		f, err := filterAt(live.DesignOf(m), live.Common(m, s), listenRate)
		if err != nil {
			return nil, err
		}
		parts = append(parts, audio.Part{Source: src, Filters: []*audio.Filter{f}, Gap: listenGap})
	}
	if err := ctx.Err(); err != nil {
		return nil, err
	}
	st, err := audio.Render(parts, 1, nil, nil)
	if err != nil {
		return nil, err
	}
	g := 1.0
	if st[1].Peak > 0 {
		g = math.Pow(10, (audio.PeakTarget-pageHeadroom)/20) / st[1].Peak
	}
	if !math.IsInf(st[0].LoudnessLUFS, 0) && !math.IsInf(st[1].LoudnessLUFS, 0) {
		g *= math.Pow(10, (st[1].LoudnessLUFS-st[0].LoudnessLUFS)/20)
	}
	if top := math.Pow(10, audio.PeakTarget/20); st[0].Peak*g > top {
		g = top / st[0].Peak
	}
	tmp, err := os.CreateTemp("", "tonewright-play-*.wav")
	if err != nil {
		return nil, err
	}
	defer os.Remove(tmp.Name())
	defer tmp.Close()
	w := audio.NewWAVWriter(tmp, listenRate, 1, false)
	if _, err := audio.Render(parts[:1], 1, []float64{g}, w.Write); err != nil {
		return nil, err
	}
	if err := w.Close(); err != nil {
		return nil, err
	}
	return os.ReadFile(tmp.Name())
}
