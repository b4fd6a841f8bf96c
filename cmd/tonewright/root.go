package main

import (
	"fmt"
	"io"
	"os"
	"regexp"
	"strings"

	"github.com/spf13/cobra"
	"golang.org/x/term"
)

// version is the tool's version, printed by --version.
const version = "0.1.0"

// app is what every command writes to, so that tests can run commands
// through the root with their own buffers.
type app struct {
	out, err io.Writer
	// tty reports whether err is a terminal (progress bars go there only
	// then).
	tty bool
}

// commands lists the constructors of the subcommands; each command's file
// adds its own in an init function.
var commands []func(*app) *cobra.Command

func register(c func(*app) *cobra.Command) { commands = append(commands, c) }

// newRoot builds the command tree writing to a's streams.
func newRoot(a *app) *cobra.Command {
	root := &cobra.Command{
		Use:   "tonewright",
		Short: "Analyse and design the passive tone-and-level section of an effect",
		Long: `tonewright analyses the passive tone-and-level section of a guitar or audio
effect exactly (modified nodal analysis): a tone network (the blend network,
a built-in one such as a treble cut, a bass/treble pair, the three-knob
stack or a tilt control, or your own written part by part), RC low-pass
filter sections and a level pot, driven by a stage with an output impedance
and loaded by what follows, every pot a knob. It finds parts for a wanted
voice in E-series values or from your own stock, shows how source, load and
part tolerances move the curve, plays it (listen) and lets you turn its
knobs on a local page (live).`,
		Example: `  tonewright demo
  tonewright new three-band-stack -o stack.yaml
  tonewright analyze stack.yaml --knob treble=0,0.5,1
  tonewright plot board.yaml -o board.png`,
		Version:       version,
		SilenceUsage:  true,
		SilenceErrors: true,
	}
	root.SetOut(a.out)
	root.SetErr(a.err)
	root.SetFlagErrorFunc(flagError)
	for _, c := range commands {
		root.AddCommand(c(a))
	}
	root.InitDefaultCompletionCmd()
	for _, c := range root.Commands() {
		if c.Name() == "completion" {
			// cobra's completion command prints its help and exits 0 for a
			// shell it does not know; that is a usage error.
			c.Args = cobra.ArbitraryArgs
			c.RunE = func(cmd *cobra.Command, args []string) error {
				if len(args) == 0 {
					return usageErrorf("completion needs a shell: %s", shellNames(cmd))
				}
				return usageErrorf("completion: %q is not a supported shell: use %s", args[0], shellNames(cmd))
			}
		}
	}
	return root
}

// flagError rewrites pflag's errors in the tool's words: a negative
// number taken for a flag ("snap -5k") and a flag value of the wrong type
// ("--seed -1").
func flagError(c *cobra.Command, err error) error {
	msg := err.Error()
	if m := negativeArg.FindStringSubmatch(msg); m != nil {
		return usageErrorf("%s: values are positive (a leading - starts a flag); see %s --help", m[1], c.CommandPath())
	}
	if m := badFlagValue.FindStringSubmatch(msg); m != nil {
		name := m[2]
		if i := strings.LastIndex(name, "--"); i >= 0 {
			name = name[i+2:]
		}
		want := "a valid value"
		if f := c.Flags().Lookup(name); f != nil {
			switch f.Value.Type() {
			case "uint64", "uint":
				want = "a whole number, 0 or more"
			case "int", "int64":
				want = "a whole number"
			case "float64":
				want = "a number"
			case "bool":
				want = "true or false"
			}
		}
		return usageErrorf("--%s %q: give %s; see %s --help", name, m[1], want, c.CommandPath())
	}
	return usageErrorf("%v (see %s --help)", err, c.CommandPath())
}

var (
	negativeArg  = regexp.MustCompile(`^unknown shorthand flag: '[0-9.]' in (-[0-9.].*)$`)
	badFlagValue = regexp.MustCompile(`^invalid argument "(.*)" for "(.*)" flag: `)
)

// shellNames lists the shells the completion command writes scripts for.
func shellNames(completion *cobra.Command) string {
	var names []string
	for _, c := range completion.Commands() {
		if c.IsAvailableCommand() {
			names = append(names, c.Name())
		}
	}
	if len(names) > 1 {
		return strings.Join(names[:len(names)-1], ", ") + " or " + names[len(names)-1]
	}
	return strings.Join(names, "")
}

// outputWriter passes writes to standard output through and keeps the
// first error, so that a command whose text could not be written (a full
// disk, a closed pipe) exits 1 however it printed: tables, help or JSON.
type outputWriter struct {
	w   io.Writer
	err error
}

func (o *outputWriter) Write(p []byte) (int, error) {
	if o.err != nil {
		return 0, o.err
	}
	n, err := o.w.Write(p)
	if err != nil {
		o.err = err
	}
	return n, err
}

// run executes the command line and returns the exit code: 0 done, 1 an
// internal failure (an output that cannot be written among them), 2 bad
// input or usage, 3 targets not met.
func run(args []string, out, errOut io.Writer) int {
	ow := &outputWriter{w: out}
	a := &app{out: ow, err: errOut}
	warnings = errOut
	if f, ok := errOut.(*os.File); ok {
		a.tty = term.IsTerminal(int(f.Fd()))
	}
	root := newRoot(a)
	root.SetArgs(args)
	err := root.Execute()
	if ow.err != nil {
		// Whatever else happened, the output is incomplete.
		fmt.Fprintf(errOut, "tonewright: cannot write the output: %v\n", ow.err)
		return exitInternal
	}
	if err == nil {
		return 0
	}
	code := exitCode(err)
	fmt.Fprintf(errOut, "tonewright: %v\n", err)
	return code
}
