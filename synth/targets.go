package synth

import (
	"fmt"
	"math"
	"os"
	"path/filepath"
	"strings"

	"gopkg.in/yaml.v3"

	"tonewright/eseries"
	"tonewright/networks"
)

// LoadTargets reads a targets file (see ParseTargets).
func LoadTargets(path string) (*Problem, error) {
	data, err := os.ReadFile(path)
	if err != nil {
		return nil, fmt.Errorf("cannot read targets file: %w", err)
	}
	return ParseTargets(data, path)
}

// ParseTargets reads a targets file's contents strictly; name names the
// file in errors, and a stock file it names (parts.stock) is read relative
// to name's directory. The keys:
//
//	name: a name for the design          # optional
//	band: {from: 20, to: 20k}            # optional: the analysis band
//	targets:
//	  scoop: {hz: 800, depth_db: -10, balance_db: 0, at: 0.5}
//	  corner_hz: 5k                      # at knob 1
//	  curve: voice.csv                   # or a whole curve (re-voicing), as analyze --csv writes it
//	  fit_level: true                    # a curve's overall level goes free
//	source: {impedance: 6.8k}            # also series_c
//	load: {r: 1M, c: 0}                  # r may be open
//	filters: 2                           # identical RC low-pass sections
//	level: {pot: {value: 100k, taper: audio}, position: 1.0}
//	parts:
//	  resistors: E24                     # a series E3…E192, or a list of values
//	  capacitors: E12
//	  pots: [10k, 20k, 25k, 50k, 100k, 250k, 500k, 1M]
//	  resistor_range: [1k, 1M]
//	  capacitor_range: [100p, 1u]
//	  stock: stock.yaml                  # only the values listed there
//	limits:                              # practical limits, each optional
//	  max_output_impedance: 10k          # |Z| back into the output at 1 kHz
//	  min_capacitor: 100p                # the default
//	  max_loss_db: 20                    # insertion loss at 1 kHz, knob 0.5
//	priority: hz+corner,depth,balance    # kept first when not all can be met
//
// Every error is a *networks.FieldError naming the file, line and key.
// Errors Solve finds later in the problem are placed on the same lines.
func ParseTargets(data []byte, name string) (*Problem, error) {
	dec := &networks.Decoder{File: name}
	doc, err := dec.Document(data)
	if err != nil {
		return nil, err
	}
	p := &Problem{dec: dec}
	value := func(dst **float64, check func(float64) string) func(*yaml.Node, string) error {
		return func(n *yaml.Node, path string) error {
			v, err := dec.ValueIn(n, path, "Hz")
			if err != nil {
				return err
			}
			if msg := check(v); msg != "" {
				return dec.Errorf(n, path, "%s", msg)
			}
			*dst = &v
			return nil
		}
	}
	number := func(dst **float64, check func(float64) string) func(*yaml.Node, string) error {
		return func(n *yaml.Node, path string) error {
			v, err := dec.Number(n, path)
			if err != nil {
				return err
			}
			if msg := check(v); msg != "" {
				return dec.Errorf(n, path, "%s", msg)
			}
			*dst = &v
			return nil
		}
	}
	positiveHz := func(v float64) string {
		if !(v > 0) {
			return fmt.Sprintf("%s must be a positive frequency, such as 800 or 1.2k", eseries.WithUnit(v, 3, "Hz"))
		}
		return ""
	}
	negative := func(v float64) string {
		if !(v < 0) {
			return fmt.Sprintf("%v dB: a scoop's depth is negative (a dip below the shoulders), e.g. -10", v)
		}
		return ""
	}
	anyDB := func(float64) string { return "" }
	knob := func(v float64) string {
		if !(v >= 0 && v <= 1) {
			return fmt.Sprintf("knob position %v is outside 0..1", v)
		}
		return ""
	}
	t := &p.Targets
	var stockPath string
	var stockNode *yaml.Node
	err = dec.Map(doc, "",
		networks.Key{Name: "name", Decode: func(n *yaml.Node, path string) (err error) { p.Name, err = dec.String(n, path); return }},
		networks.Key{Name: "band", Decode: func(n *yaml.Node, path string) error {
			var b networks.Band
			if err := dec.Band(n, path, &b); err != nil {
				return err
			}
			if err := b.Check(); err != nil {
				return dec.Errorf(n, path, "%v", err)
			}
			p.Band = &b
			return nil
		}},
		networks.Key{Name: "targets", Decode: func(n *yaml.Node, path string) error {
			if n.Kind == yaml.SequenceNode {
				items, err := parseItems(dec, n, path)
				p.Items = items
				return err
			}
			return dec.Map(n, path,
				networks.Key{Name: "scoop", Decode: func(n *yaml.Node, path string) error {
					return dec.Map(n, path,
						networks.Key{Name: "hz", Decode: value(&t.ScoopHz, positiveHz)},
						networks.Key{Name: "depth_db", Decode: number(&t.DepthDB, negative)},
						networks.Key{Name: "balance_db", Decode: number(&t.BalanceDB, anyDB)},
						networks.Key{Name: "at", Decode: number(&t.At, knob)})
				}},
				networks.Key{Name: "corner_hz", Decode: value(&t.CornerHz, positiveHz)},
				networks.Key{Name: "curve", Decode: func(n *yaml.Node, path string) error {
					f, err := dec.String(n, path)
					if err != nil {
						return err
					}
					if !filepath.IsAbs(f) {
						f = filepath.Join(filepath.Dir(name), f)
					}
					c, err := LoadCurve(f)
					if err != nil {
						return dec.Errorf(n, path, "%v", err)
					}
					p.Curve = c
					return nil
				}},
				networks.Key{Name: "fit_level", Decode: func(n *yaml.Node, path string) error {
					v, err := dec.String(n, path)
					if err != nil {
						return err
					}
					switch v {
					case "true":
						p.FitLevel = true
					case "false":
					default:
						return dec.Errorf(n, path, "%q: give true (an overall level offset goes free) or false", v)
					}
					return nil
				}})
		}},
		networks.Key{Name: "source", Decode: func(n *yaml.Node, path string) error {
			p.Source = &networks.Source{}
			return dec.Source(n, path, p.Source)
		}},
		networks.Key{Name: "load", Decode: func(n *yaml.Node, path string) error {
			p.Load = &networks.Load{R: networks.DefaultLoad.R}
			return dec.Load(n, path, p.Load)
		}},
		networks.Key{Name: "filters", Decode: func(n *yaml.Node, path string) error {
			k, err := dec.Int(n, path)
			if err != nil {
				return err
			}
			if k < 0 || k > networks.MaxFilters {
				return dec.Errorf(n, path, "%d sections: give a number from 0 to %d", k, networks.MaxFilters)
			}
			p.Filters = &k
			return nil
		}},
		networks.Key{Name: "level", Decode: func(n *yaml.Node, path string) error {
			p.Level = &networks.LevelSetting{}
			return dec.Level(n, path, p.Level)
		}},
		networks.Key{Name: "limits", Decode: func(n *yaml.Node, path string) error {
			l := &p.Limits
			return dec.Map(n, path,
				networks.Key{Name: "max_output_impedance", Decode: func(n *yaml.Node, path string) error {
					v, err := dec.ValueIn(n, path, "Ω")
					if err == nil && !(v > 0) {
						err = dec.Errorf(n, path, "%v Ω: give a positive impedance, such as 10k", v)
					}
					l.MaxOutputImpedance = v
					return err
				}},
				networks.Key{Name: "min_capacitor", Decode: func(n *yaml.Node, path string) error {
					v, err := dec.ValueIn(n, path, "F")
					if err == nil && !(v > 0) {
						err = dec.Errorf(n, path, "%v F: give a positive capacitance, such as 100p", v)
					}
					l.MinCapacitor = &v
					return err
				}},
				networks.Key{Name: "max_loss_db", Decode: func(n *yaml.Node, path string) error {
					v, err := dec.Number(n, path)
					if err == nil && !(v > 0) {
						err = dec.Errorf(n, path, "%v dB: give the largest loss at 1 kHz as a positive number of dB, such as 20", v)
					}
					l.MaxLossDB = v
					return err
				}})
		}},
		networks.Key{Name: "prefer", Decode: func(n *yaml.Node, path string) error {
			str, err := dec.String(n, path)
			if err != nil {
				return err
			}
			pr, perr := ParsePrefer(str)
			if perr != nil {
				return dec.Errorf(n, path, "%v", perr)
			}
			p.Prefer = &pr
			return nil
		}},
		networks.Key{Name: "priority", Decode: func(n *yaml.Node, path string) error {
			str, err := dec.String(n, path)
			if err != nil {
				return err
			}
			pr, perr := ParsePriority(str)
			if perr != nil {
				return dec.Errorf(n, path, "%v", perr)
			}
			p.Priority = pr
			return nil
		}},
		networks.Key{Name: "parts", Decode: func(n *yaml.Node, path string) error {
			return dec.Map(n, path,
				networks.Key{Name: "resistors", Decode: func(n *yaml.Node, path string) (err error) {
					p.Parts.Resistors, err = partSet(dec, n, path, "Ω")
					return
				}},
				networks.Key{Name: "capacitors", Decode: func(n *yaml.Node, path string) (err error) {
					p.Parts.Capacitors, err = partSet(dec, n, path, "F")
					return
				}},
				networks.Key{Name: "pots", Decode: func(n *yaml.Node, path string) (err error) {
					p.Parts.Pots, err = positiveValues(dec, n, path, "Ω")
					return
				}},
				networks.Key{Name: "resistor_range", Decode: func(n *yaml.Node, path string) (err error) {
					p.Parts.ResistorRange, err = valueRange(dec, n, path, "Ω")
					return
				}},
				networks.Key{Name: "capacitor_range", Decode: func(n *yaml.Node, path string) (err error) {
					p.Parts.CapacitorRange, err = valueRange(dec, n, path, "F")
					return
				}},
				networks.Key{Name: "stock", Decode: func(n *yaml.Node, path string) (err error) {
					stockPath, err = dec.String(n, path)
					stockNode = n
					return
				}})
		}},
	)
	if err != nil {
		return nil, err
	}
	if stockPath != "" {
		if !filepath.IsAbs(stockPath) {
			stockPath = filepath.Join(filepath.Dir(name), stockPath)
		}
		if _, err := os.Stat(stockPath); err != nil {
			return nil, dec.Errorf(stockNode, "parts.stock", "cannot read the stock file: %v", err)
		}
		st, err := LoadStock(stockPath)
		if err != nil {
			return nil, err
		}
		p.Parts.Stock = st
	}
	return p, nil
}

