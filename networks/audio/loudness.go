package audio

import "math"

// LoudnessMeter measures integrated loudness as ITU-R BS.1770 defines it:
// each channel through the K-weighting filter (a high shelf, then a
// high-pass), mean squares over 400 ms blocks overlapping by 75 %, an
// absolute gate at −70 LKFS and a relative gate 10 LU below the loudness of
// the blocks that pass it. Channels weigh 1 (mono, left, right). It keeps
// one number per 100 ms, so memory grows by 8 bytes per 100 ms measured.
type LoudnessMeter struct {
	k     [][2]biquad // per channel: shelf, high-pass
	step  int         // samples per 100 ms
	fill  int
	acc   float64
	steps []float64 // mean square per 100 ms step, summed over channels
}

type biquad struct {
	b0, b1, b2, a1, a2 float64
	z1, z2             float64
}

func (q *biquad) run(x float64) float64 {
	y := q.b0*x + q.z1
	q.z1 = q.b1*x - q.a1*y + q.z2
	q.z2 = q.b2*x - q.a2*y
	return y
}

// kWeighting returns the two K-weighting stages at rate. The analog
// prototype (shelf at 1681.97 Hz, +4.0 dB, Q 0.7072; high-pass at 38.135 Hz,
// Q 0.5003) is the one whose bilinear transform at 48 kHz gives the
// coefficients tabulated in ITU-R BS.1770; at other rates it gives the
// same curve.
func kWeighting(rate float64) [2]biquad {
	var s [2]biquad
	{
		f0, g, q := 1681.974450955533, 3.999843853973347, 0.7071752369554196
		K := math.Tan(math.Pi * f0 / rate)
		Vh := math.Pow(10, g/20)
		Vb := math.Pow(Vh, 0.4996667741545416)
		a0 := 1 + K/q + K*K
		s[0] = biquad{
			b0: (Vh + Vb*K/q + K*K) / a0,
			b1: 2 * (K*K - Vh) / a0,
			b2: (Vh - Vb*K/q + K*K) / a0,
			a1: 2 * (K*K - 1) / a0,
			a2: (1 - K/q + K*K) / a0,
		}
	}
	{
		f0, q := 38.13547087602444, 0.5003270373238773
		K := math.Tan(math.Pi * f0 / rate)
		a0 := 1 + K/q + K*K
		s[1] = biquad{b0: 1, b1: -2, b2: 1, a1: 2 * (K*K - 1) / a0, a2: (1 - K/q + K*K) / a0}
	}
	return s
}

// NewLoudnessMeter returns a meter for channels channels at rate.
func NewLoudnessMeter(rate float64, channels int) *LoudnessMeter {
	m := &LoudnessMeter{step: int(math.Round(rate / 10))}
	for c := 0; c < channels; c++ {
		m.k = append(m.k, kWeighting(rate))
	}
	return m
}

// Add measures a block: block[c] holds channel c's samples.
func (m *LoudnessMeter) Add(block [][]float64) {
	n := len(block[0])
	for i := 0; i < n; i++ {
		for c := range m.k {
			y := m.k[c][1].run(m.k[c][0].run(block[c][i]))
			m.acc += y * y
		}
		m.fill++
		if m.fill == m.step {
			m.steps = append(m.steps, m.acc/float64(m.step))
			m.acc, m.fill = 0, 0
		}
	}
}

// Loudness returns the integrated loudness in LKFS (LUFS), −Inf for
// silence or a measurement shorter than one 400 ms block.
func (m *LoudnessMeter) Loudness() float64 {
	var blocks []float64
	for i := 0; i+4 <= len(m.steps); i++ {
		blocks = append(blocks, (m.steps[i]+m.steps[i+1]+m.steps[i+2]+m.steps[i+3])/4)
	}
	lk := func(z float64) float64 { return -0.691 + 10*math.Log10(z) }
	gate := func(min float64) (float64, int) {
		s, n := 0.0, 0
		for _, z := range blocks {
			if lk(z) > min {
				s += z
				n++
			}
		}
		return s, n
	}
	s, n := gate(-70)
	if n == 0 {
		return math.Inf(-1)
	}
	s, n = gate(lk(s/float64(n)) - 10)
	if n == 0 {
		return math.Inf(-1)
	}
	return lk(s / float64(n))
}
