package site

import (
	"encoding/json"
	"regexp"
	"strings"
	"testing"

	"skysheet/datasheet"
)

// TestColorPages checks the colour on every kind of page of the test
// library: the swatch and its note at the head of a datasheet, the colour
// column of the index, the two charts with each point in the material's
// own colour, and the colour differences of a comparison.
func TestColorPages(t *testing.T) {
	out := renderTest(t, testLibrary(t), Options{})
	var cat struct {
		Materials []struct {
			Slug    string
			Figures datasheet.Figures
		}
	}
	if err := json.Unmarshal(out["catalog.json"], &cat); err != nil {
		t.Fatal(err)
	}
	index := string(out["index.html"])
	for _, m := range cat.Materials {
		hex := m.Figures.Color.Reflectance.SRGB
		if hex == "" {
			continue
		}
		page := string(out["m/"+m.Slug+"/index.html"])
		if !strings.Contains(page, `class="swatch big-swatch" style="background: `+hex+`"`) || !strings.Contains(page, "approximate on screen") {
			t.Errorf("%s: no swatch %s with its note on the datasheet", m.Slug, hex)
		}
		if !strings.Contains(index, `class="swatch cell-swatch" style="background: `+hex+`"`) {
			t.Errorf("%s: no swatch %s in the index row", m.Slug, hex)
		}
		if !strings.Contains(index, `data-slug="`+m.Slug+`"><title>`) || !strings.Contains(index, "fill:"+hex+";stroke:#3a424d") {
			t.Errorf("%s: no point in its own colour %s", m.Slug, hex)
		}
	}
	for _, id := range []string{`id="color-solar"`, `id="color-nir"`} {
		if !strings.Contains(index, id) {
			t.Errorf("index lacks the chart %s", id)
		}
	}
	cmp := string(out["compare/whites-vs-dark/index.html"])
	if n := len(regexp.MustCompile(`ΔE\*ab [0-9.]+, ΔE00 [0-9.]+`).FindAllString(cmp, -1)); n == 0 {
		t.Error("the comparison gives no colour difference")
	}
}
