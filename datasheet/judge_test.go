package datasheet

import (
	"bytes"
	"encoding/json"
	"math"
	"regexp"
	"slices"
	"strconv"
	"strings"
	"testing"

	"skysheet/spectra"
)

// Invented spectra of the ASTM E1980 reference surfaces: a constant R in
// the solar band and a constant emittance in the thermal band give, in
// closed form, α = 1 − R and ε = 1 − R_IR (a weighted mean of a constant is
// the constant; opaque, Kirchhoff's law).
const (
	uvvisWhite = "wavelength_nm,R\n280,0.8\n1000,0.8\n2400,0.8\n"    // α = 0.20
	uvvisBlack = "wavelength_nm,R\n280,0.05\n1000,0.05\n2400,0.05\n" // α = 0.95
	ftir90     = "wavelength_um,R\n2.5,0.1\n10,0.1\n25,0.1\n"        // ε = 0.90 over 2.5–25 µm
	ftir90to20 = "wavelength_um,R\n2.5,0.1\n20,0.1\n"                // stops at 20 µm
)

// blackbodyNight is the night cooling power at T_s = T_amb of a surface of
// emittance 1 under the default clear sky: the sky is black outside the
// window, so only the window counts, P = σT⁴ F_w (1 − ε_w) with the window's
// hemispherical emissivity ε_w = 1 − (1 − ε_sky)/F_w clamped to 0..1; F_w by
// Simpson integration of Planck's law, ε_sky from the stated correlation
// (Berdahl & Martin 1984, a hemispherical flux; coefficients from memory),
// Stefan–Boltzmann law. Unclamped, that is σT⁴ (1 − ε_sky).
func blackbodyNight(dewPointC, ambientK float64) float64 {
	sigmaT4 := sigmaCODATA * math.Pow(ambientK, 4)
	fw := math.Pi * integrate(func(nm float64) float64 { return planckRef(nm, ambientK) }, 8000, 13000, 2000) / sigmaT4
	epsSky := 0.711 + 0.56*dewPointC/100 + 0.73*dewPointC*dewPointC/1e4
	ew := math.Max(0, math.Min(1, 1-(1-epsSky)/fw))
	return sigmaT4 * fw * (1 - ew)
}

// bbShare is the share of blackbody power at kelvin over a–b nm within
// lo–hi nm, by Simpson integration of Planck's law.
func bbShare(a, b, lo, hi, kelvin float64) float64 {
	f := func(nm float64) float64 { return planckRef(nm, kelvin) }
	return integrate(f, a, b, 20000) / integrate(f, lo, hi, 20000)
}

