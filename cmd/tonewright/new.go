package main

import (
	"bytes"
	"fmt"
	"os"
	"strings"
	"text/tabwriter"

	"github.com/spf13/cobra"

	"tonewright/networks"
)

func init() { register(newNewCmd) }

func newNewCmd(a *app) *cobra.Command {
	var out string
	var list, netlist, force bool
	c := &cobra.Command{
		Use:   "new TOPOLOGY [-o FILE]",
		Short: "Write a starting design file for a built-in tone network",
		Long: `new writes a starting design for one of the built-in tone networks, with
invented part values that give a sensible curve behind a 10 kΩ source into
1 MΩ; the file says so in its comment. --netlist writes the same circuit in
the netlist form (tone: {network: netlist, parts: …}), to change part by
part. Without -o the design goes to stdout. --list lists the topologies.`,
		Example: `  tonewright new --list
  tonewright new treble-cut -o cut.yaml
  tonewright new three-band-stack --netlist -o stack.yaml`,
		Args: func(cmd *cobra.Command, args []string) error {
			if list {
				if len(args) > 0 {
					return usageErrorf("--list takes no topology")
				}
				return nil
			}
			return exactArgs(1, "TOPOLOGY")(cmd, args)
		},
		ValidArgsFunction: func(*cobra.Command, []string, string) ([]string, cobra.ShellCompDirective) {
			var names []string
			for _, t := range networks.Topologies() {
				names = append(names, t.Name)
			}
			return names, cobra.ShellCompDirectiveNoFileComp
		},
		RunE: func(cmd *cobra.Command, args []string) error {
			if list {
				tw := tabwriter.NewWriter(a.out, 0, 0, 2, ' ', 0)
				for _, t := range networks.Topologies() {
					fmt.Fprintf(tw, "%s\t%s\n", t.Name, t.Summary)
				}
				return tw.Flush()
			}
			tp, err := networks.TopologyByName(args[0])
			if err != nil {
				return usageErrorf("%v", err)
			}
			if out != "" {
				if err := checkOutput(out); err != nil {
					return err
				}
				if _, err := os.Stat(out); err == nil && !force {
					return usageErrorf("%s exists: new writes a starting design and will not replace a file (it may be your board); choose another name, or give --force", out)
				}
			}
			data := starterFile(tp, netlist)
			if out == "" {
				_, err := a.out.Write(data)
				return err
			}
			if err := writeFile(out, data); err != nil {
				return err
			}
			fmt.Fprintf(a.out, "wrote %s (%s%s)\n", out, tp.Name, map[bool]string{true: ", netlist form"}[netlist])
			return nil
		},
	}
	c.Flags().StringVarP(&out, "output", "o", "", "write the design to `FILE` (default stdout)")
	c.Flags().BoolVar(&list, "list", false, "list the built-in topologies, one a line")
	c.Flags().BoolVar(&netlist, "netlist", false, "write the circuit in the netlist form, part by part")
	c.Flags().BoolVar(&force, "force", false, "replace the -o file if it exists")
	return c
}

// starterFile is the design file new writes: a comment that says what the
// values are, then the design.
func starterFile(tp *networks.Topology, netlist bool) []byte {
	d := tp.DefaultDesign()
	var b bytes.Buffer
	fmt.Fprintf(&b, "# A starting design for the %s network (tonewright new).\n", tp.Name)
	fmt.Fprintf(&b, "# %s%s.\n", strings.ToUpper(tp.Summary[:1]), tp.Summary[1:])
	b.WriteString("# The part values are invented: they give a sensible curve behind a 10 kΩ\n")
	b.WriteString("# source into 1 MΩ. Change them, and the source and load, to your board.\n")
	if netlist {
		d.Tone = networks.Tone{Network: networks.NetlistNetwork, Parts: d.ToneParts()}
		b.WriteString("# The netlist form: every part by name, between named nodes (in, out, gnd).\n")
	}
	if ks := tp.Knobs(); len(ks) > 0 {
		fmt.Fprintf(&b, "# Knobs: %s (0 to 1; none has a position, so the first is swept).\n", joinComma(ks))
	}
	b.Write(d.YAML())
	return b.Bytes()
}

func joinComma(s []string) string {
	out := ""
	for i, x := range s {
		if i > 0 {
			out += ", "
		}
		out += x
	}
	return out
}
