package live

import (
	"context"
	"errors"

	"tonewright/networks"
)

// Knob is a control of a design turned from 0 to 1.
type Knob struct {
	Name  string  `json:"name"`
	Label string  `json:"label"`
	Saved float64 `json:"saved"` // the position the design file holds, or the centre
}

// Setting is a position, 0 to 1, for each knob by name. A knob missing from
// a setting stands at its saved position.
type Setting map[string]float64

// Part is a value of a design the page lets the user change: a component or
// one of the surroundings (source impedance, coupling capacitor, load).
type Part struct {
	Name  string  `json:"name"`
	Role  string  `json:"role"`
	Group string  `json:"group"` // tone, filters, level, surroundings
	Kind  string  `json:"kind"`  // resistor, capacitor, pot, source, load
	Unit  string  `json:"unit"`  // Ω or F
	Value float64 `json:"value"` // +Inf: an open load
	// Zero says what 0 means for a value that may be 0 ("none", "ideal
	// source"); empty when the value must be positive.
	Zero string `json:"zero,omitempty"`
	// Open is true for the load resistance, which may be "open".
	Open bool `json:"open,omitempty"`
}

// Peak is the largest gain on the band.
type Peak = networks.Peak

// Figures are the figures of a design at one setting, as the networks
// package defines them (the metrics analyze reports): the gain at 1 kHz,
// the scoop, the peak, the output corner and the impedances at 1 kHz. A
// nil field is a figure the curve does not have (no scoop, no corner) or
// one that is not finite.
type Figures struct {
	Gain1kDB           *float64        `json:"gain_1k_db"`
	Scoop              *networks.Scoop `json:"scoop"`
	Peak               *Peak           `json:"peak"`
	CornerHz           *float64        `json:"corner_hz"`
	LowCornerHz        *float64        `json:"low_corner_hz"`
	InputImpedanceOhm  *float64        `json:"input_impedance_ohm"`
	OutputImpedanceOhm *float64        `json:"output_impedance_ohm"`
}

// Model is everything the live server needs from a design. It is
// immutable: With returns a changed copy, so one Model may serve many
// requests at once.
type Model interface {
	// Name is the design's name for the page.
	Name() string
	// Band is the analysis band; curves are drawn over it.
	Band() networks.Band
	// Knobs lists the design's knobs in the order the page shows them.
	Knobs() []Knob
	// Parts lists the values the page may change, in signal order.
	Parts() []Part
	// With returns a copy with the named parts set to values. An unknown
	// name or a value the design refuses is a *ValueError naming the part.
	With(values map[string]float64) (Model, error)
	// Curve writes the gain in dB at each frequency of hz into db (same
	// length) at setting s.
	Curve(s Setting, hz, db []float64) error
	// Figures measures the design at setting s.
	Figures(s Setting) (Figures, error)
	// Encode returns the design file for the design with its knobs at s,
	// in the schema analyze reads.
	Encode(s Setting) ([]byte, error)
}

// Renderer plays a design: it renders the built-in phrase through cur at
// setting s, matched in loudness to ref at the same setting, and returns
// the sound as a WAV file. Builds without audio rendering have none.
type Renderer interface {
	Render(ctx context.Context, cur Model, s Setting, ref Model) ([]byte, error)
}

// ErrNoAudio is what playing answers in a build without a Renderer.
var ErrNoAudio = errors.New("playing is not available in this build: audio rendering is not part of it yet")

// ValueError is a bad value for one part or knob.
type ValueError struct {
	Field string // part or knob name
	Err   error
}

func (e *ValueError) Error() string { return e.Field + ": " + e.Err.Error() }
func (e *ValueError) Unwrap() error { return e.Err }