// TestJudgeKinds checks claims of the figures that are not fractions: the
// SRI (an index) and the cooling figures (W/m² and K).
func TestJudgeKinds(t *testing.T) {
	white := []string{"a.csv", uvvisWhite, "b.csv", ftir90}
	black := []string{"a.csv", uvvisBlack, "b.csv", ftir90}
	// Expanded uncertainty, k = 2, of a default standard uncertainty and the
	// rounding of the claim's last digit over √3: JCGM 100:2008 §6.2 and
	// §F.2.2.1 (sections from memory), closed form.
	u2 := func(u, half float64) float64 { return 2 * math.Hypot(u, half/math.Sqrt(3)) }
	night := blackbodyNight(10, 300)
	sigmaT4 := sigmaCODATA * math.Pow(300, 4) // Stefan–Boltzmann law, CODATA 2018 σ

	for _, tt := range []struct {
		name     string
		files    []string
		blackIR  bool // a blackbody surface measured 0.25–25 µm instead of files
		cond     func(*Conditions)
		claim    Claim
		status   Status
		kind     Kind
		computed float64 // NaN: not checked
		allowed  float64 // NaN: not checked
		pitfalls []PitfallCode
		reason   []string // parts of the reason
		not      []string // words the reason must not hold
		tol      float64
	}{
		// ASTM E1980 definition: the standard white (α 0.20, ε 0.90)
		// scores 100 and the standard black (α 0.95, ε 0.90) 0, at every
		// wind.
		{name: "SRI 100 of the standard white, low wind", files: white,
			claim:  Claim{Figure: "sri_low", Value: 100},
			status: Supported, kind: KindIndex, computed: 100, allowed: u2(defaultIndexUncertainty, 0.5),
			reason: []string{"The spectra give 100.0 against the claimed 100.0"}, not: []string{"fraction", "percentage"}, tol: 1e-6},
		{name: "SRI 100 of the standard white, medium wind", files: white,
			claim:  Claim{Figure: "sri_medium", Value: 100, Tolerance: 0.5},
			status: Supported, kind: KindIndex, computed: 100, allowed: 0.5, tol: 1e-6},
		{name: "SRI 0 of the standard black, high wind", files: black,
			claim:  Claim{Figure: "sri_high", Value: 0},
			status: Supported, kind: KindIndex, computed: 0, allowed: u2(defaultIndexUncertainty, 0.5), tol: 1e-6},
		{name: "SRI 110 claimed for the standard white", files: white,
			claim:  Claim{Figure: "sri_medium", Value: 110},
			status: NotSupported, kind: KindIndex, computed: 100, allowed: u2(defaultIndexUncertainty, 0.5),
			reason: []string{"The spectra give 100.0, 10.0 below the claimed 110.0, outside ±2.1"},
			not:    []string{"fraction", "percentage"}, tol: 1e-6},
		{name: "SRI 96 is no percentage", files: white,
			claim:  Claim{Figure: "sri_low", Value: 96, Tolerance: 1},
			status: NotSupported, kind: KindIndex, computed: 100, allowed: 1, not: []string{"percentage"}, tol: 1e-6},
		{name: "SRI beyond any surface", files: white,
			claim:  Claim{Figure: "sri_low", Value: 200, Tolerance: 1},
			status: NotSupported, kind: KindIndex, computed: 100, allowed: 1,
			reason: []string{"above the largest SRI any surface reaches at low wind"}, tol: 1e-6},
		{name: "SRI when the infrared data stop at 20 µm",
			files: []string{"a.csv", uvvisWhite, "b.csv", ftir90to20},
			claim: Claim{Figure: "sri_low", Value: 100},
			// coverage 88.4 %: Planck 300 K share of 2.5–20 in 2.5–25 µm (see TestJudge);
			// below 90 % the index is not given (TestCoverageGate).
			status: CannotCheck, kind: KindIndex, computed: math.NaN(), allowed: math.NaN(), pitfalls: []PitfallCode{pitfallInfraredShort},
			reason: []string{"88.4 %", "on which the index's thermal emittance rests"}, tol: 1e-6},

		// A blackbody surface (ε = 1 measured over 0.25–25 µm, held
		// constant beyond): at night only the window exchanges with the
		// clear sky, closed form above; by day the sun adds I·α with α = 1.
		{name: "night cooling power of a blackbody", blackIR: true,
			claim:  Claim{Figure: "cooling_power_night_w_m2", Value: math.Round(night*10) / 10, Tolerance: 0.2},
			status: Supported, kind: KindPower, computed: night, allowed: 0.2,
			reason: []string{"W/m² against the claimed", "with the emittance held constant over 25–100 µm ("}, tol: 0.01},
		{name: "day cooling power of a blackbody", blackIR: true,
			claim:  Claim{Figure: "cooling_power_w_m2", Value: 100},
			status: NotSupported, kind: KindPower, computed: night - 1000, allowed: u2(defaultRelUncertainty*100, 0.5),
			reason: []string{"below the claimed 100.0 W/m²", "held constant over 25–100 µm"}, tol: 0.01},
		{name: "small power claim takes the floor", blackIR: true,
			claim:  Claim{Figure: "cooling_power_night_w_m2", Value: 20},
			status: NotSupported, kind: KindPower, computed: night, allowed: u2(defaultPowerFloorWm2, 0.5), tol: 0.01},
		{name: "power above σT⁴", blackIR: true,
			claim:  Claim{Figure: "cooling_power_night_w_m2", Value: 600, Tolerance: 10},
			status: NotSupported, kind: KindPower, computed: night, allowed: 10,
			reason: []string{"more than a blackbody radiates", "σT⁴ = " + strconv.FormatFloat(sigmaT4, 'f', 1, 64) + " W/m²"}, tol: 0.01},
		{name: "power below any surface", blackIR: true,
			claim:  Claim{Figure: "cooling_power_w_m2", Value: -1500, Tolerance: 10},
			status: NotSupported, kind: KindPower, computed: night - 1000, allowed: 10,
			reason: []string{"below the least any surface can give (" + strconv.FormatFloat(-sigmaT4-1000, 'f', 1, 64) + " W/m²"}, tol: 0.01},
		{name: "temperature difference at absolute zero", blackIR: true,
			claim:  Claim{Figure: "equilibrium_delta_night_k", Value: 300, Tolerance: 1},
			status: NotSupported, kind: KindTemperatureDifference, computed: math.NaN(), allowed: 1,
			reason: []string{"at or below absolute zero"}},
		{name: "small temperature claim takes the floor", blackIR: true,
			claim: Claim{Figure: "equilibrium_delta_night_k", Value: 5},
			kind:  KindTemperatureDifference, status: -1, computed: math.NaN(), allowed: u2(defaultDeltaFloorK, 0.5), tol: 1e-12},
		{name: "cooling with infrared data to 20 µm", files: []string{"a.csv", uvvisWhite, "b.csv", ftir90to20},
			claim: Claim{Figure: "cooling_power_night_w_m2", Value: 50, Tolerance: 5},
			// Planck at 300 K: 2.5–20 µm holds 88.4 % of 2.5–25 µm (as above),
			// and 20–100 µm more than 25 % of 2.5–100 µm (checked below by
			// Simpson integration).
			status: CannotCheck, kind: KindPower, computed: math.NaN(), allowed: 5, pitfalls: []PitfallCode{pitfallHeldLarge},
			reason: []string{"cover only 88.4 % of the blackbody power at 300 K over 2.5–25 µm", "held constant over 20–100 µm"}},
		{name: "daytime cooling with solar data from 450 nm", files: []string{"a.csv", uvvis450, "b.csv", ftir90},
			claim: Claim{Figure: "cooling_power_w_m2", Value: 50, Tolerance: 5},
			// the night figure does not rest on the solar data
			status: CannotCheck, kind: KindPower, computed: math.NaN(), allowed: 5, pitfalls: []PitfallCode{pitfallSolarLateStart},
			reason: []string{"of the ASTM G173-03 global tilt power over 280–4000 nm, on which the absorbed sunlight rests", "held constant over 25–100 µm"}},
		{name: "night cooling with solar data from 450 nm", files: []string{"a.csv", uvvis450, "b.csv", ftir90},
			claim:  Claim{Figure: "cooling_power_night_w_m2", Value: 50, Tolerance: 500},
			status: Supported, kind: KindPower, computed: math.NaN(), allowed: 500},
		{name: "cooling of a cold surface: held part named", blackIR: true,
			cond:  func(c *Conditions) { c.AmbientK, c.DewPointC = 220, -60 },
			claim: Claim{Figure: "cooling_power_night_w_m2", Value: 50, Tolerance: 500},
			// Planck at 220 K: more than 25 % of 2.5–100 µm lies beyond 25 µm
			// (checked below by Simpson integration).
			status: Supported, kind: KindPower, computed: math.NaN(), allowed: 500, pitfalls: []PitfallCode{pitfallHeldLarge}},
	} {
		t.Run(tt.name, func(t *testing.T) {
			s := constSample(1, 250, 25000)
			if !tt.blackIR {
				s = sample(t, tt.files...)
			}
			c := DefaultConditions()
			if tt.cond != nil {
				tt.cond(&c)
			}
			v := judgeOne(tt.claim, JudgeInput{Spectrum: s, Conditions: c})
			if tt.status >= 0 && v.Status != tt.status {
				t.Errorf("status = %v, want %v (reason: %s)", v.Status, tt.status, v.Reason)
			}
			if v.Kind != tt.kind {
				t.Errorf("kind = %v, want %v", v.Kind, tt.kind)
			}
			near := func(name string, got Num, want float64) {
				if !math.IsNaN(want) && !(math.Abs(float64(got)-want) <= tt.tol) {
					t.Errorf("%s = %.12g, want %.12g ± %g", name, float64(got), want, tt.tol)
				}
			}
			near("computed", v.Computed, tt.computed)
			near("allowed", v.Allowed, tt.allowed)
			var codes []PitfallCode
			for _, p := range v.Pitfalls {
				codes = append(codes, p.Code)
			}
			if !slices.Equal(codes, tt.pitfalls) {
				t.Errorf("pitfalls = %v, want %v", v.Pitfalls, tt.pitfalls)
			}
			for _, r := range tt.reason {
				if !strings.Contains(v.Reason, r) {
					t.Errorf("reason %q does not contain %q", v.Reason, r)
				}
			}
			for _, r := range tt.not {
				if strings.Contains(v.Reason+v.AllowedFrom, r) {
					t.Errorf("reason %q or allowance %q contains %q", v.Reason, v.AllowedFrom, r)
				}
			}
			if n := strings.Count(strings.TrimSuffix(v.Reason, "."), ". "); n > 0 || !strings.HasSuffix(v.Reason, ".") {
				t.Errorf("reason %q is not one sentence", v.Reason)
			}
		})
	}
	if share := bbShare(20000, 100000, 2500, 100000, 300); !(share > maxHeldShare) {
		t.Errorf("data to 20 µm hold %.3f of the band, not more than %g", share, maxHeldShare)
	}
	if share := bbShare(25000, 100000, 2500, 100000, 220); !(share > maxHeldShare) {
		t.Errorf("the cold case holds %.3f of the band beyond 25 µm, not more than %g", share, maxHeldShare)
	}
}

