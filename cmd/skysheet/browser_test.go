package main

import (
	"bytes"
	"context"
	"encoding/json"
	"fmt"
	"html"
	"io"
	"math"
	"net/http"
	"net/http/httptest"
	"net/url"
	"os"
	"path"
	"path/filepath"
	"regexp"
	"slices"
	"sort"
	"strings"
	"sync"
	"testing"
	"time"

	"github.com/chromedp/cdproto/cdp"
	"github.com/chromedp/cdproto/emulation"
	"github.com/chromedp/chromedp"
)

// chromiumPath is where Debian's chromium package installs the browser.
const chromiumPath = "/usr/bin/chromium"

// TestBrowser renders the demo library (the repository root) in-process,
// serves it on 127.0.0.1 and drives headless Chromium through it: the index
// loads without console errors, the table sorts and filters, a datasheet
// shows its charts and figure table, every internal link resolves, a chart
// alone in its row takes the row, each datasheet prints to at most two
// pages of A4 and of US Letter with chart text of at least 7 pt, the pages
// work on a phone 390 px wide, and the accessibility rules of axe-core find
// no violation on any kind of page. With SKYSHEET_PRINT_DIR set, the
// prints and phone screenshots are kept there.
func TestBrowser(t *testing.T) {
	if _, err := os.Stat(chromiumPath); err != nil {
		if os.Getenv("CI") != "" {
			t.Fatalf("%s is missing; .ci/run installs Debian's chromium package before the tests", chromiumPath)
		}
		t.Skipf("%s not found: browser test skipped (apt-get install chromium to run it)", chromiumPath)
	}
	out := t.TempDir()
	if code, stdout, stderr := runCLI("render", "--site", out, "--no-cache", "../.."); code != 0 {
		t.Fatalf("skysheet render of the demo library exited %d\nstdout:\n%s\nstderr:\n%s", code, stdout, stderr)
	}
	srv := httptest.NewServer(http.FileServer(http.Dir(out)))
	defer srv.Close()

	// A guard only: the whole test takes a few seconds. The browser's life is
	// bound to this context, so no shorter timeout is set on it.
	ctx, cancel := context.WithTimeout(context.Background(), 5*time.Minute)
	defer cancel()
	opts := []chromedp.ExecAllocatorOption{
		chromedp.ExecPath(chromiumPath),
		chromedp.Headless,
		chromedp.NoSandbox,
		chromedp.DisableGPU,
		chromedp.Flag("disable-background-networking", true),
		chromedp.Flag("disable-component-update", true),
		chromedp.NoFirstRun,
		chromedp.NoDefaultBrowserCheck,
		chromedp.Flag("disable-dev-shm-usage", true),
		chromedp.UserDataDir(t.TempDir()),
		chromedp.WindowSize(1280, 1800),
	}
	allocCtx, cancelAlloc := chromedp.NewExecAllocator(ctx, opts...)
	defer cancelAlloc()
	bctx, cancelBrowser := chromedp.NewContext(allocCtx)
	defer cancelBrowser()

	con := &consoleLog{}
	if err := con.follow(bctx); err != nil {
		t.Fatalf("starting %s: %v", chromiumPath, err)
	}

	slugs := indexSlugs(t, bctx, srv.URL, con)
	if len(slugs) == 0 {
		t.Fatal("the index table has no rows")
	}
	t.Run("Sort", func(t *testing.T) { testSort(t, bctx, srv, slugs) })
	t.Run("Filter", func(t *testing.T) { testFilter(t, bctx, slugs) })
	t.Run("Datasheet", func(t *testing.T) { testDatasheet(t, bctx, srv.URL, con) })
	t.Run("Links", func(t *testing.T) { testLinks(t, srv) })
	t.Run("ChartRows", func(t *testing.T) { testChartRows(t, bctx, srv.URL, slugs) })
	t.Run("PrintPDF", func(t *testing.T) { testPrint(t, bctx, srv.URL, slugs) })
	t.Run("Phone", func(t *testing.T) { testPhone(t, bctx, srv, slugs) })
	t.Run("Search", func(t *testing.T) { testSearch(t, bctx, out, con) })
	t.Run("Accessibility", func(t *testing.T) { testAxe(t, bctx, srv.URL) })
}

// consoleLog collects console errors, uncaught exceptions and browser log
// errors (such as failed resource loads) of every page visited.
type consoleLog struct {
	mu   sync.Mutex
	msgs []string
}

// follow starts the browser and collects its console messages until ctx ends.
func (c *consoleLog) follow(ctx context.Context) error {
	if err := chromedp.Do(ctx); err != nil { // starts the browser and opens the tab
		return err
	}
	msgs := chromedp.Console(ctx)
	go func() {
		for m, err := range msgs {
			if err != nil {
				return
			}
			if m.Type != chromedp.ConsoleError && !m.IsException() && m.Type != "assert" {
				continue
			}
			// The browser asks for /favicon.ico by itself when a page names no
			// icon; that request is not a link of the site.
			if m.Source == "network" && strings.HasSuffix(m.URL, "/favicon.ico") {
				continue
			}
			text := m.String()
			if m.URL != "" {
				text += fmt.Sprintf(" (%s:%d)", m.URL, m.Line+1)
			}
			c.mu.Lock()
			c.msgs = append(c.msgs, text)
			c.mu.Unlock()
		}
	}()
	return nil
}

// take returns and clears the collected messages, after a moment for the
// last ones to arrive.
func (c *consoleLog) take() []string {
	time.Sleep(100 * time.Millisecond)
	c.mu.Lock()
	defer c.mu.Unlock()
	m := c.msgs
	c.msgs = nil
	return m
}

