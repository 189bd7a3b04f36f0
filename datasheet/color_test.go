package datasheet

import (
	"encoding/json"
	"math"
	"strings"
	"testing"
)

// lstarOf is L* of a constant reflector ρ (Y/Yn = ρ), CIE 015:2004
// §8.2.1: 116∛ρ − 16 above (6/29)³.
func lstarOf(rho float64) float64 { return 116*math.Cbrt(rho) - 16 }

// de2000Lightness is CIEDE2000 between two neutral colours (a* = b* = 0),
// where only the lightness term is left: ΔL′ / S_L with S_L = 1 +
// 0.015 (L̄′ − 50)² / √(20 + (L̄′ − 50)²) (CIE 142-2001; Sharma, Wu and
// Dalal 2005, eq. 17), kL = 1.
func de2000Lightness(l1, l2 float64) float64 {
	m := (l1+l2)/2 - 50
	return math.Abs(l2-l1) / (1 + 0.015*m*m/math.Sqrt(20+m*m))
}

func TestColorFigures(t *testing.T) {
	grey := "wavelength_nm,R\n280,0.5\n2400,0.5\n"
	f, err := compute(sample(t, "a.csv", grey, "b.csv", ftir90), DefaultConditions())
	if err != nil {
		t.Fatal(err)
	}
	lab, _ := f.Figure("color_lab")
	xy, _ := f.Figure("color_xy")
	lum, _ := f.Figure("luminous_reflectance")
	// A constant reflector 0.5: L* = 116∛0.5 − 16, a* = b* = 0, Y/100 =
	// 0.5 (CIE 015:2004 §8.2.1), and the chromaticity of D65, x = 0.31271,
	// y = 0.32902 (CIE 015:2004, from memory).
	want := []float64{lstarOf(0.5), 0, 0}
	if len(lab.Components) != 3 {
		t.Fatalf("color_lab components %v", lab.Components)
	}
	for i, w := range want {
		if math.Abs(float64(lab.Components[i])-w) > 1e-9 {
			t.Errorf("color_lab[%d] = %.12f, want %.12f", i, float64(lab.Components[i]), w)
		}
	}
	if lab.Value != lab.Components[0] || lab.Kind() != KindLab || lab.Coverage != 1 || lab.Reason != "" {
		t.Errorf("color_lab = %+v", lab)
	}
	if len(xy.Components) != 2 || math.Abs(float64(xy.Components[0])-0.31271) > 1e-4 || math.Abs(float64(xy.Components[1])-0.32902) > 1e-4 {
		t.Errorf("color_xy = %v, want D65 (0.31271, 0.32902) ± 1e-4", xy.Components)
	}
	if math.Abs(float64(lum.Value)-0.5) > 1e-12 || lum.Kind() != KindFraction {
		t.Errorf("luminous_reflectance = %v (%v), want 0.5", lum.Value, lum.Kind())
	}
	if got, want := lab.Text(), "L* 76.07, a* 0.00, b* 0.00"; got != want {
		t.Errorf("Text() = %q, want %q", got, want)
	}
	c := f.Color.Reflectance
	if c.SRGB != "#bcbcbc" || c.Clipped || f.Color.Transmittance != nil { // 1.055·0.5^(1/2.4) − 0.055 = 0.7354, ·255 → 188
		t.Errorf("colour %+v, transmittance %+v", c, f.Color.Transmittance)
	}
	if _, ok := f.Figure("luminous_transmittance"); ok {
		t.Error("an opaque sample has a luminous transmittance")
	}
	// The JSON carries the components and reads back.
	data, err := json.Marshal(lab)
	if err != nil {
		t.Fatal(err)
	}
	var back Figure
	if err := json.Unmarshal(data, &back); err != nil || len(back.Components) != 3 || back.Components[0] != lab.Components[0] {
		t.Errorf("JSON %s reads back as %+v (%v)", data, back, err)
	}
}

func TestColorTransmittance(t *testing.T) {
	// A film: R 0.1, T 0.8 everywhere: its transmitted colour is a grey of
	// L* = 116∛0.8 − 16.
	f, err := compute(sample(t, "a.csv", "wavelength_nm,R,T\n280,0.1,0.8\n2400,0.1,0.8\n"), DefaultConditions())
	if err != nil {
		t.Fatal(err)
	}
	tl, ok := f.Figure("transmitted_color_lab")
	if !ok || math.Abs(float64(tl.Value)-lstarOf(0.8)) > 1e-9 {
		t.Errorf("transmitted_color_lab = %+v, want L* %.6f", tl, lstarOf(0.8))
	}
	if lt, _ := f.Figure("luminous_transmittance"); math.Abs(float64(lt.Value)-0.8) > 1e-12 {
		t.Errorf("luminous_transmittance = %v, want 0.8", lt.Value)
	}
	if r, _ := f.Figure("luminous_reflectance"); math.Abs(float64(r.Value)-0.1) > 1e-12 {
		t.Errorf("luminous_reflectance = %v, want 0.1", r.Value)
	}
	if f.Color.Transmittance == nil || f.Color.Transmittance.Of != "transmittance" {
		t.Errorf("colour of the transmittance %+v", f.Color.Transmittance)
	}
}

