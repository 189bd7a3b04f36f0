package main

import (
	"bytes"
	"encoding/json"
	"math"
	"os"
	"path/filepath"
	"regexp"
	"strings"
	"testing"
)

var white = []string{"../../testdata/white-uvvis.csv", "../../testdata/white-ftir.tsv"}

// runCLI runs one command line in-process.
func runCLI(args ...string) (code int, stdout, stderr string) {
	var out, errb bytes.Buffer
	code = run(&env{stdout: &out, stderr: &errb, stdin: strings.NewReader("")}, args)
	return code, out.String(), errb.String()
}

func figuresArgs(extra ...string) []string {
	return append(append([]string{"figures"}, extra...), white...)
}

func writeFile(t *testing.T, name, content string) string {
	t.Helper()
	p := filepath.Join(t.TempDir(), name)
	if err := os.WriteFile(p, []byte(content), 0o644); err != nil {
		t.Fatal(err)
	}
	return p
}

const skyCSV = "# sample: invented sky transmittance (test data)\nwavelength_nm,T\n2500,0\n7900,0\n8000,0.7\n13000,0.7\n13100,0\n100000,0\n"

func TestFiguresExitCodes(t *testing.T) {
	bad := writeFile(t, "bad.csv", "wavelength_nm,R\n400,0.5\n500,abc\n")
	sky := writeFile(t, "sky.csv", skyCSV)
	noT := writeFile(t, "not.csv", "wavelength_nm,R\n8000,0.5\n9000,0.5\n")
	series := "../../content/weather/coastal-humid.csv"
	gap := writeFile(t, "gap.csv", "time,air temperature (°C),dew point (°C),global horizontal irradiance (W/m²)\n"+
		"2026-07-01T00:00+02:00,20,10,0\n2026-07-01T02:00+02:00,20,10,0\n")
	for _, tt := range []struct {
		name string
		args []string
		code int
		out  string // expected in stdout or stderr
	}{
		{"table", figuresArgs(), 0, "Solar Reflectance Index"},
		{"json", figuresArgs("--json"), 0, `"cooling_power_w_m2"`},
		{"conditions", figuresArgs("--ambient", "305", "--dew-point", "5", "--irradiance", "800", "--h-conv", "3", "--exchange-band", "3,50"), 0, "air 305 K"},
		{"h with equals", figuresArgs("--h-conv=2.5"), 0, "h 2.5 W"},
		{"spectral sky", figuresArgs("--sky", sky), 0, "Spectral sky from"},
		{"help", []string{"figures", "-h"}, 0, "-dew-point"},
		{"help before files", figuresArgs("-h"), 0, "-exchange-band"},
		{"help verb", []string{"help", "figures"}, 0, "-irradiance"},
		{"no files", []string{"figures"}, 2, "no spectrum files"},
		{"negative h", figuresArgs("--h-conv", "-1"), 2, "heat-transfer coefficient"},
		{"h not a number", figuresArgs("--h-conv=abc"), 2, "invalid value"},
		{"dew point above air", figuresArgs("--dew-point", "40"), 2, "dew point"},
		{"ambient in celsius", figuresArgs("--ambient", "25"), 2, "kelvin"},
		{"reversed band", figuresArgs("--exchange-band", "100,2.5"), 2, "LO < HI"},
		{"unknown flag", figuresArgs("--sunshine", "3"), 2, "sunshine"},
		{"bad data", []string{"figures", bad}, 1, "bad.csv:3"},
		{"missing file", []string{"figures", "nothere.csv"}, 1, "nothere.csv"},
		{"missing sky", figuresArgs("--sky", "nosky.csv"), 1, "nosky.csv"},
		{"sky without T", figuresArgs("--sky", noT), 1, "T column"},
		{"bad sky data", figuresArgs("--sky", bad), 1, "bad.csv:3"},
		{"weather series", figuresArgs("--weather", series), 0, "Over the weather series Merrowgate Point"},
		{"weather series, JSON", figuresArgs("--weather", series, "--json"), 0, `"energy_trapezoid_kwh_m2"`},
		{"missing series", figuresArgs("--weather", "noseries.csv"), 1, "noseries.csv"},
		{"series with a gap", figuresArgs("--weather", gap), 1, "gap.csv:3: column 1 (time)"},
	} {
		t.Run(tt.name, func(t *testing.T) {
			code, out, errs := runCLI(tt.args...)
			if code != tt.code {
				t.Fatalf("exit %d, want %d\nstdout: %s\nstderr: %s", code, tt.code, out, errs)
			}
			if !strings.Contains(out+errs, tt.out) {
				t.Errorf("output lacks %q\nstdout: %s\nstderr: %s", tt.out, out, errs)
			}
		})
	}
}

