package evaluate

import (
	"math"
	"testing"
	"testing/fstest"

	"skysheet/datasheet"
)

func TestEvaluateStack(t *testing.T) {
	// A clear film (R = 0, T = 1) over the flat panel leaves its optics as
	// they are: the stack's solar reflectance is the panel's 0.9 (constant
	// spectra: the weighted mean of a constant is that constant).
	fsys := baseFS()
	fsys["content/covered.md"] = &fstest.MapFile{Data: []byte("---\ntitle: Covered\nmaker: m\nstack:\n" +
		"  - {name: Film, spectra: [{file: covered/film.csv}], thickness_mm: 5, conductivity_w_mk: 0.03}\n" +
		"  - {material: flat}\nclaims:\n  - {figure: solar_reflectance, value: 0.9}\n---\n")}
	fsys["content/covered/film.csv"] = &fstest.MapFile{Data: []byte("wavelength_nm,R,T\n250,0,1\n30000,0,1\n")}
	ms, err := All(load(t, fsys), Options{})
	if err != nil {
		t.Fatal(err)
	}
	var m *Material
	for _, x := range ms {
		if x.Slug == "covered" {
			m = x
		}
	}
	if m == nil {
		t.Fatal("stack not evaluated")
	}
	f := m.Figures
	if math.Abs(float64(f.SolarReflectance)-0.9) > 1e-12 || f.Stack == nil || len(f.Stack.Layers) != 2 {
		t.Fatalf("solar reflectance %v, stack %+v", f.SolarReflectance, f.Stack)
	}
	if h := float64(f.Stack.HEffWm2K); math.Abs(h-3) > 1e-12 { // 1/(1/6 + 0.005/0.03), by hand
		t.Errorf("h_eff %g, want 3", h)
	}
	if f.Stack.Layers[1].Slug != "flat" || math.Abs(f.Conditions.HWm2K-3) > 1e-12 {
		t.Errorf("layers %+v, conditions h %g", f.Stack.Layers, f.Conditions.HWm2K)
	}
	if len(m.Verdicts) != 1 || m.Verdicts[0].Status != datasheet.Supported {
		t.Errorf("verdicts %+v", m.Verdicts)
	}
	var paths []string
	for _, in := range m.Inputs {
		paths = append(paths, in.Path)
	}
	if len(paths) != 4 || paths[0] != "content/covered.md" || paths[1] != "content/covered/film.csv" {
		t.Errorf("inputs %v", paths)
	}
}
