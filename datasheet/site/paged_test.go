package site

import (
	"bytes"
	"encoding/csv"
	"encoding/json"
	"fmt"
	"os"
	"regexp"
	"strconv"
	"strings"
	"testing"
	"testing/fstest"

	"skysheet/datasheet/library"
)

// bigLibrary returns a library of n materials, all measured by the
// spectra of the test library's basalt, titled so that the index order is
// known: "Panel 0001", "Panel 0002", …
func bigLibrary(t *testing.T, n int) *library.Library {
	t.Helper()
	lib, err := library.Load(bigLibraryFS(t, n))
	if err != nil {
		t.Fatal(err)
	}
	return lib
}

// bigLibraryFS returns the files of bigLibrary(t, n); material number i
// is content/roof/p-%04d.md.
func bigLibraryFS(t *testing.T, n int) fstest.MapFS {
	t.Helper()
	read := func(p string) []byte {
		data, err := os.ReadFile("../../testdata/library/" + p)
		if err != nil {
			t.Fatal(err)
		}
		return data
	}
	fsys := fstest.MapFS{
		"skysheet.yaml":                 {Data: read("skysheet.yaml")},
		"content/roof/basalt-uvvis.csv": {Data: read("content/roof/basalt-uvvis.csv")},
		"content/roof/basalt-ftir.csv":  {Data: read("content/roof/basalt-ftir.csv")},
	}
	for i := range n {
		cat := []string{"paint", "film"}[i%2]
		fsys[fmt.Sprintf("content/roof/p-%04d.md", i+1)] = &fstest.MapFile{Data: fmt.Appendf(nil,
			"---\ntitle: Panel %04d (invented)\nmaker: Invented Panels (invented)\ncategory: %s\nspectra:\n  - file: basalt-uvvis.csv\n  - file: basalt-ftir.csv\n---\nInvented.\n", i+1, cat)}
	}
	return fsys
}

// TestPagedTables checks a library longer than a page: the index shows
// the first pageRows rows and links pages that, followed without
// JavaScript, reach every material once; the category listings are paged
// the same way; the rows script holds every material for sorting and
// filtering in the browser; and every link resolves.
func TestPagedTables(t *testing.T) {
	const n = 2*pageRows + 37
	out := renderTest(t, bigLibrary(t, n), Options{})
	rowRE := regexp.MustCompile(`<tr data-slug="([^"]+)">`)
	index := string(out["index.html"])
	if got := len(rowRE.FindAllString(index, -1)); got != pageRows {
		t.Errorf("index shows %d rows, want %d", got, pageRows)
	}
	if !strings.Contains(index, `data-rows="`+rowsScript+`"`) || !strings.Contains(index, fmt.Sprintf(`data-total="%d"`, n)) {
		t.Error("the index table does not name the rows script and the total")
	}
	// Follow the pager from the index as a reader without JavaScript would.
	seen := map[string]int{}
	pages := []string{"index.html", indexPagesDir + "2/index.html", indexPagesDir + "3/index.html"}
	for _, p := range pages {
		html, ok := out[p]
		if !ok {
			t.Fatalf("page %s is missing", p)
		}
		if !strings.Contains(string(html), `aria-current="page"`) {
			t.Errorf("%s: the pager does not mark the current page", p)
		}
		for _, m := range rowRE.FindAllStringSubmatch(string(html), -1) {
			seen[m[1]]++
		}
	}
	if _, ok := out[indexPagesDir+"4/index.html"]; ok {
		t.Error("a page too many")
	}
	for i := range n {
		if s := fmt.Sprintf("p-%04d", i+1); seen[s] != 1 {
			t.Errorf("%s is on %d pages of the index, want 1", s, seen[s])
		}
	}
	// Rows keep their number in the whole library.
	if !strings.Contains(string(out[indexPagesDir+"3/index.html"]), `<td class="num-col">201</td>`) {
		t.Error("the third page does not start at row 201")
	}
	rows := string(out[rowsScript])
	if !strings.HasPrefix(rows, "// ") || !strings.Contains(rows, "window.skysheetRows = [[1,\"p-0001\",\"Panel 0001 (invented)\"") {
		t.Errorf("rows script starts %.120q", rows)
	}
	for i := range n {
		if !strings.Contains(rows, fmt.Sprintf(`"p-%04d"`, i+1)) {
			t.Fatalf("rows script misses p-%04d", i+1)
		}
	}
	// Listings: about half the materials each, so two pages.
	cat := listingDir("category", "paint")
	if _, ok := out[cat+"page/2/index.html"]; !ok {
		t.Errorf("the paint listing is not paged")
	}
	if len(out[cat+"index.html"]) > 400_000 || len(index) > 500_000 {
		t.Errorf("pages too large: index %d, listing %d bytes", len(index), len(out[cat+"index.html"]))
	}
	checkLinks(t, out)
}

