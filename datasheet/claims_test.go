package datasheet

import (
	"bytes"
	"encoding/json"
	"fmt"
	"math"
	"slices"
	"strings"
	"testing"

	"skysheet/spectra"
)

// sample merges invented spectrum files given as name → content.
func sample(t *testing.T, files ...string) *spectra.Spectrum {
	t.Helper()
	var parts []*spectra.Spectrum
	for i := 0; i < len(files); i += 2 {
		s, err := spectra.Decode([]byte(files[i+1]), files[i])
		if err != nil {
			t.Fatal(err)
		}
		parts = append(parts, s)
	}
	s, err := spectra.Join(parts, spectra.SpliceOptions{})
	if err != nil {
		t.Fatal(err)
	}
	return s
}

// Invented spectra whose figures are known in closed form: a constant
// value's weighted mean is that value, whatever the weighting.
const (
	uvvis90   = "wavelength_nm,R\n280,0.9\n1000,0.9\n2400,0.9\n"             // R = 0.9, 280–2400 nm
	uvvis90at = "# angle of incidence: 8°\n" + uvvis90                       // the same, measured at 8°
	uvvis320  = "wavelength_nm,R\n320,0.9\n2400,0.9\n"                       // starts at 320 nm
	uvvis450  = "wavelength_nm,R\n450,0.9\n2400,0.9\n"                       // starts at 450 nm
	ftir95    = "wavelength_um,R\n2.5,0.05\n10,0.05\n25,0.05\n"              // A = 0.95 over 2.5–25 µm (opaque)
	ftir24    = "wavelength_um,R\n2.5,0.05\n24.5,0.05\n"                     // stops at 24.5 µm
	ftir20    = "wavelength_um,R\n2.5,0.05\n20,0.05\n"                       // stops at 20 µm
	rta       = "wavelength_nm,R,T,A\n280,0.9,0.05,0.1\n2500,0.9,0.05,0.1\n" // R+T+A = 1.05
	rt        = "wavelength_nm,R,T\n280,0.8,0.1\n2500,0.8,0.1\n"
	// A step: R = 0.9 over 280–2400 nm, R = 0.2 over 2600–4000 nm, no
	// data in between.
	step = "wavelength_nm,R\n280,0.9\n2400,0.9\n\n2600,0.2\n4000,0.2\n"
)

