package audio

import (
	"fmt"
	"math"
	"math/cmplx"
	"testing"
)

type onePole float64

func (a onePole) Transfer(f float64) complex128 {
	return 1 / (1 + complex(0, 2*math.Pi*f/float64(a)))
}

func TestTmpTable(t *testing.T) {
	nws := testNetworks(t)
	for _, fc := range []float64{300, 5000} {
		nws = append(nws, network{fmt.Sprint("one-pole ", fc), onePole(2 * math.Pi * fc), []complex128{complex(-2*math.Pi*fc, 0)}})
	}
	for _, rate := range []float64{44100, 48000} {
		fs := make([]*Filter, len(nws))
		for i, nw := range nws {
			fs[i], _ = Fit(nw.h, nw.poles, rate)
		}
		line := fmt.Sprintf("%g dB:", rate)
		pl := fmt.Sprintf("%g deg:", rate)
		for _, hz := range []float64{20, 100, 1000, 5000, 8000, 10000, 12500, 16000} {
			w, ph := 0.0, 0.0
			for i, nw := range nws {
				want := 20 * math.Log10(cmplxAbs(nw.h.Transfer(hz)))
				w = math.Max(w, math.Abs(20*math.Log10(cmplx.Abs(fs[i].Response(hz)))-want))
				ph = math.Max(ph, math.Abs(cmplx.Phase(fs[i].Response(hz)/nw.h.Transfer(hz))*180/math.Pi))
			}
			line += fmt.Sprintf(" | %.3f", w)
			pl += fmt.Sprintf(" | %.2f", ph)
		}
		t.Log(line)
		t.Log(pl)
	}
}