// settle waits until the page has loaded and its scripts have run.
func settle() chromedp.Action[chromedp.Void] {
	return chromedp.Steps(
		chromedp.Poll[chromedp.Void](`document.readyState === "complete"`, chromedp.WithPollingTimeout(15*time.Second)),
		chromedp.Sleep(100*time.Millisecond),
	)
}

// eval evaluates a JavaScript expression on the current page.
func eval[T any](t *testing.T, ctx context.Context, expr string) T {
	t.Helper()
	v, err := chromedp.Run(ctx, chromedp.Evaluate[T](expr))
	if err != nil {
		t.Fatalf("evaluating %s: %v", expr, err)
	}
	return v
}

// indexSlugs opens the index, checks it loads without console errors and
// returns the slugs of its table rows in displayed order.
func indexSlugs(t *testing.T, ctx context.Context, base string, con *consoleLog) []string {
	t.Helper()
	con.take()
	err := chromedp.Do(ctx,
		chromedp.Navigate(base+"/index.html"),
		chromedp.WaitReady(chromedp.CSS("#library-table")),
		settle(),
	)
	if err != nil {
		t.Fatalf("loading the index: %v", err)
	}
	for _, m := range con.take() {
		t.Errorf("index.html: %s", m)
	}
	if n := eval[int](t, ctx, `document.querySelectorAll('input#library-filter').length`); n != 1 {
		t.Errorf("index.html: want one input#library-filter, found %d", n)
	}
	return eval[[]string](t, ctx, rowSlugsJS)
}

// rowSlugsJS lists the data-slug of every row of the library table in
// displayed order; visibleSlugsJS only those shown.
const (
	rowSlugsJS     = `Array.from(document.querySelectorAll('#library-table tbody tr[data-slug]')).map(r => r.dataset.slug)`
	visibleSlugsJS = `Array.from(document.querySelectorAll('#library-table tbody tr[data-slug]')).filter(r => r.getClientRects().length > 0 && getComputedStyle(r).visibility !== 'hidden').map(r => r.dataset.slug)`
)

// figureOf reads one headline figure of a material from its figures.json
// download (schema of "figures --json").
func figureOf(t *testing.T, srv *httptest.Server, slug, key string) float64 {
	t.Helper()
	res, err := srv.Client().Get(srv.URL + "/m/" + url.PathEscape(slug) + "/figures.json")
	if err != nil {
		t.Fatalf("figures.json of %s: %v", slug, err)
	}
	defer res.Body.Close()
	if res.StatusCode != http.StatusOK {
		t.Fatalf("figures.json of %s: %s", slug, res.Status)
	}
	var f map[string]json.RawMessage
	if err := json.NewDecoder(res.Body).Decode(&f); err != nil {
		t.Fatalf("figures.json of %s: %v", slug, err)
	}
	var v *float64
	if err := json.Unmarshal(f[key], &v); err != nil || v == nil {
		return math.NaN()
	}
	return *v
}

// monotonic tells whether xs never decreases (dir > 0) or never increases
// (dir < 0).
func monotonic(xs []float64, dir float64) bool {
	for i := 1; i < len(xs); i++ {
		if dir*(xs[i]-xs[i-1]) < 0 {
			return false
		}
	}
	return true
}

func testSort(t *testing.T, ctx context.Context, srv *httptest.Server, slugs []string) {
	const key = "solar_reflectance"
	value := map[string]float64{}
	for _, s := range slugs {
		value[s] = figureOf(t, srv, s, key)
		if math.IsNaN(value[s]) {
			t.Fatalf("%s has no %s in figures.json; the demo library gives every material one", s, key)
		}
	}
	if sorted := sort.SliceIsSorted(slugs, func(i, j int) bool { return value[slugs[i]] < value[slugs[j]] }); sorted {
		t.Logf("the index starts sorted by %s already; only the reversal is a real test", key)
	}
	order := func() ([]string, []float64) {
		err := chromedp.Do(ctx,
			chromedp.Click(chromedp.CSS(`#library-table button[data-sort-key="`+key+`"]`)),
			chromedp.Sleep(100*time.Millisecond),
		)
		if err != nil {
			t.Fatalf("clicking the %s header: %v", key, err)
		}
		got := eval[[]string](t, ctx, rowSlugsJS)
		vals := make([]float64, len(got))
		for i, s := range got {
			vals[i] = value[s]
		}
		return got, vals
	}
	first, v1 := order()
	if len(first) != len(slugs) {
		t.Fatalf("sorting changed the number of rows from %d to %d", len(slugs), len(first))
	}
	dir := 1.0
	if v1[0] > v1[len(v1)-1] {
		dir = -1
	}
	if !monotonic(v1, dir) {
		t.Errorf("after one click on %s the rows are not sorted: %v = %v", key, first, v1)
	}
	second, v2 := order()
	if !monotonic(v2, -dir) || v2[0] == v2[len(v2)-1] {
		t.Errorf("a second click on %s should reverse the order: %v = %v", key, second, v2)
	}
}