func TestJudge(t *testing.T) {
	def := DefaultConditions()
	// ∫ E dλ by the trapezoid rule on the table's own rows, read from the
	// embedded CSV apart from the package (the band limits are rows).
	nm, w := g173(t, 2)
	eg := func(lo, hi float64) float64 {
		var sum float64
		for i := 1; i < len(nm); i++ {
			if nm[i-1] >= lo && nm[i] <= hi {
				sum += (nm[i] - nm[i-1]) * (w[i] + w[i-1]) / 2
			}
		}
		return sum
	}
	// Two-level step over 280–4000 nm, mean over the covered part: closed
	// form with the ASTM G173-03 global tilt band integrals.
	stepMean := (0.9*eg(280, 2400) + 0.2*eg(2600, 4000)) / (eg(280, 2400) + eg(2600, 4000))
	// Expanded uncertainty with k = 2 of the default 0.005 and a rounding
	// of half a unit of the last digit over √3: JCGM 100:2008 eq. (10),
	// §6.2 and §F.2.2.1 (sections from memory), closed form.
	u2 := func(half float64) float64 { return 2 * math.Sqrt(0.005*0.005+half*half/3) }

	for _, tt := range []struct {
		name     string
		files    []string
		angle    string
		claim    Claim
		status   Status
		computed float64 // NaN: not checked
		allowed  float64 // NaN: not checked
		dflt     float64 // default-basis value; NaN means none
		pitfalls []PitfallCode
		reason   string // a part of the reason
		tol      float64
	}{
		{name: "supported within claimed tolerance",
			files: []string{"a.csv", uvvis90, "b.csv", ftir95},
			claim: Claim{Figure: "solar_reflectance", Value: 0.9, Tolerance: 0.01},
			// constant R = 0.9: closed form
			status: Supported, computed: 0.9, allowed: 0.01, dflt: math.NaN(), reason: "The spectra give 0.9000 against the claimed 0.9000 (difference 0.0000), within ±0.0100 (claimed tolerance).", tol: 1e-12},
		{name: "supported on the edge of the tolerance",
			files: []string{"a.csv", uvvis90},
			claim: Claim{Figure: "solar_reflectance", Value: 0.91, Tolerance: 0.01},
			// constant R = 0.9: closed form
			status: Supported, computed: 0.9, allowed: 0.01, dflt: math.NaN(), tol: 1e-12},
		{name: "not supported, claim above",
			files: []string{"a.csv", uvvis90},
			claim: Claim{Figure: "solar_reflectance", Value: 0.93, Tolerance: 0.01},
			// constant R = 0.9: closed form
			status: NotSupported, computed: 0.9, allowed: 0.01, dflt: math.NaN(),
			reason: "The spectra give 0.9000, 0.0300 below the claimed 0.9300, outside ±0.0100 (claimed tolerance).", tol: 1e-12},
		{name: "not supported, claim below",
			files: []string{"a.csv", uvvis90, "b.csv", ftir95},
			claim: Claim{Figure: "thermal_emittance", Value: 0.9, Tolerance: 0.02},
			// constant A = 1 − 0.05: closed form
			status: NotSupported, computed: 0.95, allowed: 0.02, dflt: math.NaN(), reason: "0.0500 above the claimed 0.9000", tol: 1e-12},
		{name: "supported within the default uncertainty",
			files: []string{"a.csv", uvvis90},
			claim: Claim{Figure: "solar_reflectance", Value: 0.905},
			// constant R: closed form; allowance: GUM closed form, last digit 0.001
			status: Supported, computed: 0.9, allowed: u2(0.0005), dflt: math.NaN(),
			reason: "(difference −0.0050), within ±0.0100 (expanded uncertainty; no tolerance was claimed)", tol: 1e-12},
		{name: "not supported outside the default uncertainty",
			files: []string{"a.csv", uvvis90},
			claim: Claim{Figure: "solar_reflectance", Value: 0.92},
			// allowance: GUM closed form, last digit 0.01
			status: NotSupported, computed: 0.9, allowed: u2(0.005), dflt: math.NaN(), tol: 1e-12},
		{name: "window emittance",
			files: []string{"a.csv", uvvis90, "b.csv", ftir95},
			claim: Claim{Figure: "window_emittance", Value: 0.95, Tolerance: 0.01},
			// constant A: closed form
			status: Supported, computed: 0.95, allowed: 0.01, dflt: math.NaN(), tol: 1e-12},
		{name: "stated temperature, same value on the default basis",
			files: []string{"a.csv", uvvis90, "b.csv", ftir95},
			claim: Claim{Figure: "thermal_emittance", Value: 0.95, Tolerance: 0.01, Basis: Basis{TemperatureK: 330}},
			// constant A: the same at any temperature, closed form
			status: Supported, computed: 0.95, allowed: 0.01, dflt: 0.95, tol: 1e-12},
		{name: "basis 280–4000 nm recomputed, default shown beside",
			files: []string{"a.csv", step},
			claim: Claim{Figure: "solar_reflectance", Value: 0.9, Tolerance: 0.003, Basis: Basis{SolarBandNM: []float64{280, 4000}}},
			// two-level step: closed form; default basis 280–2500 sees only 0.9
			status: NotSupported, computed: stepMean, allowed: 0.003, dflt: 0.9, tol: 1e-9},
		{name: "percentage for a fraction",
			files:  []string{"a.csv", uvvis90},
			claim:  Claim{Figure: "solar_reflectance", Value: 90},
			status: NotSupported, computed: 0.9, allowed: math.NaN(), dflt: math.NaN(), pitfalls: []PitfallCode{pitfallPercent},
			reason: "looks like a percentage", tol: 1e-12},
		{name: "fraction above 1, no percentage",
			files:  []string{"a.csv", uvvis90},
			claim:  Claim{Figure: "solar_reflectance", Value: 1.2, Tolerance: 0.5},
			status: NotSupported, computed: 0.9, allowed: 0.5, dflt: math.NaN(), reason: "out of range for a fraction", tol: 1e-12},
		{name: "percentage far from the computed value",
			files:  []string{"a.csv", uvvis90},
			claim:  Claim{Figure: "solar_reflectance", Value: 60},
			status: NotSupported, computed: 0.9, allowed: math.NaN(), dflt: math.NaN(), reason: "out of range for a fraction", tol: 1e-12},
		{name: "unknown figure",
			files:  []string{"a.csv", uvvis90},
			claim:  Claim{Figure: "solar_reflectence", Value: 0.9},
			status: CannotCheck, computed: math.NaN(), allowed: math.NaN(), dflt: math.NaN(),
			reason: `skysheet computes no figure "solar_reflectence" (did you mean solar_reflectance?)`},
		{name: "infrared data stop at 20 µm",
			files: []string{"a.csv", uvvis90, "b.csv", ftir20},
			claim: Claim{Figure: "thermal_emittance", Value: 0.95, Tolerance: 0.01},
			// coverage 88.4 %: Planck 300 K share of 2.5–20 in 2.5–25 µm
			status: CannotCheck, computed: 0.95, allowed: 0.01, dflt: math.NaN(), pitfalls: []PitfallCode{pitfallInfraredShort},
			reason: "cover only 88.4 %", tol: 1e-12},
		{name: "infrared data stop at 24.5 µm: judged, pitfall named",
			files:  []string{"a.csv", uvvis90, "b.csv", ftir24},
			claim:  Claim{Figure: "thermal_emittance", Value: 0.95, Tolerance: 0.01},
			status: Supported, computed: 0.95, allowed: 0.01, dflt: math.NaN(), pitfalls: []PitfallCode{pitfallInfraredShort}, tol: 1e-12},
		{name: "solar data start at 320 nm: judged, pitfall named",
			files:  []string{"a.csv", uvvis320},
			claim:  Claim{Figure: "solar_reflectance", Value: 0.9, Tolerance: 0.01},
			status: Supported, computed: 0.9, allowed: 0.01, dflt: math.NaN(), pitfalls: []PitfallCode{pitfallSolarLateStart}, tol: 1e-12},
		{name: "solar data start at 450 nm: cannot be checked",
			files:  []string{"a.csv", uvvis450},
			claim:  Claim{Figure: "solar_reflectance", Value: 0.9, Tolerance: 0.01},
			status: CannotCheck, computed: 0.9, allowed: 0.01, dflt: math.NaN(), pitfalls: []PitfallCode{pitfallSolarLateStart},
			reason: "at least 98 % is needed", tol: 1e-12},
		{name: "no infrared data at all",
			files:  []string{"a.csv", uvvis90},
			claim:  Claim{Figure: "thermal_emittance", Value: 0.95},
			status: CannotCheck, computed: math.NaN(), allowed: math.NaN(), dflt: math.NaN(), pitfalls: []PitfallCode{pitfallInfraredShort},
			reason: "do not reach the band 2.5–25 µm at all"},
		{name: "closure violation larger than the tolerance",
			files: []string{"a.csv", rta},
			claim: Claim{Figure: "solar_reflectance", Value: 0.9, Tolerance: 0.01},
			// |R+T+A−1| = 0.05 everywhere: closed form
			status: Supported, computed: 0.9, allowed: 0.01, dflt: math.NaN(), pitfalls: []PitfallCode{pitfallClosure}, tol: 1e-12},
		{name: "closure violation within a wide tolerance",
			files:  []string{"a.csv", rta},
			claim:  Claim{Figure: "solar_reflectance", Value: 0.9, Tolerance: 0.06},
			status: Supported, computed: 0.9, allowed: 0.06, dflt: math.NaN(), tol: 1e-12},
		{name: "transmittance without transmittance data",
			files:  []string{"a.csv", uvvis90},
			claim:  Claim{Figure: "solar_transmittance", Value: 0.05, Tolerance: 0.01},
			status: CannotCheck, computed: 0, allowed: 0.01, dflt: math.NaN(), reason: "No transmittance was measured", tol: 1e-12},
		{name: "transmittance measured",
			files: []string{"a.csv", rt},
			claim: Claim{Figure: "solar_transmittance", Value: 0.1, Tolerance: 0.01},
			// constant T = 0.1: closed form
			status: Supported, computed: 0.1, allowed: 0.01, dflt: math.NaN(), tol: 1e-12},
		{name: "absorptance from R and T",
			files: []string{"a.csv", rt},
			claim: Claim{Figure: "solar_absorptance", Value: 0.1, Tolerance: 0.01},
			// 1 − 0.8 − 0.1: closed form
			status: Supported, computed: 0.1, allowed: 0.01, dflt: math.NaN(), tol: 1e-12},
		{name: "angle far from the measured one",
			files:  []string{"a.csv", uvvis90at},
			claim:  Claim{Figure: "solar_reflectance", Value: 0.9, Tolerance: 0.01, Basis: Basis{AngleDeg: 60}},
			status: CannotCheck, computed: 0.9, allowed: 0.01, dflt: math.NaN(), reason: "measured at 8°", tol: 1e-12},
		{name: "angle from the front matter overrides",
			files: []string{"a.csv", uvvis90at}, angle: "near-normal (12°)",
			claim:  Claim{Figure: "solar_reflectance", Value: 0.9, Tolerance: 0.01, Basis: Basis{AngleDeg: 5}},
			status: Supported, computed: 0.9, allowed: 0.01, dflt: math.NaN(), tol: 1e-12},
		{name: "malformed claim",
			files:  []string{"a.csv", uvvis90},
			claim:  Claim{Figure: "solar_reflectance", Value: 0.9, Tolerance: -0.01},
			status: CannotCheck, computed: math.NaN(), allowed: math.NaN(), dflt: math.NaN(), reason: "malformed"},
		{name: "basis band reversed",
			files:  []string{"a.csv", uvvis90},
			claim:  Claim{Figure: "solar_reflectance", Value: 0.9, Basis: Basis{SolarBandNM: []float64{2500, 280}}},
			status: CannotCheck, computed: math.NaN(), allowed: math.NaN(), dflt: math.NaN(), reason: "malformed"},
		{name: "basis outside the solar table",
			files:  []string{"a.csv", uvvis90},
			claim:  Claim{Figure: "solar_reflectance", Value: 0.9, Basis: Basis{SolarBandNM: []float64{250, 2500}}},
			status: CannotCheck, computed: math.NaN(), allowed: math.NaN(), dflt: math.NaN(), reason: "cannot be computed"},
	} {
		t.Run(tt.name, func(t *testing.T) {
			v := judgeOne(tt.claim, JudgeInput{Spectrum: sample(t, tt.files...), Conditions: def, Angle: tt.angle})
			if v.Status != tt.status {
				t.Errorf("status = %v, want %v (reason: %s)", v.Status, tt.status, v.Reason)
			}
			near := func(name string, got Num, want float64) {
				if math.IsNaN(want) {
					return
				}
				if math.Abs(float64(got)-want) > tt.tol {
					t.Errorf("%s = %.12g, want %.12g", name, float64(got), want)
				}
			}
			near("computed", v.Computed, tt.computed)
			near("allowed", v.Allowed, tt.allowed)
			if !math.IsNaN(tt.computed) {
				near("difference", v.Difference, tt.computed-tt.claim.Value)
			}
			if math.IsNaN(tt.dflt) != math.IsNaN(float64(v.DefaultBasisValue)) {
				t.Errorf("default basis value = %v, want %v", v.DefaultBasisValue, tt.dflt)
			}
			near("default basis value", v.DefaultBasisValue, tt.dflt)
			var codes []PitfallCode
			for _, p := range v.Pitfalls {
				codes = append(codes, p.Code)
				if p.Text == "" {
					t.Errorf("pitfall %v without text", p.Code)
				}
			}
			if !slices.Equal(codes, tt.pitfalls) {
				t.Errorf("pitfalls = %v, want %v", v.Pitfalls, tt.pitfalls)
			}
			if !strings.Contains(v.Reason, tt.reason) {
				t.Errorf("reason %q does not contain %q", v.Reason, tt.reason)
			}
			if n := strings.Count(strings.TrimSuffix(v.Reason, "."), ". "); n > 0 || !strings.HasSuffix(v.Reason, ".") {
				t.Errorf("reason %q is not one sentence", v.Reason)
			}
		})
	}
}

