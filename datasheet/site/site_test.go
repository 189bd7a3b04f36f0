package site

import (
	"bytes"
	"encoding/json"
	"flag"
	"html"
	"os"
	"path"
	"path/filepath"
	"regexp"
	"strconv"
	"strings"
	"testing"
	"testing/fstest"

	"skysheet/datasheet"
	"skysheet/datasheet/library"
	"skysheet/spectra"
)

var dumpDir = flag.String("dump", "", "write the test library's site to this folder (for looking at it)")

// memWriter keeps a site in memory.
type memWriter map[string][]byte

func (m memWriter) WriteFile(name string, data []byte) error {
	m[name] = append([]byte(nil), data...)
	return nil
}

// testLibrary loads the repository's test library.
func testLibrary(t testing.TB) *library.Library {
	t.Helper()
	lib, err := library.Load(os.DirFS("../../testdata/library"))
	if err != nil {
		t.Fatal(err)
	}
	return lib
}

func renderTest(t testing.TB, lib *library.Library, opt Options) memWriter {
	t.Helper()
	if opt.Version == "" {
		opt.Version = "test"
	}
	out := memWriter{}
	if err := Render(lib, opt, out); err != nil {
		t.Fatal(err)
	}
	return out
}

func TestDump(t *testing.T) {
	if *dumpDir == "" {
		t.Skip("no -dump folder")
	}
	out := renderTest(t, testLibrary(t), Options{})
	for name, data := range out {
		p := filepath.Join(*dumpDir, filepath.FromSlash(name))
		if err := os.MkdirAll(filepath.Dir(p), 0o755); err != nil {
			t.Fatal(err)
		}
		if err := os.WriteFile(p, data, 0o644); err != nil {
			t.Fatal(err)
		}
	}
}

func TestRenderDeterministic(t *testing.T) {
	lib := testLibrary(t)
	a := renderTest(t, lib, Options{Workers: 1})
	b := renderTest(t, testLibrary(t), Options{Workers: 4})
	sameSite(t, a, b)
}

// sameSite checks that two renders wrote the same files, byte for byte.
func sameSite(t *testing.T, a, b memWriter) {
	t.Helper()
	if len(a) != len(b) {
		t.Fatalf("%d files vs %d", len(a), len(b))
	}
	for name, data := range a {
		if !bytes.Equal(data, b[name]) {
			t.Errorf("%s differs between renders", name)
		}
	}
}

