package main

import (
	"encoding/json"
	"math"
	"strings"
	"testing"
)

func TestFiguresStack(t *testing.T) {
	// A clear film (R = 0, T = 1) over a grey panel R = 0.4: the stack's
	// solar reflectance is the panel's 0.4 (two-layer formula with R₁ = 0,
	// T₁ = 1); 5 mm at k = 0.03 under h = 6 gives h_eff = 3 by hand.
	clear := writeFile(t, "clear.csv", "wavelength_nm,R,T\n250,0,1\n30000,0,1\n")
	uv := writeFile(t, "panel-uv.csv", "wavelength_nm,R\n250,0.4\n2500,0.4\n")
	ir := writeFile(t, "panel-ir.csv", "wavelength_nm,R\n2600,0.1\n30000,0.1\n")
	code, out, errs := runCLI("figures", "--json", "--stack", clear+"@5:0.03,"+uv+"+"+ir)
	if code != 0 {
		t.Fatalf("exit %d: %s", code, errs)
	}
	var f struct {
		SolarReflectance float64 `json:"solar_reflectance"`
		Stack            struct {
			HEff   float64 `json:"h_eff_w_m2k"`
			Layers []struct {
				Name        string  `json:"name"`
				ThicknessMM float64 `json:"thickness_mm"`
			} `json:"layers"`
		} `json:"stack"`
	}
	if err := json.Unmarshal([]byte(out), &f); err != nil {
		t.Fatal(err)
	}
	if math.Abs(f.SolarReflectance-0.4) > 1e-12 || math.Abs(f.Stack.HEff-3) > 1e-12 || len(f.Stack.Layers) != 2 ||
		f.Stack.Layers[0].ThicknessMM != 5 || !strings.Contains(f.Stack.Layers[1].Name, "panel-ir.csv") {
		t.Errorf("stack figures %+v", f)
	}
	code, out, _ = runCLI("figures", "--stack", clear+"@5:0.03,"+uv+"+"+ir)
	for _, want := range []string{"Sample: stack of ", "Layers, top first:", "with the layers above", "h_eff 3.00 W"} {
		if code != 0 || !strings.Contains(out, want) {
			t.Errorf("table (exit %d) lacks %q", code, want)
		}
	}
	for _, tt := range []struct {
		name string
		args []string
		code int
		msg  string
	}{
		{"one layer", []string{"--stack", clear}, 2, "at least two layers"},
		{"files besides", []string{"--stack", clear + "," + uv, ir}, 2, "give no other files"},
		{"with a claim", []string{"--stack", clear + "," + uv, "--claim", "solar_reflectance=0.4"}, 2, "--claim does not go with --stack"},
		{"bad conduction", []string{"--stack", clear + "@5," + uv}, 2, "@3:0.04"},
		{"zero thickness", []string{"--stack", clear + "@0:0.03," + uv}, 2, "0 < d"},
		{"empty file", []string{"--stack", clear + "+," + uv}, 2, "empty file name"},
		{"missing file", []string{"--stack", clear + "," + uv + "x"}, 1, "panel-uv.csvx"},
	} {
		code, _, errs := runCLI(append([]string{"figures"}, tt.args...)...)
		if code != tt.code || !strings.Contains(errs, tt.msg) {
			t.Errorf("%s: exit %d, %q; want %d and %q", tt.name, code, errs, tt.code, tt.msg)
		}
	}
}