// TestHeldShareInReason checks the held share a cooling verdict states
// against Simpson integration of Planck's law.
func TestHeldShareInReason(t *testing.T) {
	v := judgeOne(Claim{Figure: "cooling_power_night_w_m2", Value: 70, Tolerance: 50},
		JudgeInput{Spectrum: constSample(1, 250, 25000), Conditions: DefaultConditions()})
	m := regexp.MustCompile(`held constant over 25–100 µm \(([0-9.]+) % of the exchange band's blackbody power at 300 K\)`).FindStringSubmatch(v.Reason)
	if m == nil {
		t.Fatalf("reason %q does not state the held part", v.Reason)
	}
	got, _ := strconv.ParseFloat(m[1], 64)
	// Planck at 300 K, 25–100 µm over 2.5–100 µm: Simpson integration.
	if want := 100 * bbShare(25000, 100000, 2500, 100000, 300); math.Abs(got-want) > 0.051 {
		t.Errorf("held share %g %%, want %.3f %%", got, want)
	}
	// Measured across the whole band: said so.
	c := DefaultConditions()
	c.ExchangeBand = spectra.Interval{Lo: 2500, Hi: 25000}
	v = judgeOne(Claim{Figure: "cooling_power_night_w_m2", Value: 70, Tolerance: 50}, JudgeInput{Spectrum: constSample(1, 250, 25000), Conditions: c})
	if !strings.Contains(v.Reason, "with the emittance measured over the whole exchange band.") {
		t.Errorf("reason %q", v.Reason)
	}
}

