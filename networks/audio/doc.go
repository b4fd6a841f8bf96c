// Package audio renders sound through a network: it turns a network's exact
// response into a digital filter (Fit), runs the filter on blocks of samples
// (Filter, State), turns a knob while it plays by crossfading filters fitted
// at a grid of knob positions (TurnFilters, Turn), makes the built-in test
// signals (Signal: Pluck, Chord, PinkNoise, Sweep), measures loudness as
// ITU-R BS.1770 defines it (LoudnessMeter), sets the output's level (Gains),
// reads and writes WAV files (OpenWAV, NewWAVWriter) and strings these into
// parts played one after another (Render). It knows networks only through
// their response and poles (Response; networks.Network.Poles gives them).
//
// The digital filter is a modal (parallel) form. Each finite pole p of the
// network, in rad/s, becomes the digital pole exp(p·T) (the matched-z
// transform keeps every pole's frequency and decay exactly and is always
// stable); real poles become one-pole sections and complex pairs real
// second-order sections. The sections' numerators and a few direct FIR taps
// are then fitted to the network's exact response H(jω) on a dense grid up
// to 0.45 of the sample rate: first the linear least-squares fit of the
// complex response weighted by 1/|H| (relative error, phase included), then
// Gauss–Newton steps that keep that error below 0.2 of the sample rate and
// fit only the log magnitude above it, where a real digital filter cannot
// follow the network's phase to the Nyquist frequency. The target is the
// network's response delayed by Lookahead samples, which Render takes back,
// so the sound keeps the network's own phase and delay.
package audio
