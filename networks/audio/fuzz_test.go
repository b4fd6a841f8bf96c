package audio

import (
	"os"
	"path/filepath"
	"testing"
)

// FuzzOpenWAV: whatever the bytes, reading a file as WAV returns an error
// or samples, never a panic.
func FuzzOpenWAV(f *testing.F) {
	dir := f.TempDir()
	for i, c := range []struct{ rate, depth, ch, tag int }{{48000, 16, 1, wavPCM}, {44100, 24, 2, wavPCM}, {96000, 32, 2, wavFloat}} {
		p := filepath.Join(dir, "seed.wav")
		writePCMFile(p, c.rate, c.depth, c.ch, c.tag, 64+i)
		b, _ := os.ReadFile(p)
		f.Add(b)
		f.Add(b[:len(b)/2])
	}
	f.Add([]byte("RIFF\x00\x00\x00\x00WAVEfmt "))
	f.Fuzz(func(t *testing.T, data []byte) {
		p := filepath.Join(t.TempDir(), "in.wav")
		if err := os.WriteFile(p, data, 0o644); err != nil {
			t.Fatal(err)
		}
		_ = readAll(p)
	})
}
