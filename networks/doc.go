// Package networks models the passive tone-and-level section of an effect
// and analyses it exactly.
//
// A Network is a general linear circuit of resistors, capacitors, inductors
// and potentiometers between named nodes, driven by an ideal source behind a
// series output impedance. Compile turns it into a Solver that applies
// modified nodal analysis (complex arithmetic, LU factorisation with partial
// pivoting) to give the transfer V(out)/V(source) at any frequency.
//
// The building blocks the tool designs with (Source, Blend, the RC low-pass
// ladder, Level, Load) are values that add their parts to a Network, and a
// Chain composes them in the order the signal meets them. A Chain also has a
// compiled fast path (Compiled) that cascades the blocks' two-port
// transmission (ABCD) matrices; it equals the nodal solver to rounding and is
// what the search and the studies call millions of times.
//
// Any Network, not only a Chain, also compiles to its poles, zeros and gain
// constant (CompileZPK): the poles and zeros come from the nodal equations'
// matrix pencil by shift and invert (Poles, Zeros), the gain constant from
// the nodal solver at one frequency. A ZPK evaluates a frequency without
// allocating, and keeps its gain finite however deep an attenuation is.
//
// A Design is the design file (YAML) as a value: Load and ParseDesign read it
// strictly, reporting the line and key of any error, and WriteYAML writes it
// back. The metrics the tool reports (gain at 1 kHz, the scoop, the output
// corner, the impedances) are defined once, in metrics.go, and computed by a
// Meter; Analyze applies them to a Design at several knob positions.
package networks
