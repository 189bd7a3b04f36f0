package datasheet

import (
	"fmt"
	"math"
	"strings"
	"testing"

	"skysheet/spectra"
)

// fresnelBrute is the hemispherical/normal emittance ratio of a smooth
// dielectric of index n written out independently: the Fresnel amplitude
// coefficients in terms of the angles of incidence and refraction
// (r_s = −sin(θ−θ_t)/sin(θ+θ_t), r_p = tan(θ−θ_t)/tan(θ+θ_t)), integrated
// over θ as 2 ∫ ε(θ) cos θ sin θ dθ by composite Simpson with 20000
// intervals.
func fresnelBrute(n float64) float64 {
	emit := func(th float64) float64 {
		if th == 0 {
			r := (n - 1) / (n + 1)
			return 1 - r*r
		}
		tt := math.Asin(math.Sin(th) / n)
		rs := -math.Sin(th-tt) / math.Sin(th+tt)
		rp := math.Tan(th-tt) / math.Tan(th+tt)
		if th == math.Pi/2 {
			rp = -1 // the limit at grazing incidence: R = 1
		}
		return 1 - (rs*rs+rp*rp)/2
	}
	const m = 20000
	h := (math.Pi / 2) / m
	var sum float64
	for i := 0; i <= m; i++ {
		th := float64(i) * h
		f := emit(th) * math.Cos(th) * math.Sin(th)
		switch {
		case i == 0 || i == m:
			sum += f
		case i%2 == 1:
			sum += 4 * f
		default:
			sum += 2 * f
		}
	}
	return 2 * sum * h / 3 / emit(0)
}

func TestHemisphericalRatio(t *testing.T) {
	for _, tt := range []struct {
		n, want, tol float64
		source       string
	}{
		{1.5, 0.95, 0.01, "about 0.95 for n ≈ 1.5 (from memory)"},
		{1.0001, 1, 1e-3, "no interface, no reflection: the ratio tends to 1"},
	} {
		if got := hemisphericalRatio(tt.n); math.Abs(got-tt.want) > tt.tol {
			t.Errorf("n %g: ratio %.5f, want %g ± %g (%s)", tt.n, got, tt.want, tt.tol, tt.source)
		}
	}
	// Fresnel equations, computed independently in the test.
	for _, n := range []float64{1.2, 1.35, 1.5, 1.8, 2.4, 3.4, 4.5} {
		got, want := hemisphericalRatio(n), fresnelBrute(n)
		t.Logf("n %g: ratio %.6f, brute force %.6f", n, got, want)
		if math.Abs(got-want) > 1e-6 {
			t.Errorf("n %g: ratio %.8f, brute-force Fresnel integral %.8f", n, got, want)
		}
	}
}

