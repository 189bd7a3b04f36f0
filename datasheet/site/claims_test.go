package site

import (
	"bytes"
	"encoding/json"
	"html/template"
	"regexp"
	"sort"
	"strconv"
	"strings"
	"testing"
	"testing/fstest"

	"skysheet/datasheet"
	"skysheet/datasheet/evaluate"
	"skysheet/datasheet/library"
)

// Constant spectra: a band-weighted mean of a constant is the constant
// whatever the weighting (closed form). R = 0.9 over the solar band gives a
// solar reflectance of 0.9; an opaque R = 0.05 in the infrared an emittance
// of 1 − 0.05 = 0.95 (Kirchhoff's law). No transmittance is measured.
const (
	flatSolar   = "wavelength_nm,R\n280,0.9\n1000,0.9\n2500,0.9\n"
	flatThermal = "wavelength_um,R\n2.6,0.05\n10,0.05\n25,0.05\n"
)

// claimsMaterial is a material file with the given claims (YAML list
// items) and the flat spectra.
func claimsMaterial(title, claims string) []byte {
	return []byte("---\ntitle: " + title + "\nmaker: Test maker (invented)\nspectra:\n  - file: flat/solar.csv\n  - file: flat/thermal.csv\n" +
		"measured: {angle: 8°}\nclaims:\n" + claims + "---\nInvented test material.\n")
}

// claimsLibrary loads a library of two materials: "panel" with a
// supported, a not supported and a claim measured at another angle, and "other"
// with a supported claim, a percentage for a fraction and a transmittance
// that was not measured.
func claimsLibrary(t testing.TB, panelClaims, otherClaims string) *library.Library {
	t.Helper()
	fsys := fstest.MapFS{
		"skysheet.yaml":            {Data: []byte("title: Claims test library (invented)\n")},
		"content/panel.md":         {Data: claimsMaterial("Panel (invented)", panelClaims)},
		"content/other.md":         {Data: claimsMaterial("Other panel (invented)", otherClaims)},
		"content/flat/solar.csv":   {Data: []byte(flatSolar)},
		"content/flat/thermal.csv": {Data: []byte(flatThermal)},
	}
	lib, err := library.Load(fsys)
	if err != nil {
		t.Fatal(err)
	}
	return lib
}

const (
	panelClaims = `  - {figure: solar_reflectance, value: 0.9, tolerance: 0.01, basis: {solar_spectrum: direct}, source: "sheet <b>A</b> (invented)"}
  - {figure: thermal_emittance, value: 0.8, tolerance: 0.02, source: sheet B (invented)}
  - {figure: solar_reflectance, value: 0.9, basis: {angle_deg: 45}, source: "sheet <i>C</i> (invented)"}
`
	otherClaims = `  - {figure: solar_reflectance, value: 0.9}
  - {figure: solar_reflectance, value: 90}
  - {figure: solar_transmittance, value: 0.1}
`
)

// escaped returns s as html/template writes it in text.
func escaped(t testing.TB, s string) string {
	t.Helper()
	var b bytes.Buffer
	if err := template.Must(template.New("").Parse("{{.}}")).Execute(&b, s); err != nil {
		t.Fatal(err)
	}
	return b.String()
}