func testFilter(t *testing.T, ctx context.Context, slugs []string) {
	// type into the box as a person would; setValue clears it between cases
	filter := func(text string) []string {
		err := chromedp.Do(ctx,
			chromedp.Evaluate[chromedp.Void](`(() => { const f = document.getElementById('library-filter'); f.value = ''; f.dispatchEvent(new Event('input', {bubbles: true})); })()`),
			chromedp.SendKeys(chromedp.CSS("#library-filter"), text),
			chromedp.Sleep(150*time.Millisecond),
		)
		if err != nil {
			t.Fatalf("typing %q into the filter: %v", text, err)
		}
		return eval[[]string](t, ctx, visibleSlugsJS)
	}
	cases := []struct {
		text string
		want []string // nil: every row
	}{
		{"BX-7", []string{"bx-7"}},          // product code in one title only
		{"kestrelweave", []string{"kw-21"}}, // maker name, any case
		{"zzqx-nothing", []string{}},
		{"", nil},
	}
	for _, c := range cases {
		got := filter(c.text)
		want := c.want
		if want == nil {
			want = slugs
		}
		// the order is whatever the last sort left; compare the sets
		got, want = sortedCopy(got), sortedCopy(want)
		if strings.Join(got, " ") != strings.Join(want, " ") {
			t.Errorf("filter %q shows %d rows %v, want %v", c.text, len(got), got, want)
		}
	}
}

func sortedCopy(s []string) []string {
	c := append([]string{}, s...)
	sort.Strings(c)
	return c
}

func testDatasheet(t *testing.T, ctx context.Context, base string, con *consoleLog) {
	con.take()
	err := chromedp.Do(ctx,
		chromedp.Navigate(base+"/m/bw-93/index.html"),
		chromedp.WaitReady(chromedp.CSS("table.figures")),
		settle(),
	)
	if err != nil {
		t.Fatalf("loading a datasheet: %v", err)
	}
	charts := eval[int](t, ctx, `document.querySelectorAll('figure.chart').length`)
	svgs := eval[int](t, ctx, `document.querySelectorAll('figure.chart svg').length`)
	captions := eval[int](t, ctx, `document.querySelectorAll('figure.chart figcaption').length`)
	labelled := eval[int](t, ctx, `Array.from(document.querySelectorAll('figure.chart svg')).filter(s => s.closest('[role=img]') || s.closest('[aria-label]')).length`)
	sizes := eval[[]float64](t, ctx, `Array.from(document.querySelectorAll('figure.chart svg')).map(s => { const r = s.getBoundingClientRect(); return r.width * r.height; })`)
	rows := eval[int](t, ctx, `document.querySelectorAll('table.figures tbody tr').length`)
	for _, m := range con.take() {
		t.Errorf("m/bw-93/index.html: %s", m)
	}
	// BW-93 has UV-Vis-NIR and FTIR data: a solar and a thermal chart at least.
	if svgs < 2 {
		t.Errorf("datasheet shows %d charts (figure.chart svg), want at least 2 (solar and thermal)", svgs)
	}
	if captions < charts {
		t.Errorf("%d of %d charts have a figcaption (text alternative)", captions, charts)
	}
	if labelled < svgs {
		t.Errorf("%d of %d chart SVGs carry role=img or aria-label", labelled, svgs)
	}
	for i, a := range sizes {
		if a < 100*100 {
			t.Errorf("chart %d is drawn %g px², too small to read", i+1, a)
		}
	}
	// solar reflectance, transmittance, absorptance, UV, visible, near-IR,
	// thermal and window emittance at least
	if rows < 8 {
		t.Errorf("figure table has %d rows, want at least 8", rows)
	}
}

// linkAttr finds the tag name, the whole tag and the value of href and src
// attributes in generated HTML (html/template always double-quotes
// attribute values).
var linkAttr = regexp.MustCompile(`<([a-zA-Z]+)\b([^>]*?\s(?:href|src)\s*=\s*"([^"]*)"[^>]*)>`)

// relAttr finds the rel attribute of a tag.
var relAttr = regexp.MustCompile(`\srel\s*=\s*"([^"]*)"`)

// loads tells whether a tag with an external URL makes the browser fetch it:
// scripts, images and frames do; a <link> does for a stylesheet, icon,
// preload or manifest, but not as a canonical or alternate address.
func loads(tag, attrs string) bool {
	switch tag {
	case "a", "area":
		return false
	case "link":
		m := relAttr.FindStringSubmatch(attrs)
		if m == nil {
			return true
		}
		for _, rel := range strings.Fields(strings.ToLower(m[1])) {
			switch rel {
			case "stylesheet", "icon", "preload", "prefetch", "modulepreload", "manifest", "apple-touch-icon":
				return true
			}
		}
		return false
	}
	return true
}

// cssURL finds url(...) references in a stylesheet.
var cssURL = regexp.MustCompile(`url\(\s*['"]?([^'")]+)['"]?\s*\)`)

