package datasheet

import (
	"encoding/json"
	"fmt"
	"math"
	"slices"
	"strings"
	"testing"

	"skysheet/spectra"
)

// planckShare is the share of the Planck radiance at T over lo–hi µm that
// falls in lo–x µm, by a fine trapezoid rule on the independent planck of
// compute_test.go.
func planckShare(lo, x, hi, T float64) float64 {
	integral := func(a, b float64) float64 {
		const n = 20000
		d := (b - a) / n
		s := 0.0
		for i := range n {
			s += (planck(1000*(a+float64(i)*d), T) + planck(1000*(a+float64(i+1)*d), T)) * d / 2
		}
		return s
	}
	return integral(lo, x) / integral(lo, hi)
}

// TestCoverageGate checks the thresholds of docs/cooling.md: a figure whose
// weighting is covered less than 90 % by data has no value (null in JSON,
// with the reason), between 90 % and 98 % it is marked partial, above it
// is plain. The coverage of the thermal emittance (Planck 300 K over
// 2.5–25 µm) is recomputed here from Planck's law.
func TestCoverageGate(t *testing.T) {
	for _, tc := range []struct {
		toUM           float64 // the infrared data stop here
		wantNull, part bool
	}{
		{19, true, false},    // about 85 %
		{22.5, false, true},  // about 95 %
		{24.9, false, false}, // above 99 %
	} {
		t.Run(fmt.Sprintf("to %g µm", tc.toUM), func(t *testing.T) {
			share := planckShare(2.5, tc.toUM, 25, 300)
			if (share < 0.90) != tc.wantNull || (share >= 0.90 && share < 0.98) != tc.part {
				t.Fatalf("share %.4f does not fit the case", share)
			}
			in := fmt.Sprintf("wavelength_nm,R\n280,0.9\n2500,0.9\n\n2500.1,0.1\n%g,0.1\n", 1000*tc.toUM)
			s, err := spectra.Parse(strings.NewReader(in), "ir.csv")
			if err != nil {
				t.Fatal(err)
			}
			f, err := compute(s, DefaultConditions())
			if err != nil {
				t.Fatal(err)
			}
			x, _ := f.Figure("thermal_emittance")
			if math.Abs(float64(x.Coverage)-share) > 1e-4 {
				t.Errorf("coverage %g, Planck's law gives %g", x.Coverage, share)
			}
			data, err := json.Marshal(x)
			if err != nil {
				t.Fatal(err)
			}
			var j map[string]any
			if err := json.Unmarshal(data, &j); err != nil {
				t.Fatal(err)
			}
			reason, _ := j["reason"].(string)
			if tc.wantNull {
				want := fmt.Sprintf("not given: the data cover only %.1f %% of the Planck blackbody at 300 K weighting", 100*share)
				if j["value"] != nil || !strings.Contains(reason, want) || !strings.Contains(reason, "at least 90 % is needed") {
					t.Errorf("JSON %s, want a null value and the reason %q", data, want)
				}
				if !math.IsNaN(float64(f.ThermalEmittance)) || !math.IsNaN(float64(f.SRI.Low)) {
					t.Errorf("headline ε %g, SRI %g: want null", f.ThermalEmittance, f.SRI.Low)
				}
				if sri, _ := f.Figure("sri_low"); !math.IsNaN(float64(sri.Value)) || !strings.Contains(sri.Reason, "on which the index's thermal emittance rests") {
					t.Errorf("SRI %g, reason %q", sri.Value, sri.Reason)
				}
			} else {
				if j["value"] == nil || reason != "" {
					t.Errorf("JSON %s: want a value and no reason", data)
				}
				if x.Partial != tc.part || (j["partial"] == true) != tc.part {
					t.Errorf("partial %v (JSON %s), want %v", x.Partial, data, tc.part)
				}
			}
		})
	}
}

// TestCoverageGateCooling checks that the cooling figures follow the part
// of the exchange band that must be measured (2.5–25 µm), not the whole
// band: data to 25 µm give them, data to 19 µm (about 85 % of the
// blackbody power over 2.5–25 µm) do not, and the curve goes with them.
func TestCoverageGateCooling(t *testing.T) {
	for _, tc := range []struct {
		toUM     float64
		wantNull bool
	}{{25, false}, {19, true}} {
		in := fmt.Sprintf("wavelength_nm,R\n280,0.9\n2500,0.9\n\n2600,0.05\n%g,0.05\n", 1000*tc.toUM)
		s, err := spectra.Parse(strings.NewReader(in), "x.csv")
		if err != nil {
			t.Fatal(err)
		}
		f, err := compute(s, DefaultConditions())
		if err != nil {
			t.Fatal(err)
		}
		for _, key := range []string{"cooling_power_w_m2", "cooling_power_night_w_m2", "equilibrium_delta_k", "equilibrium_delta_night_k"} {
			x, _ := f.Figure(key)
			if math.IsNaN(float64(x.Value)) != tc.wantNull {
				t.Errorf("to %g µm: %s = %g (%s)", tc.toUM, key, x.Value, x.Reason)
			}
			if tc.wantNull && !strings.Contains(x.Reason, "of the blackbody power at 300 K over 2.5–25 µm") {
				t.Errorf("%s: reason %q", key, x.Reason)
			}
			// The coverage reported is the deciding share: the data
			// (2.6–25 µm) against Planck's law at 300 K over 2.5–25 µm,
			// not the 84 % of the whole exchange band to 100 µm.
			if want := 1 - planckShare(2.5, 2.6, 25, 300); !tc.wantNull && math.Abs(float64(x.Coverage)-want) > 2e-3 {
				t.Errorf("to %g µm: %s coverage %g, Planck's law gives %g", tc.toUM, key, x.Coverage, want)
			}
		}
		if tc.wantNull != (len(f.CoolingCurve) == 0) || tc.wantNull != math.IsNaN(float64(f.CoolingPowerNightWm2)) {
			t.Errorf("to %g µm: curve of %d points, night power %g", tc.toUM, len(f.CoolingCurve), f.CoolingPowerNightWm2)
		}
	}
}