func TestDatasheetShowsVerdicts(t *testing.T) {
	lib := claimsLibrary(t, panelClaims, otherClaims)
	out := renderTest(t, lib, Options{})
	page := string(out["m/panel/index.html"])

	vs := verdictsOf(t, lib, "panel")
	want := []datasheet.Status{datasheet.Supported, datasheet.NotSupported, datasheet.CannotCheck}
	if len(vs) != len(want) {
		t.Fatalf("%d verdicts", len(vs))
	}
	for i, v := range vs {
		if v.Status != want[i] {
			t.Fatalf("claim %d: %v, want %v (%s)", i+1, v.Status, want[i], v.Reason)
		}
		// The verdict's block on the page: its words with the neutral
		// mark, the reason and the basis, escaped.
		block := claimBlock(t, page, i+1)
		for _, s := range []string{
			`<span class="mark" aria-hidden="true">` + v.Status.Mark() + `</span> ` + v.Status.String() + `</span>`,
			`<p class="reason">` + escaped(t, v.Reason) + `</p>`,
			escaped(t, v.Basis),
		} {
			if !strings.Contains(block, s) {
				t.Errorf("claim %d: the page lacks %q in\n%s", i+1, s, block)
			}
		}
	}
	// The stated direct spectrum differs from the default: the value on
	// the default basis is given beside it.
	if vs[0].BasisNote == "" || !strings.Contains(claimBlock(t, page, 1), escaped(t, vs[0].BasisNote)) {
		t.Errorf("basis note %q missing", vs[0].BasisNote)
	}
	// The supported and unsupported claims sit beside the computed values
	// in the figures table; the unknown figure has no row there.
	for _, s := range []string{
		`<a href="#claim-1" class="supported"><span class="mark" aria-hidden="true">=</span> 0.9 ± 0.01`,
		`<a href="#claim-2" class="not-supported"><span class="mark" aria-hidden="true">≠</span> 0.8 ± 0.02`,
	} {
		if !strings.Contains(page, s) {
			t.Errorf("figures table lacks %q", s)
		}
	}
	for _, bad := range []string{"<b>A</b>", "<i>"} {
		if strings.Contains(page, bad) {
			t.Errorf("unescaped %q on the datasheet", bad)
		}
	}
	if !strings.Contains(page, "sheet &lt;b&gt;A&lt;/b&gt; (invented)") {
		t.Errorf("escaped source missing")
	}

	// A pitfall is named on the other datasheet.
	other := string(out["m/other/index.html"])
	if !strings.Contains(claimBlock(t, other, 2), "<code>percent-for-fraction</code>") {
		t.Errorf("percent pitfall missing:\n%s", claimBlock(t, other, 2))
	}
	// Without claims there is no claims section and no claims.json link.
	lib.Materials[0].Front.Claims = nil
	lib.Materials[1].Front.Claims = nil
	out = renderTest(t, lib, Options{})
	if p := string(out["m/panel/index.html"]); strings.Contains(p, `id="claims"`) || strings.Contains(p, "claims.json") {
		t.Errorf("claims section without claims")
	}
}

var claimBlockRE = regexp.MustCompile(`(?s)<tbody class="claim [a-z-]+" id="claim-(\d+)">.*?</tbody>`)

// claimBlock returns the n-th claim's tbody on a datasheet.
func claimBlock(t testing.TB, page string, n int) string {
	t.Helper()
	for _, m := range claimBlockRE.FindAllStringSubmatch(page, -1) {
		if m[1] == strconv.Itoa(n) {
			return m[0]
		}
	}
	t.Fatalf("no claim %d on the page", n)
	return ""
}

var reviewRowRE = regexp.MustCompile(`(?s)<tr class="claim ([a-z-]+)"><td><a href="([^"]+)">`)

func TestReviewPage(t *testing.T) {
	lib := claimsLibrary(t, panelClaims, otherClaims)
	out := renderTest(t, lib, Options{})
	page := string(out["review/index.html"])
	var got []string
	for _, m := range reviewRowRE.FindAllStringSubmatch(page, -1) {
		got = append(got, m[1]+" "+m[2])
	}
	// Exactly the claims not supported or not checkable, grouped by
	// verdict, materials in index order (by title).
	want := []string{
		"not-supported ../m/other/index.html#claim-2",
		"not-supported ../m/panel/index.html#claim-2",
		"cannot-check ../m/other/index.html#claim-3",
		"cannot-check ../m/panel/index.html#claim-3",
	}
	if strings.Join(got, "\n") != strings.Join(want, "\n") {
		t.Errorf("review rows:\n%s\nwant:\n%s", strings.Join(got, "\n"), strings.Join(want, "\n"))
	}
	for _, s := range []string{"6 claims: 2 supported, 2 not supported, 2 cannot be checked", `id="rules"`,
		escaped(t, "looks like a percentage"), "No transmittance was measured"} {
		if !strings.Contains(page, s) {
			t.Errorf("review page lacks %q", s)
		}
	}
	if strings.Contains(page, "<i>") || strings.Contains(page, "Every claim is supported") {
		t.Errorf("review page: unescaped content or a wrong all-clear")
	}
	for _, name := range []string{"index.html", "m/panel/index.html", "review/index.html"} {
		if !strings.Contains(string(out[name]), `review/index.html">`) {
			t.Errorf("%s does not link to the review page", name)
		}
	}
	checkLinks(t, out)

	// Every claim supported: the page says so.
	out = renderTest(t, claimsLibrary(t, "  - {figure: solar_reflectance, value: 0.9}\n", "  - {figure: thermal_emittance, value: 0.95}\n"), Options{})
	page = string(out["review/index.html"])
	if !strings.Contains(page, "Every claim is supported by its spectra: 2 of 2.") || strings.Contains(page, `<table class="review">`) {
		t.Errorf("all supported: the page does not say so")
	}
	// No claims at all.
	lib = claimsLibrary(t, "", "")
	out = renderTest(t, lib, Options{})
	if !strings.Contains(string(out["review/index.html"]), "No material in this library states a claim") {
		t.Errorf("no claims: the page does not say so")
	}
}

