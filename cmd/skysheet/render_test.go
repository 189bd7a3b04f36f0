package main

import (
	"bytes"
	"flag"
	"io/fs"
	"os"
	"path/filepath"
	"regexp"
	"strings"
	"testing"
)

var update = flag.Bool("update", false, "rewrite the golden files in testdata/")

// copyLibrary copies the test library to a fresh folder and returns it.
func copyLibrary(t *testing.T) string {
	t.Helper()
	dst := filepath.Join(t.TempDir(), "lib")
	src := filepath.Join("..", "..", "testdata", "library")
	err := filepath.WalkDir(src, func(p string, d fs.DirEntry, err error) error {
		if err != nil {
			return err
		}
		rel, _ := filepath.Rel(src, p)
		target := filepath.Join(dst, rel)
		if d.IsDir() {
			return os.MkdirAll(target, 0o755)
		}
		data, err := os.ReadFile(p)
		if err != nil {
			return err
		}
		return os.WriteFile(target, data, 0o644)
	})
	if err != nil {
		t.Fatal(err)
	}
	return dst
}

// readTree returns every file below dir by slash path.
func readTree(t *testing.T, dir string) map[string][]byte {
	t.Helper()
	out := map[string][]byte{}
	err := filepath.WalkDir(dir, func(p string, d fs.DirEntry, err error) error {
		if err != nil || d.IsDir() {
			return err
		}
		data, err := os.ReadFile(p)
		rel, _ := filepath.Rel(dir, p)
		out[filepath.ToSlash(rel)] = data
		return err
	})
	if err != nil {
		t.Fatal(err)
	}
	return out
}

func TestRenderCommand(t *testing.T) {
	lib := copyLibrary(t)
	out := filepath.Join(t.TempDir(), "site")
	code, stdout, stderr := runCLI("render", lib, "--site", out)
	if code != 0 {
		t.Fatalf("exit %d: %s", code, stderr)
	}
	if !strings.Contains(stdout, "3 materials, 1 comparison") {
		t.Errorf("summary %q", stdout)
	}
	if _, err := os.Stat(filepath.Join(out, "m", "frostline", "index.html")); err != nil {
		t.Error(err)
	}
	if code, _, _ := runCLI("render", lib, lib, "--site", out); code != 2 {
		t.Errorf("two folders: exit %d, want 2", code)
	}
	if code, _, _ := runCLI("render", filepath.Join(lib, "nothere"), "--site", out); code != 2 {
		t.Errorf("missing folder: exit %d, want 2", code)
	}
}

// TestRenderDefaultSite checks that "render DIR" writes DIR/site, not a
// folder in the current one, and that the site it wrote is not read back
// as part of the library by the next render or by review.
func TestRenderDefaultSite(t *testing.T) {
	lib := copyLibrary(t)
	cwd := t.TempDir()
	t.Chdir(cwd)
	for i, want := range []string{"3 materials, 1 comparison, ", "3 materials (3 unchanged, from the cache), 1 comparison, "} {
		// The second render replaces the first site, from the cache.
		code, stdout, stderr := runCLI("render", lib)
		if code != 0 {
			t.Fatalf("exit %d: %s", code, stderr)
		}
		if !strings.Contains(stdout, want) || !strings.Contains(stdout, filepath.Join(lib, "site")) {
			t.Errorf("render %d: summary %q: want %q and the folder %s", i+1, stdout, want, filepath.Join(lib, "site"))
		}
	}
	if _, err := os.Stat(filepath.Join(lib, "site", "m", "frostline", "index.html")); err != nil {
		t.Error(err)
	}
	if entries, _ := os.ReadDir(cwd); len(entries) != 0 {
		t.Errorf("the current folder got %d entries, want none", len(entries))
	}
	if code, out, errs := runCLI("review", lib); !strings.Contains(out, "5 files, 0 invalid") {
		t.Errorf("review after render: exit %d\n%s%s", code, out, errs)
	}
	// Inside the library folder, the default is ./site.
	t.Chdir(lib)
	if code, stdout, stderr := runCLI("render"); code != 0 || !strings.Contains(stdout, "files in site") {
		t.Errorf("render in the library folder: exit %d: %s%s", code, stdout, stderr)
	}
}

