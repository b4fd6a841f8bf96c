package main

import (
	"encoding/csv"
	"encoding/json"
	"strconv"
	"strings"
	"testing"
)

func TestPartsTable(t *testing.T) {
	code, out, errs := tw(t, "parts", demoFile)
	if code != 0 {
		t.Fatalf("exit %d: %s", code, errs)
	}
	golden(t, "parts-demo.txt", out)
	for _, want := range []string{
		"11 parts on 9 lines",
		"source.series_c",                         // the coupling capacitor is listed
		"audio (A)",                               // the level pot with its taper and code
		"filter1.r filter2.r",                     // identical values share a line
		"caution: Voltage ratings are not listed", // the valve-circuit caution
		"± 5 %",  // the tolerance the study assumes
		"100 nF", // values as the trade writes them
	} {
		if !strings.Contains(out, want) {
			t.Errorf("parts table lacks %q:\n%s", want, out)
		}
	}
}

func TestPartsCSVAndJSON(t *testing.T) {
	code, out, errs := tw(t, "parts", demoFile, "--csv")
	if code != 0 {
		t.Fatalf("exit %d: %s", code, errs)
	}
	rows, err := csv.NewReader(strings.NewReader(out)).ReadAll()
	if err != nil {
		t.Fatal(err)
	}
	if got := strings.Join(rows[0], ","); got != "quantity,value,value_si,kind,tolerance_pct,tolerance_basis,taper,taper_code,parts,roles" {
		t.Errorf("CSV header %q", got)
	}
	total := 0
	for _, r := range rows[1:] {
		q, err := strconv.Atoi(r[0])
		if err != nil {
			t.Fatalf("quantity %q: %v", r[0], err)
		}
		total += q
		if q != len(strings.Fields(r[8])) {
			t.Errorf("row %v: quantity %d but parts %q", r, q, r[8])
		}
	}
	if total != 11 {
		t.Errorf("CSV lists %d parts, want 11", total)
	}

	code, out, errs = tw(t, "parts", demoFile, "--json")
	if code != 0 {
		t.Fatalf("exit %d: %s", code, errs)
	}
	var v struct {
		Count int `json:"count"`
		Lines []struct {
			Quantity     int     `json:"quantity"`
			Value        float64 `json:"value"`
			Marking      string  `json:"marking"`
			Kind         string  `json:"kind"`
			TolerancePct float64 `json:"tolerance_pct"`
			Basis        string  `json:"tolerance_basis"`
			Taper        *string `json:"taper"`
			TaperCode    *string `json:"taper_code"`
			Parts        []struct{ Name, Role string }
		} `json:"lines"`
		Cautions []string `json:"cautions"`
	}
	if err := json.Unmarshal([]byte(out), &v); err != nil {
		t.Fatal(err)
	}
	if v.Count != 11 || len(v.Lines) != 9 || len(v.Cautions) == 0 {
		t.Errorf("count %d, %d lines, %d cautions", v.Count, len(v.Lines), len(v.Cautions))
	}
	last := v.Lines[len(v.Lines)-1]
	if last.Kind != "pot" || last.Taper == nil || *last.Taper != "audio" || *last.TaperCode != "A" || last.TolerancePct != 20 {
		t.Errorf("level pot line %+v", last)
	}
	if v.Lines[0].Parts[0].Name != "source.series_c" || v.Lines[0].Marking != "100 nF" || v.Lines[0].Taper != nil {
		t.Errorf("first line %+v, want the 100 nF coupling capacitor", v.Lines[0])
	}

	if code, _, errs := tw(t, "parts", demoFile, "--csv", "--json"); code != 2 || !strings.Contains(errs, "give one of them") {
		t.Errorf("--csv --json: exit %d, %q", code, errs)
	}
}