func TestJudgeBasisWords(t *testing.T) {
	s := sample(t, "a.csv", step)
	v := judgeOne(Claim{Figure: "solar_reflectance", Value: 0.9, Basis: Basis{SolarBandNM: []float64{280, 4000}}},
		JudgeInput{Spectrum: s, Conditions: DefaultConditions()})
	if want := "solar band 280–4000 nm (stated), ASTM G173-03 global tilt spectrum (default)"; v.Basis != want {
		t.Errorf("basis = %q, want %q", v.Basis, want)
	}
	if !slices.Equal(v.Defaulted, []string{"solar_spectrum"}) {
		t.Errorf("defaulted = %v, want [solar_spectrum]", v.Defaulted)
	}
	if want := "On the default basis (280–2500 nm, ASTM G173-03 global tilt) the spectra give 0.9000."; v.BasisNote != want {
		t.Errorf("basis note = %q, want %q", v.BasisNote, want)
	}
	if v.Conditions.SolarBand != (spectra.Interval{Lo: 280, Hi: 4000}) {
		t.Errorf("conditions used = %v", v.Conditions.SolarBand)
	}

	// The direct spectrum named: recomputed under it; a constant gives the
	// same value on both bases (closed form), but the default is still shown.
	v = judgeOne(Claim{Figure: "solar_reflectance", Value: 0.9, Basis: Basis{SolarSpectrum: "direct"}},
		JudgeInput{Spectrum: sample(t, "a.csv", uvvis90), Conditions: DefaultConditions()})
	if !strings.Contains(v.Basis, "ASTM G173-03 direct + circumsolar spectrum (stated)") || math.Abs(float64(v.DefaultBasisValue)-0.9) > 1e-12 {
		t.Errorf("direct basis: %q, default value %v", v.Basis, v.DefaultBasisValue)
	}

	// Nothing stated: every relevant key comes from the defaults.
	v = judgeOne(Claim{Figure: "thermal_emittance", Value: 0.95}, JudgeInput{Spectrum: sample(t, "b.csv", ftir95), Conditions: DefaultConditions()})
	if !slices.Equal(v.Defaulted, []string{"thermal_band_um", "temperature_k"}) || v.BasisNote != "" {
		t.Errorf("defaulted = %v, note %q", v.Defaulted, v.BasisNote)
	}
}