func TestRenderDeterministic(t *testing.T) {
	lib := copyLibrary(t)
	a, b := filepath.Join(t.TempDir(), "a"), filepath.Join(t.TempDir(), "b")
	for _, out := range []string{a, b} {
		if _, err := renderSite(lib, out, "test", &bytes.Buffer{}, false); err != nil {
			t.Fatal(err)
		}
	}
	ta, tb := readTree(t, a), readTree(t, b)
	if len(ta) == 0 || len(ta) != len(tb) {
		t.Fatalf("%d files vs %d", len(ta), len(tb))
	}
	for name, data := range ta {
		if !bytes.Equal(data, tb[name]) {
			t.Errorf("%s differs between two renders", name)
		}
	}
}

func TestRenderAtomic(t *testing.T) {
	lib := copyLibrary(t)
	parent := t.TempDir()
	out := filepath.Join(parent, "site")
	if _, err := renderSite(lib, out, "v1", &bytes.Buffer{}, false); err != nil {
		t.Fatal(err)
	}
	before := readTree(t, out)

	// Bad data: the render stops before writing.
	md := filepath.Join(lib, "content", "roof", "basalt.md")
	good, _ := os.ReadFile(md)
	writeAt(t, md, strings.Replace(string(good), "category:", "categroy:", 1))
	code, _, stderr := runCLI("render", lib, "--site", out)
	if code != 1 || strings.Count(stderr, "\n  ") != 1 || !strings.Contains(stderr, "content/roof/basalt.md:5:1: unknown key") || !strings.Contains(stderr, `did you mean "category"?`) {
		t.Errorf("exit %d, stderr %q", code, stderr)
	}
	// A claim of a figure the tool does not compute is a content error
	// too: file:line:column of the figure, the nearest key, no site.
	writeAt(t, md, strings.Replace(string(good), "figure: solar_reflectance", "figure: solar_reflectence", 1))
	code, _, stderr = runCLI("render", lib, "--site", out)
	if code != 1 || !strings.Contains(stderr, `content/roof/basalt.md:15:14: no such figure: claim 1 names "solar_reflectence" (did you mean "solar_reflectance"?)`) {
		t.Errorf("unknown figure: exit %d, stderr %q", code, stderr)
	}
	// A spectrum that cannot be read, in a library that also has a bad
	// front matter: both reported, in file order.
	writeAt(t, md, strings.Replace(string(good), "category:", "categroy:", 1))
	ftir := filepath.Join(lib, "content", "films", "clearview-ftir.csv")
	goodFTIR, _ := os.ReadFile(ftir)
	writeAt(t, ftir, strings.Replace(string(goodFTIR), "2.7,0.0500", "2.7,x", 1))
	code, _, stderr = runCLI("render", lib, "--site", out)
	if i, j := strings.Index(stderr, "content/films/clearview.md:8:11: cannot read spectrum"), strings.Index(stderr, "content/roof/basalt.md:5:1"); code != 1 || i < 0 || j < i {
		t.Errorf("spectrum and front matter: exit %d, stderr %q", code, stderr)
	}
	writeAt(t, ftir, string(goodFTIR))
	writeAt(t, md, string(good))
	if got := readTree(t, out); len(got) != len(before) {
		t.Errorf("a failed render changed the site: %d files, had %d", len(got), len(before))
	}

	// A failure while writing files, midway through the site.
	failAfter.Store(10)
	_, err := renderSite(lib, out, "v2", &bytes.Buffer{}, false)
	failAfter.Store(0)
	if err == nil {
		t.Fatal("injected failure not reported")
	}
	after := readTree(t, out)
	if len(after) != len(before) {
		t.Fatalf("old site changed: %d files, was %d", len(after), len(before))
	}
	for name, data := range before {
		if !bytes.Equal(data, after[name]) {
			t.Errorf("%s changed by a failed render", name)
		}
	}
	entries, _ := os.ReadDir(parent)
	if len(entries) != 1 {
		var names []string
		for _, e := range entries {
			names = append(names, e.Name())
		}
		t.Errorf("left behind: %v", names)
	}
	// And a good render replaces the old site.
	if _, err := renderSite(lib, out, "v3", &bytes.Buffer{}, false); err != nil {
		t.Fatal(err)
	}
	if !bytes.Contains(readTree(t, out)["index.html"], []byte("skysheet v3")) {
		t.Error("site not replaced")
	}
}