// TestJudgeBasisWordsByKind checks that the basis of each figure names
// only the conditions it rests on.
func TestJudgeBasisWordsByKind(t *testing.T) {
	s := sample(t, "a.csv", uvvisWhite, "b.csv", ftir90)
	for _, tt := range []struct {
		claim     Claim
		basis     string
		defaulted []string
		note      string
	}{
		{Claim{Figure: "cooling_power_night_w_m2", Value: 50},
			"clear two-band sky (default), dew point 10 °C (default), air at 300 K (default), exchange band 2.5–100 µm (default)",
			[]string{"sky", "dew_point_c", "ambient_k", "exchange_band_um"}, ""},
		// The absorbed sunlight is over the whole G173 range: no solar band.
		{Claim{Figure: "cooling_power_w_m2", Value: 50},
			"clear two-band sky (default), dew point 10 °C (default), air at 300 K (default), sun 1000 W/m² (default), " +
				"ASTM G173-03 global tilt spectrum (default), exchange band 2.5–100 µm (default)",
			[]string{"sky", "dew_point_c", "ambient_k", "irradiance_w_m2", "solar_spectrum", "exchange_band_um"}, ""},
		{Claim{Figure: "equilibrium_delta_night_k", Value: 5},
			"clear two-band sky (default), dew point 10 °C (default), air at 300 K (default), h 6 W m⁻² K⁻¹ (default), exchange band 2.5–100 µm (default)",
			[]string{"sky", "dew_point_c", "ambient_k", "h_w_m2k", "exchange_band_um"}, ""},
		// A stated solar spectrum changes the daytime power only (through
		// the absorbed sunlight): the default-basis value is shown for it,
		// not for the night.
		{Claim{Figure: "equilibrium_delta_k", Value: 5, Basis: Basis{SolarSpectrum: "direct"}},
			"clear two-band sky (default), dew point 10 °C (default), air at 300 K (default), h 6 W m⁻² K⁻¹ (default), sun 1000 W/m² (default), " +
				"ASTM G173-03 direct + circumsolar spectrum (stated), exchange band 2.5–100 µm (default)",
			[]string{"sky", "dew_point_c", "ambient_k", "h_w_m2k", "irradiance_w_m2", "exchange_band_um"},
			"On the default basis (clear two-band sky, dew point 10 °C, air at 300 K, h 6 W m⁻² K⁻¹, sun 1000 W/m², ASTM G173-03 global tilt spectrum, exchange band 2.5–100 µm) the spectra give"},
		{Claim{Figure: "cooling_power_night_w_m2", Value: 50, Basis: Basis{SolarSpectrum: "direct"}},
			"clear two-band sky (default), dew point 10 °C (default), air at 300 K (default), exchange band 2.5–100 µm (default)",
			[]string{"sky", "dew_point_c", "ambient_k", "exchange_band_um"}, ""},
		{Claim{Figure: "sri_low", Value: 100, Basis: Basis{TemperatureK: 320}},
			"solar band 280–2500 nm (default), ASTM G173-03 global tilt spectrum (default), thermal band 2.5–25 µm (default), " +
				"blackbody at 320 K (stated), ASTM E1980 low wind, h_c 5 W m⁻² K⁻¹ (set by the figure)",
			[]string{"solar_band_nm", "solar_spectrum", "thermal_band_um"},
			"On the default basis (solar band 280–2500 nm, ASTM G173-03 global tilt spectrum, thermal band 2.5–25 µm, blackbody at 300 K, ASTM E1980 low wind, h_c 5 W m⁻² K⁻¹) the spectra give 100.0."},
	} {
		v := judgeOne(tt.claim, JudgeInput{Spectrum: s, Conditions: DefaultConditions()})
		if v.Basis != tt.basis {
			t.Errorf("%s: basis\n %q, want\n %q", tt.claim.Figure, v.Basis, tt.basis)
		}
		if !slices.Equal(v.Defaulted, tt.defaulted) {
			t.Errorf("%s: defaulted %v, want %v", tt.claim.Figure, v.Defaulted, tt.defaulted)
		}
		if !strings.HasPrefix(v.BasisNote, tt.note) || (tt.note == "") != (v.BasisNote == "") {
			t.Errorf("%s: basis note %q, want %q…", tt.claim.Figure, v.BasisNote, tt.note)
		}
	}

	// A spectral sky names its file and no dew point.
	sky, err := spectra.Decode([]byte("wavelength_um,T\n2.5,0\n8,0\n8.1,0.8\n13,0.8\n13.1,0\n100,0\n"), "invented-sky.csv")
	if err != nil {
		t.Fatal(err)
	}
	c := DefaultConditions()
	c.Sky = SkyChoice{File: "invented-sky.csv", Spectrum: sky}
	v := judgeOne(Claim{Figure: "cooling_power_night_w_m2", Value: 50}, JudgeInput{Spectrum: s, Conditions: c})
	if want := "spectral sky invented-sky.csv (default), air at 300 K (default), exchange band 2.5–100 µm (default)"; v.Basis != want {
		t.Errorf("spectral sky: basis %q, want %q", v.Basis, want)
	}
}

