// Command tonewright analyses and designs the passive tone-and-level section
// of guitar and audio effects: the blend tone network, RC low-pass filter
// sections and a level pot, with the impedances that drive and load them.
//
// Run "tonewright --help" for the commands.
package main

import "os"

func main() {
	os.Exit(run(os.Args[1:], os.Stdout, os.Stderr))
}
