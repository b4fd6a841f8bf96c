package networks

import (
	"fmt"
	"math"
	"strings"
)

// Law is the shape of a potentiometer's track.
type Law int

// The taper laws. The trade's letter codes are A (audio), B (linear) and
// C (reverse audio).
const (
	Linear Law = iota
	Audio
	ReverseAudio
)

// DefaultAudioMidpoint is the share of the track between the start and the
// wiper at half rotation of an audio pot: 10 % (common practice, no published
// source). A reverse-audio pot mirrors it (90 %).
const DefaultAudioMidpoint = 0.1

// Taper is a pot's law and, for the exponential laws, the share of the track
// at half rotation.
type Taper struct {
	Law      Law
	Midpoint float64 // share at half rotation; 0 means the law's default
}

// ParseTaper reads a taper name: linear, audio, reverse-audio, or the letter
// codes B, A, C.
func ParseTaper(s string) (Taper, error) {
	switch strings.ToLower(strings.TrimSpace(s)) {
	case "linear", "lin", "b":
		return Taper{Law: Linear}, nil
	case "audio", "log", "a":
		return Taper{Law: Audio}, nil
	case "reverse-audio", "reverse_audio", "reverse", "c":
		return Taper{Law: ReverseAudio}, nil
	}
	return Taper{}, fmt.Errorf("unknown taper %q: use linear (B), audio (A) or reverse-audio (C)", s)
}

// String returns the taper's name as the design file writes it.
func (t Taper) String() string {
	switch t.Law {
	case Audio:
		return "audio"
	case ReverseAudio:
		return "reverse-audio"
	}
	return "linear"
}

// Mid returns the share of the track at half rotation.
func (t Taper) Mid() float64 {
	switch {
	case t.Law == Linear:
		return 0.5
	case t.Midpoint > 0:
		return t.Midpoint
	case t.Law == ReverseAudio:
		return 1 - DefaultAudioMidpoint
	}
	return DefaultAudioMidpoint
}

// Fraction returns the share of the track between the start (the
// counter-clockwise end) and the wiper at rotation x in [0, 1].
//
// The exponential laws follow (a^x − 1)/(a − 1) with a = (1/m − 1)², which
// gives the share m at half rotation. An audio pot has m < 0.5; a
// reverse-audio pot's m > 0.5 gives the mirror image 1 − audio(1 − x).
func (t Taper) Fraction(x float64) float64 {
	m := t.Mid()
	if m == 0.5 {
		return x
	}
	u := 1/m - 1
	a := u * u
	return (math.Pow(a, x) - 1) / (a - 1)
}

// check reports whether the taper's midpoint is usable.
func (t Taper) check() error {
	if t.Midpoint == 0 {
		return nil
	}
	m := t.Midpoint
	if !(m > 0 && m < 1) {
		return fmt.Errorf("midpoint %v is outside (0, 1)", m)
	}
	if t.Law == Audio && m >= 0.5 {
		return fmt.Errorf("an audio taper's midpoint must be below 0.5, got %v", m)
	}
	if t.Law == ReverseAudio && m <= 0.5 {
		return fmt.Errorf("a reverse-audio taper's midpoint must be above 0.5, got %v", m)
	}
	return nil
}

// Code returns the letter pots of this law are marked with: A audio, B
// linear, C reverse-audio, the letters ParseTaper reads (common practice,
// no published source; some makers, older European ones especially, use
// other letters, so the law's name goes with it in every listing).
func (t Taper) Code() string {
	switch t.Law {
	case Audio:
		return "A"
	case ReverseAudio:
		return "C"
	}
	return "B"
}