func TestRenderFiles(t *testing.T) {
	out := renderTest(t, testLibrary(t), Options{})
	for _, name := range []string{
		"index.html", "catalog.json", "assets/style.css", "assets/site.js",
		"m/frostline/index.html", "m/frostline/spectrum.csv", "m/frostline/figures.json", "m/frostline/source.md",
		"materials/by-category/paint/index.html", "materials/by-tag/roof/index.html", "compare/whites-vs-dark/index.html",
	} {
		if _, ok := out[name]; !ok {
			t.Errorf("%s missing", name)
		}
	}
	index := string(out["index.html"])
	for _, want := range []string{
		`<input id="library-filter" type="search"`, `<table class="materials" id="library-table">`,
		`<button type="button" data-sort-key="solar_reflectance">`, `<tr data-slug="frostline">`,
		`<figure class="chart" id="library-scatter">`, `<a href="m/frostline/index.html" data-slug="frostline">`,
	} {
		if !strings.Contains(index, want) {
			t.Errorf("index.html lacks %s", want)
		}
	}
	page := string(out["m/frostline/index.html"])
	for _, want := range []string{`<table class="figures">`, `<figure class="chart" id="chart-solar">`, `role="img" aria-label="Solar range chart.`,
		"Computed figures are not a certification", "local codes and licensed professionals", "skysheet test",
		`<td class="num">0.914</td>`, `<sup id="fnref:1">`, "<table>"} {
		if !strings.Contains(page, want) {
			t.Errorf("datasheet lacks %s", want)
		}
	}
	if strings.Contains(page, "<b>raw html") {
		t.Errorf("raw HTML went through with allow_html off")
	}
	// The download is the spectrum in the neutral format: it reads back.
	s, err := spectra.Parse(bytes.NewReader(out["m/frostline/spectrum.csv"]), "spectrum.csv")
	if err != nil || s.Len() == 0 {
		t.Errorf("spectrum.csv does not read back: %v", err)
	}
	var f datasheet.Figures
	if err := json.Unmarshal(out["m/frostline/figures.json"], &f); err != nil || f.Schema != datasheet.SchemaVersion {
		t.Errorf("figures.json: %v", err)
	}
	var cat struct {
		Schema    int `json:"schema"`
		Materials []struct {
			Slug        string                   `json:"slug"`
			FiguresFile string                   `json:"figures_file"`
			Figures     json.RawMessage          `json:"figures"`
			Headline    map[string]datasheet.Num `json:"headline"`
		} `json:"materials"`
	}
	if err := json.Unmarshal(out["catalog.json"], &cat); err != nil || len(cat.Materials) != 3 || cat.Schema != CatalogSchema {
		t.Fatalf("catalog.json: %v, %d materials, schema %d", err, len(cat.Materials), cat.Schema)
	}
	// The catalog links each material's figures instead of embedding them:
	// a small entry per material, whatever its figures hold.
	var raw struct {
		Materials []json.RawMessage `json:"materials"`
	}
	if err := json.Unmarshal(out["catalog.json"], &raw); err != nil {
		t.Fatal(err)
	}
	for i, m := range raw.Materials {
		// Claims and their verdicts stay in the catalog; the rest is small.
		var e map[string]any
		if err := json.Unmarshal(m, &e); err != nil {
			t.Fatal(err)
		}
		delete(e, "claims")
		if b, _ := json.MarshalIndent(e, "    ", "  "); len(b) > 2048 {
			t.Errorf("catalog.json: material %d takes %d bytes besides its claims, want under 2 KB", i, len(b))
		}
	}
	for _, m := range cat.Materials {
		if m.Figures != nil {
			t.Errorf("catalog.json embeds the figures of %s", m.Slug)
		}
		var f datasheet.Figures
		if err := json.Unmarshal(out[m.FiguresFile], &f); err != nil {
			t.Errorf("%s: figures_file %q: %v", m.Slug, m.FiguresFile, err)
			continue
		}
		if got := m.Headline["solar_reflectance"]; got != f.SolarReflectance && !(isNaN(got) && isNaN(f.SolarReflectance)) {
			t.Errorf("%s: headline solar reflectance %v, figures.json %v", m.Slug, got, f.SolarReflectance)
		}
	}
}

var (
	linkRE = regexp.MustCompile(`(?:href|src)="([^"#]*)(#[^"]*)?"`)
	idRE   = regexp.MustCompile(` id="([^"]+)"`)
)

// TestLinksResolve follows every relative link of every page to a file of
// the site: no 404 inside the site, and every link names a file (works
// from file://).
func TestLinksResolve(t *testing.T) {
	checkLinks(t, renderTest(t, testLibrary(t), Options{}))
}

// checkLinks checks that every relative link of every page of out names a
// file of out and, when it has a fragment into a page, an id on that page.
func checkLinks(t *testing.T, out memWriter) {
	t.Helper()
	ids := map[string]map[string]bool{}
	idsOf := func(name string) map[string]bool {
		if m, ok := ids[name]; ok {
			return m
		}
		m := map[string]bool{}
		for _, x := range idRE.FindAllStringSubmatch(string(out[name]), -1) {
			m[html.UnescapeString(x[1])] = true
		}
		ids[name] = m
		return m
	}
	for name, data := range out {
		if !strings.HasSuffix(name, ".html") {
			continue
		}
		for _, m := range linkRE.FindAllStringSubmatch(string(data), -1) {
			href := html.UnescapeString(m[1])
			if strings.Contains(href, "://") || strings.HasPrefix(href, "mailto:") {
				continue
			}
			target := name
			if href != "" {
				target = path.Join(path.Dir(name), href)
			}
			if _, ok := out[target]; !ok {
				t.Errorf("%s links to %q: %s is not in the site", name, href, target)
				continue
			}
			if frag := strings.TrimPrefix(html.UnescapeString(m[2]), "#"); frag != "" && strings.HasSuffix(target, ".html") && !idsOf(target)[frag] {
				t.Errorf("%s links to %q: %s has no id %q", name, href+m[2], target, frag)
			}
		}
	}
}