func TestVerdictJSONRoundTrip(t *testing.T) {
	s := sample(t, "a.csv", uvvis320, "b.csv", ftir20)
	var vs []Verdict
	for _, c := range []Claim{
		{Figure: "solar_reflectance", Value: 0.95, Tolerance: 0.01, Basis: Basis{SolarBandNM: []float64{280, 4000}}, Source: "sheet (invented)"},
		{Figure: "thermal_emittance", Value: 95},
		{Figure: "nope", Value: 1},
	} {
		vs = append(vs, judgeOne(c, JudgeInput{Spectrum: s, Conditions: DefaultConditions()}))
	}
	a, err := json.Marshal(vs)
	if err != nil {
		t.Fatal(err)
	}
	var back []Verdict
	if err := json.Unmarshal(a, &back); err != nil {
		t.Fatal(err)
	}
	b, _ := json.Marshal(back)
	if !bytes.Equal(a, b) {
		t.Errorf("JSON does not round-trip:\n%s\n%s", a, b)
	}
	if back[1].Status != vs[1].Status || back[1].Pitfalls[0].Code != vs[1].Pitfalls[0].Code {
		t.Errorf("status or pitfall lost: %+v", back[1])
	}
	if !bytes.Contains(a, []byte(`"status":"not supported"`)) || !bytes.Contains(a, []byte(`"code":"percent-for-fraction"`)) {
		t.Errorf("JSON lacks the words: %s", a)
	}
}