// TestEmittanceConversion checks the optional conversion: with a
// refractive index stated, the cooling figures of near-normal data are
// those of the emittance times the Fresnel ratio (recomputed here from a
// spectrum whose emittance was multiplied by it), the SRI takes the
// converted thermal emittance, the thermal emittance figure itself stays
// as measured, and every figure says its basis. Hemispherical data are
// not converted.
func TestEmittanceConversion(t *testing.T) {
	text := coarseSample(0.01, true)
	c := DefaultConditions()
	plain, err := compute(mustParse(t, text, "c.csv"), c)
	if err != nil {
		t.Fatal(err)
	}
	c.RefractiveIndex = On(1.5)
	conv, err := compute(mustParse(t, text, "c.csv"), c)
	if err != nil {
		t.Fatal(err)
	}
	ratio := fresnelBrute(1.5) // Fresnel equations, computed independently in the test
	// The same sample with its emittance A = 1 − R already multiplied by
	// the ratio, and no conversion.
	scaledText := func(d float64) string {
		s := mustParse(t, text, "c.csv")
		var b strings.Builder
		b.WriteString("wavelength_nm,R\n")
		for i, g := range s.Segments {
			if i > 0 {
				b.WriteString("\n")
			}
			for j, nm := range g.NM {
				fmt.Fprintf(&b, "%g,%.17g\n", nm, 1-ratio*(1-g.Values[spectra.R][j]-d))
			}
		}
		return b.String()
	}
	scaled, err := compute(mustParse(t, scaledText(0), "s.csv"), DefaultConditions())
	if err != nil {
		t.Fatal(err)
	}
	for _, key := range []string{"cooling_power_night_w_m2", "equilibrium_delta_night_k"} {
		a, _ := conv.Figure(key)
		b, _ := scaled.Figure(key)
		if math.Abs(float64(a.Value-b.Value)) > 1e-6 {
			t.Errorf("%s: converted %.8g, from the scaled emittance %.8g", key, float64(a.Value), float64(b.Value))
		}
		if !strings.Contains(a.Weighting, "hemispherical emittance (from near-normal, n 1.5)") {
			t.Errorf("%s: weighting %q does not name the conversion", key, a.Weighting)
		}
		if p, _ := plain.Figure(key); !strings.Contains(p.Weighting, "near-normal emittance") {
			t.Errorf("%s: weighting %q does not name the basis", key, p.Weighting)
		}
	}
	if got, want := float64(conv.SRI.ThermalEmittance), ratio*float64(plain.ThermalEmittance); math.Abs(got-want) > 1e-6 {
		t.Errorf("SRI emittance %.6f, want %.6f", got, want)
	}
	if got, want := float64(conv.SRI.Medium), SolarReflectanceIndex(float64(plain.SolarAbsorptance), ratio*float64(plain.ThermalEmittance), WindMedium); math.Abs(got-want) > 1e-4 {
		t.Errorf("SRI %.4f, want %.4f", got, want)
	}
	if conv.CoolingTerms.SolarWm2 != plain.CoolingTerms.SolarWm2 {
		t.Errorf("absorbed sunlight %v changed by the conversion (was %v): sunlight is not thermal emission", conv.CoolingTerms.SolarWm2, plain.CoolingTerms.SolarWm2)
	}
	if conv.ThermalEmittance != plain.ThermalEmittance {
		t.Errorf("thermal emittance %v changed by the conversion (was %v)", conv.ThermalEmittance, plain.ThermalEmittance)
	}
	if b := conv.EmittanceBasis; b.Data != spectra.EmittanceNearNormal || b.Figures != spectra.EmittanceHemispherical ||
		math.Abs(float64(b.Ratio)-ratio) > 1e-6 || !strings.Contains(b.Words(), "converted to hemispherical") {
		t.Errorf("basis %+v (%s)", b, b.Words())
	}
	if b := plain.EmittanceBasis; b.Data != spectra.EmittanceNearNormal || b.Figures != b.Data || !math.IsNaN(float64(b.Ratio)) ||
		b.From != "default for FTIR data" {
		t.Errorf("basis without conversion %+v", b)
	}
	// The uncertainty with the conversion: the figure recomputed from the
	// scaled emittance moved by ±u (JCGM 100:2008 5.2.2). The power is
	// linear in the emittance; the equilibrium's uncertainty is first order
	// (JCGM 100:2008 5.1.2), within a few 1e-5 of the half-difference here,
	// while a conversion left out would be some 5 % off.
	up, _ := compute(mustParse(t, scaledText(0.01), "s.csv"), DefaultConditions())
	dn, _ := compute(mustParse(t, scaledText(-0.01), "s.csv"), DefaultConditions())
	// Without sun: the scaled sample scales the solar band's absorptance too.
	for _, key := range []string{"cooling_power_night_w_m2", "equilibrium_delta_night_k"} {
		x, _ := conv.Figure(key)
		a, _ := up.Figure(key)
		b, _ := dn.Figure(key)
		want := math.Abs(float64(a.Value-b.Value)) / 2
		tol := 1e-6 * math.Max(1, want)
		if strings.HasPrefix(key, "equilibrium") {
			tol = 1e-3 * want
		}
		if x.Uncertainty == nil || math.Abs(float64(x.Uncertainty.Correlated)-want) > tol {
			t.Errorf("%s: together %+v, want %.8g", key, x.Uncertainty, want)
		}
	}
	// Hemispherical data are not converted.
	hemi, err := compute(mustParse(t, "# emittance: hemispherical\n"+text, "h.csv"), c)
	if err != nil {
		t.Fatal(err)
	}
	if b := hemi.EmittanceBasis; b.Data != spectra.EmittanceHemispherical || b.Figures != b.Data || !math.IsNaN(float64(b.Ratio)) ||
		b.From != "stated in h.csv" || hemi.CoolingPowerNightWm2 != plain.CoolingPowerNightWm2 {
		t.Errorf("hemispherical data: basis %+v, night power %v (near-normal unconverted %v)", b, hemi.CoolingPowerNightWm2, plain.CoolingPowerNightWm2)
	}
}

