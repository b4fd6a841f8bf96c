package networks

import (
	"math"
	"testing"
)

// The audio law at half rotation gives 10 % of the track (common practice,
// no published source); reverse audio mirrors it; linear is the identity.
func TestTaperFractions(t *testing.T) {
	audio, rev, lin := Taper{Law: Audio}, Taper{Law: ReverseAudio}, Taper{Law: Linear}
	for _, x := range []float64{0, 0.1, 0.25, 0.5, 0.75, 1} {
		if got := lin.Fraction(x); got != x {
			t.Errorf("linear(%g) = %g", x, got)
		}
		if got, want := rev.Fraction(x), 1-audio.Fraction(1-x); math.Abs(got-want) > 1e-12 {
			t.Errorf("reverse(%g) = %g, mirror of audio %g", x, got, want)
		}
	}
	if got := audio.Fraction(0.5); math.Abs(got-0.1) > 1e-12 {
		t.Errorf("audio(0.5) = %g, want 0.1", got)
	}
	if a0, a1 := audio.Fraction(0), audio.Fraction(1); math.Abs(a0) > 1e-12 || math.Abs(a1-1) > 1e-12 {
		t.Errorf("audio ends %g, %g", a0, a1)
	}
	custom := Taper{Law: Audio, Midpoint: 0.15}
	if got := custom.Fraction(0.5); math.Abs(got-0.15) > 1e-12 {
		t.Errorf("audio with midpoint 0.15 at half: %g", got)
	}
	// (a^x − 1)/(a − 1) with a = 81 at x = 0.25: (3 − 1)/80 = 0.025.
	if got := audio.Fraction(0.25); math.Abs(got-0.025) > 1e-12 {
		t.Errorf("audio(0.25) = %g, want 0.025", got)
	}
}

// The trade's letter codes: A audio, B linear, C reverse audio (common
// practice, no published source).
func TestParseTaper(t *testing.T) {
	for in, want := range map[string]Law{"linear": Linear, "B": Linear, "audio": Audio, "A": Audio, "a": Audio, "reverse-audio": ReverseAudio, "C": ReverseAudio} {
		got, err := ParseTaper(in)
		if err != nil || got.Law != want {
			t.Errorf("ParseTaper(%q) = %v, %v", in, got, err)
		}
	}
	if _, err := ParseTaper("exponential-ish"); err == nil {
		t.Error("bad taper accepted")
	}
}