func TestStatusText(t *testing.T) {
	for _, s := range []Status{Supported, NotSupported, CannotCheck} {
		b, err := s.MarshalText()
		if err != nil {
			t.Fatal(err)
		}
		var back Status
		if err := back.UnmarshalText(b); err != nil || back != s {
			t.Errorf("%v: read back %v, %v", s, back, err)
		}
	}
	var s Status
	if err := s.UnmarshalText([]byte("fine")); err == nil {
		t.Error("unknown status accepted")
	}
	if _, err := Status(7).MarshalText(); err == nil {
		t.Error("Status(7) marshalled")
	}
	var p PitfallCode
	if err := p.UnmarshalText([]byte("nope")); err == nil {
		t.Error("unknown pitfall accepted")
	}
}

func TestRoundingUncertainty(t *testing.T) {
	for _, tt := range []struct{ v, half float64 }{
		{0.95, 0.005}, {0.9, 0.05}, {0.955, 0.0005}, {120, 0.5}, {-3.25, 0.005},
	} {
		// half a unit of the last digit over √3: JCGM 100:2008 §F.2.2.1 (section from memory)
		want := tt.half / math.Sqrt(3)
		if got := roundingUncertainty(tt.v); math.Abs(got-want) > 1e-15 {
			t.Errorf("roundingUncertainty(%g) = %g, want %g", tt.v, got, want)
		}
	}
}