// testLinks crawls every page reachable from the index with plain HTTP and
// checks each internal link, script, stylesheet and fragment resolves.
func testLinks(t *testing.T, srv *httptest.Server) {
	base, _ := url.Parse(srv.URL + "/")
	type doc struct {
		status int
		ctype  string
		body   []byte
	}
	cache := map[string]*doc{}
	get := func(u *url.URL) *doc {
		key := u.Path
		if d, ok := cache[key]; ok {
			return d
		}
		res, err := srv.Client().Get(base.ResolveReference(&url.URL{Path: strings.TrimPrefix(u.Path, "/")}).String())
		if err != nil {
			t.Fatalf("GET %s: %v", u.Path, err)
		}
		body, _ := io.ReadAll(res.Body)
		res.Body.Close()
		d := &doc{res.StatusCode, res.Header.Get("Content-Type"), body}
		cache[key] = d
		return d
	}
	queue := []*url.URL{base.ResolveReference(&url.URL{Path: "index.html"})}
	seen := map[string]bool{queue[0].Path: true}
	checked := 0
	for len(queue) > 0 {
		page := queue[0]
		queue = queue[1:]
		d := get(page)
		if d.status != http.StatusOK {
			continue // reported where it was linked from
		}
		type ref struct{ tag, attrs, val string }
		var refs []ref
		switch {
		case strings.HasPrefix(d.ctype, "text/html"):
			for _, m := range linkAttr.FindAllSubmatch(d.body, -1) {
				refs = append(refs, ref{strings.ToLower(string(m[1])), string(m[2]), html.UnescapeString(string(m[3]))})
			}
		case strings.HasPrefix(d.ctype, "text/css"):
			for _, m := range cssURL.FindAllSubmatch(d.body, -1) {
				refs = append(refs, ref{"css", "", string(m[1])})
			}
		}
		for _, r := range refs {
			ref := r.val
			if ref == "" || strings.HasPrefix(ref, "data:") {
				continue
			}
			u, err := url.Parse(ref)
			if err != nil {
				t.Errorf("%s: link %q does not parse: %v", page.Path, ref, err)
				continue
			}
			if u.Scheme != "" || u.Host != "" {
				// the site must work offline: it may link out, but load nothing from outside
				if loads(r.tag, r.attrs) {
					t.Errorf("%s: <%s> loads an external resource %q", page.Path, r.tag, ref)
				}
				continue
			}
			if strings.HasPrefix(u.Path, "/") {
				t.Errorf("%s: link %q is absolute; site links must be relative", page.Path, ref)
				continue
			}
			target := page.ResolveReference(u)
			if !strings.HasPrefix(target.Path, base.Path) {
				t.Errorf("%s: link %q leaves the site", page.Path, ref)
				continue
			}
			checked++
			td := get(target)
			if td.status != http.StatusOK {
				t.Errorf("%s: link %q → %s gives %d", page.Path, ref, target.Path, td.status)
				continue
			}
			if frag := u.Fragment; frag != "" && strings.HasPrefix(td.ctype, "text/html") {
				if !bytes.Contains(td.body, []byte(`id="`+html.EscapeString(frag)+`"`)) {
					t.Errorf("%s: link %q: no element with id %q on %s", page.Path, ref, frag, target.Path)
				}
			}
			p := target.Path
			if strings.HasSuffix(p, "/") {
				p += "index.html"
			}
			if !seen[p] && (path.Ext(p) == ".html" || path.Ext(p) == ".css") {
				seen[p] = true
				queue = append(queue, &url.URL{Path: p})
			}
		}
	}
	if checked < 20 {
		t.Errorf("only %d internal links found from the index; the crawl is not reaching the site", checked)
	}
	for _, dir := range []string{"materials/by-category/", "materials/by-tag/"} {
		found := false
		for p := range seen {
			found = found || strings.HasPrefix(p, base.Path+dir)
		}
		if !found {
			t.Errorf("no page under %s was reached from the index", dir)
		}
	}
	t.Logf("checked %d internal links on %d pages and stylesheets", checked, len(seen))
}

// pageObject matches a page object of a PDF ("/Type /Page"), not a node of
// the page tree ("/Type /Pages"): ISO 32000-1 §7.7.3. Chromium writes these
// dictionaries uncompressed; on a 6-page print the count agreed with
// poppler's pdfinfo.
var pageObject = regexp.MustCompile(`/Type\s*/Page[^s]`)

func TestPDFPageObjects(t *testing.T) {
	// a skeleton of a PDF with a page tree of two pages (ISO 32000-1 §7.7.3),
	// written both spaced and unspaced as PDF writers do
	pdf := "%PDF-1.4\n1 0 obj\n<</Type /Catalog /Pages 2 0 R>>\nendobj\n" +
		"2 0 obj\n<</Type /Pages /Kids [3 0 R 4 0 R] /Count 2>>\nendobj\n" +
		"3 0 obj\n<</Type /Page\n/Parent 2 0 R>>\nendobj\n" +
		"4 0 obj\n<</Type/Page/Parent 2 0 R>>\nendobj\n" +
		"5 0 obj\n<</Type /ParentTree>>\nendobj\n"
	if n := len(pageObject.FindAllString(pdf, -1)); n != 2 {
		t.Errorf("counted %d page objects, want 2", n)
	}
}

// papers are the paper sizes a datasheet must print on in two pages:
// A4 is 210 × 297 mm = 8.27 × 11.69 in (ISO 216), US Letter 8.5 × 11 in
// (ANSI/ASME Y14.1).
var papers = []struct {
	name string
	size chromedp.PaperSize
}{
	{"A4", chromedp.PaperA4},
	{"Letter", chromedp.PaperLetter},
}

// minPrintPt is the smallest chart text allowed in print, in points: the
// size of small print on a datasheet (common practice, no source).
const minPrintPt = 7.0

// emulateMedia makes the page lay itself out for the given CSS media type
// ("print"), or for its own again ("").
func emulateMedia(media string) chromedp.Action[chromedp.Void] {
	return chromedp.Func(func(ctx context.Context, t *chromedp.Target) error {
		_, err := cdp.Call(ctx, t, emulation.SetEmulatedMedia, emulation.SetEmulatedMediaParams{Media: media})
		return err
	})
}

