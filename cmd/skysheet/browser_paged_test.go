package main

import (
	"context"
	"encoding/json"
	"fmt"
	"math"
	"net/http"
	"net/http/httptest"
	"net/url"
	"os"
	"os/exec"
	"path/filepath"
	"slices"
	"strings"
	"testing"
	"time"

	"github.com/chromedp/cdproto/cdp"
	"github.com/chromedp/cdproto/emulation"
	"github.com/chromedp/chromedp"
)

// pagedN is the size of the generated library of TestBrowserPagedIndex:
// three pages of the index (100, 100 and 10 rows), small enough to render
// in seconds under the race detector.
const pagedN = 210

// indexRows is the number of rows of a page of the index (indexRows in
// datasheet/site).
const indexRows = 100

// TestBrowserPagedIndex generates an invented library of pagedN materials
// with bench/genlib (go run), renders it in-process, serves it on
// 127.0.0.1 and drives headless Chromium through its paged index: the
// first page is under 500 KB with everything it loads, and loads the
// rows script only when asked to sort or filter; sorting and filtering
// through the rows script reach materials beyond the first page; with
// JavaScript disabled the pager's links reach every material once; and
// axe-core finds no violation on the paged index, before and after
// sorting, and on a later page. The skip rules are TestBrowser's, and the
// go command is needed as well.
func TestBrowserPagedIndex(t *testing.T) {
	need := func(what string, err error) {
		if err == nil {
			return
		}
		if os.Getenv("CI") != "" {
			t.Fatalf("%s unavailable in CI: %v", what, err)
		}
		t.Skipf("%s unavailable: %v: paged index browser test skipped", what, err)
	}
	_, err := os.Stat(chromiumPath)
	need(chromiumPath+" (apt-get install chromium)", err)
	goCmd, err := exec.LookPath("go")
	need("the go command", err)
	if testing.Short() {
		t.Skip("generates and renders a library of a few hundred materials")
	}

	lib := filepath.Join(t.TempDir(), "lib")
	start := time.Now()
	gen := exec.Command(goCmd, "run", "skysheet/bench/genlib", "-n", fmt.Sprint(pagedN), "-o", lib)
	if out, err := gen.CombinedOutput(); err != nil {
		t.Fatalf("go run skysheet/bench/genlib: %v\n%s", err, out)
	}
	site := t.TempDir()
	if code, stdout, stderr := runCLI("render", "--site", site, lib); code != 0 {
		t.Fatalf("skysheet render of the generated library exited %d\nstdout:\n%s\nstderr:\n%s", code, stdout, stderr)
	}
	t.Logf("generated and rendered %d materials in %v", pagedN, time.Since(start).Round(time.Millisecond))
	cat := readCatalog(t, site)
	if len(cat) != pagedN {
		t.Fatalf("catalog.json lists %d materials, want %d", len(cat), pagedN)
	}

	srv := httptest.NewServer(http.FileServer(http.Dir(site)))
	defer srv.Close()
	ctx, cancel := context.WithTimeout(context.Background(), 5*time.Minute)
	defer cancel()
	allocCtx, cancelAlloc := chromedp.NewExecAllocator(ctx,
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
	)
	defer cancelAlloc()
	bctx, cancelBrowser := chromedp.NewContext(allocCtx)
	defer cancelBrowser()
	con := &consoleLog{}
	if err := con.follow(bctx); err != nil {
		t.Fatalf("starting %s: %v", chromiumPath, err)
	}

	first := indexSlugs(t, bctx, srv.URL, con)
	if len(first) != indexRows {
		t.Fatalf("the index shows %d rows, want the first %d", len(first), indexRows)
	}
	t.Run("FirstPage", func(t *testing.T) { testFirstPage(t, bctx, site) })
	t.Run("Sort", func(t *testing.T) { testPagedSort(t, bctx, cat, first) })
	t.Run("Filter", func(t *testing.T) { testPagedFilter(t, bctx, srv.URL, cat, first) })
	t.Run("NoScript", func(t *testing.T) { testPagedNoScript(t, bctx, srv.URL, cat) })
	t.Run("Accessibility", func(t *testing.T) { testPagedAxe(t, bctx, srv.URL) })
	for _, m := range con.take() {
		t.Errorf("console: %s", m)
	}
}