func FuzzJudge(f *testing.F) {
	f.Add("solar_reflectance", 0.9, 0.01, 280.0, 2500.0, "global", 300.0, 8.0)
	f.Add("thermal_emittance", 95.0, 0.0, 0.0, 0.0, "", 0.0, 0.0)
	f.Add("x", math.Inf(1), -1.0, 2500.0, 280.0, "sideways", -5.0, 100.0)
	f.Add("sri_low", 110.0, 0.0, 0.0, 0.0, "", 0.0, 0.0)
	f.Add("cooling_power_w_m2", 600.0, 0.0, 280.0, 4000.0, "direct", 0.0, 0.0)
	f.Add("equilibrium_delta_night_k", 300.0, 1.0, 0.0, 0.0, "", 320.0, 0.0)
	s, err := spectra.Join([]*spectra.Spectrum{mustDecode(f, "a.csv", uvvis320), mustDecode(f, "b.csv", ftir20)}, spectra.SpliceOptions{})
	if err != nil {
		f.Fatal(err)
	}
	f.Fuzz(func(t *testing.T, fig string, value, tol, lo, hi float64, sun string, k, angle float64) {
		c := Claim{Figure: fig, Value: value, Tolerance: tol, Basis: Basis{SolarSpectrum: sun, TemperatureK: k, AngleDeg: angle}}
		if lo != 0 || hi != 0 {
			c.Basis.SolarBandNM = []float64{lo, hi}
		}
		v := judgeOne(c, JudgeInput{Spectrum: s, Conditions: DefaultConditions()})
		if v.Status < Supported || v.Status > CannotCheck || v.Reason == "" {
			t.Fatalf("bad verdict %+v", v)
		}
		if v.Status != CannotCheck && (math.IsNaN(float64(v.Computed)) || math.IsNaN(float64(v.Difference))) {
			t.Fatalf("decided without a computed value: %+v", v)
		}
		if v.Status == Supported && !(math.Abs(float64(v.Difference)) <= float64(v.Allowed)+edge) {
			t.Fatalf("supported outside the allowance: %+v", v)
		}
		if _, err := json.Marshal(v); err != nil {
			t.Fatalf("verdict does not marshal: %v", err)
		}
	})
}

func mustDecode(f *testing.F, name, data string) *spectra.Spectrum {
	s, err := spectra.Decode([]byte(data), name)
	if err != nil {
		f.Fatal(err)
	}
	return s
}

func ExampleJudgeAll() {
	uvvis, _ := spectra.Decode([]byte("wavelength_nm,R\n280,0.93\n2500,0.93\n"), "invented-uvvis.csv")
	v := JudgeAll([]Claim{{Figure: "solar_reflectance", Value: 0.95, Tolerance: 0.01}},
		JudgeInput{Spectrum: uvvis, Conditions: DefaultConditions()})[0]
	fmt.Println(v.Status)
	fmt.Println(v.Reason)
	fmt.Println(v.Basis)
	// Output:
	// not supported
	// The spectra give 0.9300, 0.0200 below the claimed 0.9500, outside ±0.0100 (claimed tolerance).
	// solar band 280–2500 nm (default), ASTM G173-03 global tilt spectrum (default)
}