// TestCoverageGateRule checks the gate alone on figures with set
// coverages: below 90 % null, 90 % to 98 % partial.
func TestCoverageGateRule(t *testing.T) {
	f := &Figures{Figures: []Figure{
		{Key: "solar_reflectance", Label: "Solar reflectance", Value: 0.9, Coverage: 0.85, Weighting: "w", Band: spectra.Interval{Lo: 280, Hi: 2500}, BandUnit: "nm"},
		{Key: "uv_reflectance", Value: 0.5, Coverage: 0.90},
		{Key: "visible_reflectance", Value: 0.9, Coverage: 0.979},
		{Key: "nir_reflectance", Value: 0.9, Coverage: 0.98},
	}, SolarReflectance: 0.9}
	applyCoverage(f)
	got := func(key string) Figure { x, _ := f.Figure(key); return x }
	if x := got("solar_reflectance"); !math.IsNaN(float64(x.Value)) || !strings.Contains(x.Reason, "85.0 %") || !math.IsNaN(float64(f.SolarReflectance)) {
		t.Errorf("85 %%: %+v, headline %g", x, f.SolarReflectance)
	}
	for key, partial := range map[string]bool{"uv_reflectance": true, "visible_reflectance": true, "nir_reflectance": false} {
		if x := got(key); math.IsNaN(float64(x.Value)) || x.Partial != partial || x.Reason != "" {
			t.Errorf("%s: %+v, want partial %v", key, x, partial)
		}
	}
}

// TestModelNotes checks the notes of samples outside the SRI's and the
// cooling model's assumptions: clear glass (it transmits), a film that
// transmits only thermal radiation, a bare metal (emittance below 0.1)
// and an opaque white (none).
func TestModelNotes(t *testing.T) {
	sri := []string{"sri_low", "sri_medium", "sri_high"}
	for _, tc := range []struct {
		name, in string
		codes    []string
		says     string
	}{
		// Flat T: the solar and thermal transmittances are these values.
		{"clear glass", "wavelength_nm,R,T\n280,0.08,0.83\n2500,0.08,0.83\n\n2600,0.05,0\n25000,0.05,0\n",
			[]string{NoteSRINotOpaque, NoteCoolingLoneLayer}, "transmits 83.0 % of sunlight and 0.0 % of thermal radiation"},
		{"thermal only", "wavelength_nm,R,T\n280,0.9,0\n2500,0.9,0\n\n2600,0.05,0.3\n25000,0.05,0.3\n",
			[]string{NoteSRINotOpaque, NoteCoolingLoneLayer}, "0.0 % of sunlight and 30.0 % of thermal radiation"},
		// Just above 0.01: transmitting.
		{"T 0.011", "wavelength_nm,R,T\n280,0.9,0.011\n25000,0.05,0.011\n", []string{NoteSRINotOpaque, NoteCoolingLoneLayer}, "1.1 % of sunlight"},
		{"T 0.009", "wavelength_nm,R,T\n280,0.9,0.009\n25000,0.05,0.009\n", nil, ""},
		// ε = 1 − R = 0.05, 0.1 and 0.2 over the thermal band.
		{"bare metal", "wavelength_nm,R\n280,0.9\n2500,0.9\n\n2600,0.95\n25000,0.95\n", []string{NoteSRILowEmittance}, "thermal emittance above 0.1; this sample's is 0.050"},
		{"emittance 0.1", "wavelength_nm,R\n280,0.9\n2500,0.9\n\n2600,0.9\n25000,0.9\n", []string{NoteSRILowEmittance}, "is 0.100"},
		{"emittance 0.2", "wavelength_nm,R\n280,0.9\n2500,0.9\n\n2600,0.8\n25000,0.8\n", nil, ""},
		{"opaque white", "wavelength_nm,R\n280,0.9\n2500,0.9\n\n2600,0.05\n25000,0.05\n", nil, ""},
	} {
		t.Run(tc.name, func(t *testing.T) {
			s, err := spectra.Parse(strings.NewReader(tc.in), "x.csv")
			if err != nil {
				t.Fatal(err)
			}
			f, err := compute(s, DefaultConditions())
			if err != nil {
				t.Fatal(err)
			}
			var codes []string
			var text string
			for _, n := range f.ModelNotes {
				codes = append(codes, n.Code)
				text += n.Text + " "
				if n.Code != NoteCoolingLoneLayer && !slices.Equal(n.Figures, sri) {
					t.Errorf("%s concerns %v", n.Code, n.Figures)
				}
			}
			if !slices.Equal(codes, tc.codes) || !strings.Contains(text, tc.says) {
				t.Errorf("notes %v %q, want %v saying %q", codes, text, tc.codes, tc.says)
			}
			if len(tc.codes) > 0 && tc.codes[0] == NoteSRINotOpaque {
				if !strings.Contains(text, "defined for opaque surfaces") || !strings.Contains(text, "a lone layer radiating from its upper face, with nothing behind it") {
					t.Errorf("notes %q", text)
				}
				if n := f.NotesFor("cooling_power_w_m2"); len(n) != 1 || n[0].Code != NoteCoolingLoneLayer {
					t.Errorf("notes for the day cooling power: %v", n)
				}
			}
			data, _ := json.Marshal(f)
			if !strings.Contains(string(data), `"model_notes":[`) {
				t.Error("model_notes missing from JSON")
			}
		})
	}
}