func TestClaimsDownloads(t *testing.T) {
	lib := claimsLibrary(t, panelClaims, otherClaims)
	want := verdictsOf(t, lib, "panel")
	out := renderTest(t, lib, Options{})

	// claims.json: the verdicts as "skysheet review --format json" has them.
	var cf struct {
		Schema   int                     `json:"schema"`
		Slug     string                  `json:"slug"`
		Inputs   []library.Input         `json:"inputs"`
		Counts   datasheet.VerdictCounts `json:"counts"`
		Verdicts []datasheet.Verdict     `json:"verdicts"`
	}
	if err := json.Unmarshal(out["m/panel/claims.json"], &cf); err != nil {
		t.Fatal(err)
	}
	if cf.Schema != ClaimsSchema || cf.Slug != "panel" || len(cf.Inputs) != 3 ||
		cf.Counts != (datasheet.VerdictCounts{Claims: 3, Supported: 1, NotSupported: 1, CannotCheck: 1}) {
		t.Errorf("claims.json: %+v", cf)
	}
	if len(cf.Verdicts) != len(want) {
		t.Fatalf("claims.json: %d verdicts", len(cf.Verdicts))
	}
	for i, v := range cf.Verdicts {
		if v.Status != want[i].Status || v.Reason != want[i].Reason || v.Claim.Figure != want[i].Claim.Figure {
			t.Errorf("claims.json verdict %d: %v %q", i+1, v.Status, v.Reason)
		}
	}

	// catalog.json: each claim keeps its keys and gains its verdict,
	// without repeating the claim inside.
	var cat struct {
		Materials []struct {
			Slug       string                       `json:"slug"`
			ClaimsFile string                       `json:"claims_file"`
			Claims     []map[string]json.RawMessage `json:"claims"`
		} `json:"materials"`
	}
	if err := json.Unmarshal(out["catalog.json"], &cat); err != nil {
		t.Fatal(err)
	}
	for _, m := range cat.Materials {
		if m.Slug != "panel" {
			continue
		}
		if m.ClaimsFile != "m/panel/claims.json" {
			t.Errorf("claims_file %q", m.ClaimsFile)
		}
		if len(m.Claims) != 3 {
			t.Fatalf("catalog: %d claims", len(m.Claims))
		}
		for i, c := range m.Claims {
			var keys []string
			for k := range c {
				keys = append(keys, k)
			}
			sort.Strings(keys)
			var v map[string]json.RawMessage
			if err := json.Unmarshal(c["verdict"], &v); err != nil {
				t.Fatalf("claim %d: verdict: %v", i+1, err)
			}
			var status datasheet.Status
			if err := json.Unmarshal(v["status"], &status); err != nil || status != want[i].Status {
				t.Errorf("claim %d: status %s, want %v", i+1, v["status"], want[i].Status)
			}
			if _, ok := v["claim"]; ok {
				t.Errorf("claim %d: the verdict repeats the claim", i+1)
			}
			if _, ok := c["figure"]; !ok {
				t.Errorf("claim %d: keys %v", i+1, keys)
			}
		}
	}
	// figures.json keeps exactly the figures schema.
	var f map[string]json.RawMessage
	if err := json.Unmarshal(out["m/panel/figures.json"], &f); err != nil {
		t.Fatal(err)
	}
	for _, k := range []string{"claims", "verdicts"} {
		if _, ok := f[k]; ok {
			t.Errorf("figures.json has %q", k)
		}
	}
}

// TestSameSiteWhateverWorkers checks that the site, pages written as
// materials are evaluated included, does not depend on the number of
// workers.
func TestSameSiteWhateverWorkers(t *testing.T) {
	a := renderTest(t, claimsLibrary(t, panelClaims, otherClaims), Options{Workers: 1})
	b := renderTest(t, claimsLibrary(t, panelClaims, otherClaims), Options{Workers: 4})
	sameSite(t, a, b)
}

// verdictsOf returns the verdicts the evaluation step gives the material
// slug of lib.
func verdictsOf(t *testing.T, lib *library.Library, slug string) []datasheet.Verdict {
	t.Helper()
	ms, err := evaluate.All(lib, evaluate.Options{})
	if err != nil {
		t.Fatal(err)
	}
	for _, m := range ms {
		if m.Slug == slug {
			return m.Verdicts
		}
	}
	t.Fatalf("no material %q", slug)
	return nil
}
