package main

import (
	"fmt"
	"io"
)

// studyOutput is what a study command delivers: a plot if asked for, then
// the result as JSON or as a table.
type studyOutput struct {
	plotPath, input string
	asJSON          bool
	value           any
	plot            func() *bode
	panels          func() *panels // instead of plot, for the figures that are not Bode plots
	text            func(io.Writer)
}

// deliver draws the plot (when plotPath is set), then prints the JSON or
// the table and says where the plot went.
func (a *app) deliver(o studyOutput) error {
	if o.plotPath != "" && o.panels != nil {
		if err := o.panels().render(o.plotPath, o.input); err != nil {
			return err
		}
	} else if o.plotPath != "" {
		if err := o.plot().render(o.plotPath, o.input); err != nil {
			return err
		}
	}
	if o.asJSON {
		return printJSON(a.out, o.value)
	}
	o.text(a.out)
	if o.plotPath != "" {
		fmt.Fprintf(a.out, "\nwrote %s\n", o.plotPath)
	}
	return nil
}
