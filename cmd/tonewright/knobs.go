package main

import (
	"fmt"
	"strings"

	"github.com/spf13/cobra"

	"tonewright/networks"
)

// knobChoice is what a command's --knob flags (and its older --positions
// or --blend flag, which set the design's swept knob) ask for.
type knobChoice struct {
	knobs     []string // NAME=LIST, as given
	positions string   // --positions or --blend, as given
	changed   bool     // whether --positions or --blend was given
	flag      string   // its name, for messages
}

// addKnobFlag adds the repeatable --knob flag.
func addKnobFlag(c *cobra.Command, k *knobChoice, many bool) {
	help := "put a knob at positions: `NAME=LIST`, e.g. treble=0,0.5,1 (repeat for more knobs; every combination is taken)"
	if !many {
		help = "put a knob at a position: `NAME=P`, e.g. treble=0.3 (repeat for more knobs)"
	}
	c.Flags().StringArrayVar(&k.knobs, "knob", nil, help)
}

// settings returns the knob settings a command measures: the --knob lists
// (every combination, the first outermost); --positions or --blend for the
// design's swept knob (the blend knob of a blend design); knobs not named
// at their design positions. With neither, the swept knob takes its
// default positions.
func (k *knobChoice) settings(cmd *cobra.Command, d *networks.Design) ([]networks.Setting, error) {
	k.changed = cmd.Flags().Changed(k.flag)
	var lists []networks.KnobList
	for _, s := range k.knobs {
		l, err := networks.ParseKnobFlag(s)
		if err != nil {
			return nil, usageErrorf("--knob %v", err)
		}
		lists = append(lists, l)
	}
	if k.changed || len(lists) == 0 {
		ps, err := parsePositions(k.flag, k.positions)
		if err != nil {
			return nil, err
		}
		name := d.SweptKnob()
		if name == "" && len(d.Knobs()) > 0 && k.changed {
			name = d.Knobs()[0].Name
		}
		for _, l := range lists {
			if l.Name == name {
				return nil, usageErrorf("--%s and --knob %s both set the %s knob: give one", k.flag, name, name)
			}
		}
		if name != "" && (k.changed || len(lists) == 0) {
			lists = append([]networks.KnobList{{Name: name, Positions: ps}}, lists...)
		} else if k.changed {
			return nil, usageErrorf("--%s: this design has no knob to turn", k.flag)
		}
	}
	ss, err := d.Settings(lists)
	if err != nil {
		return nil, usageErrorf("--knob: %v", err)
	}
	return ss, nil
}

// single returns the one setting a command that measures at one setting
// is asked for.
func (k *knobChoice) single(cmd *cobra.Command, d *networks.Design) (networks.Setting, error) {
	ss, err := k.settings(cmd, d)
	if err != nil {
		return nil, err
	}
	if len(ss) != 1 {
		return nil, usageErrorf("this command measures one knob setting: give each knob one position (--knob NAME=P)")
	}
	return ss[0], nil
}

// settingLabel names a setting in tables, legends and titles by the knobs
// that vary (varied); a blend design whose only varied knob is the blend
// keeps its plain "blend 0.5".
func settingLabel(s networks.Setting, varied []string) string {
	if len(varied) == 0 {
		return "as designed"
	}
	return s.Label(varied)
}

// csvSetting names a setting in a CSV column: the position alone when the
// blend knob is all that varies (db_at_0.5), else NAME=P pairs joined by
// semicolons (db_at_treble=0.5;bass=0).
func csvSetting(s networks.Setting, varied []string) string {
	if len(varied) == 1 && varied[0] == networks.BlendKnob {
		return posLabel(s[networks.BlendKnob])
	}
	var parts []string
	for _, n := range varied {
		parts = append(parts, fmt.Sprintf("%s=%s", n, posLabel(s[n])))
	}
	if len(parts) == 0 {
		return "design"
	}
	return strings.Join(parts, ";")
}

// cornerWhere says where a study measures the corner: at blend knob 1 for
// a blend design, else at the study's setting.
func cornerWhere(d *networks.Design) string {
	if d.Tone.Network == networks.BlendNetwork {
		return "knob 1"
	}
	return "this setting"
}

// studyLabel names the setting a study measures at: "blend 0.5" for a
// blend design, else the knobs not at their design positions (or swept).
func studyLabel(d *networks.Design, s networks.Setting) string {
	if _, ok := s[networks.BlendKnob]; ok && d.Tone.Network == networks.BlendNetwork {
		return "blend " + posLabel(s[networks.BlendKnob])
	}
	return settingLabel(s, d.Varied([]networks.Setting{s}))
}