// TestFigureSpecs checks that every figure Compute returns has its entry
// in the table of kinds, with a kind that fits its unit.
func TestFigureSpecs(t *testing.T) {
	// With a transmittance, so that the transmitted colour is computed.
	f, err := compute(sample(t, "a.csv", "wavelength_nm,R,T\n280,0.5,0.3\n2400,0.5,0.3\n", "b.csv", ftir90), DefaultConditions())
	if err != nil {
		t.Fatal(err)
	}
	units := map[Kind]string{KindFraction: "", KindIndex: "", KindPower: "W/m²", KindTemperatureDifference: "K", KindLab: "", KindChromaticity: ""}
	seen := map[string]bool{}
	for _, x := range f.Figures {
		s, ok := figureSpecs[x.Key]
		if !ok {
			t.Errorf("figure %q is not in figureSpecs", x.Key)
			continue
		}
		seen[x.Key] = true
		if u, ok := units[s.kind]; !ok || u != x.Unit {
			t.Errorf("figure %q: kind %v does not fit unit %q", x.Key, s.kind, x.Unit)
		}
		if x.Kind() != s.kind {
			t.Errorf("Kind of %q = %v, want %v", x.Key, x.Kind(), s.kind)
		}
	}
	for k := range figureSpecs {
		if !seen[k] {
			t.Errorf("figureSpecs lists %q, which Compute does not return", k)
		}
	}
	// A figure the table lacks takes its kind from its unit.
	for unit, want := range map[string]Kind{"": KindFraction, "W/m²": KindPower, "K": KindTemperatureDifference, "nm": kindQuantity} {
		if got := (Figure{Key: "later_figure", Unit: unit}).Kind(); got != want {
			t.Errorf("Kind of unit %q = %v, want %v", unit, got, want)
		}
	}
	for _, k := range []Kind{KindFraction, KindIndex, KindPower, KindTemperatureDifference, kindQuantity, KindLab, KindChromaticity} {
		b, err := k.MarshalText()
		var back Kind
		if err != nil || back.UnmarshalText(b) != nil || back != k {
			t.Errorf("kind %v does not round-trip: %q, %v", k, b, back)
		}
	}
}