func TestColorNotCovered(t *testing.T) {
	f, err := compute(sample(t, "a.csv", "wavelength_nm,R\n400,0.5\n2400,0.5\n"), DefaultConditions())
	if err != nil {
		t.Fatal(err)
	}
	for _, key := range []string{"color_lab", "color_xy", "luminous_reflectance"} {
		x, _ := f.Figure(key)
		if !math.IsNaN(float64(x.Value)) || !strings.Contains(x.Reason, "380–400 nm") || !strings.Contains(x.Reason, "no extrapolation") {
			t.Errorf("%s = %v, reason %q", key, x.Value, x.Reason)
		}
		if f.Missing(key) != x.Reason {
			t.Errorf("Missing(%s) = %q", key, f.Missing(key))
		}
		// The share of ȳ·D65 weight that 400–780 nm holds (between 0.99
		// and 1: the 380–400 nm tail carries almost no luminous weight).
		if cov := float64(x.Coverage); !(cov > 0.99 && cov < 1) {
			t.Errorf("%s coverage %g", key, cov)
		}
	}
	if c := f.Color.Reflectance; c.SRGB != "" || c.Reason == "" {
		t.Errorf("colour %+v", c)
	}
	vs := JudgeAll([]Claim{{Figure: "color_lab", Values: []float64{50, 0, 0}}, {Figure: "luminous_reflectance", Value: 0.5}},
		JudgeInput{Spectrum: sample(t, "a.csv", "wavelength_nm,R\n400,0.5\n2400,0.5\n"), Conditions: DefaultConditions()})
	for _, v := range vs {
		if v.Status != CannotCheck || !strings.Contains(v.Reason, "380–400 nm") {
			t.Errorf("%s: %v, %q", v.Claim.Figure, v.Status, v.Reason)
		}
	}
}

func TestJudgeColor(t *testing.T) {
	grey := sample(t, "a.csv", "wavelength_nm,R\n280,0.5\n2400,0.5\n")
	l := lstarOf(0.5) // 76.0693…
	for _, tt := range []struct {
		name   string
		claim  Claim
		status Status
		diff   float64 // the colour difference, from a closed form
		reason string
	}{
		{"exact, ΔE*ab", Claim{Figure: "color_lab", Values: []float64{l, 0, 0}, Tolerance: 1}, Supported, 0, "ΔE*ab 0.00"},
		// √(0.3² + 0.4²) = 0.5 (a 3-4-5 triangle).
		{"near, ΔE*ab", Claim{Figure: "color_lab", Values: []float64{l, 0.3, 0.4}, Tolerance: 1}, Supported, 0.5, "within the allowed 1.00 (claimed tolerance)"},
		{"darker, ΔE*ab", Claim{Figure: "color_lab", Values: []float64{l - 3, 0, 0}, Tolerance: 2}, NotSupported, 3, "ΔE*ab 3.00, outside"},
		{"darker, ΔE00", Claim{Figure: "color_lab", Values: []float64{l - 3, 0, 0}, Tolerance: 2.5, DeltaE: DeltaE2000}, Supported,
			de2000Lightness(l, l-3), "ΔE00"},
		{"darker, cie76 named", Claim{Figure: "color_lab", Values: []float64{l - 3, 0, 0}, Tolerance: 2, DeltaE: DeltaE76}, NotSupported, 3, "ΔE*ab"},
		// No tolerance: 2·√(1² + (0.05/√3)²) for values given to 0.1.
		{"default allowance", Claim{Figure: "color_lab", Values: []float64{76.1, 1.9, 0}}, Supported, math.Hypot(0.0307, 1.9),
			"expanded uncertainty; no tolerance was claimed"},
		{"chromaticity", Claim{Figure: "color_xy", Values: []float64{0.3127, 0.3290}, Tolerance: 0.001}, Supported, math.NaN(), "Δxy"},
		{"chromaticity far", Claim{Figure: "color_xy", Values: []float64{0.45, 0.40}, Tolerance: 0.01}, NotSupported, math.NaN(), "outside"},
		{"L* below 0", Claim{Figure: "color_lab", Values: []float64{-5, 0, 0}, Tolerance: 1}, NotSupported, math.NaN(), "below L* = 0"},
		{"xy off the diagram", Claim{Figure: "color_xy", Values: []float64{0.7, 0.5}}, NotSupported, math.NaN(), "outside the chromaticity diagram"},
		{"one value for a colour", Claim{Figure: "color_lab", Value: 50}, CannotCheck, math.NaN(), "want the 3 values L*, a*, b*"},
		{"values for a fraction", Claim{Figure: "solar_reflectance", Values: []float64{0.5, 0.5}}, CannotCheck, math.NaN(), "states one value"},
		{"unknown delta_e", Claim{Figure: "color_lab", Values: []float64{50, 0, 0}, DeltaE: "cmc"}, CannotCheck, math.NaN(), "want cie76 or ciede2000"},
		{"delta_e for xy", Claim{Figure: "color_xy", Values: []float64{0.3, 0.3}, DeltaE: DeltaE2000}, CannotCheck, math.NaN(), "delta_e is for L*a*b*"},
		{"transmittance of an opaque sample", Claim{Figure: "luminous_transmittance", Value: 0.5}, CannotCheck, math.NaN(), "No transmittance was measured"},
		{"luminous reflectance", Claim{Figure: "luminous_reflectance", Value: 0.5, Tolerance: 0.01}, Supported, math.NaN(), "0.5000"},
	} {
		t.Run(tt.name, func(t *testing.T) {
			v := JudgeAll([]Claim{tt.claim}, JudgeInput{Spectrum: grey, Conditions: DefaultConditions()})[0]
			if v.Status != tt.status || !strings.Contains(v.Reason, tt.reason) {
				t.Errorf("%v: %s; want %v, %q", v.Status, v.Reason, tt.status, tt.reason)
			}
			if !math.IsNaN(tt.diff) && math.Abs(float64(v.Difference)-tt.diff) > 1e-4 {
				t.Errorf("difference %.6f, want %.6f", float64(v.Difference), tt.diff)
			}
		})
	}
}

