package main

import (
	"fmt"
	"io"
	"math"
	"os"
	"path/filepath"
	"sort"
	"strconv"
	"strings"
	"text/tabwriter"

	"github.com/spf13/cobra"

	"tonewright/networks"
	"tonewright/networks/audio"
)

func init() { register(newListenCmd) }

// listenFlags are the listen command's options.
type listenFlags struct {
	input, signal, turn, makeup, out string
	knobs                            []string
	match, float, asJSON             bool
	rate                             int
	seconds, gap                     float64
}

// Defaults of the listen command.
const (
	listenRate      = 48000
	listenSeconds   = 4.0 // a built-in signal per setting
	listenTurn      = 8.0 // a turn of the knob
	listenGap       = 0.5
	listenPositions = "0,0.5,1"
	// maxSignalSeconds bounds a built-in signal, which is held in memory
	// (at 192 kHz, 120 s is 180 MB); an input file is streamed.
	maxSignalSeconds = 120
)

func newListenCmd(a *app) *cobra.Command {
	var o listenFlags
	c := &cobra.Command{
		Use:   "listen DESIGN.yaml [DESIGN2.yaml] -o OUT.wav",
		Short: "Render sound through a design at its knob settings, or while a knob turns",
		Long: `listen plays a signal through the design's exact response and writes a WAV
file: each knob setting in turn, with a short gap between them, or, with
--turn, the knob turning from 0 to 1. With a second design every setting is
played by the first design, then by the second (A, B, A, B, …).

The signal is a WAV file (--input: 16- or 24-bit PCM or 32-bit float, mono
or stereo, 22.05 to 192 kHz; the output has its rate) or a built-in one made
here (--signal): pluck (an invented phrase of plucked-string notes,
Karplus–Strong), chord (an invented strummed chord), noise (pink), sweep (a
logarithmic sine sweep).

Level: a passive network loses 10–40 dB. --makeup auto (the default) applies
one gain to the whole file so that its loudest moment peaks at −1 dBFS, which
keeps the level differences between settings; --makeup DB is a fixed gain;
--match-loudness first brings every setting to the same loudness (ITU-R
BS.1770), so that tone is judged at equal loudness. A setting that clips is
named in a warning. The cue sheet (time, design, setting) is printed, or
given as JSON with --json.`,
		Example: `  tonewright listen board.yaml -o board.wav
  tonewright listen board.yaml --knob blend=0,0.25,0.5 --signal chord -o chord.wav
  tonewright listen board.yaml --turn blend=10 -o turn.wav
  tonewright listen old.yaml new.yaml --input riff.wav --match-loudness -o ab.wav`,
		Args: func(cmd *cobra.Command, args []string) error {
			if len(args) < 1 || len(args) > 2 {
				return usageErrorf("listen takes one or two design files (got %d arguments); see %s --help", len(args), cmd.CommandPath())
			}
			return nil
		},
		ValidArgsFunction: yamlFiles,
		RunE: func(cmd *cobra.Command, args []string) error {
			return runListen(a, cmd, o, args)
		},
	}
	f := c.Flags()
	f.StringVar(&o.input, "input", "", "play `FILE.wav` (instead of a built-in signal)")
	f.StringVar(&o.signal, "signal", "pluck", "built-in signal: pluck, chord, noise or sweep")
	f.StringArrayVar(&o.knobs, "knob", nil, "knob positions to play, `NAME=LIST` (e.g. blend=0,0.5,1); repeat for several knobs (every combination is played)")
	f.StringVar(&o.turn, "turn", "", "turn knob `NAME[=SECONDS]` from 0 to 1 over the signal (default 8 s, or the input file's length)")
	f.StringVar(&o.makeup, "makeup", "auto", "output gain: auto (peak at −1 dBFS) or a fixed gain in dB")
	f.BoolVar(&o.match, "match-loudness", false, "give every setting the same loudness (ITU-R BS.1770)")
	f.BoolVar(&o.float, "float", false, "write 32-bit float samples (default 24-bit PCM)")
	f.BoolVar(&o.asJSON, "json", false, "print the cue sheet as JSON")
	f.StringVarP(&o.out, "output", "o", "", "write the sound to `OUT.wav` (required)")
	f.IntVar(&o.rate, "rate", listenRate, "sample rate of a built-in signal, Hz")
	f.Float64Var(&o.seconds, "seconds", listenSeconds, "length of a built-in signal per setting, s")
	f.Float64Var(&o.gap, "gap", listenGap, "silence between settings, s (the filter rings out in it)")
	return c
}

// Adapter: the one place where a design at a knob setting becomes a
// network and its exact response: the same circuit and evaluator that
// analyze uses (Design.Network, Design.Compile).

