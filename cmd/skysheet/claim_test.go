package main

import (
	"encoding/csv"
	"encoding/json"
	"math"
	"path/filepath"
	"slices"
	"strconv"
	"strings"
	"testing"

	"skysheet/datasheet"
)

func TestParseClaim(t *testing.T) {
	for _, tt := range []struct {
		in       string
		want     datasheet.Claim
		errorHas string
	}{
		{"thermal_emittance=0.95", datasheet.Claim{Figure: "thermal_emittance", Value: 0.95}, ""},
		{"thermal_emittance=0.95±0.02", datasheet.Claim{Figure: "thermal_emittance", Value: 0.95, Tolerance: 0.02}, ""},
		{" solar_reflectance = 0.9 +- 0.01 ", datasheet.Claim{Figure: "solar_reflectance", Value: 0.9, Tolerance: 0.01}, ""},
		{"solar_reflectance=0.9+/-0.01", datasheet.Claim{Figure: "solar_reflectance", Value: 0.9, Tolerance: 0.01}, ""},
		{"cooling_power_w_m2=95", datasheet.Claim{Figure: "cooling_power_w_m2", Value: 95}, ""},
		{"thermal_emitance=0.95", datasheet.Claim{}, `did you mean "thermal_emittance"?`},
		{"thermal_emittance", datasheet.Claim{}, "want FIGURE=VALUE"},
		{"thermal_emittance=", datasheet.Claim{}, "want FIGURE=VALUE"},
		{"thermal_emittance=95%", datasheet.Claim{}, "not a number"},
		{"thermal_emittance=0.95±x", datasheet.Claim{}, "tolerance"},
		{"thermal_emittance=0.95±-0.1", datasheet.Claim{}, "tolerance"},
		{"thermal_emittance=NaN", datasheet.Claim{}, "not a finite number"},
		{"color_lab=52,24.5,18±2", datasheet.Claim{Figure: "color_lab", Values: []float64{52, 24.5, 18}, Tolerance: 2}, ""},
		{"color_xy=0.41, 0.36", datasheet.Claim{Figure: "color_xy", Values: []float64{0.41, 0.36}}, ""},
		{"color_lab=52,24.5", datasheet.Claim{}, "want the 3 values L*, a*, b*"},
		{"color_lab=52", datasheet.Claim{}, "want the 3 values"},
		{"color_lab=52,x,18", datasheet.Claim{}, "not a number"},
		{"solar_reflectance=0.9,0.1", datasheet.Claim{}, "states one value"},
	} {
		got, err := parseClaim(tt.in)
		switch {
		case tt.errorHas == "" && err != nil:
			t.Errorf("%q: %v", tt.in, err)
		case tt.errorHas != "" && (err == nil || !strings.Contains(err.Error(), tt.errorHas)):
			t.Errorf("%q: error %v, want one with %q", tt.in, err, tt.errorHas)
		case tt.errorHas == "" && (got.Figure != tt.want.Figure || got.Value != tt.want.Value || got.Tolerance != tt.want.Tolerance ||
			!slices.Equal(got.Values, tt.want.Values)):
			t.Errorf("%q: %+v, want %+v", tt.in, got, tt.want)
		}
	}
}

