package site

import (
	"encoding/json"
	"strings"
	"testing"
	"testing/fstest"

	"skysheet/datasheet/library"
)

func TestStackPage(t *testing.T) {
	fsys := fstest.MapFS{
		"skysheet.yaml":      {Data: []byte("title: Stacks (invented)\n")},
		"content/panel.md":   {Data: []byte("---\ntitle: Panel (invented)\nmaker: m\nspectra: [{file: panel.csv}]\n---\n")},
		"content/panel.csv":  {Data: []byte("wavelength_nm,R\n250,0.95\n2500,0.95\n2600,0.1\n30000,0.1\n")},
		"content/covered.md": {Data: []byte("---\ntitle: Covered panel (invented)\nmaker: m\nstack:\n  - {name: Foam cover, spectra: [{file: foam.csv}], thickness_mm: 5, conductivity_w_mk: 0.03}\n  - {material: panel}\n---\n")},
		"content/foam.csv":   {Data: []byte("wavelength_nm,R,T\n250,0.6,0.35\n30000,0.05,0.9\n")},
		"content/compare.md": {Data: []byte("---\ntitle: Panels\ncompare: [covered, panel]\nreference: panel\n---\n")},
	}
	lib, err := library.Load(fsys)
	if err != nil {
		t.Fatal(err)
	}
	out := renderTest(t, lib, Options{})
	page := string(out["m/covered/index.html"])
	for _, want := range []string{
		`Layers, top first`,
		`<th scope="row">1. Foam cover</th><td class="num">5 mm</td><td class="num">0.03 W m⁻¹ K⁻¹</td>`,
		`<th scope="row">2. <a href="../../m/panel/index.html">Panel (invented)</a></th>`,
		`h_eff 3.00 W m⁻² K⁻¹ through the layers above, h 6 W m⁻² K⁻¹ without them`,
		`With the layers above`,
		`Computed from the spectra of its layers`,
	} {
		if !strings.Contains(page, want) {
			t.Errorf("the stack's page lacks %q", want)
		}
	}
	if !strings.Contains(string(out["m/covered/spectrum.csv"]), "R,T,A") {
		t.Errorf("spectrum.csv of the stack:\n%.200s", out["m/covered/spectrum.csv"])
	}
	var cat struct {
		Materials []struct {
			Slug  string `json:"slug"`
			Stack []struct {
				Name, Slug, Page string
				ThicknessMM      *float64 `json:"thickness_mm"`
			} `json:"stack"`
		} `json:"materials"`
		Comparisons []struct {
			Reference string `json:"reference"`
		} `json:"comparisons"`
	}
	if err := json.Unmarshal(out["catalog.json"], &cat); err != nil {
		t.Fatal(err)
	}
	for _, m := range cat.Materials {
		switch m.Slug {
		case "covered":
			if len(m.Stack) != 2 || m.Stack[0].Name != "Foam cover" || m.Stack[0].ThicknessMM == nil || *m.Stack[0].ThicknessMM != 5 ||
				m.Stack[1].Slug != "panel" || m.Stack[1].Page != "m/panel/index.html" {
				t.Errorf("catalog stack %+v", m.Stack)
			}
		case "panel":
			if m.Stack != nil {
				t.Errorf("a measured material lists layers: %+v", m.Stack)
			}
		}
	}
	if len(cat.Comparisons) != 1 || cat.Comparisons[0].Reference != "panel" {
		t.Errorf("catalog comparisons %+v", cat.Comparisons)
	}
	checkLinks(t, out)
}

func TestReferencePage(t *testing.T) {
	mat := func(title, file string) *fstest.MapFile {
		return &fstest.MapFile{Data: []byte("---\ntitle: " + title + "\nmaker: m\nspectra: [{file: " + file + "}]\n---\n")}
	}
	fsys := fstest.MapFS{
		"skysheet.yaml":       {Data: []byte("title: Textiles (invented)\n")},
		"content/cotton.md":   mat("Cotton-like (invented)", "cotton.csv"),
		"content/cotton.csv":  {Data: []byte("wavelength_nm,R,T\n250,0.3,0.05\n2500,0.5,0.3\n30000,0.05,0.05\n")},
		"content/cool.md":     mat("Cool weave (invented)", "cool.csv"),
		"content/cool.csv":    {Data: []byte("wavelength_nm,R,T\n250,0.6,0\n2500,0.7,0.2\n30000,0.05,0.4\n")},
		"content/skin.md":     mat("Skin-like surface (invented)", "skin.csv"),
		"content/skin.csv":    {Data: []byte("wavelength_nm,R\n250,0.3\n30000,0.03\n")},
		"content/textiles.md": {Data: []byte("---\ntitle: Textiles\ncompare: [cotton, cool]\nreference: cotton\nskin: skin\n---\n")},
	}
	lib, err := library.Load(fsys)
	if err != nil {
		t.Fatal(err)
	}
	out := renderTest(t, lib, Options{})
	page := string(out["compare/textiles/index.html"])
	for _, want := range []string{
		"Against the reference: Cotton-like (invented)",
		`<th scope="row">Solar reflectance</th><td class="num">`,
		`<span class="sub">reference</span>`,
		`<span class="sub">Δ &#43;`,
		"UV transmittance, erythemally weighted",
		"UV protection factor implied",
		"Heat reaching the skin, sun",
		"Fabric temperature, night",
		`<a href="../../m/skin/index.html">Skin-like surface (invented)</a>`,
		"no substitute for thermal-comfort testing or UV-protection testing",
		"People in heat need shade, water and rest",
		"not a rating",
		"Skin held at 307.15 K", // the balance's assumptions
	} {
		if !strings.Contains(page, want) {
			t.Errorf("the comparison lacks %q", want)
		}

	}
	checkLinks(t, out)
}