func TestEscaping(t *testing.T) {
	lib := testLibrary(t)
	m := lib.Materials[0]
	m.Front.Title = `<script>alert("title")</script>`
	m.Front.Maker = `Maker & "Sons" <b>`
	m.Front.Tags = append(m.Front.Tags, `<img src=x onerror=alert(1)>`)
	m.Front.Measured.Notes = `</dd><script>x</script>`
	m.Body = []byte("Text <script>alert(1)</script> and [link](javascript:alert(1))\n")
	out := renderTest(t, lib, Options{})
	for name, data := range out {
		if !strings.HasSuffix(name, ".html") {
			continue
		}
		s := string(data)
		for _, bad := range []string{`<script>alert`, `<script>x`, `<img src=x`, `<b>`, `javascript:alert`} {
			if strings.Contains(s, bad) {
				t.Errorf("%s contains unescaped %q", name, bad)
			}
		}
	}
	page := string(out["m/"+m.Slug+"/index.html"])
	if !strings.Contains(page, "&lt;script&gt;alert(&#34;title&#34;)&lt;/script&gt;") {
		t.Errorf("escaped title missing from the datasheet")
	}
}

func TestAllowHTML(t *testing.T) {
	lib := testLibrary(t)
	lib.Config.AllowHTML = true
	out := renderTest(t, lib, Options{})
	if !strings.Contains(string(out["m/frostline/index.html"]), "<b>raw html is dropped</b>") {
		t.Errorf("allow_html: raw HTML should pass")
	}
}

func TestTemplateOverride(t *testing.T) {
	over := fstest.MapFS{
		"footer.html": {Data: []byte(`{{define "site-footer"}}<footer>custom footer {{.Site.Title}}</footer>{{end}}`)},
		"style.css":   {Data: []byte("body{}")},
	}
	out := renderTest(t, testLibrary(t), Options{Templates: over})
	if !strings.Contains(string(out["index.html"]), "<footer>custom footer Northfield Test Bench (invented)</footer>") {
		t.Errorf("block override not applied")
	}
	if string(out["assets/style.css"]) != "body{}" {
		t.Errorf("asset override not applied")
	}
	// A whole default file replaced by one of the same name.
	over = fstest.MapFS{"listing.html": {Data: []byte(`{{define "listing"}}LISTING {{.L.Name}}{{end}}`)}}
	out = renderTest(t, testLibrary(t), Options{Templates: over})
	if got := string(out["materials/by-tag/roof/index.html"]); got != "LISTING roof" {
		t.Errorf("file override: %q", got)
	}
	// A broken override is an error naming the file.
	over = fstest.MapFS{"bad.html": {Data: []byte(`{{define "x"}}{{.Nope}`)}}
	err := Render(testLibrary(t), Options{Templates: over}, memWriter{})
	if err == nil || !strings.Contains(err.Error(), "bad.html") {
		t.Errorf("broken template: %v", err)
	}
	// An override of a row's figure cells that fails when run is an error
	// naming a material and the tables, not a page with the cells missing.
	over = fstest.MapFS{"cells.html": {Data: []byte(`{{define "material-cells"}}{{.Nope}}{{end}}`)}}
	err = Render(testLibrary(t), Options{Templates: over}, memWriter{})
	if err == nil || !strings.Contains(err.Error(), "material tables") || !strings.Contains(err.Error(), "content/") {
		t.Errorf("failing cells template: %v", err)
	}
}