// TestVerdictWords checks the small formatting helpers the site and the
// check report share: the claim as written, the neutral marks, signed
// numbers and the counts.
func TestVerdictWords(t *testing.T) {
	for _, tt := range []struct{ got, want string }{
		{Claim{Value: 0.95, Tolerance: 0.01}.Text(), "0.95 ± 0.01"},
		{Claim{Value: 0.950}.Text(), "0.95"},
		{Claim{Value: 96}.Text(), "96"},
		{Supported.Mark() + NotSupported.Mark() + CannotCheck.Mark(), "=≠?"},
		{formatSigned(-0.0357, ""), "−0.0357"},
		{formatSigned(0.00001, ""), "0.0000"},
		{formatSigned(math.NaN(), ""), "n/a"},
		{formatSigned(12.34, "W/m²"), "+12.3 W/m²"},
	} {
		if tt.got != tt.want {
			t.Errorf("got %q, want %q", tt.got, tt.want)
		}
	}
	var c VerdictCounts
	c.Add(Verdict{Status: Supported}, Verdict{Status: NotSupported}, Verdict{Status: CannotCheck}, Verdict{Status: CannotCheck})
	if c != (VerdictCounts{Claims: 4, Supported: 1, NotSupported: 1, CannotCheck: 2}) {
		t.Errorf("counts %+v", c)
	}
}

// TestMissingData checks that a claim on data that lack what the figure
// rests on names the band that is missing: the thermal band for an SRI on
// UV-Vis-NIR data (the solar band is covered), the exchange band for a
// cooling figure, the solar band for an SRI on FTIR data; and that
// Figures.Missing says the same for a reader.
func TestMissingData(t *testing.T) {
	uv := sample(t, "a.csv", uvvis90)
	ir := sample(t, "b.csv", ftir95)
	c := DefaultConditions()
	for _, tt := range []struct {
		name    string
		s       *spectra.Spectrum
		figure  string
		reason  string
		missing string
	}{
		{"SRI without infrared", uv, "sri_medium", "The data do not reach the band 2.5–25 µm at all.", "no infrared data over 2.5–25 µm"},
		{"SRI without solar data", ir, "sri_low", "The data do not reach the band 280–2500 nm at all.", "no solar data over 280–2500 nm"},
		{"cooling without infrared", uv, "cooling_power_w_m2", "The data do not reach the band 2.5–100 µm at all.", "no infrared data over 2.5–100 µm"},
		{"night cooling without infrared", uv, "equilibrium_delta_night_k", "The data do not reach the band 2.5–100 µm at all.", "no infrared data over 2.5–100 µm"},
		// The infrared file reaches into 2.5–4 µm: 0.8 % of the sunlight.
		{"day cooling without solar data", ir, "cooling_power_w_m2",
			"The data cover only 0.8 % of the ASTM G173-03 global tilt power over 280–4000 nm, on which the absorbed sunlight rests (at least 90 % is needed), with the emittance held constant over 25–100 µm (16.2 % of the exchange band's blackbody power at 300 K).",
			"the data cover only 0.8 % of the ASTM G173-03 global tilt power over 280–4000 nm, on which the absorbed sunlight rests (at least 90 % is needed)"},
		{"emittance without infrared", uv, "thermal_emittance", "The data do not reach the band 2.5–25 µm at all.", "no infrared data over 2.5–25 µm"},
		{"reflectance without solar data", ir, "solar_reflectance", "The data do not reach the band 280–2500 nm at all.", "no solar data over 280–2500 nm"},
	} {
		t.Run(tt.name, func(t *testing.T) {
			v := JudgeAll([]Claim{{Figure: tt.figure, Value: 50}}, JudgeInput{Spectrum: tt.s, Conditions: c})[0]
			if v.Status != CannotCheck || v.Reason != tt.reason {
				t.Errorf("%v: %q, want %q", v.Status, v.Reason, tt.reason)
			}
			f, err := compute(tt.s, c)
			if err != nil {
				t.Fatal(err)
			}
			if got := f.Missing(tt.figure); got != tt.missing {
				t.Errorf("Missing = %q, want %q", got, tt.missing)
			}
		})
	}
	f, _ := compute(sample(t, "a.csv", uvvis90, "b.csv", ftir95), c)
	if got := f.Missing("sri_medium"); got != "" {
		t.Errorf("a figure with a value: Missing = %q", got)
	}
}