// designKnobs lists the knobs a design has and where each sits by default
// (a knob without a position at its centre).
func designKnobs(d *networks.Design) map[string]float64 {
	k := map[string]float64{}
	for _, kn := range d.Knobs() {
		k[kn.Name] = kn.Position
	}
	return k
}

// designAt returns the design's network at a knob setting and its exact
// response; knobs the setting leaves out sit at their positions.
func designAt(d *networks.Design, setting map[string]float64) (*networks.Network, audio.Response, error) {
	full, err := d.Setting(setting)
	if err != nil {
		return nil, nil, err
	}
	e, err := d.Compile(full)
	if err != nil {
		return nil, nil, err
	}
	return d.Network(full), e, nil
}

// filterAt fits the digital filter of a design at a setting.
func filterAt(d *networks.Design, setting map[string]float64, rate float64) (*audio.Filter, error) {
	n, h, err := designAt(d, setting)
	if err != nil {
		return nil, err
	}
	poles, err := n.Poles()
	if err != nil {
		return nil, err
	}
	return audio.Fit(h, poles, rate)
}

// cueSheet is what listen prints: where each part starts, what plays it.
type cueSheet struct {
	Output          string  `json:"output"`
	SampleRate      int     `json:"sample_rate"`
	Channels        int     `json:"channels"`
	Seconds         float64 `json:"seconds"`
	Signal          string  `json:"signal"`
	Makeup          string  `json:"makeup"`
	LoudnessMatched bool    `json:"loudness_matched"`
	Cues            []cue   `json:"cues"`
}

// cue is one part of the output. end_s includes the gap in which the
// filter rings out.
type cue struct {
	StartS       float64            `json:"start_s"`
	EndS         float64            `json:"end_s"`
	Design       string             `json:"design"`
	Knobs        map[string]float64 `json:"knobs"`
	Turn         *turnCue           `json:"turn,omitempty"`
	GainDB       float64            `json:"gain_db"`
	PeakDBFS     float64            `json:"peak_dbfs"`
	LoudnessLUFS *float64           `json:"loudness_lufs"`
	Clipped      int64              `json:"clipped_samples"`
}

// turnCue says which knob turns (from 0 to 1) and over how long.
type turnCue struct {
	Knob    string  `json:"knob"`
	Seconds float64 `json:"seconds"`
	Filters int     `json:"filters"`
}