// TestKeyCards checks the headline cards: a figure without its data says
// why instead of showing a bare "— W/m²", and a figure with a standard
// uncertainty shows it, on the card and in the index.
func TestKeyCards(t *testing.T) {
	fsys := fstest.MapFS{
		"skysheet.yaml": {Data: []byte("title: Cards (invented)\n")},
		"content/uv.md": {Data: []byte("---\ntitle: UV-Vis only (invented)\nmaker: Test maker (invented)\nspectra: [{file: uv.csv}]\n---\n")},
		// R = 0.9 ± 0.005 everywhere: the solar reflectance is 0.9 and its
		// uncertainty 0.005 when the errors move together (a weighted mean
		// of a constant shift is that shift, closed form).
		"content/uv.csv": {Data: []byte("# u_R: 0.005\nwavelength_nm,R\n280,0.9\n1000,0.9\n2500,0.9\n")},
	}
	lib, err := library.Load(fsys)
	if err != nil {
		t.Fatal(err)
	}
	out := renderTest(t, lib, Options{})
	page := string(out["m/uv/index.html"])
	for _, want := range []string{
		`<dt>Solar reflectance</dt><dd><span class="big">0.900</span><span class="note">±0.005; 280–2500 nm, global</span>`,
		`<dt>Thermal emittance</dt><dd><span class="big">n/a</span><span class="note">no infrared data over 2.5–25 µm</span>`,
		`<dt>Net cooling, day</dt><dd><span class="big">n/a</span><span class="note">no infrared data over 2.5–100 µm</span>`,
	} {
		if !strings.Contains(page, want) {
			t.Errorf("the datasheet lacks %q", want)
		}
	}
	if strings.Contains(page, `<span class="big">—</span>`) {
		t.Error("a card shows a bare —")
	}
	index := string(out["index.html"])
	if !regexp.MustCompile(`data-key="solar_reflectance" data-value="[0-9.]+">0.900 ±0.005</td>`).MatchString(index) {
		t.Error("the index does not show the uncertainty")
	}
}

// TestListingNumbers checks that category and tag pages number their
// rows from 1 in their own order, not with the library index's numbers.
func TestListingNumbers(t *testing.T) {
	out := renderTest(t, testLibrary(t), Options{})
	rowNumber := regexp.MustCompile(`<td class="num-col">(\d+)</td>`)
	for name, data := range out {
		if !strings.HasPrefix(name, "materials/by-") || !strings.HasSuffix(name, ".html") {
			continue
		}
		var got []string
		for _, m := range rowNumber.FindAllStringSubmatch(string(data), -1) {
			got = append(got, m[1])
		}
		if len(got) == 0 {
			t.Fatalf("%s: no numbered rows", name)
		}
		for i, n := range got {
			if n != strconv.Itoa(i+1) {
				t.Errorf("%s: row numbers %v, want 1…%d", name, got, len(got))
				break
			}
		}
	}
}

// TestUncertaintyWords checks that a figure whose inputs have stated
// uncertainties only in part says so in plain words, linked to the
// explanation beside the table.
func TestUncertaintyWords(t *testing.T) {
	page := string(renderTest(t, testLibrary(t), Options{})["m/frostline/index.html"])
	// Frostline states u_R for its UV-Vis-NIR file only: the cooling
	// figures rest about half on the FTIR file, which states none.
	if !regexp.MustCompile(`<td class="num"><span class="unc">±[0-9.]+ / ±[0-9.]+</span> <a href="#note-uncertainty">\(covers [0-9]+ %\)</a></td>`).MatchString(page) {
		t.Error("no partial uncertainty in words")
	}
	if !strings.Contains(page, `id="note-uncertainty"`) || strings.Contains(page, "partial,") {
		t.Error("the explanation is not reachable, or the old wording remains")
	}
}

