package main

import (
	"bytes"
	"encoding/csv"
	"fmt"
	"io"
	"strconv"
	"strings"
	"text/tabwriter"

	"github.com/spf13/cobra"

	"tonewright/networks"
)

func init() { register(newPartsCmd) }

// partsCautions are printed under every parts list: the voltage ratings a
// list of values cannot show (common practice, no published source).
var partsCautions = []string{
	"Voltage ratings are not listed: in a valve (tube) amplifier the coupling capacitor and the pots can sit at the plate supply's DC voltage, so choose parts rated above it; the tool does not know the voltages.",
	"A valve amplifier holds lethal voltages even with the power off, until the supply capacitors are discharged: if you are not trained to work inside one, do not.",
}

func newPartsCmd(a *app) *cobra.Command {
	var asCSV, asJSON bool
	c := &cobra.Command{
		Use:   "parts DESIGN.yaml",
		Short: "List the parts to fit: values, kinds, tolerances and tapers, identical parts grouped",
		Long: `parts lists every part a builder fits for the design, the coupling
capacitor and the level pot included, one line per distinct part: the
quantity, the value as the trade writes it, the kind, the tolerance the
tolerance study assumes for it (the tolerance of the coarsest E-series that
holds the value, else the kind's default: resistors 5 %, capacitors 10 %,
pots 20 %), for pots the taper and its code letter, and the names and roles
of the parts on that line. Identical parts (kind, value, tolerance, taper)
share a line.

--csv prints the list as CSV, --json as JSON. The cautions about voltage
ratings follow the table and are in the JSON.`,
		Example: `  tonewright parts board.yaml
  tonewright parts board.yaml --csv > board-parts.csv
  tonewright parts board.yaml --json`,
		Args:              exactArgs(1, "DESIGN.yaml"),
		ValidArgsFunction: yamlFiles,
		RunE: func(cmd *cobra.Command, args []string) error {
			if asCSV && asJSON {
				return usageErrorf("--csv and --json both choose the output form: give one of them")
			}
			d, err := loadDesign(args[0])
			if err != nil {
				return err
			}
			list := partsList(d)
			switch {
			case asJSON:
				return printJSON(a.out, list)
			case asCSV:
				_, err := a.out.Write(partsCSV(list))
				return err
			}
			writePartsList(a.out, d, list)
			return nil
		},
	}
	c.Flags().BoolVar(&asCSV, "csv", false, "print the list as CSV")
	c.Flags().BoolVar(&asJSON, "json", false, "print the list as JSON")
	return c
}

// listedPart is one part on a line of the parts list.
type listedPart struct {
	Name string `json:"name"`
	Role string `json:"role"`
}

// partsLine is one line of the parts list: identical parts with their
// quantity.
type partsLine struct {
	Quantity       int          `json:"quantity"`
	Value          float64      `json:"value"`   // base units: Ω or F
	Marking        string       `json:"marking"` // as the trade writes it: "4.7 kΩ"
	Kind           string       `json:"kind"`    // resistor, capacitor, pot
	TolerancePct   float64      `json:"tolerance_pct"`
	ToleranceBasis string       `json:"tolerance_basis"` // "E24 value", "resistor default"
	Taper          *string      `json:"taper"`           // pots only: linear, audio, reverse-audio
	TaperCode      *string      `json:"taper_code"`      // pots only: B, A, C
	Parts          []listedPart `json:"parts"`

	taper networks.Taper
}

// partsListJSON is the parts command's output.
type partsListJSON struct {
	Name     string      `json:"name"`
	Count    int         `json:"count"` // parts in all
	Lines    []partsLine `json:"lines"`
	Cautions []string    `json:"cautions"`
}

