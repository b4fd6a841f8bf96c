package audio

import "math"

// PeakTarget is where the automatic makeup gain puts the loudest moment of
// the whole output, dBFS.
const PeakTarget = -1.0

// Makeup is the output's level rule: Auto applies the one gain that brings
// the whole output's peak to PeakTarget; otherwise DB is a fixed gain.
type Makeup struct {
	Auto bool
	DB   float64
}

// Gains returns each part's gain (linear) from Render's measurement of the
// parts at unit gain. Without matching, every part gets the same makeup
// gain, which keeps the level differences between them. With matching,
// each part is first brought to the loudness of the loudest part (ITU-R
// BS.1770 integrated loudness; a silent part keeps its level), then the
// makeup applies to all.
func Gains(stats []PartStats, match bool, m Makeup) []float64 {
	g := make([]float64, len(stats))
	ref := math.Inf(-1)
	for _, s := range stats {
		ref = math.Max(ref, s.LoudnessLUFS)
	}
	peak := 0.0
	for i, s := range stats {
		g[i] = 1
		if match && !math.IsInf(s.LoudnessLUFS, 0) && !math.IsInf(ref, 0) {
			g[i] = math.Pow(10, (ref-s.LoudnessLUFS)/20)
		}
		peak = math.Max(peak, s.Peak*g[i])
	}
	k := math.Pow(10, m.DB/20)
	if m.Auto {
		k = 1
		if peak > 0 {
			k = math.Pow(10, PeakTarget/20) / peak
		}
	}
	for i := range g {
		g[i] *= k
	}
	return g
}
