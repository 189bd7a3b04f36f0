package datasheet

import (
	"errors"
	"math"
	"strings"
	"testing"

	"skysheet/spectra"
)

// emitterCSV is a selective emitter: reflective in the sun, black in the
// 8–13 µm window, half grey elsewhere in the infrared.
const emitterCSV = "wavelength_nm,R\n250,0.96\n2500,0.96\n2600,0.5\n7900,0.5\n8000,0.02\n13000,0.02\n13100,0.5\n30000,0.5\n"

func TestComputeStackClearCover(t *testing.T) {
	// A cover with T = 1, R = 0 everywhere changes no optical figure; with
	// 5 mm at k = 0.03 under h = 6 it halves h: by hand 1/(1/6 + 0.005/0.03)
	// = 3 W m⁻² K⁻¹. The stack's figures are then the emitter's own under
	// h = 3, computed here by Compute on the emitter alone.
	c := DefaultConditions()
	emitter := mustParse(t, emitterCSV, "emitter.csv")
	clear := mustParse(t, "wavelength_nm,R,T\n250,0,1\n30000,0,1\n", "clear.csv")
	st, err := ComputeStack([]Layer{
		{Name: "Clear cover", Sample: clear, Conductor: &Conductor{ThicknessM: 0.005, ConductivityWmK: 0.03}},
		{Name: "Emitter", Slug: "emitter", Sample: emitter},
	}, c)
	if err != nil {
		t.Fatal(err)
	}
	f := st.Figures
	if got := float64(f.Stack.HEffWm2K); math.Abs(got-3) > 1e-12 {
		t.Errorf("h_eff %.15g, want 3 (by hand)", got)
	}
	c3 := c
	c3.HWm2K = 3
	alone, err := Compute(emitter, resolved(emitter, c), c3)
	if err != nil {
		t.Fatal(err)
	}
	bare, err := Compute(emitter, resolved(emitter, c), c)
	if err != nil {
		t.Fatal(err)
	}
	for _, key := range []string{"solar_reflectance", "solar_transmittance", "thermal_emittance", "window_emittance",
		"cooling_power_w_m2", "cooling_power_night_w_m2", "equilibrium_delta_k", "equilibrium_delta_night_k"} {
		got, _ := f.Figure(key)
		want, _ := alone.Figure(key)
		if d := math.Abs(float64(got.Value - want.Value)); !(d <= 1e-9) {
			t.Errorf("%s: stack %.12g, emitter alone under h_eff %.12g", key, float64(got.Value), float64(want.Value))
		}
	}
	u := f.Stack.Uncovered
	if u.EquilibriumDeltaK != bare.EquilibriumDeltaK || u.CoolingPowerWm2 != bare.CoolingPowerWm2 || u.EquilibriumDeltaNightK != bare.EquilibriumDeltaNightK {
		t.Errorf("uncovered %+v, emitter alone under h: %v %v %v", u, bare.CoolingPowerWm2, bare.EquilibriumDeltaK, bare.EquilibriumDeltaNightK)
	}
	if !(f.EquilibriumDeltaNightK > bare.EquilibriumDeltaNightK) {
		t.Errorf("a wind-blocking clear cover should let the emitter settle colder at night: %v vs %v", f.EquilibriumDeltaNightK, bare.EquilibriumDeltaNightK)
	}
	if l := f.Stack.Layers; len(l) != 2 || l[0].SolarAbsorbed != 0 || l[0].ThicknessMM != 5 || l[1].Slug != "emitter" || !math.IsNaN(float64(l[1].ThicknessMM)) {
		t.Errorf("layers %+v", l)
	}
	all := strings.Join(f.Assumptions, " ")
	for _, want := range []string{"h_eff = 1/(1/h + Σ dᵢ/kᵢ) = 3 W", "one surface at one temperature", "same from both sides"} {
		if !strings.Contains(all, want) {
			t.Errorf("assumptions do not say %q", want)
		}
	}
}

func TestComputeStackAbsorbedShares(t *testing.T) {
	// A grey cover R = 0.1, T = 0.7 over an opaque mirror-ish substrate
	// R₂ = 0.9: R = 0.1 + 0.49·0.9/(1 − 0.09) = 0.1 + 0.441/0.91 (two-layer
	// formula, by hand); the layers' absorbed shares add up to 1 − R.
	c := DefaultConditions()
	cover := mustParse(t, "wavelength_nm,R,T\n250,0.1,0.7\n30000,0.1,0.7\n", "cover.csv")
	sub := mustParse(t, "wavelength_nm,R\n250,0.9\n30000,0.9\n", "sub.csv")
	st, err := ComputeStack([]Layer{{Name: "Cover", Sample: cover}, {Name: "Substrate", Sample: sub}}, c)
	if err != nil {
		t.Fatal(err)
	}
	f := st.Figures
	want := 0.1 + 0.441/0.91
	if math.Abs(float64(f.SolarReflectance)-want) > 1e-12 {
		t.Errorf("solar reflectance %.15g, want %.15g", float64(f.SolarReflectance), want)
	}
	var sum float64
	for _, l := range f.Stack.Layers {
		sum += float64(l.SolarAbsorbed)
	}
	if math.Abs(sum-float64(f.SolarAbsorptance)) > 1e-12 {
		t.Errorf("layers absorb %.15g in all, the stack %.15g", sum, float64(f.SolarAbsorptance))
	}
	// Cover: 0.2 (1 + 0.7·0.9/0.91); substrate: 0.7·0.1/0.91 (by hand, as in
	// spectra's two-layer test).
	if a := float64(f.Stack.Layers[0].SolarAbsorbed); math.Abs(a-0.2*(1+0.63/0.91)) > 1e-12 {
		t.Errorf("cover absorbs %.15g", a)
	}
	if a := float64(f.Stack.Layers[1].SolarAbsorbed); math.Abs(a-0.07/0.91) > 1e-12 {
		t.Errorf("substrate absorbs %.15g", a)
	}
	if h := float64(f.Stack.HEffWm2K); h != 6 || !strings.Contains(strings.Join(f.Assumptions, " "), "No layer gives a thickness") {
		t.Errorf("no conducting layer: h_eff %g", h)
	}
	if got, want := f.Origins.Text(), "R computed from the layers; T computed from the layers; A derived as A = 1 − R − T"; got != want {
		t.Errorf("origins %q, want %q", got, want)
	}
	if st.Sample.Len() == 0 || !st.Sample.Has(0) {
		t.Error("the stack's spectrum is empty")
	}
}

func TestComputeStackErrors(t *testing.T) {
	c := DefaultConditions()
	a := mustParse(t, emitterCSV, "a.csv")
	if _, err := ComputeStack([]Layer{{Sample: a}}, c); !errors.Is(err, ErrSystemInput) {
		t.Errorf("one layer: %v", err)
	}
	if _, err := ComputeStack([]Layer{{Sample: a, Conductor: &Conductor{ThicknessM: 0.001}}, {Sample: a}}, c); !errors.Is(err, ErrSystemInput) {
		t.Errorf("zero conductivity: %v", err)
	}
	far := mustParse(t, "wavelength_nm,R\n40000,0.5\n50000,0.5\n", "far.csv")
	if _, err := ComputeStack([]Layer{{Sample: a}, {Sample: far}}, c); err == nil {
		t.Error("layers without a common range: no error")
	}
}

// resolved resolves s with c's closure tolerance.
func resolved(s *spectra.Spectrum, c Conditions) spectra.Optics {
	return spectra.Resolve(s, c.ClosureTol)
}
