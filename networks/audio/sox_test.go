package audio

import (
	"math"
	"os"
	"path/filepath"
	"testing"
)

// TestSoxAgrees writes sine tones rendered through fitted filters to 24-bit
// WAV files and reads their RMS level with sox (`sox FILE -n stat`, the
// outside meter): it must agree with this package's own measurement of the
// same file within 0.05 dB, and the level against the input tone (also
// measured by sox) must lie within the bounds of the network's
// exact gain.
func TestSoxAgrees(t *testing.T) {
	RequireSox(t)
	dir := t.TempDir()
	worstMeter, worstGain := 0.0, 0.0
	defer func() {
		t.Logf("sox against our reading: %.4f dB at most; sox's gain against the network's: %.4f dB at most", worstMeter, worstGain)
	}()
	for _, rate := range []float64{44100, 48000} {
		for _, nw := range testNetworks(t) {
			f, err := Fit(nw.h, nw.poles, rate)
			if err != nil {
				t.Fatal(err)
			}
			for _, hz := range []float64{50, 1000, 5000, 10000, 16000} {
				in, out := steadyTone(f, hz)
				soxIn := soxRMSdB(t, writeTone(t, dir, "in", in, int(rate)))
				path := writeTone(t, dir, "out", out, int(rate))
				soxOut := soxRMSdB(t, path)
				own := ownRMSdB(t, path)
				worstMeter = math.Max(worstMeter, math.Abs(soxOut-own))
				if d := math.Abs(soxOut - own); d > 0.05 {
					t.Errorf("%g Hz, %s, %g Hz tone: sox reads %.3f dB, we read %.3f dB", rate, nw.name, hz, soxOut, own)
				}
				want := 20 * math.Log10(cmplxAbs(nw.h.Transfer(hz)))
				bound := 0.1
				if hz > 10000 {
					bound = 0.5
				}
				worstGain = math.Max(worstGain, math.Abs(soxOut-soxIn-want))
				if e := math.Abs(soxOut - soxIn - want); e > bound {
					t.Errorf("%g Hz, %s, %g Hz tone: sox measures %.3f dB gain, the network has %.3f dB", rate, nw.name, hz, soxOut-soxIn, want)
				}
			}
		}
	}
}

// steadyTone renders two seconds of a half-scale sine at hz through f and
// returns the input and output over the last whole number of periods of
// the second second.
func steadyTone(f *Filter, hz float64) (in, out []float64) {
	rate := f.Rate
	n := int(2 * rate)
	x := make([]float64, n)
	for i := range x {
		x[i] = 0.5 * math.Sin(2*math.Pi*hz*float64(i)/rate)
	}
	y := make([]float64, n)
	f.Process(f.NewState(), x, y)
	m := int(math.Round(math.Floor(float64(n/2)*hz/rate) * rate / hz))
	return x[n-m:], y[n-m:]
}

func writeTone(t *testing.T, dir, name string, x []float64, rate int) string {
	t.Helper()
	path := filepath.Join(dir, name+".wav")
	file, err := os.Create(path)
	if err != nil {
		t.Fatal(err)
	}
	w := NewWAVWriter(file, rate, 1, false)
	if err := w.Write([][]float64{x}); err != nil {
		t.Fatal(err)
	}
	if err := w.Close(); err != nil {
		t.Fatal(err)
	}
	if err := file.Close(); err != nil {
		t.Fatal(err)
	}
	return path
}

func soxRMSdB(t *testing.T, path string) float64 {
	t.Helper()
	st, err := SoxStat(path)
	if err != nil {
		t.Fatal(err)
	}
	rms, ok := st["RMS amplitude"]
	if !ok {
		t.Fatalf("sox stat gave no RMS amplitude: %v", st)
	}
	return 20 * math.Log10(rms)
}

// ownRMSdB reads path back with OpenWAV and returns its RMS level in dB.
func ownRMSdB(t *testing.T, path string) float64 {
	t.Helper()
	r, err := OpenWAV(path)
	if err != nil {
		t.Fatal(err)
	}
	defer r.Close()
	block := [][]float64{make([]float64, BlockFrames)}
	s, n := 0.0, 0
	for {
		k, err := r.Read(block)
		if k == 0 || err != nil {
			break
		}
		for _, v := range block[0][:k] {
			s += v * v
		}
		n += k
	}
	return 10 * math.Log10(s/float64(n))
}
