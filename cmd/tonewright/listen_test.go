package main

import (
	"encoding/json"
	"math"
	"os"
	"path/filepath"
	"strings"
	"testing"

	"tonewright/networks/audio"
)

// listenSheet runs listen with --json and decodes the cue sheet.
func listenSheet(t *testing.T, args ...string) cueSheet {
	t.Helper()
	code, out, errOut := tw(t, append([]string{"listen", "--json"}, args...)...)
	if code != 0 {
		t.Fatalf("listen %v: exit %d: %s", args, code, errOut)
	}
	var s cueSheet
	if err := json.Unmarshal([]byte(out), &s); err != nil {
		t.Fatalf("%v\n%s", err, out)
	}
	return s
}

func TestListenSettings(t *testing.T) {
	wav := filepath.Join(t.TempDir(), "out.wav")
	s := listenSheet(t, demoFile, "--knob", "blend=0,1", "--seconds", "1", "-o", wav)
	if len(s.Cues) != 2 || s.Cues[0].Knobs["blend"] != 0 || s.Cues[1].Knobs["blend"] != 1 {
		t.Fatalf("cues %+v", s.Cues)
	}
	if s.Cues[1].StartS != 1.5 || s.SampleRate != 48000 || s.Channels != 1 {
		t.Errorf("sheet %+v", s)
	}
	// makeup auto: the loudest part peaks at −1 dBFS, the others below, by
	// as much as their level differs.
	top := math.Max(s.Cues[0].PeakDBFS, s.Cues[1].PeakDBFS)
	if math.Abs(top-audio.PeakTarget) > 1e-9 {
		t.Errorf("loudest peak %.3f dBFS, want %.1f", top, audio.PeakTarget)
	}
	if s.Cues[0].GainDB != s.Cues[1].GainDB {
		t.Errorf("auto makeup applied different gains: %v, %v", s.Cues[0].GainDB, s.Cues[1].GainDB)
	}
	r, err := audio.OpenWAV(wav)
	if err != nil {
		t.Fatal(err)
	}
	r.Close()
	if r.Frames != int64(s.Seconds*48000) || r.Rate != 48000 {
		t.Errorf("the file holds %d frames at %d Hz; the sheet says %v s", r.Frames, r.Rate, s.Seconds)
	}
}

// TestListenPeakBySox: the outside meter (sox stat) reads the file's peak
// at −1 dBFS, as --makeup auto promises.
func TestListenPeakBySox(t *testing.T) {
	audio.RequireSox(t)
	wav := filepath.Join(t.TempDir(), "out.wav")
	listenSheet(t, demoFile, "--signal", "chord", "--seconds", "1", "-o", wav)
	st, err := audio.SoxStat(wav)
	if err != nil {
		t.Fatal(err)
	}
	peak := 20 * math.Log10(math.Max(st["Maximum amplitude"], -st["Minimum amplitude"]))
	if math.Abs(peak-audio.PeakTarget) > 0.01 {
		t.Errorf("sox reads the peak at %.3f dBFS, want %.1f", peak, audio.PeakTarget)
	}
}

func TestListenABAndMatch(t *testing.T) {
	wav := filepath.Join(t.TempDir(), "ab.wav")
	s := listenSheet(t, demoFile, exampleFile, "--knob", "blend=0,1", "--seconds", "1", "--signal", "noise", "--match-loudness", "-o", wav)
	if len(s.Cues) != 4 {
		t.Fatalf("%d cues", len(s.Cues))
	}
	for i, c := range s.Cues {
		wantDesign := s.Cues[i%2].Design
		if c.Design != wantDesign || c.Knobs["blend"] != float64(i/2) {
			t.Errorf("cue %d: %s at %v", i, c.Design, c.Knobs)
		}
		if c.LoudnessLUFS == nil || math.Abs(*c.LoudnessLUFS-*s.Cues[0].LoudnessLUFS) > 0.01 {
			t.Errorf("cue %d: loudness %v, want all equal (ITU-R BS.1770)", i, c.LoudnessLUFS)
		}
	}
	if s.Cues[0].Design == s.Cues[1].Design {
		t.Errorf("A and B are the same design: %s", s.Cues[0].Design)
	}
}

func TestListenTurnAB(t *testing.T) {
	wav := filepath.Join(t.TempDir(), "turns.wav")
	s := listenSheet(t, demoFile, exampleFile, "--turn", "blend=1", "--makeup", "-3 dB", "-o", wav)
	if len(s.Cues) != 2 || s.Cues[0].Turn == nil || s.Cues[1].Turn == nil || s.Cues[0].Design == s.Cues[1].Design {
		t.Fatalf("cues %+v", s.Cues)
	}
	if s.Cues[1].StartS != 1.5 || s.Cues[0].GainDB != -3 {
		t.Errorf("second turn starts at %v s (want 1.5), gain %v dB (want -3)", s.Cues[1].StartS, s.Cues[0].GainDB)
	}
}