// printableWidthJS gives the width in CSS px of the printable area of a
// paper %g inches wide: the paper less the left and right margins of the
// stylesheet's @page rule (Chrome lays a print out at 96 CSS px per inch).
const printableWidthJS = `(() => {
	let left = '0px', right = '0px';
	for (const s of document.styleSheets) for (const r of s.cssRules) if (r.type === CSSRule.PAGE_RULE) {
		left = r.style.marginLeft || left; right = r.style.marginRight || right;
	}
	const d = document.createElement('div');
	d.style.cssText = 'position:absolute;left:0;top:0;height:1px;width:calc(%gin - ' + left + ' - ' + right + ')';
	document.body.appendChild(d);
	const w = d.getBoundingClientRect().width;
	d.remove();
	return w;
})()`

// chartTextJS finds the smallest chart text as drawn, in points: each
// text's font size in SVG units times the drawn width of its SVG over the
// width of its viewBox, at 72 pt to 96 CSS px. Checked once against a
// printed A4 PDF: the word boxes that poppler's pdftotext -bbox gives for
// chart text, over the ascent plus descent of the font used (Liberation
// Sans, 1.117 em), came to 7.39 pt where this gave 7.37 pt.
const chartTextJS = `(() => {
	let min = Infinity, where = '', n = 0;
	for (const svg of document.querySelectorAll('figure.chart svg')) {
		const r = svg.getBoundingClientRect(), vb = svg.viewBox.baseVal;
		if (!r.width || !vb || !vb.width) continue;
		for (const t of svg.querySelectorAll('text')) {
			if (!t.textContent.trim()) continue;
			n++;
			const pt = parseFloat(getComputedStyle(t).fontSize) * r.width / vb.width * 72 / 96;
			if (pt < min) { min = pt; where = svg.closest('figure').id + ': "' + t.textContent + '"'; }
		}
	}
	return {pt: n ? min : 0, where: where, n: n};
})()`

// chartText is the result of chartTextJS.
type chartText struct {
	PT    float64 `json:"pt"`
	Where string  `json:"where"`
	N     int     `json:"n"`
}

func testPrint(t *testing.T, ctx context.Context, base string, slugs []string) {
	defer chromedp.Do(ctx, emulateMedia(""), chromedp.ResetViewport())
	for _, slug := range slugs {
		err := chromedp.Do(ctx,
			chromedp.Navigate(base+"/m/"+slug+"/index.html"),
			chromedp.WaitReady(chromedp.CSS("table.figures")),
			settle(),
		)
		if err != nil {
			t.Fatalf("loading m/%s/: %v", slug, err)
		}
		for _, paper := range papers {
			pdf, err := chromedp.Run(ctx, chromedp.PrintToPDF(chromedp.PDFPaper(paper.size)))
			if err != nil {
				t.Fatalf("printing m/%s/ on %s: %v", slug, paper.name, err)
			}
			if dir := os.Getenv("SKYSHEET_PRINT_DIR"); dir != "" {
				// keep the prints to look at them (e.g. with pdftoppm)
				if err := os.WriteFile(filepath.Join(dir, slug+"-"+paper.name+".pdf"), pdf, 0o644); err != nil {
					t.Error(err)
				}
			}
			n := len(pageObject.FindAll(pdf, -1))
			switch {
			case n == 0:
				t.Errorf("m/%s/: no page objects found in the %d-byte %s PDF", slug, len(pdf), paper.name)
			case n > 2:
				t.Errorf("m/%s/ prints to %d %s pages, want at most 2", slug, n, paper.name)
			}

			// The chart text as printed: the page laid out for print at the
			// width of the paper's printable area.
			w := eval[float64](t, ctx, fmt.Sprintf(printableWidthJS, paper.size.Width))
			if w < 500 || w > 820 {
				t.Fatalf("printable width on %s worked out at %g CSS px; the @page margins do not parse", paper.name, w)
			}
			if err := chromedp.Do(ctx, chromedp.EmulateViewport(int64(w), 1000), emulateMedia("print"), chromedp.Sleep(50*time.Millisecond)); err != nil {
				t.Fatal(err)
			}
			txt := eval[chartText](t, ctx, chartTextJS)
			if err := chromedp.Do(ctx, emulateMedia(""), chromedp.ResetViewport()); err != nil {
				t.Fatal(err)
			}
			if txt.N == 0 {
				t.Errorf("m/%s/ on %s: no chart text found", slug, paper.name)
				continue
			}
			if txt.PT < minPrintPt {
				t.Errorf("m/%s/ on %s: chart text prints at %.2f pt (%s), want at least %g pt", slug, paper.name, txt.PT, txt.Where, minPrintPt)
			}
			t.Logf("m/%s/ on %s: %d pages, smallest chart text %.2f pt", slug, paper.name, n, txt.PT)
		}
	}
}

// chartRowsJS groups the charts of a page into rows (by their top) and
// reports, for each row, the share of the row's width its charts and the
// gaps between them take, and the drawn width of every chart's SVG.
const chartRowsJS = `(() => {
	const box = document.querySelector('.charts');
	if (!box) return {rows: [], svgs: []};
	const cw = box.getBoundingClientRect().width;
	const gap = parseFloat(getComputedStyle(box).columnGap) || 0;
	const rows = new Map();
	for (const f of box.querySelectorAll(':scope > figure.chart')) {
		const r = f.getBoundingClientRect(), top = Math.round(r.top);
		if (!rows.has(top)) rows.set(top, []);
		rows.get(top).push({id: f.id, w: r.width});
	}
	return {
		rows: Array.from(rows.values()).map(fs => ({ids: fs.map(f => f.id).join(' '),
			share: (fs.reduce((a, f) => a + f.w, 0) + gap * (fs.length - 1)) / cw})),
		svgs: Array.from(box.querySelectorAll('figure.chart svg')).map(s => s.getBoundingClientRect().width),
	};
})()`