// partSet reads a series name (E3…E192) or a list of values.
func partSet(dec *networks.Decoder, n *yaml.Node, path, unit string) (eseries.Set, error) {
	if n.Kind == yaml.ScalarNode {
		s, err := dec.String(n, path)
		if err != nil {
			return nil, err
		}
		se, err := eseries.SeriesByName(s)
		if err != nil {
			return nil, dec.Errorf(n, path, "unknown series %q: use one of %s, or a list of values such as [1k, 4.7k, 10k]",
				s, strings.Join(eseries.SeriesNames(), ", "))
		}
		return se, nil
	}
	vs, err := positiveValues(dec, n, path, unit)
	if err != nil {
		return nil, err
	}
	l, err := eseries.NewList(vs)
	if err != nil {
		return nil, dec.Errorf(n, path, "%v", err)
	}
	return l, nil
}

// positiveValues reads a non-empty list of positive part values; a value
// written with a unit must be in unit (Ω or F).
func positiveValues(dec *networks.Decoder, n *yaml.Node, path, unit string) ([]float64, error) {
	var out []float64
	err := dec.List(n, path, func(c *yaml.Node, p string) error {
		v, err := dec.ValueIn(c, p, unit)
		if err != nil {
			return err
		}
		if !(v > 0) {
			return dec.Errorf(c, p, "%v must be a positive value, such as 4.7k or 100n", v)
		}
		out = append(out, v)
		return nil
	})
	if err == nil && len(out) == 0 {
		err = dec.Errorf(n, path, "the list is empty: give at least one value, such as [10k, 100k]")
	}
	return out, err
}