// TestDataWarnings checks that the readers' plausibility warnings are on
// the datasheet, naming the file.
func TestDataWarnings(t *testing.T) {
	fsys := fstest.MapFS{
		"skysheet.yaml": {Data: []byte("title: Warnings (invented)\n")},
		"content/w.md":  {Data: []byte("---\ntitle: Mislabelled (invented)\nmaker: Test maker (invented)\nspectra: [{file: uv.csv}]\n---\n")},
		// Fractions under a percent header.
		"content/uv.csv": {Data: []byte("wavelength_nm,R (%)\n280,0.9\n2500,0.9\n")},
	}
	lib, err := library.Load(fsys)
	if err != nil {
		t.Fatal(err)
	}
	page := string(renderTest(t, lib, Options{})["m/w/index.html"])
	if !regexp.MustCompile(`(?s)<div class="data-warnings" role="note".*<li>content/uv.csv: column 2 \(R \(%\)\) is marked as percent but every value is at most 1.05 \(largest 0.9\): fractions in a percent column\?`).MatchString(page) {
		t.Error("the datasheet does not show the warning")
	}
	plain := string(renderTest(t, testLibrary(t), Options{})["m/frostline/index.html"])
	if plain == "" || strings.Contains(plain, "data-warnings") {
		t.Error("a warning box without warnings")
	}
}

// TestCoverageMarks checks how the site writes a figure covered 90–98 %
// by data (a "partial data" mark) and one covered less than 90 % (n/a
// with the reason), on the datasheet and in the index. The infrared data
// stop at 22.5 µm (95.0 % of the Planck 300 K weighting over 2.5–25 µm)
// and at 19 µm (85.3 %); see datasheet.TestCoverageGate.
func TestCoverageMarks(t *testing.T) {
	md := func(title string) []byte {
		return []byte("---\ntitle: " + title + " (invented)\nmaker: Test maker (invented)\nspectra: [{file: " + strings.ToLower(title) + ".csv}]\n---\n")
	}
	fsys := fstest.MapFS{
		"skysheet.yaml":        {Data: []byte("title: Coverage (invented)\n")},
		"content/partial.md":   {Data: md("Partial")},
		"content/partial.csv":  {Data: []byte("wavelength_nm,R\n280,0.9\n2500,0.9\n\n2500.1,0.1\n22500,0.1\n")},
		"content/withheld.md":  {Data: md("Withheld")},
		"content/withheld.csv": {Data: []byte("wavelength_nm,R\n280,0.9\n2500,0.9\n\n2500.1,0.1\n19000,0.1\n")},
	}
	lib, err := library.Load(fsys)
	if err != nil {
		t.Fatal(err)
	}
	out := renderTest(t, lib, Options{})
	partial, withheld, index := string(out["m/partial/index.html"]), string(out["m/withheld/index.html"]), string(out["index.html"])
	for _, c := range []struct{ page, name, re string }{
		{partial, "partial row", `<tr data-key="thermal_emittance"><th scope="row">Thermal emittance</th><td class="num">0.900 <span class="partial">partial data</span></td>`},
		{partial, "partial card", `<dt>Thermal emittance</dt><dd><span class="big">0.900</span> <span class="partial">partial data</span>`},
		{withheld, "n/a row", `<tr data-key="thermal_emittance"><th scope="row">Thermal emittance</th><td class="num">n/a<span class="sub why">coverage &lt; 90 %</span></td>`},
		{withheld, "n/a card", `<dt>Thermal emittance</dt><dd><span class="big">n/a</span><span class="note">coverage &lt; 90 %</span>`},
		{withheld, "full reason", `<li>Not given, as the data cover only 85\.\d % of the Planck blackbody at 300 K weighting over the band 2\.5–25 µm \(at least 90 % is needed\): Thermal emittance; SRI, low wind; SRI, medium wind; SRI, high wind\.</li>`},
		{index, "index partial", `data-key="thermal_emittance" data-value="[0-9.]+">0\.900 <span class="partial">partial</span></td>`},
		{index, "index n/a", `data-key="thermal_emittance" data-value="">n/a<span class="sub why">coverage &lt; 90 %</span></td>`},
		{withheld, "thresholds said", `Below 98 % a value is marked <span class="partial">partial data</span>; below 90 % it is not given \(n/a\)\.`},
	} {
		if !regexp.MustCompile(c.re).MatchString(c.page) {
			t.Errorf("%s: no match for %s", c.name, c.re)
		}
	}
	if strings.Contains(withheld, "0.900") && strings.Contains(withheld, `data-key="thermal_emittance"><th scope="row">Thermal emittance</th><td class="num">0.9`) {
		t.Error("the withheld emittance is shown")
	}
}

