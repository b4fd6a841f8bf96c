package audio

import (
	"encoding/binary"
	"errors"
	"fmt"
	"io"
	"math"
	"os"

	goaudio "github.com/go-audio/audio"
	"github.com/go-audio/wav"
)

// The sample rates a WAV input may have, Hz.
const (
	MinRate = 22050
	MaxRate = 192000
)

// WAV format codes (the fmt chunk's format tag).
const (
	wavPCM        = 1
	wavFloat      = 3
	wavExtensible = 0xFFFE
)

// WAVReader reads a WAV file's samples as float64 in −1..1, block by block.
// It reads 16- and 24-bit PCM and 32-bit float, any number of channels.
type WAVReader struct {
	Path     string
	Rate     int
	Channels int
	Frames   int64 // as the header says
	float    bool
	depth    int
	f        *os.File
	d        *wav.Decoder
	buf      *goaudio.IntBuffer
	read     int64
}

// OpenWAV opens path and checks that it is a WAV file this package reads:
// the error says what is wrong with it.
func OpenWAV(path string) (*WAVReader, error) {
	f, err := os.Open(path)
	if err != nil {
		return nil, err
	}
	r := &WAVReader{Path: path, f: f}
	if err := r.open(); err != nil {
		f.Close()
		return nil, fmt.Errorf("%s: %w", path, err)
	}
	return r, nil
}

func (r *WAVReader) open() (err error) {
	defer func() {
		if p := recover(); p != nil {
			err = fmt.Errorf("malformed WAV file (%v)", p)
		}
	}()
	st, err := r.f.Stat()
	if err != nil {
		return err
	}
	if st.Size() == 0 {
		return errors.New("the file is empty")
	}
	sub, err := checkChunks(r.f, st.Size())
	if err != nil {
		return err
	}
	if _, err := r.f.Seek(0, io.SeekStart); err != nil {
		return err
	}
	d := wav.NewDecoder(r.f)
	d.ReadInfo()
	if d.NumChans == 0 {
		if err := d.Err(); err != nil {
			return fmt.Errorf("not a WAV file (%v)", err)
		}
		return errors.New("not a WAV file: no RIFF/WAVE header with a fmt chunk")
	}
	r.Channels, r.Rate, r.depth = int(d.NumChans), int(d.SampleRate), int(d.BitDepth)
	tag := d.WavAudioFormat
	if tag == wavExtensible {
		tag = sub
	}
	switch {
	case tag == wavPCM && (r.depth == 16 || r.depth == 24):
	case tag == wavFloat && r.depth == 32:
		r.float = true
	default:
		return fmt.Errorf("unsupported encoding (format %d, %d bits): use 16- or 24-bit PCM or 32-bit float", tag, r.depth)
	}
	if r.Rate < MinRate || r.Rate > MaxRate {
		return fmt.Errorf("sample rate %d Hz is outside %d–%d Hz", r.Rate, MinRate, MaxRate)
	}
	if err := d.FwdToPCM(); err != nil || d.PCMChunk == nil {
		return errors.New("no data chunk: the file is truncated or not a WAV file")
	}
	r.Frames = int64(d.PCMSize) / int64(r.Channels*r.depth/8)
	if r.Frames == 0 {
		return errors.New("the data chunk holds no samples")
	}
	r.d = d
	r.buf = &goaudio.IntBuffer{Data: make([]int, 4096*r.Channels)}
	return nil
}

