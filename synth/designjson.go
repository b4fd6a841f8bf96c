package synth

import (
	"encoding/json"
	"math"

	"tonewright/networks"
)

// DesignJSON is a design in the design file's schema, as JSON: the same
// keys as the YAML (name, band, source, tone, filters, level, load), every
// number in base units (Ω, F, Hz). A load r of open is the string "open".
type DesignJSON struct {
	Name    string     `json:"name"`
	Band    BandJSON   `json:"band"`
	Source  SourceJSON `json:"source"`
	Tone    ToneJSON   `json:"tone"`
	Filters []RCJSON   `json:"filters"`
	Level   *LevelJSON `json:"level,omitempty"`
	Load    LoadJSON   `json:"load"`
}

// BandJSON is the band: {from, to}.
type BandJSON struct {
	From float64 `json:"from"`
	To   float64 `json:"to"`
}

// SourceJSON is the source: {impedance, series_c}.
type SourceJSON struct {
	Impedance float64 `json:"impedance"`
	SeriesC   float64 `json:"series_c"`
}

// ToneJSON is the tone network.
type ToneJSON struct {
	Network  string  `json:"network"`
	Lowpass  RCJSON  `json:"lowpass"`
	Highpass CRJSON  `json:"highpass"`
	Pot      PotJSON `json:"pot"`
}

// RCJSON is {r, c}; CRJSON is the high-pass leg's {c, r}.
type RCJSON struct {
	R float64 `json:"r"`
	C float64 `json:"c"`
}

// CRJSON is the high-pass leg: {c, r}.
type CRJSON struct {
	C float64 `json:"c"`
	R float64 `json:"r"`
}

// PotJSON is a pot: {value, taper, midpoint}; midpoint only when set.
type PotJSON struct {
	Value    float64 `json:"value"`
	Taper    string  `json:"taper"`
	Midpoint float64 `json:"midpoint,omitempty"`
}

// LevelJSON is the level pot and its position.
type LevelJSON struct {
	Pot      PotJSON `json:"pot"`
	Position float64 `json:"position"`
}

// LoadJSON is the load: {r, c}, r "open" for none.
type LoadJSON struct {
	R Resistance `json:"r"`
	C float64    `json:"c"`
}

// Resistance marshals as a number, or as "open" when infinite.
type Resistance float64

// MarshalJSON writes the resistance, or "open".
func (r Resistance) MarshalJSON() ([]byte, error) {
	if math.IsInf(float64(r), 1) {
		return []byte(`"open"`), nil
	}
	return json.Marshal(float64(r))
}

// NewDesignJSON returns d in the design-file schema for JSON output.
func NewDesignJSON(d *networks.Design) *DesignJSON {
	pot := func(p networks.PotPart) PotJSON {
		return PotJSON{Value: p.Value, Taper: p.Taper.String(), Midpoint: p.Taper.Midpoint}
	}
	j := &DesignJSON{
		Name:   d.Name,
		Band:   BandJSON{d.Band.From, d.Band.To},
		Source: SourceJSON{d.Source.Impedance, d.Source.SeriesC},
		Tone: ToneJSON{Network: d.Tone.Network,
			Lowpass:  RCJSON{d.Tone.Lowpass.R, d.Tone.Lowpass.C},
			Highpass: CRJSON{d.Tone.Highpass.C, d.Tone.Highpass.R},
			Pot:      pot(d.Tone.Pot)},
		Filters: []RCJSON{},
		Load:    LoadJSON{Resistance(d.Load.R), d.Load.C},
	}
	for _, f := range d.Filters {
		j.Filters = append(j.Filters, RCJSON{f.R, f.C})
	}
	if d.Level != nil {
		j.Level = &LevelJSON{Pot: pot(d.Level.Pot), Position: d.Level.Position}
	}
	return j
}

// MarshalJSON writes the targets with the targets file's keys:
// {"scoop": {"hz", "depth_db", "balance_db", "at"}, "corner_hz"}; a target
// that is not set is null.
func (t Targets) MarshalJSON() ([]byte, error) {
	type scoop struct {
		Hz        *float64 `json:"hz"`
		DepthDB   *float64 `json:"depth_db"`
		BalanceDB *float64 `json:"balance_db"`
		At        *float64 `json:"at"`
	}
	var out struct {
		Scoop    *scoop   `json:"scoop"`
		CornerHz *float64 `json:"corner_hz"`
	}
	if t.ScoopHz != nil || t.DepthDB != nil || t.BalanceDB != nil {
		out.Scoop = &scoop{t.ScoopHz, t.DepthDB, t.BalanceDB, t.At}
	}
	out.CornerHz = t.CornerHz
	return json.Marshal(out)
}

// MarshalJSON writes a check with the tool's snake_case keys: name, key,
// unit, wanted, ideal, achieved (null when the figure is missing: no scoop,
// or no corner below 10 × band top), the errors in the figure's unit
// (ideal_error_pct and error_pct, in percent, for frequencies;
// ideal_error_db and error_db for levels; null when missing),
// ideal_found, found, ideal_met and met.
func (c Check) MarshalJSON() ([]byte, error) {
	type head struct {
		Name     string   `json:"name"`
		Key      string   `json:"key"`
		Unit     string   `json:"unit"`
		Wanted   float64  `json:"wanted"`
		Ideal    *float64 `json:"ideal"`
		Achieved *float64 `json:"achieved"`
	}
	type tail struct {
		IdealFound bool `json:"ideal_found"`
		Found      bool `json:"found"`
		IdealMet   bool `json:"ideal_met"`
		Met        bool `json:"met"`
	}
	opt := func(v float64, ok bool) *float64 {
		if !ok {
			return nil
		}
		return &v
	}
	h := head{Name: c.Name, Key: c.Key, Unit: c.Unit, Wanted: c.Wanted,
		Ideal: opt(c.Ideal, c.IdealFound), Achieved: opt(c.Achieved, c.Found)}
	t := tail{c.IdealFound, c.Found, c.IdealMet, c.Met}
	if c.Unit == "Hz" {
		return json.Marshal(struct {
			head
			IdealErrorPct *float64 `json:"ideal_error_pct"`
			ErrorPct      *float64 `json:"error_pct"`
			tail
		}{h, opt(100*c.IdealError, c.IdealFound), opt(100*c.Error, c.Found), t})
	}
	return json.Marshal(struct {
		head
		IdealErrorDB *float64 `json:"ideal_error_db"`
		ErrorDB      *float64 `json:"error_db"`
		tail
	}{h, opt(c.IdealError, c.IdealFound), opt(c.Error, c.Found), t})
}
