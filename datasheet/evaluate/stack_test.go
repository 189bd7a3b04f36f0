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

func TestEvaluateWorn(t *testing.T) {
	// Two fabrics against a reference over a skin-like surface: an opaque
	// one (T = 0 in the UV gives zero erythemal transmittance) and a clear
	// one (T = 1, R = 0: the skin's balance is that of bare skin, checked in
	// datasheet; here the plumbing gives the same numbers as the direct
	// calls).
	fsys := baseFS()
	mat := func(title, file string) []byte {
		return []byte("---\ntitle: " + title + "\nmaker: m\nspectra: [{file: " + file + "}]\n---\n")
	}
	fsys["content/clear.md"] = &fstest.MapFile{Data: mat("Clear", "clear.csv")}
	fsys["content/clear.csv"] = &fstest.MapFile{Data: []byte("wavelength_nm,R,T\n250,0,1\n30000,0,1\n")}
	fsys["content/opaque.md"] = &fstest.MapFile{Data: mat("Opaque", "opaque.csv")}
	fsys["content/opaque.csv"] = &fstest.MapFile{Data: []byte("wavelength_nm,R,T\n250,0.4,0\n30000,0.1,0\n")}
	fsys["content/skin.md"] = &fstest.MapFile{Data: mat("Skin", "skin.csv")}
	fsys["content/skin.csv"] = &fstest.MapFile{Data: []byte("wavelength_nm,R\n250,0.3\n30000,0.03\n")}
	fsys["content/wear.md"] = &fstest.MapFile{Data: []byte("---\ntitle: Wear\ncompare: [opaque, clear]\nreference: opaque\nskin: skin\n---\n")}
	fsys["content/uv.md"] = &fstest.MapFile{Data: []byte("---\ntitle: UV only\ncompare: [opaque, clear]\nreference: clear\n---\n")}
	fsys["content/plain.md"] = &fstest.MapFile{Data: []byte("---\ntitle: Plain\ncompare: [opaque, clear]\n---\n")}
	ms, err := All(load(t, fsys), Options{})
	if err != nil {
		t.Fatal(err)
	}
	by := map[string]*Material{}
	for _, m := range ms {
		by[m.Slug] = m
	}
	for _, slug := range []string{"flat", "skin"} {
		if by[slug].Worn != nil {
			t.Errorf("%s is in no comparison with a reference, yet has worn figures", slug)
		}
	}
	op, cl := by["opaque"].Worn, by["clear"].Worn
	if len(op) != 2 || len(cl) != 2 || op["plain"] != nil {
		t.Fatalf("worn: opaque %v, clear %v", op, cl)
	}
	if u := op["wear"].UV; u.Transmittance != 0 || !u.AboveCap {
		t.Errorf("opaque fabric: UV %+v, want T_ery 0", u)
	}
	if u := cl["uv"].UV; math.Abs(float64(u.Transmittance)-1) > 1e-12 || cl["uv"].Day != nil || cl["uv"].Skin != "" {
		t.Errorf("clear fabric without a skin: %+v", cl["uv"])
	}
	w := cl["wear"]
	if w.Day == nil || w.Night == nil || w.Skin != "skin" || w.Problem != "" {
		t.Fatalf("clear fabric over skin: %+v", w)
	}
	s := datasheet.SkinSettingFor(by["clear"].Conditions, by["clear"].Figures.Sky)
	f, err := datasheet.FabricOnSkin(by["clear"].Optics, by["skin"].Optics, s)
	if err != nil {
		t.Fatal(err)
	}
	day, _ := datasheet.SkinHeat(f, s)
	if w.Day.SkinGainWm2 != day.SkinGainWm2 || w.Night.SkinGainWm2 >= w.Day.SkinGainWm2 {
		t.Errorf("heat into skin: day %g (direct %g), night %g", w.Day.SkinGainWm2, day.SkinGainWm2, w.Night.SkinGainWm2)
	}
}