// chartOutsideJS lists the charts whose drawing or caption is not within
// the chart's frame.
const chartOutsideJS = `Array.from(document.querySelectorAll('figure.chart')).filter(f => {
	const r = f.getBoundingClientRect();
	return Array.from(f.querySelectorAll(':scope > svg, :scope > figcaption')).some(c => {
		const q = c.getBoundingClientRect();
		return q.left < r.left - 0.5 || q.right > r.right + 0.5 || q.top < r.top - 0.5 || q.bottom > r.bottom + 0.5;
	});
}).map(f => f.id)`

// chartRows is the result of chartRowsJS.
type chartRows struct {
	Rows []struct {
		IDs   string  `json:"ids"`
		Share float64 `json:"share"`
	} `json:"rows"`
	SVGs []float64 `json:"svgs"`
}

// testChartRows checks on every datasheet and comparison, on a desktop
// screen, a narrower one and in print, that each chart's drawing lies
// within its frame (on the index too), that each row of charts takes the
// whole row (a chart alone in its row does not leave the rest empty), and
// that every chart of a page is drawn at about one width, so that its text
// keeps one size.
func testChartRows(t *testing.T, ctx context.Context, base string, slugs []string) {
	defer chromedp.Do(ctx, emulateMedia(""), chromedp.ResetViewport())
	pages := []string{"compare/white-roof-surfaces/index.html", "compare/metal-backed/index.html"}
	for _, s := range slugs {
		pages = append(pages, "m/"+s+"/index.html")
	}
	layouts := []struct {
		name  string
		width int64
		media string
	}{
		{"1280 px", 1280, ""},
		{"800 px", 800, ""},
		{"print", 718, "print"}, // A4's printable width at 10 mm margins
	}
	lone := 0
	for _, p := range append(pages, "index.html") {
		if err := chromedp.Do(ctx, chromedp.Navigate(base+"/"+p), settle()); err != nil {
			t.Fatalf("loading %s: %v", p, err)
		}
		for _, l := range layouts {
			if err := chromedp.Do(ctx, chromedp.EmulateViewport(l.width, 1000), emulateMedia(l.media), chromedp.Sleep(50*time.Millisecond)); err != nil {
				t.Fatal(err)
			}
			for _, id := range eval[[]string](t, ctx, chartOutsideJS) {
				t.Errorf("%s at %s: the drawing of chart %q runs outside its frame", p, l.name, id)
			}
			if p == "index.html" {
				continue
			}
			got := eval[chartRows](t, ctx, chartRowsJS)
			if len(got.SVGs) == 0 {
				t.Errorf("%s: no charts", p)
				continue
			}
			for _, r := range got.Rows {
				if !strings.Contains(r.IDs, " ") {
					lone++
				}
				if r.Share < 0.97 {
					t.Errorf("%s at %s: the row of charts %q takes %.0f %% of the width, want all of it", p, l.name, r.IDs, 100*r.Share)
				}
			}
			lo, hi := slices.Min(got.SVGs), slices.Max(got.SVGs)
			if hi > lo*1.1 {
				t.Errorf("%s at %s: charts drawn from %.0f to %.0f px wide, want one width (±10 %%) so that their text keeps one size", p, l.name, lo, hi)
			}
		}
	}
	if lone == 0 {
		t.Error("no chart stood alone in its row on any page or layout: the check above checked nothing")
	}
}

// phoneW and phoneH are the size of a phone screen in CSS px.
const phoneW, phoneH = 390, 844

// reachableJS scrolls each cell of the first row of the library table into
// view in turn and reports those that are then not visible within the
// screen, are covered by something else, or leave the material's name
// (the first line of the row's title cell) out of view, so that a figure
// could not be told apart from the next row's.
const reachableJS = `(() => {
	const bad = [];
	const row = document.querySelector('#library-table tbody tr[data-slug]');
	const title = row.querySelector('td[data-key="title"]');
	const seen = (c, what) => {
		const r = c.getBoundingClientRect();
		const x = r.left + r.width / 2, y = r.top + Math.min(r.height / 2, 10);
		const hit = document.elementFromPoint(x, y);
		if (r.left < -0.5 || r.right > innerWidth + 0.5 || !hit || !c.contains(hit)) bad.push(what + ' at ' + Math.round(r.left) + '–' + Math.round(r.right) + ' px');
	};
	for (const c of row.querySelectorAll('td[data-key]')) {
		c.scrollIntoView({block: 'center', inline: 'nearest'});
		seen(c, c.dataset.key);
		if (c !== title) seen(title, 'the material name beside ' + c.dataset.key);
	}
	for (const s of document.querySelectorAll('.table-scroll')) s.scrollLeft = 0;
	scrollTo(0, 0);
	return bad;
})()`