// TestFiguresClaim judges single claims of the demo's materials from the
// command line; the verdicts are those the demo's review gives (see
// docs/demo.md), reached by the same judge.
func TestFiguresClaim(t *testing.T) {
	demoFiles := func(dir string) []string {
		m, err := filepath.Glob(filepath.Join("..", "..", "content", dir, "*.[ct]sv"))
		if err != nil || len(m) != 2 {
			t.Fatalf("%s: %v %v", dir, m, err)
		}
		return m
	}
	bx7, px2, atw := demoFiles("paints/bx-7"), demoFiles("coatings/px-2"), demoFiles("tiles/at-w")
	for _, tt := range []struct {
		name  string
		args  []string
		files []string
		code  int
		has   []string
	}{
		{"supported on its stated basis", []string{"--claim", "solar_reflectance=0.95±0.005", "--solar-band", "280,4000"}, bx7, 0,
			[]string{"[=] supported: solar_reflectance 0.95 ± 0.005", "basis: solar band 280–4000 nm (stated)",
				"On the default basis (280–2500 nm", "1 claim: 1 supported", "Result: consistent."}},
		{"not supported on the default basis", []string{"--claim", "solar_reflectance=0.95±0.005"}, bx7, 1,
			[]string{"[≠] not supported: solar_reflectance 0.95 ± 0.005", "0.9556", "Result: inconsistent"}},
		{"percent for a fraction", []string{"--claim", "solar_reflectance=96±1"}, px2, 1,
			[]string{"not supported: solar_reflectance 96 ± 1", "pitfall (percent-for-fraction)"}},
		{"two claims", []string{"--claim", "thermal_emittance=0.95±0.02", "--claim", "solar_reflectance=0.955±0.01"}, px2, 0,
			[]string{"2 claims: 2 supported"}},
		{"cannot be checked", []string{"--claim", "thermal_emittance=0.9±0.02"}, atw, 0,
			[]string{"[?] cannot be checked: thermal_emittance 0.9 ± 0.02", "Result: consistent."}},
		{"cannot be checked, strict", []string{"--strict", "--claim", "thermal_emittance=0.9±0.02"}, atw, 1,
			[]string{"[?] cannot be checked", "with --strict"}},
		{"unknown figure", []string{"--claim", "solar_reflectanse=0.9"}, bx7, 2, []string{`did you mean "solar_reflectance"?`}},
		{"strict without a claim", []string{"--strict"}, bx7, 2, []string{"go with --claim"}},
	} {
		t.Run(tt.name, func(t *testing.T) {
			code, out, errs := runCLI(append(append([]string{"figures"}, tt.args...), tt.files...)...)
			if code != tt.code {
				t.Errorf("exit %d, want %d\n%s%s", code, tt.code, out, errs)
			}
			for _, h := range tt.has {
				if !strings.Contains(out+errs, h) {
					t.Errorf("output lacks %q:\n%s%s", h, out, errs)
				}
			}
		})
	}

	code, out, _ := runCLI(append([]string{"figures", "--json", "--claim", "solar_reflectance=0.95±0.005", "--solar-band", "280,4000"}, bx7...)...)
	var r reviewReport
	if err := json.Unmarshal([]byte(out), &r); err != nil || code != 0 {
		t.Fatalf("--json: exit %d, %v\n%s", code, err, out)
	}
	if len(r.Materials) != 1 || len(r.Materials[0].Verdicts) != 1 {
		t.Fatalf("--json: %s", out)
	}
	v := r.Materials[0].Verdicts[0]
	if v.Status != datasheet.Supported || v.Claim.Basis.SolarBandNM[1] != 4000 || !r.OK {
		t.Errorf("--json: verdict %+v", v)
	}
}

// TestFiguresCSV checks that figures --csv gives every figure of --json,
// in order, with the same value to the last bit.
func TestFiguresCSV(t *testing.T) {
	code, out, errs := runCLI(figuresArgs("--csv")...)
	if code != 0 {
		t.Fatalf("exit %d: %s", code, errs)
	}
	rows, err := csv.NewReader(strings.NewReader(out)).ReadAll()
	if err != nil {
		t.Fatal(err)
	}
	_, js, _ := runCLI(figuresArgs("--json")...)
	var f datasheet.Figures
	if err := json.Unmarshal([]byte(js), &f); err != nil {
		t.Fatal(err)
	}
	if len(rows) != len(f.Figures)+1 || rows[0][2] != "value (unit)" {
		t.Fatalf("%d rows for %d figures, header %q", len(rows), len(f.Figures), rows[0])
	}
	for i, x := range f.Figures {
		r := rows[i+1]
		v, err := strconv.ParseFloat(r[2], 64)
		if r[0] != x.Key || (err != nil || v != float64(x.Value)) && !(r[2] == "" && math.IsNaN(float64(x.Value))) {
			t.Errorf("row %d: %q, want %s = %v", i+1, r, x.Key, x.Value)
		}
	}
	if code, _, errs := runCLI(figuresArgs("--csv", "--json")...); code != 2 || !strings.Contains(errs, "give one") {
		t.Errorf("--csv --json: exit %d, %s", code, errs)
	}
}