// TestCatalogParts checks that catalog.json, whose materials' entries are
// made in parts of pageRows (each kept in the cache) and put into the
// document, lists every material once, in index order, indented as
// json.Indent indents it; and, for libraries whose catalog the catalog
// type reads back without loss, that it is the document
// json.MarshalIndent makes of the whole catalog.
func TestCatalogParts(t *testing.T) {
	type testCase struct {
		lib       *library.Library
		roundTrip bool
	}
	cases := map[string]testCase{"test library": {testLibrary(t), false}} // stacks, weather, claims
	for _, n := range []int{0, 1, pageRows, 2*pageRows + 37} {
		cases[fmt.Sprintf("%d materials", n)] = testCase{bigLibrary(t, n), true}
	}
	for name, tc := range cases {
		out := renderTest(t, tc.lib, Options{})
		// search.js, made in parts the same way, is the whole index as
		// json.Encoder writes it.
		js, ok := bytes.CutPrefix(out[searchIndexName], []byte("window.skysheetSearchIndex = "))
		var idx [][4]string
		if err := json.Unmarshal(js, &idx); !ok || err != nil || len(idx) != len(tc.lib.Materials) {
			t.Errorf("%s: %s holds %d entries (%v), want %d", name, searchIndexName, len(idx), err, len(tc.lib.Materials))
		}
		var whole bytes.Buffer
		json.NewEncoder(&whole).Encode(idx)
		if !bytes.Equal(js, whole.Bytes()) {
			t.Errorf("%s: %s is not the whole index as json.Encoder writes it", name, searchIndexName)
		}
		got := out["catalog.json"]
		var c catalog
		if err := json.Unmarshal(got, &c); err != nil {
			t.Fatalf("%s: %v", name, err)
		}
		if len(c.Materials) != len(tc.lib.Materials) {
			t.Errorf("%s: catalog.json lists %d materials, want %d", name, len(c.Materials), len(tc.lib.Materials))
		}
		for i := 1; i < len(c.Materials); i++ {
			if a, b := c.Materials[i-1], c.Materials[i]; strings.ToLower(a.Title) > strings.ToLower(b.Title) || a.Slug == b.Slug {
				t.Errorf("%s: %s listed before %s", name, a.Slug, b.Slug)
			}
		}
		var compact, indented bytes.Buffer
		if err := json.Compact(&compact, got); err != nil {
			t.Fatal(err)
		}
		json.Indent(&indented, compact.Bytes(), "", "  ")
		indented.WriteByte('\n')
		if !bytes.Equal(got, indented.Bytes()) {
			t.Errorf("%s: catalog.json is not indented as json.Indent indents it", name)
		}
		// The index's rows.js and materials.csv, made in parts the same way,
		// are every row once, in index order, as json.Marshal and
		// csv.Writer write the whole.
		if js, ok := out[rowsScript]; ok || len(tc.lib.Materials) > pageRows {
			_, js, _ = bytes.Cut(js, []byte("window.skysheetRows = "))
			js, ok = bytes.CutSuffix(js, []byte(";\n"))
			var rows [][]any
			if err := json.Unmarshal(js, &rows); !ok || err != nil || len(rows) != len(tc.lib.Materials) {
				t.Errorf("%s: %s holds %d rows (%v), want %d", name, rowsScript, len(rows), err, len(tc.lib.Materials))
			}
			for i, r := range rows {
				if n, _ := r[0].(float64); int(n) != i+1 {
					t.Fatalf("%s: %s row %d is numbered %v", name, rowsScript, i+1, r[0])
				}
			}
			if whole, _ := json.Marshal(rows); !bytes.Equal(js, whole) {
				t.Errorf("%s: %s is not the whole as json.Marshal writes it", name, rowsScript)
			}
		}
		records, err := csv.NewReader(bytes.NewReader(out[tableCSVName])).ReadAll()
		if err != nil || len(records) != len(tc.lib.Materials)+1 {
			t.Fatalf("%s: %s: %d records (%v), want %d", name, tableCSVName, len(records), err, len(tc.lib.Materials)+1)
		}
		for i, r := range records[1:] {
			if r[0] != strconv.Itoa(i+1) {
				t.Fatalf("%s: %s line %d is numbered %s", name, tableCSVName, i+2, r[0])
			}
		}
		var wholeCSV bytes.Buffer
		csv.NewWriter(&wholeCSV).WriteAll(records)
		if !bytes.Equal(out[tableCSVName], wholeCSV.Bytes()) {
			t.Errorf("%s: %s is not the whole as csv.Writer writes it", name, tableCSVName)
		}
		if !tc.roundTrip {
			continue
		}
		want, err := json.MarshalIndent(c, "", "  ")
		if err != nil {
			t.Fatal(err)
		}
		if !bytes.Equal(got, append(want, '\n')) {
			t.Errorf("%s: catalog.json (%d bytes) is not the whole catalog indented (%d bytes)", name, len(got), len(want)+1)
		}
	}
}
