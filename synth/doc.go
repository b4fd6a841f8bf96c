// Package synth finds the parts of a blend tone network and its RC low-pass
// sections from the voice wanted: the depth, frequency and balance of the mid
// scoop at one knob position, the output corner at knob 1, and the
// impedances around the network (the driving stage's output impedance, the
// load, an optional level pot).
//
// A Problem holds the targets, the surroundings and the parts allowed (an
// IEC 60063 series, an explicit list or a stock file); ParseTargets reads one
// from a targets file. Solve searches in two stages.
//
// The continuous stage works in log space on every unknown at once, because
// the parts interact through loading. It seeds the search from the physics:
// the closed form of the ideal blend network (IdealNotch), the legs'
// dividers at the centre for the balance, and the ladder's corner
// (LadderTau), at several impedance levels per pot value; it corrects the
// best seeds' balance with the true metric, adds a few seeded random starts,
// refines the best starts of distinct impedance levels with Nelder–Mead and
// polishes the best. The objective is the error of each metric, exactly as
// package networks defines it, in units of IdealTolerance through a
// pseudo-Huber loss (squared near the target, linear far away, so that one
// unreachable target does not drag the others), plus a small tie-break
// toward the least insertion loss at 1 kHz at knob 0.5. Where a candidate
// has no scoop, the levels at the target frequency keep the slope, and a
// penalty larger than any corner miss keeps the scoop when the targets
// cannot all be met.
//
// A fresh synthesis then runs the lean phase, because the targets fix only
// four of its unknowns and the tie-break alone cannot choose between the
// impedance levels left free: for the demo's voice the first phase lands
// on a network that loses 32.7 dB at 1 kHz where one that loses 25.7 dB
// meets the targets as well. The lean phase restores the first phase's
// result and a seed for each pot value, leg-to-pot ratio and choice of the
// leg solved for the balance (see freshSeeds) to the targets, by damped
// Gauss–Newton steps on the measured errors; then, from the restored
// points of least loss, it maximises the gain at 1 kHz over the high-pass
// leg's R, the pot and the sections' R with Nelder–Mead, solving the
// targets for the other four parts at each trial point. It keeps the first
// phase's result unless it finds a design that meets the targets with less
// loss.
//
// The discrete stage of a fresh synthesis walks the exact solutions (see
// walk.go and mesh.go): from near the middle of the part ranges, anchors
// spread over the solutions by steps along them at each allowed pot near,
// and about each anchor the combinations of allowed values ranked by the
// local slopes (solving for the parts best conditioned there), the few
// hundred best measured (shortlist.go) and the best polished by moves of
// one or two parts. Among the designs within the tolerance it prefers the closest
// (Closest) or the one of least loss (LeastLoss, Options.Prefer). A
// re-voicing snaps jointly: every combination of the members just below
// and just above each ideal value, then single-part (and, when those
// stall, two-part) moves to the neighbouring members until none improves.
//
// Before it reports that the ideal parts miss, a synthesis pulls many
// more starts onto the targets (see rescue.go), none of them drawn from
// Options.Seed, so the verdict is the same for every seed. Targets that
// cannot all be met are kept in priority order (Problem.Priority): the
// parts of allowed values are then ranked by their misses beyond the
// tolerance, rank by rank, before any cost, so that they never give up a
// target the ideal parts keep for a step towards one ranked below it; when
// the joint snap still does, the sequential snap tries again. Limits
// (Problem.Limits) bound the output impedance, the smallest capacitor and
// the loss; a design that breaks one does not meet the targets.
//
// Any network can be re-voiced: a netlist design's parts are the
// variables, by name, and its figures are measured along its swept knob.
//
// Re-voicing starts from an existing design (Problem.From) and may limit
// which parts change (Problem.Free) and how many (Problem.MaxChanges); the
// Result lists the swaps. Targets not given keep the design's own figures.
// Without a limit it also searches each part alone and starts the joint
// search from the best of those, so more freedom is never worse than one
// change; results are ranked by the number of targets missed, then by
// cost. When a limited search misses, the search without the limit tells
// whether the limit is the cause (Result.Cause, Result.Unlimited).
//
// Results are deterministic: the same Problem and Options give the same
// Result on any machine and any number of cores.
package synth