func runListen(a *app, cmd *cobra.Command, o listenFlags, args []string) error {
	if o.out == "" {
		return usageErrorf("listen needs an output file: -o OUT.wav")
	}
	if ext := strings.ToLower(filepath.Ext(o.out)); ext != ".wav" && o.out != os.DevNull {
		return usageErrorf("-o %s: listen writes WAV files; name the output .wav", o.out)
	}
	makeup := audio.Makeup{Auto: true}
	if o.makeup != "auto" {
		v, err := strconv.ParseFloat(strings.TrimSpace(strings.TrimSuffix(strings.TrimSpace(o.makeup), "dB")), 64)
		if err != nil || math.IsNaN(v) || math.Abs(v) > 120 {
			return usageErrorf("--makeup %q: use auto or a gain in dB from -120 to 120, e.g. 20", o.makeup)
		}
		makeup = audio.Makeup{DB: v}
	}
	if !(o.gap >= 0 && o.gap <= 60) {
		return usageErrorf("--gap %v: use 0 to 60 seconds", o.gap)
	}
	var designs []*networks.Design
	for _, p := range args {
		d, err := loadDesign(p)
		if err != nil {
			return err
		}
		if err := d.Validate(); err != nil {
			return badInput(fmt.Errorf("%s: %w", p, err))
		}
		designs = append(designs, d)
	}
	if err := checkOutput(o.out, append(append([]string{}, args...), o.input)...); err != nil {
		return err
	}
	turnKnob, turnSeconds, err := parseTurn(o.turn, cmd.Flags().Changed("turn"))
	if err != nil {
		return err
	}
	settings, err := listenSettings(designs, o.knobs, turnKnob)
	if err != nil {
		return err
	}

	// The source.
	var src audio.Source
	var label string
	if o.input != "" {
		for _, f := range []string{"signal", "rate", "seconds"} {
			if cmd.Flags().Changed(f) {
				return usageErrorf("--input and --%s: --%s is for a built-in signal; the input file sets its own", f, f)
			}
		}
		w, err := audio.NewWAVFile(o.input)
		if err != nil {
			return badInput(err)
		}
		src, label = w, o.input
		if turnKnob != "" && turnSeconds == 0 {
			turnSeconds = float64(w.Frames) / float64(w.SampleRate)
		}
	} else {
		if o.rate < audio.MinRate || o.rate > audio.MaxRate {
			return usageErrorf("--rate %d: use %d to %d Hz", o.rate, audio.MinRate, audio.MaxRate)
		}
		secs := o.seconds
		if turnKnob != "" && cmd.Flags().Changed("seconds") {
			return usageErrorf("--turn and --seconds: a turn's length is given with it, as --turn %s=SECONDS", turnKnob)
		}
		if turnKnob != "" {
			if turnSeconds == 0 {
				turnSeconds = listenTurn
			}
			secs = turnSeconds
		}
		if !(secs > 0 && secs <= maxSignalSeconds) {
			return usageErrorf("a built-in signal of %v s: use more than 0 and at most %v s (--seconds, or the seconds of --turn)", secs, maxSignalSeconds)
		}
		x, err := audio.Signal(o.signal, float64(o.rate), secs)
		if err != nil {
			return usageErrorf("--signal: %v", err)
		}
		src, label = &audio.Samples{SampleRate: o.rate, Data: x}, "built-in "+o.signal
	}
	rate := float64(src.Rate())

	// The parts: each setting by each design in turn.
	var parts []audio.Part
	var cues []cue
	for _, s := range settings {
		for _, d := range designs {
			knobs := designKnobs(d)
			for k, v := range s {
				knobs[k] = v
			}
			p := audio.Part{Source: src, Gap: o.gap}
			c := cue{Design: designTitle(d), Knobs: knobs}
			if turnKnob != "" {
				fs, _, err := audio.TurnFilters(func(pos float64) (audio.Response, []complex128, error) {
					at := map[string]float64{}
					for k, v := range knobs {
						at[k] = v
					}
					at[turnKnob] = pos
					n, h, err := designAt(d, at)
					if err != nil {
						return nil, nil, err
					}
					poles, err := n.Poles()
					return h, poles, err
				}, rate)
				if err != nil {
					return fmt.Errorf("%s: %w", designTitle(d), err)
				}
				p.Filters = fs
				p.TurnFrames = int64(math.Round(turnSeconds * rate))
				delete(c.Knobs, turnKnob)
				c.Turn = &turnCue{Knob: turnKnob, Seconds: turnSeconds, Filters: len(fs)}
			} else {
				f, err := filterAt(d, knobs, rate)
				if err != nil {
					return fmt.Errorf("%s: %w", designTitle(d), err)
				}
				p.Filters = []*audio.Filter{f}
			}
			parts = append(parts, p)
			cues = append(cues, c)
		}
	}

	channels := src.Channels()
	measured, err := audio.Render(parts, channels, nil, nil)
	if err != nil {
		return badInput(err)
	}
	gains := audio.Gains(measured, o.match, makeup)
	var stats []audio.PartStats
	err = writeStream(o.out, func(f *os.File) error {
		w := audio.NewWAVWriter(f, src.Rate(), channels, o.float)
		var err error
		stats, err = audio.Render(parts, channels, gains, w.Write)
		if err != nil {
			return badInput(err)
		}
		return w.Close()
	}, append(append([]string{}, args...), o.input)...)
	if err != nil {
		return err
	}

	sheet := cueSheet{Output: o.out, SampleRate: src.Rate(), Channels: channels, Signal: label, Makeup: o.makeup, LoudnessMatched: o.match}
	for i, st := range stats {
		c := cues[i]
		c.StartS = float64(st.Start) / rate
		c.EndS = float64(st.Start+st.Frames) / rate
		c.GainDB = 20 * math.Log10(gains[i])
		c.PeakDBFS = 20 * math.Log10(st.Peak)
		if l := measured[i].LoudnessLUFS; !math.IsInf(l, 0) {
			l += c.GainDB
			c.LoudnessLUFS = &l
		}
		c.Clipped = st.Clipped
		sheet.Cues = append(sheet.Cues, c)
		sheet.Seconds = c.EndS
		if st.Clipped > 0 {
			fmt.Fprintf(a.err, "warning: %s at %s clips: %d samples beyond full scale (peak %+.1f dBFS); lower --makeup\n", c.Design, cueLabel(c), st.Clipped, c.PeakDBFS)
		}
	}
	if o.asJSON {
		return printJSON(a.out, sheet)
	}
	writeCueSheet(a.out, sheet)
	return nil
}

// parseTurn reads --turn NAME[=SECONDS]; seconds is 0 when not given.
func parseTurn(s string, given bool) (knob string, seconds float64, err error) {
	if !given {
		return "", 0, nil
	}
	name, secs, has := strings.Cut(s, "=")
	name = strings.TrimSpace(name)
	if name == "" {
		return "", 0, usageErrorf("--turn %q: name a knob, e.g. --turn blend or --turn blend=8", s)
	}
	if has {
		v, err := strconv.ParseFloat(strings.TrimSuffix(strings.TrimSpace(secs), "s"), 64)
		if err != nil || !(v >= 0.1 && v <= 3600) {
			return "", 0, usageErrorf("--turn %q: the seconds must be a number from 0.1 to 3600, e.g. --turn blend=8", s)
		}
		seconds = v
	}
	return name, seconds, nil
}