// figuresClaims are claims on the material's own conditions and on two
// stated bases, one of them twice.
var figuresClaims = []Claim{
	{Figure: "solar_reflectance", Value: 0.8, Tolerance: 0.01},
	{Figure: "thermal_emittance", Value: 0.9},
	{Figure: "sri_medium", Value: 100},
	{Figure: "cooling_power_night_w_m2", Value: 60},
	{Figure: "equilibrium_delta_k", Value: 3},
	{Figure: "solar_reflectance", Value: 0.8, Basis: Basis{SolarBandNM: []float64{280, 4000}}},
	{Figure: "cooling_power_w_m2", Value: 0.8, Basis: Basis{SolarBandNM: []float64{280, 4000}}},
	{Figure: "thermal_emittance", Value: 0.9, Basis: Basis{TemperatureK: 320}},
	{Figure: "no_such_figure", Value: 1},
	{Figure: "solar_reflectance", Value: math.NaN()},
}

// TestJudgeReusesFigures checks that claims on the material's own
// conditions reuse its figures, that each other basis is computed once,
// and that the verdicts are the same as when everything is recomputed.
func TestJudgeReusesFigures(t *testing.T) {
	for _, sm := range []struct {
		name string
		s    *spectra.Spectrum
	}{
		{"reference white", sample(t, "a.csv", uvvisWhite, "b.csv", ftir90)},
		{"invented white coating with u_R", whiteSample(t)},
	} {
		t.Run(sm.name, func(t *testing.T) { testReuse(t, sm.s) })
	}
}

func testReuse(t *testing.T, s *spectra.Spectrum) {
	c := DefaultConditions()
	own, err := compute(s, c)
	if err != nil {
		t.Fatal(err)
	}
	// Compute is deterministic, so reusing its result is the same as
	// computing again.
	again, _ := compute(s, c)
	if a, b := mustJSON(t, own), mustJSON(t, again); !bytes.Equal(a, b) {
		t.Fatal("two computations of the same figures differ")
	}
	// Recomputed for every claim, as one Judge call per claim does.
	var fresh []Verdict
	for _, cl := range figuresClaims {
		fresh = append(fresh, judgeOne(cl, JudgeInput{Spectrum: s, Conditions: c, Angle: "8°"}))
	}
	want := mustJSON(t, fresh)

	for _, tt := range []struct {
		name     string
		figures  *Figures
		computes int
	}{
		{"with the material's figures", own, 2},              // the two stated bases
		{"without them", nil, 3},                             // and the own conditions once
		{"with figures of other conditions", other(t, s), 3}, // not used
	} {
		j := newJudge(JudgeInput{Spectrum: s, Conditions: c, Figures: tt.figures, Angle: "8°"})
		var vs []Verdict
		for _, cl := range figuresClaims {
			vs = append(vs, j.judge(cl))
		}
		if j.computes != tt.computes {
			t.Errorf("%s: %d computations, want %d", tt.name, j.computes, tt.computes)
		}
		if got := mustJSON(t, vs); !bytes.Equal(got, want) {
			t.Errorf("%s: verdicts differ from those recomputed per claim:\n%s\n%s", tt.name, got, want)
		}
		all := mustJSON(t, JudgeAll(figuresClaims, JudgeInput{Spectrum: s, Conditions: c, Figures: tt.figures, Angle: "8°"}))
		if !bytes.Equal(all, want) {
			t.Errorf("%s: JudgeAll differs from Judge", tt.name)
		}
	}
	// Given the resolved optics, the judge resolves nothing itself.
	o := spectra.Resolve(s, c.ClosureTol)
	j := newJudge(JudgeInput{Spectrum: s, Optics: &o, Conditions: c, Figures: own, Angle: "8°"})
	var vs []Verdict
	for _, cl := range figuresClaims {
		vs = append(vs, j.judge(cl))
	}
	if j.resolves != 0 {
		t.Errorf("with the optics: resolved %d times, want 0", j.resolves)
	}
	if got := mustJSON(t, vs); !bytes.Equal(got, want) {
		t.Errorf("with the optics: verdicts differ from those recomputed per claim")
	}
	if vs := JudgeAll(nil, JudgeInput{Spectrum: s, Conditions: c}); vs == nil || len(vs) != 0 {
		t.Errorf("JudgeAll(nil) = %#v, want empty", vs)
	}
}