// catalogEntry is what the paged index test reads of a material in
// catalog.json.
type catalogEntry struct {
	Slug     string              `json:"slug"`
	Title    string              `json:"title"`
	Maker    string              `json:"maker"`
	Category string              `json:"category"`
	Headline map[string]*float64 `json:"headline"`
}

func readCatalog(t *testing.T, site string) []catalogEntry {
	t.Helper()
	data, err := os.ReadFile(filepath.Join(site, "catalog.json"))
	if err != nil {
		t.Fatal(err)
	}
	var cat struct {
		Materials []catalogEntry `json:"materials"`
	}
	if err := json.Unmarshal(data, &cat); err != nil {
		t.Fatalf("catalog.json: %v", err)
	}
	return cat.Materials
}

// testFirstPage checks the weight of the index as first loaded: the HTML
// and everything the browser fetched for it, with the rows script not
// among them.
func testFirstPage(t *testing.T, ctx context.Context, site string) {
	info, err := os.Stat(filepath.Join(site, "index.html"))
	if err != nil {
		t.Fatal(err)
	}
	type resource struct {
		Name string  `json:"name"`
		Size float64 `json:"size"`
	}
	loaded := eval[[]resource](t, ctx, `performance.getEntriesByType('navigation').concat(performance.getEntriesByType('resource')).map(e => ({name: e.name, size: e.transferSize}))`)
	total := 0.0
	for _, r := range loaded {
		total += r.Size
		if strings.HasSuffix(r.Name, "/rows.js") {
			t.Errorf("the first page loads %s before any sorting or filtering", r.Name)
		}
	}
	t.Logf("index.html %d bytes; the first load fetched %d resources, %.0f bytes", info.Size(), len(loaded), total)
	if info.Size() >= 500_000 || total >= 500_000 {
		t.Errorf("first page: index.html %d bytes, %.0f bytes loaded; want under 500 KB", info.Size(), total)
	}
}

// headline returns the figure key of every material that has it.
func headline(cat []catalogEntry, key string) map[string]float64 {
	out := map[string]float64{}
	for _, m := range cat {
		if v := m.Headline[key]; v != nil && !math.IsNaN(*v) {
			out[m.Slug] = *v
		}
	}
	return out
}

// testPagedSort sorts by solar reflectance: the rows shown come from the
// whole library (the lowest first, then the highest), not from the first
// page alone.
func testPagedSort(t *testing.T, ctx context.Context, cat []catalogEntry, first []string) {
	const key = "solar_reflectance"
	value := headline(cat, key)
	lowest, highest := "", ""
	for s, v := range value {
		if lowest == "" || v < value[lowest] || v == value[lowest] && s < lowest {
			lowest = s
		}
		if highest == "" || v > value[highest] || v == value[highest] && s < highest {
			highest = s
		}
	}
	click := func() []string {
		err := chromedp.Do(ctx,
			chromedp.Click(chromedp.CSS(`#library-table button[data-sort-key="`+key+`"]`)),
			chromedp.Poll[chromedp.Void](`window.skysheetRows !== undefined`, chromedp.WithPollingTimeout(15*time.Second)),
			chromedp.Sleep(100*time.Millisecond),
		)
		if err != nil {
			t.Fatalf("sorting by %s: %v", key, err)
		}
		return eval[[]string](t, ctx, rowSlugsJS)
	}
	for _, dir := range []struct {
		name string
		want string
		sign float64
	}{{"ascending", lowest, 1}, {"descending", highest, -1}} {
		got := click()
		if len(got) != indexRows {
			t.Fatalf("%s: %d rows shown, want %d", dir.name, len(got), indexRows)
		}
		vals := make([]float64, len(got))
		for i, s := range got {
			vals[i] = value[s]
		}
		if got[0] != dir.want || !monotonic(vals, dir.sign) {
			t.Errorf("%s by %s: first %s, want %s of the whole library; sorted %v", dir.name, key, got[0], dir.want, monotonic(vals, dir.sign))
		}
		beyond := 0
		for _, s := range got {
			if !slices.Contains(first, s) {
				beyond++
			}
		}
		if beyond == 0 {
			t.Errorf("%s: every row shown is from the first page", dir.name)
		}
	}
}

