package synth
import ("testing";"fmt";"tonewright/networks")
func TestTmpPri(t *testing.T){
	tg := Targets{ScoopHz: ptr(800.0), DepthDB: ptr(-8.0), BalanceDB: ptr(30.0), CornerHz: ptr(10e3)}
	p := &Problem{Targets: tg, Source: &networks.Source{Impedance: 1e3}}
	r, _ := Solve(p, Options{})
	for _, c := range r.Checks { fmt.Printf("%s wanted %v ideal %v (%v) chosen %v (%v)\n", c.Name, c.Wanted, c.Ideal, c.IdealMet, c.Achieved, c.Met) }
	for _, pp := range r.Parts { fmt.Printf("%s %v %v\n", pp.Name, pp.Ideal, pp.Chosen) }
}
