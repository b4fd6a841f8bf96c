package networks

import "testing"

func TestPartsRoundTrip(t *testing.T) {
	d, err := ParseDesign([]byte(exampleDesign), "x.yaml")
	if err != nil {
		t.Fatal(err)
	}
	names := d.PartNames()
	want := []string{"lowpass.r", "lowpass.c", "highpass.c", "highpass.r", "pot", "filter1.r", "filter1.c", "filter2.r", "filter2.c", "level"}
	if len(names) != len(want) {
		t.Fatalf("parts %v", names)
	}
	c := d.Clone()
	for i, n := range want {
		if names[i] != n {
			t.Errorf("part %d is %s, want %s", i, names[i], n)
		}
		if err := c.SetPart(n, float64(i+1)); err != nil {
			t.Fatal(err)
		}
		if v, _ := c.PartValue(n); v != float64(i+1) {
			t.Errorf("%s = %g after set", n, v)
		}
	}
	if d.Filters[0].R != 10e3 || d.Level.Pot.Value != 100e3 {
		t.Error("Clone shares storage")
	}
	for _, bad := range []string{"filter3.r", "filter1.x", "filter1.rr", "tone", ""} {
		if err := c.SetPart(bad, 1); err == nil {
			t.Errorf("part %q accepted", bad)
		}
	}
}
