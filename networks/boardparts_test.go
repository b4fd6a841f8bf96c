package networks

import "testing"

func TestBoardParts(t *testing.T) {
	d, err := ParseDesign([]byte(exampleDesign), "x.yaml")
	if err != nil {
		t.Fatal(err)
	}
	d.Source.SeriesC = 100e-9
	d.Level = &LevelSetting{Pot: PotPart{Value: 100e3, Taper: Taper{Law: Audio}}, Position: 1}
	ps := d.BoardParts()
	if ps[0].Name != "source.series_c" || ps[0].Kind != PartCapacitor || ps[0].Value != 100e-9 {
		t.Errorf("first part %+v, want the coupling capacitor", ps[0])
	}
	if got, want := len(ps), len(d.Parts())+1; got != want {
		t.Errorf("%d board parts, want %d", got, want)
	}
	if last := ps[len(ps)-1]; last.Name != "level" {
		t.Errorf("last part %q, want level", last.Name)
	}
	if tp, ok := d.PotTaper("level"); !ok || tp.Code() != "A" {
		t.Errorf("level taper %v %v, want audio (A)", tp, ok)
	}
	if tp, ok := d.PotTaper("pot"); !ok || tp.Code() != d.Tone.Pot.Taper.Code() {
		t.Errorf("blend pot taper %v %v", tp, ok)
	}
	if _, ok := d.PotTaper("lowpass.r"); ok {
		t.Errorf("lowpass.r has a taper")
	}
	d.Source.SeriesC = 0
	if ps := d.BoardParts(); ps[0].Name == "source.series_c" {
		t.Errorf("a DC-coupled design lists a coupling capacitor")
	}
}