func mustJSON(t *testing.T, v any) []byte {
	t.Helper()
	b, err := json.Marshal(v)
	if err != nil {
		t.Fatal(err)
	}
	return b
}

// other returns figures of s under conditions other than the defaults.
func other(t *testing.T, s *spectra.Spectrum) *Figures {
	c := DefaultConditions()
	c.TemperatureK = 330
	f, err := compute(s, c)
	if err != nil {
		t.Fatal(err)
	}
	return f
}

// BenchmarkJudgeAll judges the claims of one invented material with and
// without reusing its already computed figures.
func BenchmarkJudgeAll(b *testing.B) {
	s := whiteSample(b)
	c := DefaultConditions()
	own, err := compute(s, c)
	if err != nil {
		b.Fatal(err)
	}
	claims := figuresClaims[:5] // all on the material's own conditions
	for _, bb := range []struct {
		name    string
		figures *Figures
		judge   func(Claim, JudgeInput) Verdict
	}{
		{"per claim, recomputed", nil, judgeOne},
		{"JudgeAll, own figures reused", own, nil},
	} {
		b.Run(bb.name, func(b *testing.B) {
			in := JudgeInput{Spectrum: s, Conditions: c, Figures: bb.figures}
			for b.Loop() {
				if bb.judge != nil {
					for _, cl := range claims {
						bb.judge(cl, in)
					}
				} else {
					JudgeAll(claims, in)
				}
			}
		})
	}
}

// TestSRITranslucentPitfall: ASTM E1980 defines the SRI for opaque surfaces;
// a sample with constant T = 0.30 over the solar band has solar
// transmittance 0.30 (closed form: the weighted mean of a constant), so an
// SRI claim on it must name the pitfall, and an opaque one must not.
func TestSRITranslucentPitfall(t *testing.T) {
	for _, tt := range []struct {
		name, in string
		want     bool
	}{
		{"translucent", "wavelength_nm,R,T\n250,0.5,0.3\n2500,0.5,0.3\n\n2600,0.05,0\n30000,0.05,0\n", true},
		{"opaque", "wavelength_nm,R,T\n250,0.5,0\n2500,0.5,0\n\n2600,0.05,0\n30000,0.05,0\n", false},
	} {
		s, err := spectra.Parse(strings.NewReader(tt.in), "x.csv")
		if err != nil {
			t.Fatal(err)
		}
		v := judgeOne(Claim{Figure: "sri_medium", Value: 50}, JudgeInput{Spectrum: s, Conditions: DefaultConditions()})
		got := false
		for _, p := range v.Pitfalls {
			got = got || p.Code == pitfallSRITranslucent
		}
		if got != tt.want {
			t.Errorf("%s: pitfall %v, want %v (pitfalls %+v)", tt.name, got, tt.want, v.Pitfalls)
		}
	}
}

// TestAllConds checks that the conditions of a figure the kind table does
// not know include every condition some known figure rests on.
func TestAllConds(t *testing.T) {
	for key, s := range figureSpecs {
		for _, c := range s.conds {
			if !slices.Contains(allConds, c) {
				t.Errorf("%s rests on %s, which allConds lacks", key, c.key())
			}
		}
	}
}