// testPagedFilter filters by a product code found only beyond the first
// page, and by a word that matches more than a page of rows, which are
// then listed a hundred at a time.
func testPagedFilter(t *testing.T, ctx context.Context, base string, cat []catalogEntry, first []string) {
	if err := chromedp.Do(ctx, chromedp.Navigate(base+"/index.html"), settle()); err != nil {
		t.Fatal(err)
	}
	matching := func(term string) []string {
		var out []string
		for _, m := range cat {
			if strings.Contains(strings.ToLower(m.Title+" "+m.Maker+" "+m.Category), strings.ToLower(term)) {
				out = append(out, m.Slug)
			}
		}
		return out
	}
	// The last material of the index, on its last page; its title's
	// product code (the word with a hyphen) should match it alone.
	last := cat[len(cat)-1]
	code := ""
	for _, w := range strings.Fields(last.Title) {
		if strings.Contains(w, "-") {
			code = w
		}
	}
	if code == "" || slices.Contains(first, last.Slug) {
		t.Fatalf("no product code in %q, or %s on the first page", last.Title, last.Slug)
	}
	// The word of the most materials among a few of every generated library.
	word, most := "", 0
	for _, w := range []string{"paint", "white", "invented"} {
		if n := len(matching(w)); n > most {
			word, most = w, n
		}
	}
	if most <= indexRows {
		t.Fatalf("no filter word matches more than %d materials", indexRows)
	}
	filter := func(text string) []string {
		err := chromedp.Do(ctx,
			chromedp.Evaluate[chromedp.Void](`(() => { const f = document.getElementById('library-filter'); f.value = ''; f.dispatchEvent(new Event('input', {bubbles: true})); })()`),
			chromedp.SendKeys(chromedp.CSS("#library-filter"), text),
			chromedp.Poll[chromedp.Void](`window.skysheetRows !== undefined`, chromedp.WithPollingTimeout(15*time.Second)),
			chromedp.Sleep(150*time.Millisecond),
		)
		if err != nil {
			t.Fatalf("typing %q into the filter: %v", text, err)
		}
		return eval[[]string](t, ctx, visibleSlugsJS)
	}
	if got, want := filter(code), matching(code); !slices.Equal(sortedCopy(got), sortedCopy(want)) || !slices.Contains(got, last.Slug) {
		t.Errorf("filter %q shows %v, want %v", code, got, want)
	}
	got, want := filter(word), matching(word)
	if len(got) != indexRows {
		t.Errorf("filter %q shows %d rows, want the first %d of %d", word, len(got), indexRows, len(want))
	}
	count := eval[string](t, ctx, `document.querySelector('.filter-count').textContent`)
	if !strings.HasPrefix(count, fmt.Sprintf("%d of %d shown", len(want), len(cat))) {
		t.Errorf("filter %q: the count says %q, want %d of %d", word, count, len(want), len(cat))
	}
	for len(got) < len(want) {
		n := len(got)
		if err := chromedp.Do(ctx, chromedp.Click(chromedp.CSS("button.more-rows")), chromedp.Sleep(100*time.Millisecond)); err != nil {
			t.Fatalf("showing more rows: %v", err)
		}
		if got = eval[[]string](t, ctx, visibleSlugsJS); len(got) <= n {
			t.Fatalf("showing more rows: still %d of %d", len(got), len(want))
		}
	}
	if !slices.Equal(sortedCopy(got), sortedCopy(want)) {
		t.Errorf("filter %q, every row shown: %d rows, want %d", word, len(got), len(want))
	}
}

