package audio

import "testing"

func BenchmarkFit(b *testing.B) {
	nw := testNetworks(b)[1]
	for b.Loop() {
		if _, err := Fit(nw.h, nw.poles, 48000); err != nil {
			b.Fatal(err)
		}
	}
}
