package audio

import (
	"encoding/binary"
	"errors"
	"io"
	"math"
	"os"
	"path/filepath"
	"strings"
	"testing"

	goaudio "github.com/go-audio/audio"
	"github.com/go-audio/wav"
)

// writePCM writes a test WAV of the given encoding with go-audio/wav: a
// ramp of frames frames per channel, values in the encoding's integers.
func writePCM(t *testing.T, path string, rate, depth, channels, tag, frames int) {
	t.Helper()
	if err := writePCMFile(path, rate, depth, channels, tag, frames); err != nil {
		t.Fatal(err)
	}
}

func writePCMFile(path string, rate, depth, channels, tag, frames int) error {
	f, err := os.Create(path)
	if err != nil {
		return err
	}
	e := wav.NewEncoder(f, rate, depth, channels, tag)
	buf := &goaudio.IntBuffer{Format: &goaudio.Format{NumChannels: channels, SampleRate: rate}, SourceBitDepth: depth}
	for i := 0; i < frames; i++ {
		for c := 0; c < channels; c++ {
			v := float64(i%100-50) / 100 * float64(c+1) / 2
			if tag == wavFloat {
				buf.Data = append(buf.Data, int(int32(math.Float32bits(float32(v)))))
			} else {
				buf.Data = append(buf.Data, int(v*float64(int(1)<<(depth-1))))
			}
		}
	}
	if err := e.Write(buf); err != nil {
		return err
	}
	if err := e.Close(); err != nil {
		return err
	}
	return f.Close()
}

func TestWAVReadsEncodings(t *testing.T) {
	dir := t.TempDir()
	for _, c := range []struct {
		depth, tag, channels, rate int
	}{{16, wavPCM, 1, 44100}, {24, wavPCM, 2, 48000}, {32, wavFloat, 2, 96000}, {16, wavPCM, 2, 22050}, {24, wavPCM, 1, 192000}} {
		path := filepath.Join(dir, "in.wav")
		writePCM(t, path, c.rate, c.depth, c.channels, c.tag, 1000)
		r, err := OpenWAV(path)
		if err != nil {
			t.Fatalf("%+v: %v", c, err)
		}
		if r.Rate != c.rate || r.Channels != c.channels || r.Frames != 1000 {
			t.Errorf("%+v: read %d Hz, %d channels, %d frames", c, r.Rate, r.Channels, r.Frames)
		}
		block := make([][]float64, c.channels)
		for i := range block {
			block[i] = make([]float64, 300)
		}
		got := 0
		for {
			n, err := r.Read(block)
			if n == 0 {
				if !errors.Is(err, io.EOF) {
					t.Errorf("%+v: end: %v", c, err)
				}
				break
			}
			for i := 0; i < n; i++ {
				for ch := 0; ch < c.channels; ch++ {
					want := float64((got+i)%100-50) / 100 * float64(ch+1) / 2
					if math.Abs(block[ch][i]-want) > 1e-4 {
						t.Fatalf("%+v: frame %d channel %d: %v, want %v", c, got+i, ch, block[ch][i], want)
					}
				}
			}
			got += n
		}
		r.Close()
		if got != 1000 {
			t.Errorf("%+v: %d frames read", c, got)
		}
	}
}

