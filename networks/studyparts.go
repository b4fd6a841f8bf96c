package networks

// The studies (tolerance, sensitivity) vary every part of the design, and
// two more that are real parts on the board though they sit outside the
// tone network and its filters: the source's coupling capacitor and the
// load's capacitance (a cable, the next stage's input), each when the
// design has it. Parts, which synthesis uses to decide what it designs,
// leaves them out; StudyParts adds them.

// The names the studies give the chain's own capacitors.
const (
	SourceCouplingPart = "source.series_c"
	LoadCapPart        = "load.c"
)

// StudyParts returns the parts the studies vary, in signal order: the
// source's coupling capacitor (when series_c > 0), the parts Parts lists,
// and the load's capacitance (when load.c > 0).
func (d *Design) StudyParts() []Part {
	var ps []Part
	if d.Source.SeriesC > 0 {
		ps = append(ps, Part{SourceCouplingPart, "source coupling capacitor", PartCapacitor, d.Source.SeriesC})
	}
	ps = append(ps, d.Parts()...)
	if d.Load.C > 0 {
		ps = append(ps, Part{LoadCapPart, "load capacitance", PartCapacitor, d.Load.C})
	}
	return ps
}

// chainPartRef returns where the design keeps the value of one of the
// chain's own capacitors that StudyParts names, nil otherwise.
func (d *Design) chainPartRef(name string) *float64 {
	switch {
	case name == SourceCouplingPart && d.Source.SeriesC > 0:
		return &d.Source.SeriesC
	case name == LoadCapPart && d.Load.C > 0:
		return &d.Load.C
	}
	return nil
}
