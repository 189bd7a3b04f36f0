package site

import (
	"bytes"
	"encoding/csv"
	"encoding/json"
	"strconv"
	"strings"
	"testing"

	"skysheet/datasheet"
)

// TestTableCSV checks that the index and each listing offer their table as
// CSV beside it, with units in the column names and every number equal,
// to the last bit, to the material's figures.json.
func TestTableCSV(t *testing.T) {
	out := renderTest(t, testLibrary(t), Options{})
	figs := map[string]datasheet.Figures{}
	for name, data := range out {
		if slug, ok := strings.CutSuffix(strings.TrimPrefix(name, "m/"), "/figures.json"); ok {
			var f datasheet.Figures
			if err := json.Unmarshal(data, &f); err != nil {
				t.Fatal(err)
			}
			figs[slug] = f
		}
	}
	for _, tc := range []struct{ page, csvName string }{
		{"index.html", "materials.csv"},
		{"materials/by-category/paint/index.html", "materials/by-category/paint/materials.csv"},
		{"materials/by-tag/roof/index.html", "materials/by-tag/roof/materials.csv"},
	} {
		if !bytes.Contains(out[tc.page], []byte(`<a href="materials.csv" download>Download this table as CSV</a>`)) {
			t.Errorf("%s: no link to its CSV", tc.page)
		}
		rows, err := csv.NewReader(bytes.NewReader(out[tc.csvName])).ReadAll()
		if err != nil || len(rows) < 2 {
			t.Fatalf("%s: %v, %d rows", tc.csvName, err, len(rows))
		}
		head := strings.Join(rows[0], ",")
		if want := "#,material,slug,maker,lab,product_code,category,tags,solar_reflectance (fraction),solar_reflectance u (fraction),"; !strings.HasPrefix(head, want) {
			t.Errorf("%s: header %s, want it to start %s", tc.csvName, head, want)
		}
		if !strings.Contains(head, ",cooling_power_w_m2 (W/m²),") || !strings.HasSuffix(head, ",page") {
			t.Errorf("%s: header %s", tc.csvName, head)
		}
		tableRows := bytes.Count(out[tc.page], []byte("<tr data-slug="))
		if len(rows)-1 != tableRows {
			t.Errorf("%s: %d rows, the table has %d", tc.csvName, len(rows)-1, tableRows)
		}
		for _, r := range rows[1:] {
			f, ok := figs[r[2]]
			if !ok {
				t.Errorf("%s: no material %q", tc.csvName, r[2])
				continue
			}
			for i, h := range rows[0] {
				key, unit, ok := strings.Cut(h, " (")
				if !ok || strings.HasSuffix(key, " u") {
					continue
				}
				x, _ := f.Figure(key)
				// A colour's column is named by its first component (L*).
				if want := strings.TrimSuffix(unit, ")"); want != "fraction" && want != x.Unit && x.Components == nil {
					t.Errorf("%s: column %s, figure unit %q", tc.csvName, h, x.Unit)
				}
				got, err := strconv.ParseFloat(r[i], 64)
				if err != nil || got != float64(x.Value) {
					t.Errorf("%s: %s of %s = %q, figures.json %v", tc.csvName, key, r[2], r[i], x.Value)
				}
			}
			if r[len(r)-1] != "m/"+r[2]+"/index.html" {
				t.Errorf("%s: page %q", tc.csvName, r[len(r)-1])
			}
		}
	}

	// Each material's figures as CSV beside figures.json, and linked.
	if !bytes.Contains(out["m/frostline/index.html"], []byte(`href="figures.csv"`)) {
		t.Error("the datasheet does not link figures.csv")
	}
	rows, err := csv.NewReader(bytes.NewReader(out["m/frostline/figures.csv"])).ReadAll()
	if f := figs["frostline"]; err != nil || len(rows) != len(f.Figures)+1 {
		t.Fatalf("figures.csv: %v, %d rows for %d figures", err, len(rows), len(f.Figures))
	}
	for i, x := range figs["frostline"].Figures {
		r := rows[i+1]
		got, err := strconv.ParseFloat(r[2], 64)
		if r[0] != x.Key || (err != nil || got != float64(x.Value)) && r[2] != "" {
			t.Errorf("figures.csv row %d: %q, want %s = %v", i+1, r, x.Key, x.Value)
		}
	}
}

// TestTextCell checks that text a spreadsheet would run as a formula is
// written as text (OWASP, "CSV Injection": cells starting with =, +, -, @,
// tab or carriage return get a leading apostrophe), and other text as is.
func TestTextCell(t *testing.T) {
	for _, tc := range []struct{ in, want string }{
		{`=HYPERLINK("http://example.invalid","x")`, `'=HYPERLINK("http://example.invalid","x")`},
		{"+1+2", "'+1+2"},
		{"-2+3", "'-2+3"},
		{"@SUM(A1)", "'@SUM(A1)"},
		{"\t=1", "'\t=1"},
		{"\r=1", "'\r=1"},
		{"White roof coating = cool", "White roof coating = cool"},
		{"BX-7", "BX-7"},
		{"", ""},
	} {
		if got := textCell(tc.in); got != tc.want {
			t.Errorf("textCell(%q) = %q, want %q", tc.in, got, tc.want)
		}
	}
}