// TestModelNotesShown checks that a transmitting sample's notes (the SRI
// is defined for opaque surfaces; the cooling figures take a lone layer
// with nothing behind it) are on its datasheet beside the figures, marked
// on the figures they concern, and marked with words in the index row.
func TestModelNotesShown(t *testing.T) {
	fsys := fstest.MapFS{
		"skysheet.yaml":    {Data: []byte("title: Notes (invented)\n")},
		"content/glass.md": {Data: []byte("---\ntitle: Clear pane (invented)\nmaker: Test maker (invented)\nspectra: [{file: glass.csv}]\n---\n")},
		// T = 0.83 over the solar band: 83 % of sunlight transmitted.
		"content/glass.csv": {Data: []byte("wavelength_nm,R,T\n280,0.08,0.83\n2500,0.08,0.83\n\n2600,0.05,0\n25000,0.05,0\n")},
		"content/white.md":  {Data: []byte("---\ntitle: White (invented)\nmaker: Test maker (invented)\nspectra: [{file: white.csv}]\n---\n")},
		"content/white.csv": {Data: []byte("wavelength_nm,R\n280,0.9\n2500,0.9\n\n2600,0.05\n25000,0.05\n")},
	}
	lib, err := library.Load(fsys)
	if err != nil {
		t.Fatal(err)
	}
	out := renderTest(t, lib, Options{})
	glass, white, index := string(out["m/glass/index.html"]), string(out["m/white/index.html"]), string(out["index.html"])
	for _, want := range []string{
		`<li id="model-sri-not-opaque"><span class="mark" aria-hidden="true">†</span> The SRI (ASTM E1980) is defined for opaque surfaces; this sample transmits 83.0 % of sunlight`,
		`<li id="model-cooling-lone-layer"><span class="mark" aria-hidden="true">‡</span> The cooling figures take a lone layer radiating from its upper face, with nothing behind it`,
		`<th scope="row">SRI, low wind</th><td class="num">`,
		`<a class="model-mark" href="#model-sri-not-opaque"><span aria-hidden="true">†</span><span class="vh"> (note: the SRI is defined for opaque surfaces)</span></a>`,
		`<a class="model-mark" href="#model-cooling-lone-layer"><span aria-hidden="true">‡</span><span class="vh"> (note: a lone layer with nothing behind it)</span></a>`,
	} {
		if !strings.Contains(glass, want) {
			t.Errorf("the glass's datasheet lacks %q", want)
		}
	}
	if !regexp.MustCompile(`<th scope="row">SRI, low wind</th><td class="num">[0-9.]+<a class="model-mark" href="#model-sri-not-opaque">`).MatchString(glass) {
		t.Error("the SRI row is not marked")
	}
	if !regexp.MustCompile(`<dt>Net cooling, day</dt><dd><span class="big">[-0-9.]+</span> <span class="unit">W/m²</span><a class="model-mark" href="#model-cooling-lone-layer">`).MatchString(glass) {
		t.Error("the cooling card is not marked")
	}
	if !strings.Contains(index, `<a href="m/glass/index.html">Clear pane (invented)</a><a class="model-mark" href="m/glass/index.html#model-sri-not-opaque"><span aria-hidden="true">†</span><span class="vh"> (note: the SRI is defined for opaque surfaces)</span></a>`) {
		t.Error("the index row of the glass is not marked")
	}
	if strings.Contains(white, "model-mark") || strings.Contains(white, "model-notes") || strings.Contains(index, `White (invented)</a><a class="model-mark"`) {
		t.Error("an opaque white is marked")
	}
}