func TestRenderRefusesSiteFolder(t *testing.T) {
	lib := copyLibrary(t)
	other := t.TempDir()
	writeAt(t, filepath.Join(other, "notes.txt"), "keep me")
	for _, out := range []string{lib, filepath.Dir(lib), filepath.Join(lib, "content", "site"), filepath.Join(lib, "templates"), filepath.Join(lib, "templates", "site")} {
		code, _, stderr := runCLI("render", lib, "--site", out)
		if code != 2 {
			t.Errorf("--site %s: exit %d, want 2 (%s)", out, code, stderr)
		}
	}
	// A folder that holds files but was not rendered is bad data, not bad
	// usage: the message says how to go on.
	code, _, stderr := runCLI("render", lib, "--site", other)
	if code != 1 || !strings.Contains(stderr, "was not rendered by skysheet") || !strings.Contains(stderr, "create an empty file "+filepath.Join(other, siteMarker)) {
		t.Errorf("--site %s: exit %d, want 1 (%s)", other, code, stderr)
	}
	if data, _ := os.ReadFile(filepath.Join(other, "notes.txt")); string(data) != "keep me" {
		t.Error("unrelated folder was touched")
	}
}

// svgBody matches the inside of an inline chart.
var svgBody = regexp.MustCompile(`(?s)(<svg [^>]*>).*?</svg>`)

// normalise keeps a page's HTML but replaces chart drawings (checked by
// the chart tests) with a marker, so the golden file shows the page.
func normalise(b []byte) []byte {
	return svgBody.ReplaceAll(b, []byte("$1…</svg>"))
}

func TestGoldenDatasheet(t *testing.T) {
	lib := copyLibrary(t)
	out := filepath.Join(t.TempDir(), "site")
	if _, err := renderSite(lib, out, "test", &bytes.Buffer{}, false); err != nil {
		t.Fatal(err)
	}
	got, err := os.ReadFile(filepath.Join(out, "m", "frostline", "index.html"))
	if err != nil {
		t.Fatal(err)
	}
	got = normalise(got)
	golden := filepath.Join("testdata", "datasheet-frostline.golden")
	if *update {
		if err := os.MkdirAll("testdata", 0o755); err != nil {
			t.Fatal(err)
		}
		if err := os.WriteFile(golden, got, 0o644); err != nil {
			t.Fatal(err)
		}
	}
	want, err := os.ReadFile(golden)
	if err != nil {
		t.Fatalf("%v (run go test -update to create it)", err)
	}
	if !bytes.Equal(got, want) {
		t.Errorf("%s differs; check the page and rerun with -update", golden)
	}
}

// TestGoldenCatalog guards catalog.json of the test library: every
// material's metadata, figures (cooling and uncertainty included) and
// claims with their verdicts.
func TestGoldenCatalog(t *testing.T) {
	lib := copyLibrary(t)
	out := filepath.Join(t.TempDir(), "site")
	if _, err := renderSite(lib, out, "test", &bytes.Buffer{}, false); err != nil {
		t.Fatal(err)
	}
	got, err := os.ReadFile(filepath.Join(out, "catalog.json"))
	if err != nil {
		t.Fatal(err)
	}
	golden := filepath.Join("testdata", "catalog.golden.json")
	if *update {
		if err := os.WriteFile(golden, got, 0o644); err != nil {
			t.Fatal(err)
		}
	}
	want, err := os.ReadFile(golden)
	if err != nil {
		t.Fatalf("%v (run go test -update to create it)", err)
	}
	if !bytes.Equal(got, want) {
		t.Errorf("%s differs; check the catalog and rerun with -update", golden)
	}
}