func TestFiguresJSONKeys(t *testing.T) {
	code, out, errs := runCLI(figuresArgs("--json", "--ambient", "302", "--dew-point", "-5", "--irradiance", "900", "--h-conv", "4")...)
	if code != 0 {
		t.Fatalf("exit %d: %s", code, errs)
	}
	var doc map[string]any
	if err := json.Unmarshal([]byte(out), &doc); err != nil {
		t.Fatal(err)
	}
	for _, k := range []string{"cooling_power_w_m2", "cooling_power_night_w_m2", "equilibrium_delta_k", "equilibrium_delta_night_k",
		"held_power_w_m2", "cooling_terms", "sensitivity", "cautions"} {
		if _, ok := doc[k]; !ok {
			t.Errorf("key %q missing", k)
		}
	}
	for _, k := range []string{"cooling_power_w_m2", "cooling_power_night_w_m2", "equilibrium_delta_k", "equilibrium_delta_night_k"} {
		if _, ok := doc[k].(float64); !ok {
			t.Errorf("%s = %v, want a number", k, doc[k])
		}
	}
	sub := func(key string, keys ...string) map[string]any {
		m, ok := doc[key].(map[string]any)
		if !ok {
			t.Fatalf("%s is not an object: %v", key, doc[key])
		}
		for _, k := range keys {
			if _, ok := m[k]; !ok {
				t.Errorf("%s.%s missing", key, k)
			}
		}
		return m
	}
	sub("sri", "low", "medium", "high", "note", "translucent")
	sky := sub("sky", "model", "emissivity", "window_emissivity", "window_fraction", "clamped", "description")
	if sky["model"] != "clear two-band" {
		t.Errorf("sky model %v", sky["model"])
	}
	cond := sub("conditions", "ambient_k", "dew_point_c", "irradiance_w_m2", "h_w_m2k", "exchange_band_um", "sky")
	for k, want := range map[string]float64{"ambient_k": 302, "dew_point_c": -5, "irradiance_w_m2": 900, "h_w_m2k": 4} {
		if cond[k] != want {
			t.Errorf("conditions.%s = %v, want %v", k, cond[k], want)
		}
	}
	curve, ok := doc["cooling_curve"].([]any)
	if !ok || len(curve) != 51 {
		t.Fatalf("cooling_curve: %d points, want 51", len(curve))
	}
	p0 := curve[0].(map[string]any)
	for _, k := range []string{"surface_k", "net_w_m2", "net_night_w_m2"} {
		if _, ok := p0[k]; !ok {
			t.Errorf("cooling_curve[0].%s missing", k)
		}
	}
	keys := map[string]map[string]any{}
	for _, x := range doc["figures"].([]any) {
		m := x.(map[string]any)
		keys[m["key"].(string)] = m
	}
	for _, k := range []string{"cooling_power_w_m2", "cooling_power_night_w_m2", "equilibrium_delta_k", "equilibrium_delta_night_k", "sri_low", "sri_medium", "sri_high"} {
		if _, ok := keys[k]; !ok {
			t.Errorf("figures list lacks %s", k)
		}
	}
	if u, ok := keys["solar_reflectance"]["uncertainty"].(map[string]any); !ok || u["uncorrelated"] == nil || u["correlated"] == nil {
		t.Errorf("solar_reflectance uncertainty: %v", keys["solar_reflectance"]["uncertainty"])
	}
	if w := keys["cooling_power_w_m2"]["weighting"].(string); !strings.Contains(w, "dew point -5 °C") {
		t.Errorf("cooling power weighting does not state the sky: %q", w)
	}
}

// TestFiguresRefractiveIndex checks --refractive-index: the report says
// the emittance basis and the conversion, and the cooling figures change.
func TestFiguresRefractiveIndex(t *testing.T) {
	_, plain, _ := runCLI(figuresArgs()...)
	code, out, errs := runCLI(figuresArgs("--refractive-index", "1.5")...)
	if code != 0 {
		t.Fatalf("exit %d: %s", code, errs)
	}
	if !strings.Contains(plain, "Emittance: near-normal (default for FTIR data)\n") {
		t.Errorf("report without conversion does not state the basis")
	}
	for _, want := range []string{"Emittance: near-normal (default for FTIR data); cooling figures and SRI converted to hemispherical as a smooth dielectric of n 1.5 (× 0.946)",
		"hemispherical emittance (from near-normal, n 1.5)"} {
		if !strings.Contains(out, want) {
			t.Errorf("report lacks %q", want)
		}
	}
	if code, _, errs := runCLI(figuresArgs("--refractive-index", "0.5")...); code != 2 || !strings.Contains(errs, "refractive index 0.5") {
		t.Errorf("refractive index 0.5: exit %d, %s", code, errs)
	}
}