// testPagedNoScript follows the pager from the index in a tab with
// JavaScript disabled, as a reader without it would: every material is on
// exactly one page.
func testPagedNoScript(t *testing.T, ctx context.Context, base string, cat []catalogEntry) {
	tab, cancel := chromedp.NewContext(ctx)
	defer cancel()
	// A guard only: every page here loads in well under a second.
	tab, cancelTimeout := context.WithTimeout(tab, time.Minute)
	defer cancelTimeout()
	noScript := chromedp.Func(func(ctx context.Context, tg *chromedp.Target) error {
		_, err := cdp.Call(ctx, tg, emulation.SetScriptExecutionDisabled, emulation.SetScriptExecutionDisabledParams{Value: true})
		return err
	})
	if err := chromedp.Do(tab, noScript); err != nil {
		t.Fatalf("disabling JavaScript: %v", err)
	}
	seen := map[string]int{}
	visited := map[string]bool{}
	queue := []string{base + "/index.html"}
	for len(queue) > 0 {
		page := queue[0]
		queue = queue[1:]
		if visited[page] {
			continue
		}
		visited[page] = true
		if err := chromedp.Do(tab, chromedp.Navigate(page), chromedp.WaitReady(chromedp.CSS("table.materials"))); err != nil {
			t.Fatalf("%s without JavaScript: %v", page, err)
		}
		nodes := func(sel string) []*chromedp.Node {
			ns, err := chromedp.Run(tab, chromedp.Nodes(chromedp.CSSAll(sel)))
			if err != nil {
				t.Fatalf("%s without JavaScript, %s: %v", page, sel, err)
			}
			return ns
		}
		// Every page has its rows and its pager (a query waits for at
		// least one match).
		rows, links := nodes(`table.materials tbody tr[data-slug]`), nodes(`nav.pager a[href]`)
		if len(visited) == 1 {
			// The script unhides the index's filter box: hidden, it did
			// not run.
			for _, n := range nodes(`.table-tools`) {
				if _, hidden := n.Attribute("hidden"); !hidden {
					t.Fatalf("%s: the filter box is shown, so scripts ran", page)
				}
			}
		}
		for _, n := range rows {
			seen[n.AttributeValue("data-slug")]++
		}
		u, err := url.Parse(page)
		if err != nil {
			t.Fatal(err)
		}
		for _, n := range links {
			ref, err := u.Parse(n.AttributeValue("href"))
			if err != nil {
				t.Fatalf("%s: pager link %q: %v", page, n.AttributeValue("href"), err)
			}
			queue = append(queue, ref.String())
		}
	}
	want := (len(cat) + indexRows - 1) / indexRows
	if len(visited) != want {
		t.Errorf("the pager reaches %d pages, want %d", len(visited), want)
	}
	for _, m := range cat {
		if seen[m.Slug] != 1 {
			t.Errorf("%s is on %d pages of the index, want 1", m.Slug, seen[m.Slug])
		}
	}
	if len(seen) != len(cat) {
		t.Errorf("the pages list %d materials, the catalog %d", len(seen), len(cat))
	}
}

// testPagedAxe runs axe-core on the paged index as loaded and after a
// sort (rows built by the script, the "more" button shown) and on its
// second page, at desktop and phone widths.
func testPagedAxe(t *testing.T, ctx context.Context, base string) {
	src, err := os.ReadFile(axeScript)
	if err != nil {
		if os.Getenv("CI") != "" {
			t.Fatalf("axe-core unavailable in CI: %v (run npm ci --prefix testdata/axe)", err)
		}
		t.Skipf("axe-core unavailable: %v (run npm ci --prefix testdata/axe)", err)
	}
	defer chromedp.Do(ctx, chromedp.ResetViewport())
	for _, w := range []int64{1280, phoneW} {
		for _, p := range []struct {
			name, page string
			then       chromedp.Action[chromedp.Void]
		}{
			{"index", "index.html", nil},
			{"index sorted", "index.html", chromedp.Steps(
				chromedp.Click(chromedp.CSS(`#library-table button[data-sort-key="thermal_emittance"]`)),
				chromedp.Poll[chromedp.Void](`window.skysheetRows !== undefined`, chromedp.WithPollingTimeout(15*time.Second)),
				chromedp.Sleep(100*time.Millisecond))},
			{"page 2", "materials/page/2/index.html", nil},
		} {
			steps := []chromedp.Action[chromedp.Void]{chromedp.EmulateViewport(w, 900), chromedp.Navigate(base + "/" + p.page), settle()}
			if p.then != nil {
				steps = append(steps, p.then)
			}
			steps = append(steps, chromedp.Evaluate[chromedp.Void](string(src)))
			if err := chromedp.Do(ctx, steps...); err != nil {
				t.Fatalf("loading %s with axe-core: %v", p.name, err)
			}
			vs, err := chromedp.Run(ctx, chromedp.Evaluate[[]axeViolation](axeRunJS, chromedp.EvalAwaitPromise))
			if err != nil {
				t.Fatalf("running axe-core on %s: %v", p.name, err)
			}
			for _, v := range vs {
				t.Errorf("%s at %d px: %s (%s): %s\n\t%s", p.name, w, v.ID, v.Impact, v.Help, strings.Join(v.Targets, "\n\t"))
			}
		}
	}
}