func TestRenderEscapesContent(t *testing.T) {
	lib := copyLibrary(t)
	md := filepath.Join(lib, "content", "roof", "basalt.md")
	src, _ := os.ReadFile(md)
	writeAt(t, md, strings.Replace(string(src), "title: Basalt roof coating (invented)", `title: "<script>alert('x')</script> Basalt"`, 1))
	out := filepath.Join(t.TempDir(), "site")
	if _, err := renderSite(lib, out, "test", &bytes.Buffer{}, false); err != nil {
		t.Fatal(err)
	}
	for name, data := range readTree(t, out) {
		if strings.HasSuffix(name, ".html") && bytes.Contains(data, []byte("<script>alert")) {
			t.Errorf("%s holds the title unescaped", name)
		}
	}
	page, _ := os.ReadFile(filepath.Join(out, "m", "basalt", "index.html"))
	if !bytes.Contains(page, []byte("&lt;script&gt;alert(&#39;x&#39;)&lt;/script&gt; Basalt")) {
		t.Error("escaped title not found")
	}
}

func TestRenderPathEscapes(t *testing.T) {
	outside := filepath.Join(t.TempDir(), "outside.csv")
	writeAt(t, outside, "wavelength_nm,R\n280,0.5\n2500,0.5\n")
	for _, tc := range []struct {
		name, file string
		link       bool // make content/roof/link.csv a symbolic link to outside
		want       string
	}{
		{"dot-dot", "../../../outside.csv", false, "path leaves the library folder"},
		{"absolute", outside, false, "absolute paths are not allowed"},
		{"symlink out", "link.csv", true, "escapes"},
	} {
		t.Run(tc.name, func(t *testing.T) {
			lib := copyLibrary(t)
			if tc.link {
				if err := os.Symlink(outside, filepath.Join(lib, "content", "roof", "link.csv")); err != nil {
					t.Skip("no symbolic links here:", err)
				}
			}
			md := filepath.Join(lib, "content", "roof", "basalt.md")
			src, _ := os.ReadFile(md)
			writeAt(t, md, strings.Replace(string(src), "file: basalt-uvvis.csv", "file: "+tc.file, 1))
			code, _, stderr := runCLI("render", lib, "--site", filepath.Join(t.TempDir(), "site"))
			if code != 1 || !strings.Contains(stderr, "content/roof/basalt.md:9:") || !strings.Contains(stderr, tc.want) {
				t.Errorf("exit %d, stderr %q; want exit 1 naming basalt.md:9 and %q", code, stderr, tc.want)
			}
		})
	}
	// A symbolic link that stays inside the library is fine.
	lib := copyLibrary(t)
	if err := os.Symlink("basalt-uvvis.csv", filepath.Join(lib, "content", "roof", "inside.csv")); err == nil {
		md := filepath.Join(lib, "content", "roof", "basalt.md")
		src, _ := os.ReadFile(md)
		writeAt(t, md, strings.Replace(string(src), "file: basalt-uvvis.csv", "file: inside.csv", 1))
		if code, _, stderr := runCLI("render", lib, "--site", filepath.Join(t.TempDir(), "site")); code != 0 {
			t.Errorf("inside link: exit %d: %s", code, stderr)
		}
	}
}

func TestProgressBar(t *testing.T) {
	var b bytes.Buffer
	lib := copyLibrary(t)
	if _, err := renderSite(lib, filepath.Join(t.TempDir(), "p"), "test", &b, true); err != nil {
		t.Fatal(err)
	}
	if !strings.Contains(b.String(), "] 3/3 materials") {
		t.Errorf("progress %q", b.String())
	}
}

// writeAt writes a file at path p.
func writeAt(t *testing.T, p, data string) {
	t.Helper()
	if err := os.WriteFile(p, []byte(data), 0o644); err != nil {
		t.Fatal(err)
	}
}