// listenSettings is the list of knob settings to play: every combination of
// the --knob lists, in the order given, the last knob changing fastest.
// Without --knob for the first design's swept knob (the blend knob of a
// blend design; and without a turn of it) that knob plays at 0, 0.5 and 1.
func listenSettings(designs []*networks.Design, knobFlags []string, turn string) ([]map[string]float64, error) {
	type list struct {
		name string
		ps   []float64
	}
	var lists []list
	seen := map[string]bool{}
	for _, kf := range knobFlags {
		name, vals, ok := strings.Cut(kf, "=")
		name = strings.TrimSpace(name)
		if !ok || name == "" {
			return nil, usageErrorf("--knob %q: use NAME=LIST, e.g. --knob blend=0,0.5,1", kf)
		}
		if seen[name] {
			return nil, usageErrorf("--knob %s is given twice: put all its positions in one list", name)
		}
		seen[name] = true
		ps, err := parsePositions("knob "+name, vals)
		if err != nil {
			return nil, err
		}
		if name == turn && len(ps) > 0 {
			return nil, usageErrorf("--knob %s and --turn %s: a knob that turns has no fixed positions", name, name)
		}
		lists = append(lists, list{name, ps})
	}
	if swept := designs[0].SweptKnob(); swept != "" && !seen[swept] && turn != swept {
		ps, _ := parsePositions("knob", listenPositions)
		lists = append([]list{{swept, ps}}, lists...)
	}
	for _, d := range designs {
		have := designKnobs(d)
		names := make([]string, 0, len(have))
		for k := range have {
			names = append(names, k)
		}
		sort.Strings(names)
		check := func(k string) error {
			if _, ok := have[k]; !ok {
				return usageErrorf("%s has no knob %q: its knobs are %s", designTitle(d), k, strings.Join(names, ", "))
			}
			return nil
		}
		for _, l := range lists {
			if err := check(l.name); err != nil {
				return nil, err
			}
		}
		if turn != "" {
			if err := check(turn); err != nil {
				return nil, err
			}
		}
	}
	out := []map[string]float64{{}}
	for _, l := range lists {
		var next []map[string]float64
		for _, s := range out {
			for _, p := range l.ps {
				m := map[string]float64{l.name: p}
				for k, v := range s {
					m[k] = v
				}
				next = append(next, m)
			}
		}
		out = next
	}
	if turn != "" && len(knobFlags) == 0 {
		out = []map[string]float64{{}}
	}
	return out, nil
}

// cueLabel is "blend 0.5, level 1" or "blend turning".
func cueLabel(c cue) string {
	names := make([]string, 0, len(c.Knobs))
	for k := range c.Knobs {
		names = append(names, k)
	}
	sort.Strings(names)
	var parts []string
	if c.Turn != nil {
		parts = append(parts, fmt.Sprintf("%s turning 0→1 over %s s", c.Turn.Knob, posLabel(math.Round(c.Turn.Seconds*100)/100)))
	}
	for _, k := range names {
		parts = append(parts, k+" "+posLabel(c.Knobs[k]))
	}
	return strings.Join(parts, ", ")
}

// writeCueSheet prints the cue sheet as a table.
func writeCueSheet(w io.Writer, s cueSheet) {
	fmt.Fprintf(w, "%s: %s, %d Hz, %d channel(s), %.1f s; makeup %s", s.Output, s.Signal, s.SampleRate, s.Channels, s.Seconds, s.Makeup)
	if s.LoudnessMatched {
		fmt.Fprint(w, ", loudness matched (ITU-R BS.1770)")
	}
	fmt.Fprint(w, "\n\n")
	tw := tabwriter.NewWriter(w, 0, 0, 2, ' ', 0)
	fmt.Fprintln(tw, "time\tdesign\tsetting\tgain\tpeak\tloudness\t")
	for _, c := range s.Cues {
		loud := "silent"
		if c.LoudnessLUFS != nil {
			loud = fmt.Sprintf("%.1f LUFS", *c.LoudnessLUFS)
		}
		fmt.Fprintf(tw, "%s\t%s\t%s\t%s\t%+.1f dBFS\t%s\t\n", clock(c.StartS), c.Design, cueLabel(c), db(c.GainDB), c.PeakDBFS, loud)
	}
	tw.Flush()
}

// clock prints seconds as m:ss.s.
func clock(s float64) string {
	m := math.Floor(s / 60)
	return fmt.Sprintf("%d:%04.1f", int(m), s-60*m)
}