// valueRange reads [low, high].
func valueRange(dec *networks.Decoder, n *yaml.Node, path, unit string) ([2]float64, error) {
	vs, err := positiveValues(dec, n, path, unit)
	if err != nil {
		return [2]float64{}, err
	}
	if len(vs) != 2 || !(vs[0] <= vs[1]) || math.IsInf(vs[1], 0) {
		return [2]float64{}, dec.Errorf(n, path, "a range is two values, low then high, such as [1k, 1M]")
	}
	return [2]float64{vs[0], vs[1]}, nil
}

// LoadStock reads a stock file (see ParseStock).
func LoadStock(path string) (*Stock, error) {
	data, err := os.ReadFile(path)
	if err != nil {
		return nil, fmt.Errorf("cannot read stock file: %w", err)
	}
	return ParseStock(data, path)
}

// ParseStock reads a stock file: the values on hand of each kind, as the
// design file writes values.
//
//	resistors: [1k, 2.2k, 4.7k, 10k, 22k, 47k, 100k]
//	capacitors: [1n, 2.2n, 4.7n, 10n]
//	pots: [25k, 100k]
//
// Every key is optional; a kind not listed is not restricted by the stock.
func ParseStock(data []byte, name string) (*Stock, error) {
	dec := &networks.Decoder{File: name}
	doc, err := dec.Document(data)
	if err != nil {
		return nil, err
	}
	st := &Stock{File: name}
	list := func(dst *[]float64, unit string) func(*yaml.Node, string) error {
		return func(n *yaml.Node, path string) (err error) { *dst, err = positiveValues(dec, n, path, unit); return }
	}
	err = dec.Map(doc, "",
		networks.Key{Name: "resistors", Decode: list(&st.Resistors, "Ω")},
		networks.Key{Name: "capacitors", Decode: list(&st.Capacitors, "F")},
		networks.Key{Name: "pots", Decode: list(&st.Pots, "Ω")})
	if err != nil {
		return nil, err
	}
	return st, nil
}

// place gives an error found in the problem the file and line it came
// from, when the problem was read from a file.
func (p *Problem) place(err error) error {
	if p.dec != nil && err != nil {
		return p.dec.Place(err)
	}
	return err
}
