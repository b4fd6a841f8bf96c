package audio

import (
	"errors"
	"fmt"
	"io"
	"math"
)

// Source is a replayable input: each Open starts it from the beginning.
type Source interface {
	Rate() int
	Channels() int
	Open() (Reader, error)
}

// Reader yields blocks of samples, one slice per channel; at the end it
// returns 0 and io.EOF.
type Reader interface {
	Read(block [][]float64) (int, error)
	Close() error
}

// Samples is a mono Source held in memory (a built-in signal).
type Samples struct {
	SampleRate int
	Data       []float64
}

func (s *Samples) Rate() int     { return s.SampleRate }
func (s *Samples) Channels() int { return 1 }
func (s *Samples) Open() (Reader, error) {
	return &samplesReader{data: s.Data}, nil
}

type samplesReader struct{ data []float64 }

func (r *samplesReader) Read(block [][]float64) (int, error) {
	if len(r.data) == 0 {
		return 0, io.EOF
	}
	n := copy(block[0], r.data)
	r.data = r.data[n:]
	return n, nil
}
func (r *samplesReader) Close() error { return nil }

// WAVFile is a Source read from a WAV file, opened anew for each part.
type WAVFile struct {
	Path       string
	SampleRate int
	Chans      int
	Frames     int64
}

// NewWAVFile checks path (see OpenWAV) and returns it as a Source.
func NewWAVFile(path string) (*WAVFile, error) {
	r, err := OpenWAV(path)
	if err != nil {
		return nil, err
	}
	defer r.Close()
	return &WAVFile{Path: path, SampleRate: r.Rate, Chans: r.Channels, Frames: r.Frames}, nil
}

func (w *WAVFile) Rate() int             { return w.SampleRate }
func (w *WAVFile) Channels() int         { return w.Chans }
func (w *WAVFile) Open() (Reader, error) { return OpenWAV(w.Path) }

// Part is one stretch of the output: the source through one filter (a
// setting), or through several while a knob turns (see Turn), then Gap
// seconds in which the filter's tail rings out on silence.
type Part struct {
	Source     Source
	Filters    []*Filter // one: a setting; several: a turn (every channel has its own state)
	TurnFrames int64     // for a turn: samples from the first filter to the last
	Gap        float64
}

// PartStats is what Render measured of a part, after its gain.
type PartStats struct {
	Start, Frames int64   // first frame in the output, length in frames
	Peak          float64 // largest |sample|
	LoudnessLUFS  float64 // ITU-R BS.1770 integrated loudness
	Clipped       int64   // samples beyond full scale
}

// BlockFrames is the block size Render works in.
const BlockFrames = 4096

// Render plays the parts one after another, each multiplied by its gain
// (linear), and hands every block, channels × frames, to sink (nil: measure
// only). Channels is the output's channel count; a mono source feeds every
// channel. It returns what it measured of each part. With gains nil it is
// the measuring pass: unit gains, and the loudness is measured too; with
// gains, LoudnessLUFS is left NaN (it is the measuring pass's plus the
// gain in dB), which saves the K-weighting filters.
func Render(parts []Part, channels int, gains []float64, sink func([][]float64) error) ([]PartStats, error) {
	in := make([][]float64, channels)
	out := make([][]float64, channels)
	for c := range in {
		in[c] = make([]float64, BlockFrames)
		out[c] = make([]float64, BlockFrames)
	}
	blk := make([][]float64, channels)
	stats := make([]PartStats, len(parts))
	var at int64
	for p, part := range parts {
		g := 1.0
		if gains != nil {
			g = gains[p]
		}
		if len(part.Filters) == 0 {
			return nil, fmt.Errorf("part %d has no filter", p+1)
		}
		rate := part.Source.Rate()
		if part.Source.Channels() > channels {
			return nil, fmt.Errorf("part %d has %d channels, the output %d", p+1, part.Source.Channels(), channels)
		}
		procs := make([]func(in, out []float64), channels)
		for c := range procs {
			if len(part.Filters) == 1 {
				f, st := part.Filters[0], part.Filters[0].NewState()
				procs[c] = func(in, out []float64) { f.Process(st, in, out) }
			} else {
				t := NewTurn(part.Filters, part.TurnFrames)
				procs[c] = t.Process
			}
		}
		r, err := part.Source.Open()
		if err != nil {
			return nil, err
		}
		var meter *LoudnessMeter
		if gains == nil {
			meter = NewLoudnessMeter(float64(rate), channels)
		}
		st := &stats[p]
		st.Start = at
		// The filters' output lags by Delay samples: feed that many more
		// zeros at the end and drop as many samples at the start, so the
		// part keeps the network's own timing.
		lag := int64(part.Filters[0].Delay)
		skip := lag
		gap := int64(math.Round(part.Gap*float64(rate))) + lag
		srcCh := part.Source.Channels()
		done := false
		for {
			var n int
			if !done {
				n, err = r.Read(in[:srcCh])
				if errors.Is(err, io.EOF) || (n == 0 && err == nil) {
					done, err = true, nil
				}
				if err != nil {
					r.Close()
					return nil, err
				}
				for c := srcCh; c < channels; c++ {
					copy(in[c][:n], in[0][:n])
				}
			}
			if done {
				if gap <= 0 {
					break
				}
				n = int(min(int64(BlockFrames), gap))
				gap -= int64(n)
				for c := range in {
					clear(in[c][:n])
				}
			}
			if n == 0 {
				continue
			}
			drop := int(min(skip, int64(n)))
			skip -= int64(drop)
			for c := range out {
				procs[c](in[c][:n], out[c][:n])
				o := out[c][drop:n]
				for i := range o {
					o[i] *= g
					a := math.Abs(o[i])
					if a > st.Peak {
						st.Peak = a
					}
					if a > 1 {
						st.Clipped++
					}
				}
				blk[c] = o
			}
			if drop == n {
				continue
			}
			if meter != nil {
				meter.Add(blk)
			}
			if sink != nil {
				if err := sink(blk); err != nil {
					r.Close()
					return nil, err
				}
			}
			st.Frames += int64(n - drop)
			at += int64(n - drop)
		}
		r.Close()
		st.LoudnessLUFS = math.NaN()
		if meter != nil {
			st.LoudnessLUFS = meter.Loudness()
		}
	}
	return stats, nil
}