// TestWAVRefuses: every bad input is refused with the reason.
func TestWAVRefuses(t *testing.T) {
	dir := t.TempDir()
	good := filepath.Join(dir, "good.wav")
	writePCM(t, good, 48000, 16, 1, wavPCM, 5000)
	data, _ := os.ReadFile(good)
	cases := []struct {
		name, want string
		make       func(path string)
	}{
		{"empty", "empty", func(p string) { os.WriteFile(p, nil, 0o644) }},
		{"text", "not a WAV file", func(p string) { os.WriteFile(p, []byte("name: a design, not a sound\n"), 0o644) }},
		{"truncated", "truncated", func(p string) { os.WriteFile(p, data[:len(data)/2], 0o644) }},
		{"header only", "", func(p string) { os.WriteFile(p, data[:30], 0o644) }},
		{"8-bit", "unsupported encoding", func(p string) { writePCM(t, p, 48000, 8, 1, wavPCM, 100) }},
		{"32-bit integer", "unsupported encoding", func(p string) { writePCM(t, p, 48000, 32, 1, wavPCM, 100) }},
		{"8 kHz", "sample rate 8000 Hz is outside", func(p string) { writePCM(t, p, 8000, 16, 1, wavPCM, 100) }},
		{"384 kHz", "sample rate 384000 Hz is outside", func(p string) { writePCM(t, p, 384000, 16, 1, wavPCM, 100) }},
	}
	for _, c := range cases {
		path := filepath.Join(dir, strings.ReplaceAll(c.name, " ", "-")+".wav")
		c.make(path)
		err := readAll(path)
		if err == nil {
			t.Errorf("%s: accepted", c.name)
			continue
		}
		if !strings.Contains(err.Error(), c.want) || !strings.Contains(err.Error(), path) {
			t.Errorf("%s: %v (want the file and %q)", c.name, err, c.want)
		}
	}
}

// readAll opens and reads the whole file, returning the first error.
func readAll(path string) error {
	r, err := OpenWAV(path)
	if err != nil {
		return err
	}
	defer r.Close()
	block := make([][]float64, r.Channels)
	for i := range block {
		block[i] = make([]float64, 1024)
	}
	for {
		n, err := r.Read(block)
		if n == 0 {
			if !errors.Is(err, io.EOF) {
				return err
			}
			return nil
		}
	}
}

// TestWAVReadsExtensibleFloat: a WAVE_FORMAT_EXTENSIBLE file whose
// subformat is IEEE float (the form many recording programs write for
// 32-bit float) is read as float. The file is built by hand here, byte by
// byte as the WAVE format's extensible header lays it out.
func TestWAVReadsExtensibleFloat(t *testing.T) {
	le := binary.LittleEndian
	samples := []float32{0.5, -0.25, 0.125, 1}
	var b []byte
	b = append(b, "RIFF"...)
	b = le.AppendUint32(b, uint32(4+8+40+8+4*len(samples)))
	b = append(b, "WAVEfmt "...)
	b = le.AppendUint32(b, 40)
	b = le.AppendUint16(b, wavExtensible)
	b = le.AppendUint16(b, 1)        // channels
	b = le.AppendUint32(b, 48000)    // rate
	b = le.AppendUint32(b, 48000*4)  // bytes per second
	b = le.AppendUint16(b, 4)        // block align
	b = le.AppendUint16(b, 32)       // bits
	b = le.AppendUint16(b, 22)       // extension size
	b = le.AppendUint16(b, 32)       // valid bits
	b = le.AppendUint32(b, 4)        // channel mask: front centre
	b = le.AppendUint16(b, wavFloat) // subformat GUID, first two bytes
	b = append(b, 0x00, 0x00, 0x00, 0x00, 0x10, 0x00, 0x80, 0x00, 0x00, 0xAA, 0x00, 0x38, 0x9B, 0x71)
	b = append(b, "data"...)
	b = le.AppendUint32(b, uint32(4*len(samples)))
	for _, v := range samples {
		b = le.AppendUint32(b, math.Float32bits(v))
	}
	path := filepath.Join(t.TempDir(), "ext.wav")
	if err := os.WriteFile(path, b, 0o644); err != nil {
		t.Fatal(err)
	}
	r, err := OpenWAV(path)
	if err != nil {
		t.Fatal(err)
	}
	defer r.Close()
	block := [][]float64{make([]float64, 8)}
	n, err := r.Read(block)
	if err != nil || n != len(samples) {
		t.Fatalf("read %d frames, %v", n, err)
	}
	for i, v := range samples {
		if block[0][i] != float64(v) {
			t.Errorf("sample %d: %v, want %v", i, block[0][i], v)
		}
	}
}
