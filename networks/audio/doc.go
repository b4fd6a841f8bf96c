// Package audio renders sound through a network: it turns a network's exact
// response into a digital filter (Fit), runs the filter on blocks of samples
// (Filter, State), turns a knob while it plays by crossfading filters fitted
// at a grid of knob positions (Turn), makes the built-in test signals
// (Pluck, Chord, PinkNoise, Sweep), measures loudness as ITU-R BS.1770 defines
// it (Loudness), reads and writes WAV files (OpenWAV, CreateWAV) and strings
// these into a program of parts played one after another (Render).
//
// The digital filter is a modal (parallel) form. Each finite pole p of the
// network, in rad/s, becomes the digital pole exp(p·T) (the matched-z
// transform keeps every pole's frequency and decay exactly and is always
// stable); real poles become one-pole sections and complex pairs real
// second-order sections. The sections' numerators and a few direct FIR taps
// are then the linear least-squares fit of the network's exact complex
// response H(jω) on a dense grid up to 0.45 of the sample rate, weighted by
// 1/|H| so that the error is relative (in dB) and the phase is fitted too.
package audio