func TestFiguresHumanOutput(t *testing.T) {
	code, out, errs := runCLI(figuresArgs("--dew-point", "-20")...)
	if code != 0 {
		t.Fatalf("exit %d: %s", code, errs)
	}
	for _, want := range []string{
		"Sky: Clear sky, two-band model", "clamped", // the dry sky clamps, in words
		"net cooling power at ambient", "K below the air",
		"Solar Reflectance Index", "opaque, horizontal or low-sloped",
		"Sensitivity", "dew point +5 °C",
		"u noise", "u together", "u worst", // the white data give u_R
		"held constant", "With 0.9 to 1 there instead (standard uncertainty of the extrapolation): ±", "Cautions:", "not a certification",
		"cooling: air 300 K, dew point -20 °C, sun 1000 W/m², h 6 W m⁻² K⁻¹, exchange band 2.5–100 µm, sky clear two-band",
	} {
		if !strings.Contains(out, want) {
			t.Errorf("human output lacks %q", want)
		}
	}
}

// TestFiguresOrigins checks that figures says which of R, T and A was
// derived, in the table and in JSON: a file with R and A has T = 1 − R − A.
func TestFiguresOrigins(t *testing.T) {
	file := writeFile(t, "ra.csv", "wavelength_nm,R,A\n250,0.05,0.10\n30000,0.05,0.10\n")
	code, out, errs := runCLI("figures", file)
	if code != 0 || !strings.Contains(out, "R, T and A: R measured; T derived as T = 1 − R − A; A measured") {
		t.Errorf("exit %d\n%s%s", code, out, errs)
	}
	code, out, errs = runCLI("figures", "--json", file)
	var f struct {
		Origins          map[string]string `json:"origins"`
		SolarAbsorptance float64           `json:"solar_absorptance"`
	}
	if err := json.Unmarshal([]byte(out), &f); code != 0 || err != nil {
		t.Fatalf("exit %d, %v\n%s", code, err, errs)
	}
	// R + T + A = 1: α is the stated A, 0.10, not 1 − R = 0.95.
	if f.Origins["T"] != "derived" || math.Abs(f.SolarAbsorptance-0.10) > 1e-9 {
		t.Errorf("origins %v, α %g", f.Origins, f.SolarAbsorptance)
	}
}

// TestFiguresCoverageAndNotes checks the CLI's table and JSON for a figure
// covered less than 90 % (n/a with the reason; null with "reason"), one
// covered 90–98 % ("partial data") and a transmitting sample's notes.
func TestFiguresCoverageAndNotes(t *testing.T) {
	// Infrared data to 19 µm: about 85 % of the Planck 300 K weighting
	// over 2.5–25 µm (datasheet.TestCoverageGate).
	short := writeFile(t, "short.csv", "wavelength_nm,R\n280,0.9\n2500,0.9\n\n2500.1,0.1\n19000,0.1\n")
	code, out, errs := runCLI("figures", short)
	if code != 0 || !regexp.MustCompile(`Thermal emittance +n/a \(see below\)`).MatchString(out) ||
		!regexp.MustCompile(`  - Thermal emittance: n/a, not given: the data cover only 85\.\d % of the Planck blackbody at 300 K weighting`).MatchString(out) {
		t.Errorf("exit %d\n%s%s", code, out, errs)
	}
	_, out, _ = runCLI("figures", "--json", short)
	var f struct {
		ThermalEmittance *float64 `json:"thermal_emittance"`
		Figures          []struct {
			Key     string   `json:"key"`
			Value   *float64 `json:"value"`
			Reason  string   `json:"reason"`
			Partial bool     `json:"partial"`
		} `json:"figures"`
	}
	if err := json.Unmarshal([]byte(out), &f); err != nil {
		t.Fatal(err)
	}
	for _, x := range f.Figures {
		if x.Key == "thermal_emittance" && (x.Value != nil || !strings.Contains(x.Reason, "at least 90 % is needed")) {
			t.Errorf("JSON thermal emittance %v, reason %q", x.Value, x.Reason)
		}
	}
	if f.ThermalEmittance != nil {
		t.Errorf("headline thermal emittance %v, want null", *f.ThermalEmittance)
	}
	partial := writeFile(t, "partial.csv", "wavelength_nm,R\n280,0.9\n2500,0.9\n\n2500.1,0.1\n22500,0.1\n")
	if _, out, _ := runCLI("figures", partial); !regexp.MustCompile(`Thermal emittance +0\.9000 \(partial data\)`).MatchString(out) ||
		!strings.Contains(out, "Partial data: the data cover 90–98 % of the figure's weighting") {
		t.Errorf("partial:\n%s", out)
	}
	glass := writeFile(t, "glass.csv", "wavelength_nm,R,T\n280,0.08,0.83\n2500,0.08,0.83\n\n2600,0.05,0\n25000,0.05,0\n")
	if _, out, _ := runCLI("figures", glass); !regexp.MustCompile(`SRI, low wind +[0-9.]+ \[sri-not-opaque\]`).MatchString(out) ||
		!strings.Contains(out, "[cooling-lone-layer] The cooling figures take a lone layer") {
		t.Errorf("glass:\n%s", out)
	}
}
