package networks

import (
	"fmt"
	"io"
	"strconv"
	"strings"
)

// SPICEValue writes a value as a plain exponent number (4.7e+03). SPICE
// reads the suffix M as milli, so a deck never uses prefixes.
func SPICEValue(v float64) string { return strconv.FormatFloat(v, 'e', -1, 64) }

// WriteSPICE writes the network as a SPICE deck: the source is V1 with
// "AC 1", node names as in the network (ground is 0), and an .ac line over
// band with perDecade points per decade, and a .print line for the output's
// magnitude (dB) and phase. title is the deck's first line.
func (n *Network) WriteSPICE(w io.Writer, title string, band Band, perDecade int) error {
	if err := n.check(); err != nil {
		return err
	}
	var b strings.Builder
	fmt.Fprintf(&b, "* %s\n", strings.ReplaceAll(title, "\n", " "))
	drive, z := n.Source()
	node := func(s string) string {
		if isGround(s) {
			return "0"
		}
		return s
	}
	if z > 0 {
		fmt.Fprintf(&b, "V1 src 0 DC 0 AC 1\n")
		fmt.Fprintf(&b, "Rsrc src %s %s\n", node(drive), SPICEValue(z))
	} else {
		fmt.Fprintf(&b, "V1 %s 0 DC 0 AC 1\n", node(drive))
	}
	for _, e := range n.Flatten() {
		if node(e.A) == node(e.B) {
			// Both ends on one node (the shorted segment of a pot wired
			// as a variable resistor): it carries no current.
			continue
		}
		name := e.Name
		letter := map[Kind]string{Resistor: "R", Capacitor: "C", Inductor: "L"}[e.Kind]
		if !strings.HasPrefix(strings.ToUpper(name), letter) {
			name = letter + "_" + name
		}
		fmt.Fprintf(&b, "%s %s %s %s\n", name, node(e.A), node(e.B), SPICEValue(e.Value))
	}
	fmt.Fprintf(&b, ".ac dec %d %s %s\n", perDecade, SPICEValue(band.From), SPICEValue(band.To))
	fmt.Fprintf(&b, "* vdb() is the gain in dB, vp() the phase in radians\n.print ac vdb(%s) vp(%s)\n.end\n", n.out, n.out)
	_, err := io.WriteString(w, b.String())
	return err
}