// testPhone checks the pages on a phone screen: no page scrolls sideways,
// every figure of the library table can be scrolled into view, and the
// table still sorts and filters.
func testPhone(t *testing.T, ctx context.Context, srv *httptest.Server, slugs []string) {
	defer chromedp.Do(ctx, chromedp.ResetViewport())
	if err := chromedp.Do(ctx, chromedp.EmulateViewport(phoneW, phoneH, chromedp.EmulateMobile)); err != nil {
		t.Fatal(err)
	}
	for _, p := range pageKinds {
		if err := chromedp.Do(ctx, chromedp.Navigate(srv.URL+"/"+p), settle()); err != nil {
			t.Fatalf("loading %s: %v", p, err)
		}
		if w := eval[float64](t, ctx, `document.documentElement.scrollWidth`); w > phoneW {
			t.Errorf("%s at %d px: the page is %g px wide and scrolls sideways", p, phoneW, w)
		}
		if dir := os.Getenv("SKYSHEET_PRINT_DIR"); dir != "" {
			png, err := chromedp.Run(ctx, chromedp.FullScreenshot(100))
			if err == nil {
				err = os.WriteFile(filepath.Join(dir, "phone-"+strings.NewReplacer("/", "-", ".html", "").Replace(p)+".png"), png, 0o644)
			}
			if err != nil {
				t.Error(err)
			}
		}
	}
	if err := chromedp.Do(ctx, chromedp.Navigate(srv.URL+"/index.html"), settle()); err != nil {
		t.Fatal(err)
	}
	cells := eval[int](t, ctx, `document.querySelectorAll('#library-table tbody tr[data-slug]:first-child td.num[data-key]').length`)
	if cells < 3 {
		t.Fatalf("the first row of the library table has %d figure cells, want at least 3", cells)
	}
	for _, c := range eval[[]string](t, ctx, reachableJS) {
		t.Errorf("index at %d px, first row, scrolled to each figure: %s is not in view", phoneW, c)
	}
	testSort(t, ctx, srv, slugs)
	testFilter(t, ctx, slugs)
}

// pageKinds are one page of every kind of the demo site.
var pageKinds = []string{
	"index.html",
	"m/bw-93/index.html",
	"m/sf-50/weather.html",
	"materials/by-category/paint/index.html",
	"compare/white-roof-surfaces/index.html",
	"review/index.html",
}

// axeScript is axe-core's browser bundle as installed by
// `npm ci --prefix testdata/axe` (see .ci/run).
const axeScript = "../../testdata/axe/node_modules/axe-core/axe.min.js"

// axeRunJS runs every axe-core rule on the page and returns the
// violations.
const axeRunJS = `axe.run(document, {resultTypes: ['violations']}).then(r => r.violations.map(v => ({
	id: v.id, impact: v.impact || '', help: v.help,
	targets: v.nodes.map(n => n.target.join(' ') + (n.failureSummary ? ' (' + n.failureSummary.replace(/\s+/g, ' ') + ')' : '')),
})))`

// axeViolation is one violated rule of axe-core with the elements that
// violate it.
type axeViolation struct {
	ID      string   `json:"id"`
	Impact  string   `json:"impact"`
	Help    string   `json:"help"`
	Targets []string `json:"targets"`
}

// testAxe runs axe-core on one page of every kind at desktop and phone
// width and fails on every violation, whatever its impact (the pages have
// none).
func testAxe(t *testing.T, ctx context.Context, base string) {
	src, err := os.ReadFile(axeScript)
	if err != nil {
		if os.Getenv("CI") != "" {
			t.Fatalf("axe-core unavailable in CI: %v (run npm ci --prefix testdata/axe)", err)
		}
		t.Skipf("axe-core unavailable: %v (run npm ci --prefix testdata/axe)", err)
	}
	defer chromedp.Do(ctx, chromedp.ResetViewport())
	for _, w := range []int64{1280, phoneW} {
		for _, p := range pageKinds {
			err := chromedp.Do(ctx,
				chromedp.EmulateViewport(w, 900),
				chromedp.Navigate(base+"/"+p),
				settle(),
				chromedp.Evaluate[chromedp.Void](string(src)),
			)
			if err != nil {
				t.Fatalf("loading %s with axe-core: %v", p, err)
			}
			vs, err := chromedp.Run(ctx, chromedp.Evaluate[[]axeViolation](axeRunJS, chromedp.EvalAwaitPromise))
			if err != nil {
				t.Fatalf("running axe-core on %s: %v", p, err)
			}
			for _, v := range vs {
				t.Errorf("%s at %d px: %s (%s): %s\n\t%s", p, w, v.ID, v.Impact, v.Help, strings.Join(v.Targets, "\n\t"))
			}
		}
	}
}

// TestFigureHeadingsExplained renders the demo library and checks the
// headings of every datasheet's figure table: plain words, no shorthand,
// and for each term a reader may not know, a link to a note on the same
// page that explains it.
func TestFigureHeadingsExplained(t *testing.T) {
	out := t.TempDir()
	if code, stdout, stderr := runCLI("render", "--site", out, "--no-cache", "../.."); code != 0 {
		t.Fatalf("skysheet render of the demo library exited %d\nstdout:\n%s\nstderr:\n%s", code, stdout, stderr)
	}
	pages, err := filepath.Glob(filepath.Join(out, "m", "*", "index.html"))
	if err != nil || len(pages) == 0 {
		t.Fatalf("no datasheets rendered: %v", err)
	}
	thead := regexp.MustCompile(`(?s)<table class="figures">\s*<thead>(.*?)</thead>`)
	th := regexp.MustCompile(`(?s)<th scope="col"[^>]*>(.*?)</th>`)
	tag := regexp.MustCompile(`<[^>]*>`)
	ref := regexp.MustCompile(`<a class="note-ref" href="#([^"]+)"`)
	// shorthand the headings once used; the notes spell these out
	jargon := []string{"indep.", "together", "Std.", "σ", "k ="}
	withUnc := 0
	for _, p := range pages {
		b, err := os.ReadFile(p)
		if err != nil {
			t.Fatal(err)
		}
		page := string(b)
		name, _ := filepath.Rel(out, p)
		m := thead.FindStringSubmatch(page)
		if m == nil {
			t.Errorf("%s: no figure table", name)
			continue
		}
		explained := map[string]bool{}
		for _, h := range th.FindAllStringSubmatch(m[1], -1) {
			words := html.UnescapeString(tag.ReplaceAllString(h[1], " "))
			for _, j := range jargon {
				if strings.Contains(words, j) {
					t.Errorf("%s: the heading %q uses the shorthand %q", name, strings.Join(strings.Fields(words), " "), j)
				}
			}
			label := strings.Fields(words)[0]
			for _, r := range ref.FindAllStringSubmatch(h[1], -1) {
				note := regexp.MustCompile(`(?s)id="` + regexp.QuoteMeta(r[1]) + `"><dt>([^<]+)</dt><dd>(.+?)</dd>`).FindStringSubmatch(page)
				if note == nil {
					t.Errorf("%s: heading %s links to #%s, which is not a note (dt and dd) on the page", name, label, r[1])
					continue
				}
				if len(strings.Fields(tag.ReplaceAllString(note[2], " "))) < 12 {
					t.Errorf("%s: the note on %s is too short to explain it: %q", name, note[1], note[2])
				}
				explained[label] = true
			}
		}
		want := []string{"Weighting", "Coverage"}
		if strings.Contains(m[1], "Uncertainty") {
			want = append(want, "Uncertainty")
			withUnc++
		}
		for _, w := range want {
			if !explained[w] {
				t.Errorf("%s: the heading %s has no link to a note explaining it", name, w)
			}
		}
		if strings.Contains(page, "Closure check") {
			t.Errorf("%s: says \"Closure check\"; the energy balance R + T + A = 1 is meant", name)
		}
	}
	if withUnc == 0 {
		t.Error("no demo datasheet has an uncertainty column: its note went unchecked")
	}
}

