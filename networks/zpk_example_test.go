package networks_test

import (
	"fmt"

	"tonewright/networks"
)

// A first-order low-pass, 10 kΩ into 10 nF from an ideal source, compiled
// to its poles, zeros and gain: one pole at −1/RC = −10 000 rad/s, and the
// gain at the corner, 1/(2πRC) ≈ 1591.5 Hz, is −3.01 dB (circuit theory).
// Far above, the gain falls 20 dB per decade without limit, yet stays a
// finite number.
func ExampleNetwork_CompileZPK() {
	var n networks.Network
	n.SetSource("in", 0)
	n.Resistor("R", "in", "out", 10e3)
	n.Capacitor("C", "out", networks.Ground, 10e-9)
	n.SetOutput("out")
	k, err := n.CompileZPK()
	if err != nil {
		fmt.Println(err)
		return
	}
	fmt.Printf("poles %.6g rad/s, %d zeros\n", real(k.Poles()[0]), len(k.Zeros()))
	fmt.Printf("at 1591.55 Hz: %.3f dB\n", k.GainDB(1591.55))
	fmt.Printf("at 1e100 Hz: %.2f dB\n", k.GainDB(1e100))
	// Output:
	// poles -10000 rad/s, 0 zeros
	// at 1591.55 Hz: -3.010 dB
	// at 1e100 Hz: -1935.96 dB
}