// partsList groups the design's board parts into lines, in signal order
// of each line's first part.
func partsList(d *networks.Design) partsListJSON {
	out := partsListJSON{Name: designTitle(d), Cautions: partsCautions}
	for _, p := range d.BoardParts() {
		out.Count++
		tol, basis := networks.DefaultTolerance(p)
		tp, isPot := d.PotTaper(p.Name)
		found := false
		for i := range out.Lines {
			l := &out.Lines[i]
			if l.Kind == p.Kind.String() && l.Value == p.Value && l.TolerancePct == 100*tol && (l.Taper != nil) == isPot && l.taper == tp {
				l.Quantity++
				l.Parts = append(l.Parts, listedPart{p.Name, p.Role})
				found = true
				break
			}
		}
		if found {
			continue
		}
		unit := p.Kind.Unit()
		l := partsLine{Quantity: 1, Value: p.Value, Marking: withUnit(p.Value, 4, unit), Kind: p.Kind.String(),
			TolerancePct: 100 * tol, ToleranceBasis: basis, Parts: []listedPart{{p.Name, p.Role}}}
		if isPot {
			name, code := tp.String(), tp.Code()
			l.Taper, l.TaperCode, l.taper = &name, &code, tp
		}
		out.Lines = append(out.Lines, l)
	}
	return out
}

func (l partsLine) names() string {
	var s []string
	for _, p := range l.Parts {
		s = append(s, p.Name)
	}
	return strings.Join(s, " ")
}

func (l partsLine) roles() string {
	var s []string
	for _, p := range l.Parts {
		s = append(s, p.Role)
	}
	return strings.Join(s, "; ")
}

func (l partsLine) taperText() string {
	if l.Taper == nil {
		return ""
	}
	return *l.Taper + " (" + *l.TaperCode + ")"
}

// writePartsList prints the parts list as a table with the cautions.
func writePartsList(w io.Writer, d *networks.Design, list partsListJSON) {
	fmt.Fprintf(w, "%s: %d parts on %d lines\n\n", designTitle(d), list.Count, len(list.Lines))
	tw := tabwriter.NewWriter(w, 0, 0, 2, ' ', 0)
	fmt.Fprintln(tw, "qty\tvalue\tkind\ttolerance\ttaper\tparts\trole")
	for _, l := range list.Lines {
		fmt.Fprintf(tw, "%d\t%s\t%s\t± %s\t%s\t%s\t%s\n", l.Quantity, l.Marking, l.Kind,
			strconv.FormatFloat(l.TolerancePct, 'g', 4, 64)+" %", orDash(l.taperText()), l.names(), l.roles())
	}
	tw.Flush()
	fmt.Fprintln(w, "\ntolerance: what the tolerance study assumes (the coarsest E-series holding the value, else the kind's default);")
	fmt.Fprintln(w, "taper: the law, then the code letter pots are commonly marked with (makers differ: check the law).")
	fmt.Fprintln(w)
	for _, c := range list.Cautions {
		fmt.Fprintln(w, wrap("caution: "+c, 78, "  "))
	}
}

// wrap breaks s into lines of at most width characters at spaces, the
// lines after the first indented.
func wrap(s string, width int, indent string) string {
	var b strings.Builder
	n := 0
	for i, word := range strings.Fields(s) {
		wl := len([]rune(word))
		switch {
		case i == 0:
		case n+1+wl > width:
			b.WriteString("\n" + indent)
			n = len(indent)
		default:
			b.WriteString(" ")
			n++
		}
		b.WriteString(word)
		n += wl
	}
	return b.String()
}

func orDash(s string) string {
	if s == "" {
		return "—"
	}
	return s
}

// partsCSV writes the list as CSV, one row per line: quantity, value as
// marked, value in base units, kind, tolerance in percent and its basis,
// taper and code (empty for parts that are not pots), part names
// (space-separated) and roles (separated by "; ").
func partsCSV(list partsListJSON) []byte {
	var b bytes.Buffer
	w := csv.NewWriter(&b)
	_ = w.Write([]string{"quantity", "value", "value_si", "kind", "tolerance_pct", "tolerance_basis", "taper", "taper_code", "parts", "roles"})
	for _, l := range list.Lines {
		taper, code := "", ""
		if l.Taper != nil {
			taper, code = *l.Taper, *l.TaperCode
		}
		_ = w.Write([]string{strconv.Itoa(l.Quantity), l.Marking, strconv.FormatFloat(l.Value, 'g', -1, 64), l.Kind,
			strconv.FormatFloat(l.TolerancePct, 'g', 4, 64), l.ToleranceBasis, taper, code, l.names(), l.roles()})
	}
	w.Flush()
	return b.Bytes()
}