func TestListenTurnOfAnInput(t *testing.T) {
	dir := t.TempDir()
	in := filepath.Join(dir, "in.wav")
	f, _ := os.Create(in)
	w := audio.NewWAVWriter(f, 44100, 2, true)
	x := audio.PinkNoise(44100, 2)
	w.Write([][]float64{x, x})
	w.Close()
	f.Close()
	out := filepath.Join(dir, "turn.wav")
	s := listenSheet(t, demoFile, "--input", in, "--turn", "blend", "--float", "-o", out)
	if len(s.Cues) != 1 || s.Cues[0].Turn == nil || s.Cues[0].Turn.Knob != "blend" || s.Cues[0].Turn.Seconds != 1 {
		t.Fatalf("cues %+v", s.Cues)
	}
	r, err := audio.OpenWAV(out)
	if err != nil {
		t.Fatal(err)
	}
	r.Close()
	if r.Rate != 44100 || r.Channels != 2 {
		t.Errorf("wrote %d Hz, %d channels; want the input's 44100 Hz, 2", r.Rate, r.Channels)
	}
}

func TestListenClipWarns(t *testing.T) {
	wav := filepath.Join(t.TempDir(), "loud.wav")
	code, _, errOut := tw(t, "listen", demoFile, "--knob", "blend=0,1", "--seconds", "1", "--makeup", "40", "-o", wav)
	if code != 0 {
		t.Fatalf("exit %d: %s", code, errOut)
	}
	if !strings.Contains(errOut, "warning") || !strings.Contains(errOut, "blend 1") || !strings.Contains(errOut, "clips") {
		t.Errorf("no clipping warning naming the setting: %q", errOut)
	}
}

// TestListenRefuses: bad input exits 2, names the file and the reason, and
// leaves no output (not even a temporary file).
func TestListenRefuses(t *testing.T) {
	dir := t.TempDir()
	notWAV := writeTemp(t, "riff.wav", "this is text\n")
	// A WAV file cut short after its header announced more.
	whole := filepath.Join(t.TempDir(), "whole.wav")
	f, _ := os.Create(whole)
	w := audio.NewWAVWriter(f, 48000, 1, false)
	w.Write([][]float64{audio.PinkNoise(48000, 1)})
	w.Close()
	f.Close()
	data, _ := os.ReadFile(whole)
	cut := writeTemp(t, "cut.wav", string(data[:len(data)/2]))
	empty := writeTemp(t, "empty.wav", "")
	out := filepath.Join(dir, "out.wav")
	for _, c := range []struct {
		args []string
		want string
	}{
		{[]string{"--input", notWAV}, "not a WAV file"},
		{[]string{"--input", empty}, "empty"},
		{[]string{"--input", cut}, "truncated"},
		{[]string{"--input", cut, "--seconds", "3"}, "--seconds is for a built-in signal"},
		{[]string{"--input", filepath.Join(dir, "missing.wav")}, "missing.wav"},
		{[]string{"--knob", "tone=0,1"}, `no knob "tone"`},
		{[]string{"--knob", "blend=0,2"}, "bad knob position"},
		{[]string{"--turn", "blend", "--knob", "blend=0"}, "a knob that turns"},
		{[]string{"--signal", "hum"}, "unknown signal"},
		{[]string{"--makeup", "loud"}, "--makeup"},
		{[]string{"--rate", "8000"}, "--rate"},
		{[]string{"--turn", "blend=3", "--seconds", "2"}, "a turn's length is given with it"},
		{[]string{"-o", filepath.Join(dir, "out.mp3")}, "name the output .wav"},
	} {
		code, _, errOut := tw(t, append([]string{"listen", demoFile, "-o", out}, c.args...)...)
		if code != 2 || !strings.Contains(errOut, c.want) {
			t.Errorf("%v: exit %d, %q (want 2 and %q)", c.args, code, errOut, c.want)
		}
	}
	left, _ := os.ReadDir(dir)
	if len(left) != 0 {
		t.Errorf("files left behind: %v", left)
	}
	if code, _, _ := tw(t, "listen", demoFile); code != 2 {
		t.Errorf("no -o: exit %d", code)
	}
}

// TestListenDemoTable keeps the cue sheet of the demo design in a golden
// file, which the README shows.
func TestListenDemoTable(t *testing.T) {
	dir := t.TempDir()
	code, out, errOut := tw(t, "listen", demoFile, "-o", filepath.Join(dir, "board.wav"))
	if code != 0 {
		t.Fatalf("exit %d: %s", code, errOut)
	}
	golden(t, "listen-demo.txt", strings.ReplaceAll(out, dir+string(filepath.Separator), ""))
}