// checkChunks walks the RIFF file's chunk headers before the WAV library
// reads them, because the library allocates whatever size a header claims:
// every chunk before the data chunk must fit in the file, and the format
// chunk must have a format chunk's size.
// It returns the format code of a WAVE_FORMAT_EXTENSIBLE file's subformat
// (the first two bytes of its GUID: 1 PCM, 3 float), 0 for other files.
func checkChunks(f io.ReaderAt, size int64) (sub uint16, err error) {
	var h [12]byte
	if _, err := f.ReadAt(h[:], 0); err != nil || string(h[0:4]) != "RIFF" || string(h[8:12]) != "WAVE" {
		return 0, errors.New("not a WAV file: no RIFF/WAVE header")
	}
	for pos := int64(12); ; {
		var c [8]byte
		if _, err := f.ReadAt(c[:], pos); err != nil {
			return 0, errors.New("no data chunk: the file is truncated or not a WAV file")
		}
		id, n := string(c[0:4]), int64(binary.LittleEndian.Uint32(c[4:8]))
		if id == "data" {
			return sub, nil
		}
		if pos+8+n > size {
			return 0, fmt.Errorf("the %q chunk claims %d bytes, more than the file holds: the file is truncated or not a WAV file", id, n)
		}
		if id == "fmt " {
			if n < 16 || n > 64 {
				return 0, fmt.Errorf("a format chunk of %d bytes: not a WAV file", n)
			}
			var fm [26]byte
			if n >= 26 {
				if _, err := f.ReadAt(fm[:], pos+8); err == nil && binary.LittleEndian.Uint16(fm[0:2]) == wavExtensible {
					sub = binary.LittleEndian.Uint16(fm[24:26])
				}
			}
		}
		pos += 8 + n + n&1
	}
}

// Read fills block (one slice per channel, all of one length) and returns
// the number of frames read; at the end it returns 0 and io.EOF. A file
// shorter than its header says is an error.
func (r *WAVReader) Read(block [][]float64) (n int, err error) {
	defer func() {
		if p := recover(); p != nil {
			n, err = 0, fmt.Errorf("%s: malformed WAV data (%v)", r.Path, p)
		}
	}()
	want := len(block[0])
	if len(r.buf.Data) < want*r.Channels {
		r.buf.Data = make([]int, want*r.Channels)
	}
	r.buf.Data = r.buf.Data[:want*r.Channels]
	got, err := r.d.PCMBuffer(r.buf)
	if err != nil {
		return 0, fmt.Errorf("%s: %w", r.Path, err)
	}
	frames := got / r.Channels
	if frames == 0 {
		if r.read < r.Frames {
			return 0, fmt.Errorf("%s: truncated: the header announces %d frames, the file holds %d", r.Path, r.Frames, r.read)
		}
		return 0, io.EOF
	}
	scale := 1 / float64(int(1)<<(r.depth-1))
	for i := 0; i < frames; i++ {
		for c := 0; c < r.Channels; c++ {
			v := r.buf.Data[i*r.Channels+c]
			if r.float {
				block[c][i] = float64(math.Float32frombits(uint32(int32(v))))
			} else {
				block[c][i] = float64(v) * scale
			}
		}
	}
	r.read += int64(frames)
	return frames, nil
}

// Close closes the file.
func (r *WAVReader) Close() error { return r.f.Close() }

// WAVWriter writes float64 samples to a WAV file: 24-bit PCM (rounded,
// clipped to full scale) or 32-bit float.
type WAVWriter struct {
	e        *wav.Encoder
	float    bool
	channels int
	buf      *goaudio.IntBuffer
}

// NewWAVWriter starts a WAV stream on w at rate with channels channels.
// Close must be called to complete the header.
func NewWAVWriter(w io.WriteSeeker, rate, channels int, float bool) *WAVWriter {
	depth, tag := 24, wavPCM
	if float {
		depth, tag = 32, wavFloat
	}
	return &WAVWriter{
		e:        wav.NewEncoder(w, rate, depth, channels, tag),
		float:    float,
		channels: channels,
		buf:      &goaudio.IntBuffer{Format: &goaudio.Format{NumChannels: channels, SampleRate: rate}, SourceBitDepth: depth},
	}
}

// Write appends a block (one slice per channel).
func (w *WAVWriter) Write(block [][]float64) error {
	n := len(block[0])
	if cap(w.buf.Data) < n*w.channels {
		w.buf.Data = make([]int, n*w.channels)
	}
	w.buf.Data = w.buf.Data[:n*w.channels]
	const full = 1<<23 - 1
	for i := 0; i < n; i++ {
		for c := 0; c < w.channels; c++ {
			v := block[c][i]
			if w.float {
				w.buf.Data[i*w.channels+c] = int(int32(math.Float32bits(float32(v))))
				continue
			}
			s := math.Round(v * (1 << 23))
			w.buf.Data[i*w.channels+c] = int(math.Max(-full-1, math.Min(full, s)))
		}
	}
	return w.e.Write(w.buf)
}

// Close completes the file's header.
func (w *WAVWriter) Close() error { return w.e.Close() }