func TestColorClaimText(t *testing.T) {
	for _, tt := range []struct {
		c    Claim
		want string
	}{
		{Claim{Figure: "color_lab", Values: []float64{52, 24.5, 18}, Tolerance: 2, DeltaE: DeltaE2000}, "L* 52, a* 24.5, b* 18, ΔE00 ≤ 2"},
		{Claim{Figure: "color_lab", Values: []float64{52, 24.5, 18}}, "L* 52, a* 24.5, b* 18"},
		{Claim{Figure: "color_xy", Values: []float64{0.41, 0.36}, Tolerance: 0.005}, "x 0.41, y 0.36, Δxy ≤ 0.005"},
		{Claim{Figure: "solar_reflectance", Value: 0.9, Tolerance: 0.01}, "0.9 ± 0.01"},
	} {
		if got := tt.c.Text(); got != tt.want {
			t.Errorf("Text() = %q, want %q", got, tt.want)
		}
	}
	data, err := json.Marshal(Claim{Figure: "color_lab", Values: []float64{52, 24.5, 18}, DeltaE: DeltaE2000})
	if err != nil || !strings.Contains(string(data), `"values":[52,24.5,18]`) || !strings.Contains(string(data), `"delta_e":"ciede2000"`) {
		t.Errorf("JSON %s (%v)", data, err)
	}
}

func TestColorDifference(t *testing.T) {
	grey := func(rho string) *Figures {
		f, err := compute(sample(t, "a.csv", "wavelength_nm,R\n280,"+rho+"\n2400,"+rho+"\n"), DefaultConditions())
		if err != nil {
			t.Fatal(err)
		}
		return f
	}
	a, b := grey("0.5"), grey("0.2")
	de76, de00, ok := ColorDifference(a, b)
	// Two greys differ only in L*: ΔE*ab = |ΔL*|, and ΔE00 its lightness
	// term (closed forms above).
	l1, l2 := lstarOf(0.5), lstarOf(0.2)
	if !ok || math.Abs(de76-math.Abs(l1-l2)) > 1e-9 || math.Abs(de00-de2000Lightness(l1, l2)) > 1e-9 {
		t.Errorf("ΔE = %g, %g (%v), want %g, %g", de76, de00, ok, math.Abs(l1-l2), de2000Lightness(l1, l2))
	}
	short, err := compute(sample(t, "a.csv", "wavelength_nm,R\n400,0.5\n2400,0.5\n"), DefaultConditions())
	if err != nil {
		t.Fatal(err)
	}
	if _, _, ok := ColorDifference(a, short); ok {
		t.Error("a colour difference with a sample that has no colour")
	}
}
