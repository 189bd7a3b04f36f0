package site

import (
	"encoding/json"
	"os"
	"strings"
	"testing"

	"skysheet/datasheet/library"
)

// TestSeriesPages renders the demo library, whose two metal-backed
// materials name the invented inland series: each gets a series page with
// its three charts and twelve months, linked from its datasheet; the
// comparison of the two shows the totals side by side; catalog.json has the
// totals and months with the series' name and hash, not the days.
func TestSeriesPages(t *testing.T) {
	lib, err := library.Load(os.DirFS("../.."))
	if err != nil {
		t.Fatal(err)
	}
	out := renderTest(t, lib, Options{})
	for _, slug := range []string{"sf-50", "ql-se3"} {
		page := string(out["m/"+slug+"/weather.html"])
		for _, want := range []string{`id="chart-daily"`, `id="chart-day-power"`, `id="chart-day-temp"`, "<th scope=\"row\">2025-07</th>",
			"Whole series", "thermal mass is neglected", "not a measurement", "licensed design", "Dravenholt Basin"} {
			if !strings.Contains(page, want) {
				t.Errorf("%s series page lacks %q", slug, want)
			}
		}
		if n := strings.Count(page, "<tr><th scope=\"row\">2025-"); n != 12 {
			t.Errorf("%s: %d month rows", slug, n)
		}
		sheet := string(out["m/"+slug+"/index.html"])
		if !strings.Contains(sheet, `href="weather.html"`) || !strings.Contains(sheet, "kWh/m² of cooling") {
			t.Errorf("%s datasheet does not link its series page", slug)
		}
		var f struct {
			Weather *struct {
				Days   []json.RawMessage `json:"days"`
				SHA256 string            `json:"sha256"`
			} `json:"weather"`
		}
		if err := json.Unmarshal(out["m/"+slug+"/figures.json"], &f); err != nil || f.Weather == nil || len(f.Weather.Days) != 365 {
			t.Errorf("%s figures.json: %v", slug, err)
		}
	}
	if _, ok := out["m/bw-93/weather.html"]; ok {
		t.Error("a series page for a material without a series")
	}
	cmp := string(out["compare/metal-backed/index.html"])
	if !strings.Contains(cmp, "Cooling energy over Dravenholt Basin") || strings.Contains(cmp, "other series") {
		t.Error("comparison page lacks the series totals")
	}
	var cat struct {
		Materials []struct {
			Slug    string `json:"slug"`
			Weather *struct {
				Series string            `json:"series"`
				SHA256 string            `json:"sha256"`
				Energy float64           `json:"energy_kwh_m2"`
				Days   []json.RawMessage `json:"days"`
				Months []json.RawMessage `json:"months"`
			} `json:"weather"`
		} `json:"materials"`
	}
	if err := json.Unmarshal(out["catalog.json"], &cat); err != nil {
		t.Fatal(err)
	}
	n := 0
	for _, m := range cat.Materials {
		w := m.Weather
		if w == nil {
			continue
		}
		n++
		if len(w.SHA256) != 64 || !strings.Contains(w.Series, "Dravenholt") || !(w.Energy > 0) || len(w.Days) != 0 || len(w.Months) != 12 {
			t.Errorf("catalog %s: %+v", m.Slug, w)
		}
	}
	if n != 2 {
		t.Errorf("%d materials with a series in the catalog", n)
	}
}