// TestEmittanceBasisPitfall checks the pitfall emittance-basis: named when
// a claim states the other basis, with both values (the other by the
// Fresnel ratio, computed independently in the test, or recomputed with
// the conversion), and not named when the bases agree.
func TestEmittanceBasisPitfall(t *testing.T) {
	s := mustParse(t, coarseSample(0, false), "c.csv")
	c := DefaultConditions()
	f, err := compute(s, c)
	if err != nil {
		t.Fatal(err)
	}
	cn := c
	cn.RefractiveIndex = On(1.5)
	fc, err := compute(s, cn)
	if err != nil {
		t.Fatal(err)
	}
	te, _ := f.Figure("thermal_emittance")
	night, _ := fc.Figure("cooling_power_night_w_m2")
	hemiTE := float64(te.Value) * fresnelBrute(1.5)
	for _, tt := range []struct {
		name   string
		claim  Claim
		want   bool
		inText []string
	}{
		{"hemispherical claim of the band emittance", Claim{Figure: "thermal_emittance", Value: 0.9, Basis: Basis{Emittance: "hemispherical"}}, true,
			[]string{"hemispherical emittance but the figure rests on near-normal emittance (default for FTIR data)",
				KindFraction.Format(float64(te.Value), ""), "about " + KindFraction.Format(hemiTE, "") + " hemispherical", "n 1.5, illustrative"}},
		{"hemispherical claim of a cooling power", Claim{Figure: "cooling_power_night_w_m2", Value: 90, Basis: Basis{Emittance: "hemispherical"}}, true,
			[]string{"about " + KindPower.Format(float64(night.Value), "W/m²") + " hemispherical"}},
		{"hemispherical claim with its index", Claim{Figure: "cooling_power_night_w_m2", Value: 90, Basis: Basis{Emittance: "hemispherical", RefractiveIndex: 1.5}}, false, nil},
		{"near-normal claim", Claim{Figure: "thermal_emittance", Value: 0.9, Basis: Basis{Emittance: "near-normal"}}, false, nil},
		{"no basis stated", Claim{Figure: "sri_medium", Value: 90}, false, nil},
		{"a solar figure", Claim{Figure: "solar_reflectance", Value: 0.9, Basis: Basis{Emittance: "hemispherical"}}, false, nil},
	} {
		t.Run(tt.name, func(t *testing.T) {
			v := judgeOne(tt.claim, JudgeInput{Spectrum: s, Conditions: c})
			var p *Pitfall
			for i := range v.Pitfalls {
				if v.Pitfalls[i].Code == pitfallEmittanceBasis {
					p = &v.Pitfalls[i]
				}
			}
			if (p != nil) != tt.want {
				t.Fatalf("pitfall %v, want %v (%+v)", p, tt.want, v.Pitfalls)
			}
			for _, w := range tt.inText {
				if !strings.Contains(p.Text, w) {
					t.Errorf("pitfall %q lacks %q", p.Text, w)
				}
			}
			if tt.claim.Basis.RefractiveIndex > 0 && v.Computed != night.Value {
				t.Errorf("computed %v, want the converted %v", v.Computed, night.Value)
			}
			if tt.claim.Basis.Emittance != "" && tt.claim.Figure != "solar_reflectance" &&
				!strings.Contains(v.Basis, tt.claim.Basis.Emittance+" emittance (stated)") {
				t.Errorf("basis %q does not name the claimed emittance", v.Basis)
			}
		})
	}
	if err := (Claim{Figure: "thermal_emittance", Value: 0.9, Basis: Basis{Emittance: "sideways"}}).Validate(); err == nil ||
		!strings.Contains(err.Error(), "want near-normal or hemispherical") {
		t.Errorf("bad basis: %v", err)
	}
	if err := (Claim{Figure: "thermal_emittance", Value: 0.9, Basis: Basis{RefractiveIndex: 0.8}}).Validate(); err == nil {
		t.Error("refractive index 0.8 accepted")
	}
}