// testSearch uses the search box of a datasheet opened from file://, as a
// reader with the site on disk would (a page from file:// may load a
// script but not fetch a file): a word of a title, maker, lab, product
// code, tag or notes lists the materials holding it, a link leads to the
// material, nothing is logged as an error, and axe-core finds no
// violation with the list open.
func testSearch(t *testing.T, ctx context.Context, site string, con *consoleLog) {
	page := (&url.URL{Scheme: "file", Path: filepath.ToSlash(site) + "/m/bw-93/index.html"}).String()
	if err := chromedp.Do(ctx, chromedp.Navigate(page), settle()); err != nil {
		t.Fatalf("loading %s: %v", page, err)
	}
	con.take()
	search := func(text string) []string {
		err := chromedp.Do(ctx,
			chromedp.Evaluate[chromedp.Void](`(() => { const f = document.getElementById('site-search'); f.value = ''; f.dispatchEvent(new Event('input', {bubbles: true})); })()`),
			chromedp.SendKeys(chromedp.CSS("#site-search"), text),
			chromedp.Poll[chromedp.Void](`document.getElementById('site-search-count').textContent !== ''`, chromedp.WithPollingTimeout(10*time.Second)),
		)
		if err != nil {
			t.Fatalf("typing %q into the search box: %v", text, err)
		}
		return eval[[]string](t, ctx, `Array.from(document.querySelectorAll('#site-search-results a')).map(a => a.dataset.slug)`)
	}
	for _, c := range []struct {
		text string
		want []string
	}{
		{"Kestrelweave", []string{"kw-21"}},          // maker, another case
		{"BX-7", []string{"bx-7"}},                   // product code
		{"titania", []string{"bw-93", "bw-93-aged"}}, // tag
		{"skeleton", []string{"px-2"}},               // a word of the notes only
		{"glazed tile", []string{"at-w"}},            // every word must match
		{"zzqx-nothing", []string{}},
	} {
		got := search(c.text)
		if strings.Join(sortedCopy(got), " ") != strings.Join(sortedCopy(c.want), " ") {
			t.Errorf("search %q lists %v, want %v", c.text, got, c.want)
		}
	}
	if msg := eval[string](t, ctx, `document.getElementById('site-search-count').textContent`); msg != "No material matches." {
		t.Errorf("no match: the count says %q", msg)
	}

	search("kestrelweave")
	href := eval[string](t, ctx, `document.querySelector('#site-search-results a').href`)
	if !strings.HasSuffix(href, "/m/kw-21/index.html") {
		t.Errorf("the match links %s", href)
	}
	if errs := con.take(); len(errs) > 0 {
		t.Errorf("errors while searching:\n%s", strings.Join(errs, "\n"))
	}
	if err := chromedp.Do(ctx, chromedp.Navigate(href), settle()); err != nil {
		t.Errorf("following the match to its datasheet: %v", err)
	}

	// axe-core last: it reads the stylesheets, which a page from file://
	// may not, and logs that as an error.
	if err := chromedp.Do(ctx, chromedp.Navigate(page), settle()); err != nil {
		t.Fatalf("loading %s: %v", page, err)
	}
	search("white")
	if src, err := os.ReadFile(axeScript); err == nil {
		if err := chromedp.Do(ctx, chromedp.Evaluate[chromedp.Void](string(src))); err != nil {
			t.Fatalf("loading axe-core: %v", err)
		}
		vs, err := chromedp.Run(ctx, chromedp.Evaluate[[]axeViolation](axeRunJS, chromedp.EvalAwaitPromise))
		if err != nil {
			t.Fatalf("running axe-core on the open search list: %v", err)
		}
		for _, v := range vs {
			t.Errorf("search list open: %s (%s): %s\n\t%s", v.ID, v.Impact, v.Help, strings.Join(v.Targets, "\n\t"))
		}
	} else if os.Getenv("CI") != "" {
		t.Fatalf("axe-core unavailable in CI: %v", err)
	}
	con.take()
}
