package site

import (
	"bytes"
	"crypto/sha256"
	"fmt"
	"io/fs"
	"maps"
	"os"
	"path/filepath"
	"reflect"
	"slices"
	"strings"
	"sync"
	"testing"
	"testing/fstest"
	"time"

	"skysheet/datasheet/evaluate"
	"skysheet/datasheet/library"
)

// copyDemo copies the demo library (config and content/) into a new
// folder and returns it.
func copyDemo(t *testing.T) string { return copyLibrary(t, "../..") }

// copyLibrary copies the library in src (config and content/) into a new
// folder and returns it.
func copyLibrary(t *testing.T, src string) string {
	t.Helper()
	dst := t.TempDir()
	if err := os.CopyFS(filepath.Join(dst, "content"), os.DirFS(filepath.Join(src, "content"))); err != nil {
		t.Fatal(err)
	}
	cfg, err := os.ReadFile(filepath.Join(src, "skysheet.yaml"))
	if err != nil {
		t.Fatal(err)
	}
	if err := os.WriteFile(filepath.Join(dst, "skysheet.yaml"), cfg, 0o644); err != nil {
		t.Fatal(err)
	}
	return dst
}

// mapWriter keeps the files written to it.
type mapWriter map[string][]byte

func (w mapWriter) WriteFile(name string, data []byte) error {
	w[name] = bytes.Clone(data)
	return nil
}

// linkWriter keeps the files written to it, and those given by path.
type linkWriter struct{ mapWriter }

func (w linkWriter) LinkFile(name, src string, _ fs.FileInfo) error {
	data, err := os.ReadFile(src)
	w.mapWriter[name] = data
	return err
}

// renderDir renders the library in dir with the given cache (nil for
// none) and returns the site.
func renderDir(t *testing.T, dir string, c *Cache, link bool) map[string][]byte {
	t.Helper()
	lib, err := library.Load(os.DirFS(dir))
	if err != nil {
		t.Fatal(err)
	}
	opt := Options{Version: "test", Cache: c}
	if tdir := filepath.Join(dir, "templates"); isDir(tdir) {
		opt.Templates = os.DirFS(tdir)
	}
	out := mapWriter{}
	var w Writer = out
	if link {
		w = linkWriter{out}
	}
	if err := Render(lib, opt, w); err != nil {
		t.Fatal(err)
	}
	if c != nil {
		if err := c.Commit(); err != nil {
			t.Fatal(err)
		}
	}
	return out
}

func isDir(p string) bool {
	st, err := os.Stat(p)
	return err == nil && st.IsDir()
}

func openCache(t *testing.T, dir, build string) *Cache {
	t.Helper()
	c, err := OpenCache(dir, build)
	if err != nil {
		t.Fatal(err)
	}
	return c
}

// sameFiles fails unless got and want hold the same files, byte for byte.
func sameFiles(t *testing.T, got, want map[string][]byte) {
	t.Helper()
	for _, n := range slices.Sorted(maps.Keys(want)) {
		g, ok := got[n]
		switch {
		case !ok:
			t.Errorf("%s: missing", n)
		case !bytes.Equal(g, want[n]):
			t.Errorf("%s: differs from the render without cache (%d bytes against %d)", n, len(g), len(want[n]))
			if d := os.Getenv("CACHE_DIFF_DIR"); d != "" {
				os.WriteFile(filepath.Join(d, "got-"+filepath.Base(n)), g, 0o644)
				os.WriteFile(filepath.Join(d, "want-"+filepath.Base(n)), want[n], 0o644)
			}
		}
	}
	for n := range got {
		if _, ok := want[n]; !ok {
			t.Errorf("%s: not in the render without cache", n)
		}
	}
}

// cacheable counts the materials of the library in dir that the cache
// keeps: those no comparison sets against a reference.
func cacheable(t *testing.T, dir string) int {
	lib, err := library.Load(os.DirFS(dir))
	if err != nil {
		t.Fatal(err)
	}
	worn := map[string]bool{}
	for _, c := range lib.Comparisons {
		if c.Reference != nil || c.Skin != nil {
			for _, m := range c.Materials {
				worn[m.Slug] = true
			}
		}
	}
	return len(lib.Materials) - len(worn)
}

func TestCacheReuse(t *testing.T) {
	dir := copyDemo(t)
	want := renderDir(t, dir, nil, false)
	n := cacheable(t, dir)
	if n < 10 {
		t.Fatalf("only %d demo materials are cacheable", n)
	}
	for _, link := range []bool{false, true} {
		cdir := t.TempDir()
		cold := openCache(t, cdir, "build-1")
		sameFiles(t, renderDir(t, dir, cold, link), want)
		if cold.Hits() != 0 {
			t.Errorf("link=%v: a render into an empty cache took %d materials from it", link, cold.Hits())
		}
		warm := openCache(t, cdir, "build-1")
		sameFiles(t, renderDir(t, dir, warm, link), want)
		if warm.Hits() != n {
			t.Errorf("link=%v: the second render took %d materials from the cache, want all %d cacheable ones", link, warm.Hits(), n)
		}
		if errs := warm.WriteErrors(); len(errs) > 0 {
			t.Errorf("write errors: %v", errs)
		}
	}
}

// entries returns the entry folders of the cache in dir.
func entries(t *testing.T, dir string) []string {
	t.Helper()
	es, err := os.ReadDir(filepath.Join(dir, cacheVersion))
	if err != nil {
		t.Fatal(err)
	}
	var out []string
	for _, e := range es {
		if e.IsDir() {
			out = append(out, filepath.Join(dir, cacheVersion, e.Name()))
		}
	}
	return out
}

// materialEntries returns the number of materials' entries in the cache
// in dir (the index lists them with their inputs, pages' entries have
// none) and checks that the folder holds the entries the index lists and
// no others.
func materialEntries(t *testing.T, dir string) int {
	t.Helper()
	index := readEntries(filepath.Join(dir, cacheVersion), "build-1")
	n := 0
	for _, e := range index {
		if len(e.Kept.Inputs) > 0 {
			n++
		}
	}
	folders := entries(t, dir)
	for _, f := range folders {
		if index[filepath.Base(f)] == nil {
			t.Errorf("entry %s is not in the index", filepath.Base(f))
		}
	}
	if len(folders) != len(index) {
		t.Errorf("%d entry folders, %d entries in the index", len(folders), len(index))
	}
	return n
}

// entryOf returns the entry folder of the material whose datasheet is
// m/SLUG/index.html, as the index of the cache in dir lists it.
func entryOf(t *testing.T, dir, slug string) string {
	t.Helper()
	for key, e := range readEntries(filepath.Join(dir, cacheVersion), "build-1") {
		for _, f := range e.Files {
			if f.Name == "m/"+slug+"/index.html" {
				return filepath.Join(dir, cacheVersion, key)
			}
		}
	}
	t.Fatalf("no cache entry for %s", slug)
	return ""
}

// TestCacheInvalid checks that every kind of stale, truncated or corrupt
// entry is detected and ignored: the render then equals one without the
// cache, and takes from the cache only the materials left untouched. It
// uses the small test library (TestCacheReuse covers the demo).
func TestCacheInvalid(t *testing.T) {
	const slug = "frostline" // a material on a comparison without a reference
	tests := []struct {
		name string
		// change spoils the cache in cdir or changes the library in dir;
		// it returns how many cacheable materials are no longer reused.
		change func(t *testing.T, dir, cdir string) int
		build  string
	}{
		{"nothing changed", func(t *testing.T, dir, cdir string) int { return 0 }, ""},
		{"spectrum changed", func(t *testing.T, dir, cdir string) int {
			p := spectrumOf(t, dir, slug)
			data, _ := os.ReadFile(p)
			// One more decimal on the last number: the same figures to
			// the eye, another SHA-256.
			data = append(bytes.TrimRight(data, "\r\n"), []byte("1\n")...)
			write(t, p, data)
			return 1
		}, ""},
		{"spectrum touched, content unchanged", func(t *testing.T, dir, cdir string) int {
			p := spectrumOf(t, dir, slug)
			later := time.Now().Add(time.Hour)
			if err := os.Chtimes(p, later, later); err != nil {
				t.Fatal(err)
			}
			return 0
		}, ""},
		{"Markdown changed", func(t *testing.T, dir, cdir string) int {
			p := markdownOf(t, dir, slug)
			data, _ := os.ReadFile(p)
			write(t, p, append(data, []byte("\nOne more sentence.\n")...))
			return 1
		}, ""},
		{"index truncated", func(t *testing.T, dir, cdir string) int {
			p := filepath.Join(cdir, cacheVersion, indexFile)
			data, _ := os.ReadFile(p)
			write(t, p, data[:len(data)/2])
			return cacheable(t, dir)
		}, ""},
		{"index short of its checksum", func(t *testing.T, dir, cdir string) int {
			p := filepath.Join(cdir, cacheVersion, indexFile)
			data, _ := os.ReadFile(p)
			write(t, p, data[:len(data)-1])
			return cacheable(t, dir)
		}, ""},
		{"index corrupt", func(t *testing.T, dir, cdir string) int {
			p := filepath.Join(cdir, cacheVersion, indexFile)
			data, _ := os.ReadFile(p)
			data[len(data)/2] ^= 0x55
			write(t, p, data)
			return cacheable(t, dir)
		}, ""},
		{"index with bytes after its checksum", func(t *testing.T, dir, cdir string) int {
			p := filepath.Join(cdir, cacheVersion, indexFile)
			data, _ := os.ReadFile(p)
			write(t, p, append(data, 0))
			return cacheable(t, dir)
		}, ""},
		{"index empty", func(t *testing.T, dir, cdir string) int {
			write(t, filepath.Join(cdir, cacheVersion, indexFile), nil)
			return cacheable(t, dir)
		}, ""},
		{"cached page truncated", func(t *testing.T, dir, cdir string) int {
			p := filepath.Join(entryOf(t, cdir, slug), "0")
			data, _ := os.ReadFile(p)
			write(t, p, data[:len(data)-1])
			return 1
		}, ""},
		{"cached page rewritten at the same size", func(t *testing.T, dir, cdir string) int {
			p := filepath.Join(entryOf(t, cdir, slug), "0")
			data, _ := os.ReadFile(p)
			data[0] ^= 0x20
			time.Sleep(10 * time.Millisecond)
			write(t, p, data)
			return 1
		}, ""},
		{"journal corrupt", func(t *testing.T, dir, cdir string) int {
			p := journalOf(t, dir, cdir, slug)
			data, _ := os.ReadFile(p)
			data[len(data)/2] ^= 0x55
			write(t, p, data)
			return cacheable(t, dir)
		}, ""},
		{"journal truncated", func(t *testing.T, dir, cdir string) int {
			p := journalOf(t, dir, cdir, slug)
			data, _ := os.ReadFile(p)
			write(t, p, data[:len(data)-1])
			return cacheable(t, dir)
		}, ""},
		{"journal on an earlier index", func(t *testing.T, dir, cdir string) int {
			// A render stopped between writing a new index and removing
			// the journal on the one before: the journal is not read.
			p := journalOf(t, dir, cdir, slug)
			old, _ := os.ReadFile(p)
			base := filepath.Join(cdir, cacheVersion)
			if _, err := writeIndex(base, "build-1", readEntries(base, "build-1")); err != nil {
				t.Fatal(err)
			}
			write(t, p, old)
			return 0
		}, ""},
		{"cached file missing", func(t *testing.T, dir, cdir string) int {
			os.Remove(filepath.Join(entryOf(t, cdir, slug), "0"))
			return 1
		}, ""},
		{"cache deleted", func(t *testing.T, dir, cdir string) int {
			os.RemoveAll(filepath.Join(cdir, cacheVersion))
			os.MkdirAll(filepath.Join(cdir, cacheVersion), 0o755)
			return cacheable(t, dir)
		}, ""},
		{"another build", func(t *testing.T, dir, cdir string) int { return cacheable(t, dir) }, "build-2"},
		{"config changed", func(t *testing.T, dir, cdir string) int {
			p := filepath.Join(dir, "skysheet.yaml")
			data, _ := os.ReadFile(p)
			write(t, p, append(data, []byte("\n# a comment\n")...))
			return cacheable(t, dir)
		}, ""},
		{"template override added", func(t *testing.T, dir, cdir string) int {
			os.MkdirAll(filepath.Join(dir, "templates"), 0o755)
			css, _ := fs.ReadFile(os.DirFS("../../templates"), "style.css")
			write(t, filepath.Join(dir, "templates", "style.css"), append(css, []byte("\n/* changed */\n")...))
			return cacheable(t, dir)
		}, ""},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			dir, cdir := copyLibrary(t, "../../testdata/library"), t.TempDir()
			renderDir(t, dir, openCache(t, cdir, "build-1"), true)
			missed := tt.change(t, dir, cdir)
			want := renderDir(t, dir, nil, false)
			build := "build-1"
			if tt.build != "" {
				build = tt.build
			}
			c := openCache(t, cdir, build)
			sameFiles(t, renderDir(t, dir, c, true), want)
			if got, n := c.Hits(), cacheable(t, dir)-missed; got != n {
				t.Errorf("took %d materials from the cache, want %d", got, n)
			}
			// The entry is whole again: the next render reuses everything.
			again := openCache(t, cdir, build)
			sameFiles(t, renderDir(t, dir, again, true), want)
			if got, n := again.Hits(), cacheable(t, dir); got != n {
				t.Errorf("the render after took %d materials from the cache, want %d", got, n)
			}
		})
	}
}

// journalOf changes the spectrum of material slug in dir and renders
// with the cache in cdir, which writes a journal on its index; it returns
// the journal's path.
func journalOf(t *testing.T, dir, cdir, slug string) string {
	t.Helper()
	p := spectrumOf(t, dir, slug)
	data, _ := os.ReadFile(p)
	write(t, p, append(bytes.TrimRight(data, "\r\n"), []byte("1\n")...))
	renderDir(t, dir, openCache(t, cdir, "build-1"), true)
	j := filepath.Join(cdir, cacheVersion, journalFile)
	if !isFile(j) {
		t.Fatal("no journal written")
	}
	return j
}

func write(t *testing.T, p string, data []byte) {
	t.Helper()
	if err := os.WriteFile(p, data, 0o644); err != nil {
		t.Fatal(err)
	}
}

// markdownOf returns the Markdown file of material slug in dir.
func markdownOf(t *testing.T, dir, slug string) string {
	t.Helper()
	lib, err := library.Load(os.DirFS(dir))
	if err != nil {
		t.Fatal(err)
	}
	m, ok := lib.Material(slug)
	if !ok {
		t.Fatalf("no material %s in the demo", slug)
	}
	return filepath.Join(dir, filepath.FromSlash(m.Path))
}

// spectrumOf returns the first spectrum file of material slug in dir.
func spectrumOf(t *testing.T, dir, slug string) string {
	t.Helper()
	lib, err := library.Load(os.DirFS(dir))
	if err != nil {
		t.Fatal(err)
	}
	m, _ := lib.Material(slug)
	_, inputs, err := lib.ReadSample(m)
	if err != nil {
		t.Fatal(err)
	}
	for _, in := range inputs[1:] {
		if strings.HasSuffix(in.Path, ".csv") || strings.HasSuffix(in.Path, ".txt") {
			return filepath.Join(dir, filepath.FromSlash(in.Path))
		}
	}
	t.Fatalf("%s has no spectrum file in columns", slug)
	return ""
}

func TestCacheCommit(t *testing.T) {
	dir, cdir := copyDemo(t), t.TempDir()
	renderDir(t, dir, openCache(t, cdir, "build-1"), true)
	before := materialEntries(t, cdir)
	os.MkdirAll(filepath.Join(cdir, cacheVersion, ".new-left-by-a-killed-render"), 0o755)
	os.MkdirAll(filepath.Join(cdir, "v0", "old-format"), 0o755)
	// A material removed from the library: its entry goes at the next prune.
	if err := os.Remove(markdownOf(t, dir, "kw-21")); err != nil {
		t.Fatal(err)
	}
	renderDir(t, dir, openCache(t, cdir, "build-1"), true) // commits
	if got := materialEntries(t, cdir); got != before-1 {
		t.Errorf("after prune: %d material entries, want %d", got, before-1)
	}
	if isDir(filepath.Join(cdir, "v0")) {
		t.Error("the folder of an older format was kept")
	}
}

// readEntries returns the entries of the index in folder base, its
// journal's changes made (see readIndex).
func readEntries(base, build string) map[string]*entry {
	es, _, _ := readIndex(base, build)
	return es
}

// FuzzReadIndex feeds the cache's index reader arbitrary bytes: it must
// never panic, and an index it accepts must be written back and read again
// to the same entries.
func FuzzReadIndex(f *testing.F) {
	seed := indexBytes(f, seedEntries())
	f.Add(seed)
	f.Add(seed[:len(seed)/2])
	f.Add([]byte(indexMagic))
	f.Fuzz(func(t *testing.T, data []byte) {
		base := t.TempDir()
		if err := os.WriteFile(filepath.Join(base, indexFile), data, 0o644); err != nil {
			t.Fatal(err)
		}
		writtenBack(t, readEntries(base, "b"))
	})
}

// FuzzReadJournal feeds the cache's index reader a valid index and
// arbitrary bytes as its journal: it must never panic, and what it accepts
// must be written back as an index and read again to the same entries.
func FuzzReadJournal(f *testing.F) {
	index := indexBytes(f, seedEntries())
	sum := index[len(index)-sha256.Size:]
	base := f.TempDir()
	put := &entry{Key: "k3", Kept: kept{Warnings: []string{"w"}}}
	if err := writeJournal(base, journalHead{Build: "b", Index: sum}, []*entry{put}, []string{"k2"}); err != nil {
		f.Fatal(err)
	}
	seed, err := os.ReadFile(filepath.Join(base, journalFile))
	if err != nil {
		f.Fatal(err)
	}
	f.Add(seed)
	f.Add(seed[:len(seed)/2])
	f.Add([]byte(journalMagic))
	f.Fuzz(func(t *testing.T, data []byte) {
		base := t.TempDir()
		if err := os.WriteFile(filepath.Join(base, indexFile), index, 0o644); err != nil {
			t.Fatal(err)
		}
		if err := os.WriteFile(filepath.Join(base, journalFile), data, 0o644); err != nil {
			t.Fatal(err)
		}
		writtenBack(t, readEntries(base, "b"))
	})
}

// seedEntries are entries of an index for the fuzz targets' seeds.
func seedEntries() map[string]*entry {
	return map[string]*entry{
		"k1": {Key: "k1", Kept: kept{Warnings: []string{}, Inputs: []library.Input{{Path: "a.csv", SHA256: "00"}}},
			Files: []cachedFile{{Name: "m/a/index.html", Size: 3, ModTime: 1}}},
		"k2": {Key: "k2"},
	}
}

// writtenBack checks that entries es (none: nothing to check), written
// as an index and read again, are the same entries.
func writtenBack(t *testing.T, es map[string]*entry) {
	t.Helper()
	if es == nil {
		return
	}
	again := t.TempDir()
	if _, err := writeIndex(again, "b", es); err != nil {
		t.Fatal(err)
	}
	back := readEntries(again, "b")
	if len(back) != len(es) {
		t.Fatalf("written back, %d entries read again, want %d", len(back), len(es))
	}
	for k := range es {
		if back[k] == nil {
			t.Fatalf("entry %q lost when written back", k)
		}
	}
}

// indexBytes returns the bytes of an index of es, of build "b".
func indexBytes(tb testing.TB, es map[string]*entry) []byte {
	base := tb.TempDir()
	if _, err := writeIndex(base, "b", es); err != nil {
		tb.Fatal(err)
	}
	data, err := os.ReadFile(filepath.Join(base, indexFile))
	if err != nil {
		tb.Fatal(err)
	}
	return data
}

// TestOpenCacheRefusesForeignFolder checks that a folder holding files
// but no tag is not taken for a cache (which would prune them).
func TestOpenCacheRefusesForeignFolder(t *testing.T) {
	dir := t.TempDir()
	write(t, filepath.Join(dir, "notes.txt"), []byte("mine"))
	if _, err := OpenCache(dir, "b"); err == nil || !strings.Contains(err.Error(), "CACHEDIR.TAG") {
		t.Errorf("a folder of notes opened as a cache: %v", err)
	}
	empty := filepath.Join(t.TempDir(), "new")
	c, err := OpenCache(empty, "b")
	if err != nil {
		t.Fatal(err)
	}
	os.MkdirAll(filepath.Join(empty, "vintage"), 0o755) // not a format folder
	if err := c.Commit(); err != nil {
		t.Fatal(err)
	}
	if !isDir(filepath.Join(empty, "vintage")) {
		t.Error("Commit removed a folder that is not one of the cache's")
	}
	if _, err := OpenCache(empty, "b"); err != nil {
		t.Errorf("the cache made there does not open again: %v", err)
	}
}

// recordWriter keeps the files written to it, and those given by path,
// and records the path each of the latter was given by.
type recordWriter struct {
	mapWriter
	src map[string]string
}

func (w recordWriter) LinkFile(name, src string, _ fs.FileInfo) error {
	w.src[name] = src
	data, err := os.ReadFile(src)
	w.mapWriter[name] = data
	return err
}

// renderCommit loads fsys and renders it into out with the cache c (nil:
// none), then commits the cache.
func renderCommit(t *testing.T, fsys fs.FS, c *Cache, out Writer) {
	t.Helper()
	lib, err := library.Load(fsys)
	if err != nil {
		t.Fatal(err)
	}
	if err := Render(lib, Options{Version: "test", Cache: c}, out); err != nil {
		t.Fatal(err)
	}
	if c != nil {
		if err := c.Commit(); err != nil {
			t.Fatal(err)
		}
	}
}

// TestCachePages checks that the pages that list materials (the pages of
// the index after the first, the category and tag listings and their
// tables as CSV) are taken from the cache when the materials they list
// are unchanged, and made afresh, as a render without cache makes them,
// when one of them changed.
func TestCachePages(t *testing.T) {
	const n = 3*pageRows + 7
	fsys := bigLibraryFS(t, n)
	render := func(c *Cache) recordWriter {
		t.Helper()
		out := recordWriter{mapWriter{}, map[string]string{}}
		renderCommit(t, fsys, c, out)
		return out
	}
	cdir := t.TempDir()
	cold := render(openCache(t, cdir, "build-1"))
	sameFiles(t, cold.mapWriter, render(nil).mapWriter)

	// Panel 0150 (index page 2, category "film": odd numbers are paint)
	// gets a new title that keeps its place in the index order.
	md := "content/roof/p-0150.md"
	fsys[md] = &fstest.MapFile{Data: bytes.Replace(fsys[md].Data, []byte("Panel 0150 (invented)"), []byte("Panel 0150 (invented, revised)"), 1)}
	warm := render(openCache(t, cdir, "build-1"))
	sameFiles(t, warm.mapWriter, render(nil).mapWriter)
	// Files made afresh are stored in the cache and given from there too,
	// but under a new key: a file taken from the cache is given by the
	// path it was given by before.
	for name, want := range map[string]bool{
		"materials/page/2/index.html":                   false, // lists the changed material
		"materials/page/3/index.html":                   true,
		"materials/page/4/index.html":                   true,
		"materials/by-category/film/index.html":         false,
		"materials/by-category/film/materials.csv":      false,
		"materials/by-category/paint/index.html":        true,
		"materials/by-category/paint/page/2/index.html": true,
		"materials/by-category/paint/materials.csv":     true,
		"index.html":          false, // rests on every material
		"materials.csv":       false,
		"m/p-0001/index.html": true,
		"m/p-0150/index.html": false,
	} {
		if _, ok := warm.mapWriter[name]; !ok {
			t.Errorf("%s: not in the site", name)
		} else if got := warm.src[name] != "" && warm.src[name] == cold.src[name]; got != want {
			t.Errorf("%s: taken from the cache %v, want %v", name, got, want)
		}
	}
	if !strings.Contains(string(warm.mapWriter["materials/page/2/index.html"]), "Panel 0150 (invented, revised)") {
		t.Error("index page 2 does not name the new title")
	}
}

// walkAll is walkSlices entering every value: what walkSlices must visit,
// in the same order.
func walkAll(v reflect.Value, visit func(reflect.Value)) {
	switch v.Kind() {
	case reflect.Pointer, reflect.Interface:
		if !v.IsNil() {
			walkAll(v.Elem(), visit)
		}
	case reflect.Struct:
		for i := range v.NumField() {
			if v.Type().Field(i).IsExported() {
				walkAll(v.Field(i), visit)
			}
		}
	case reflect.Slice:
		visit(v)
		for i := range v.Len() {
			walkAll(v.Index(i), visit)
		}
	case reflect.Array:
		for i := range v.Len() {
			walkAll(v.Index(i), visit)
		}
	case reflect.Map:
		visit(v)
	}
}

// TestWalkSlicesSkipsOnlyWhatHoldsNone checks that walkSlices, which does
// not enter values of types that can hold no slice or map, visits what a
// walk entering everything visits, in the same order: on every entry of
// the cache of a demo render, and on values of recursive, array and
// interface types.
func TestWalkSlicesSkipsOnlyWhatHoldsNone(t *testing.T) {
	type node struct {
		Name  string
		Next  *node
		Pairs [2]struct{ A, B []int }
		Any   any
		Plain [3]float64
	}
	values := []any{
		&node{Name: "a", Next: &node{Any: []string{}, Next: &node{Pairs: [2]struct{ A, B []int }{{A: []int{1}}, {B: []int{}}}}}, Any: map[string]int{}},
		&node{Any: struct{ S []int }{S: []int{}}},
	}
	dir, cdir := copyDemo(t), t.TempDir()
	renderDir(t, dir, openCache(t, cdir, "build-1"), true)
	for _, e := range readEntries(filepath.Join(cdir, cacheVersion), "build-1") {
		values = append(values, &e.Kept)
	}
	if len(values) < 12 {
		t.Fatalf("only %d values", len(values))
	}
	for i, x := range values {
		var got, want []string
		walkSlices(reflect.ValueOf(x), func(v reflect.Value) {
			got = append(got, fmt.Sprintf("%v %d %p", v.Type(), v.Len(), v.UnsafePointer()))
		})
		walkAll(reflect.ValueOf(x), func(v reflect.Value) {
			want = append(want, fmt.Sprintf("%v %d %p", v.Type(), v.Len(), v.UnsafePointer()))
		})
		if !slices.Equal(got, want) {
			t.Errorf("value %d: walkSlices visited %d slices and maps, a full walk %d:\n%q\n%q", i, len(got), len(want), got, want)
		}
	}
}

// TestCacheIndexKept checks that a render that changed no entry leaves
// the cache's index file as it was, and that one that changed an entry
// writes it again.
func TestCacheIndexKept(t *testing.T) {
	dir, cdir := copyDemo(t), t.TempDir()
	index := filepath.Join(cdir, cacheVersion, indexFile)
	// Files changed less than 2 s before a render are not stamped (see
	// library.Library.Stamps); a later render that finds them old enough
	// records their stamps and rightly writes the index again. Let the
	// copies age first, so that the renders below find what they found.
	time.Sleep(2100 * time.Millisecond)
	renderDir(t, dir, openCache(t, cdir, "build-1"), true)
	first, err := os.Stat(index)
	if err != nil {
		t.Fatal(err)
	}
	renderDir(t, dir, openCache(t, cdir, "build-1"), true)
	if st, err := os.Stat(index); err != nil || !os.SameFile(st, first) {
		t.Errorf("nothing changed, yet the index was written again (%v)", err)
	}
	spec := spectrumOf(t, dir, "kw-21")
	data, err := os.ReadFile(spec)
	if err != nil {
		t.Fatal(err)
	}
	if err := os.WriteFile(spec, append(data, '\n'), 0o644); err != nil {
		t.Fatal(err)
	}
	renderDir(t, dir, openCache(t, cdir, "build-1"), true)
	// The change goes into the journal on the index (see writeJournal).
	if st, err := os.Stat(index); err != nil || !os.SameFile(st, first) {
		t.Errorf("a spectrum changed: the index was written again (%v), want a journal on it", err)
	}
	if _, err := os.Stat(filepath.Join(cdir, cacheVersion, journalFile)); err != nil {
		t.Errorf("a spectrum changed, yet no journal was written: %v", err)
	}
	if got := materialEntries(t, cdir); got != cacheable(t, dir) {
		t.Errorf("%d materials' entries, want %d", got, cacheable(t, dir))
	}
	// The entries of the index and its journal are those of the render
	// that wrote them, and give every material to the next.
	c := openCache(t, cdir, "build-1")
	renderDir(t, dir, c, true)
	if c.Hits() != cacheable(t, dir) {
		t.Errorf("took %d materials from the index and its journal, want %d", c.Hits(), cacheable(t, dir))
	}
	if got := readEntries(filepath.Join(cdir, cacheVersion), "build-1"); !sameValues(reflect.ValueOf(got), reflect.ValueOf(c.next)) {
		t.Errorf("the entries read (%d) are not those the render committed (%d)", len(got), len(c.next))
	}
}

// TestCacheJournalStamps checks that the stamps a render records for
// entries of the index (their files having become old enough to stamp,
// see library.Library.Stamps) go into the journal: the render after,
// finding them, has nothing to write.
func TestCacheJournalStamps(t *testing.T) {
	dir, cdir := copyDemo(t), t.TempDir()
	base := filepath.Join(cdir, cacheVersion)
	renderDir(t, dir, openCache(t, cdir, "build-1"), true) // the copies too new to stamp
	time.Sleep(2100 * time.Millisecond)
	renderDir(t, dir, openCache(t, cdir, "build-1"), true) // stamps them
	index, err := os.Stat(filepath.Join(base, indexFile))
	if err != nil {
		t.Fatal(err)
	}
	journal, err := os.Stat(filepath.Join(base, journalFile))
	if err != nil {
		t.Fatalf("stamps recorded, yet no journal: %v", err)
	}
	renderDir(t, dir, openCache(t, cdir, "build-1"), true)
	if st, err := os.Stat(filepath.Join(base, indexFile)); err != nil || !os.SameFile(st, index) {
		t.Errorf("nothing changed, yet the index was written again (%v)", err)
	}
	if st, err := os.Stat(filepath.Join(base, journalFile)); err != nil || !os.SameFile(st, journal) {
		t.Errorf("nothing changed, yet the journal was written again (%v)", err)
	}
}

// TestCacheJournalFolds checks that a render that changes more entries
// than a journal holds (see journalLimit) writes a new index, with no
// journal on it, and that a render changing one material after that
// writes a journal again.
func TestCacheJournalFolds(t *testing.T) {
	fsys := bigLibraryFS(t, 3*pageRows)
	cdir := t.TempDir()
	base := filepath.Join(cdir, cacheVersion)
	render := func() {
		t.Helper()
		renderCommit(t, fsys, openCache(t, cdir, "build-1"), mapWriter{})
	}
	render()
	first, err := os.Stat(filepath.Join(base, indexFile))
	if err != nil {
		t.Fatal(err)
	}
	md := "content/roof/p-0150.md"
	fsys[md] = &fstest.MapFile{Data: bytes.Replace(fsys[md].Data, []byte("Invented."), []byte("Invented, revised."), 1)}
	render()
	if st, err := os.Stat(filepath.Join(base, indexFile)); err != nil || !os.SameFile(st, first) {
		t.Errorf("one material changed: the index was written again (%v)", err)
	}
	if !isFile(filepath.Join(base, journalFile)) {
		t.Error("one material changed: no journal")
	}
	// Every material changes with the config.
	fsys["skysheet.yaml"] = &fstest.MapFile{Data: append(bytes.Clone(fsys["skysheet.yaml"].Data), "\n# a comment\n"...)}
	render()
	if st, err := os.Stat(filepath.Join(base, indexFile)); err != nil || os.SameFile(st, first) {
		t.Errorf("every material changed, yet the index was not written again (%v)", err)
	}
	if isFile(filepath.Join(base, journalFile)) {
		t.Error("every material changed: a journal was left on the new index")
	}
	if n := len(readEntries(base, "build-1")); n <= journalLimit(n) {
		t.Fatalf("%d entries: within one journal's limit, the test shows nothing", n)
	}
	fsys[md] = &fstest.MapFile{Data: bytes.Replace(fsys[md].Data, []byte("revised"), []byte("revised again"), 1)}
	render()
	if !isFile(filepath.Join(base, journalFile)) {
		t.Error("one material changed after the new index: no journal")
	}
	c := openCache(t, cdir, "build-1")
	renderCommit(t, fsys, c, mapWriter{})
	if c.Hits() != 3*pageRows {
		t.Errorf("took %d materials from the index and its journal, want %d", c.Hits(), 3*pageRows)
	}
}

// sameValues is reflect.DeepEqual of what gob keeps (exported fields)
// but for NaN, which it takes as equal to NaN (figures out of reach are
// NaN).
func sameValues(a, b reflect.Value) bool {
	if a.Kind() != b.Kind() || a.Type() != b.Type() {
		return false
	}
	switch a.Kind() {
	case reflect.Float32, reflect.Float64:
		x, y := a.Float(), b.Float()
		return x == y || x != x && y != y
	case reflect.Pointer, reflect.Interface:
		if a.IsNil() || b.IsNil() {
			return a.IsNil() == b.IsNil()
		}
		return sameValues(a.Elem(), b.Elem())
	case reflect.Struct:
		for i := range a.NumField() {
			if a.Type().Field(i).IsExported() && !sameValues(a.Field(i), b.Field(i)) {
				return false
			}
		}
		return true
	case reflect.Slice:
		if a.IsNil() != b.IsNil() {
			return false
		}
		fallthrough
	case reflect.Array:
		if a.Len() != b.Len() {
			return false
		}
		for i := range a.Len() {
			if !sameValues(a.Index(i), b.Index(i)) {
				return false
			}
		}
		return true
	case reflect.Map:
		if a.IsNil() != b.IsNil() || a.Len() != b.Len() {
			return false
		}
		for _, k := range a.MapKeys() {
			if v := b.MapIndex(k); !v.IsValid() || !sameValues(a.MapIndex(k), v) {
				return false
			}
		}
		return true
	}
	return reflect.DeepEqual(a.Interface(), b.Interface())
}

func isFile(p string) bool {
	st, err := os.Stat(p)
	return err == nil && st.Mode().IsRegular()
}

// TestCachePartsShifted: the parts of files made of every material
// (rows.js, materials.csv, catalog.json, search.js) are kept by where they
// start too: a hundred materials put before all the others leave the
// same hundreds of materials in parts that now start further on, whose
// rows are numbered anew, not taken from the cache.
func TestCachePartsShifted(t *testing.T) {
	fsys := bigLibraryFS(t, 2*pageRows)
	render := func(c *Cache) mapWriter {
		t.Helper()
		out := mapWriter{}
		renderCommit(t, fsys, c, out)
		return out
	}
	cdir := t.TempDir()
	render(openCache(t, cdir, "build-1"))
	for i := range pageRows {
		fsys[fmt.Sprintf("content/roof/a-%04d.md", i)] = &fstest.MapFile{Data: fmt.Appendf(nil,
			"---\ntitle: Added panel %04d (invented)\nmaker: Invented Panels (invented)\ncategory: paint\nspectra:\n  - file: basalt-uvvis.csv\n  - file: basalt-ftir.csv\n---\nInvented.\n", i)}
	}
	sameFiles(t, render(openCache(t, cdir, "build-1")), render(nil))
}

// TestCacheComparisons checks that a comparison page is taken from the
// cache while its Markdown file and materials are unchanged, and made
// afresh, as a render without cache makes it, when one of its materials
// changed: the charts then draw the others from their files read again.
// A comparison against a reference or over skin is made afresh each time.
func TestCacheComparisons(t *testing.T) {
	dir := copyDemo(t)
	render := func(c *Cache) recordWriter {
		t.Helper()
		out := recordWriter{mapWriter{}, map[string]string{}}
		renderCommit(t, os.DirFS(dir), c, out)
		return out
	}
	cdir := t.TempDir()
	cold := render(openCache(t, cdir, "build-1"))
	sameFiles(t, cold.mapWriter, render(nil).mapWriter)

	// tc-31 is in "cool-colours" only, beside tr-30, sg-12 and dg-40.
	p := filepath.Join(dir, "content/paints/tc-31/uvvis.csv")
	data, err := os.ReadFile(p)
	if err != nil {
		t.Fatal(err)
	}
	changed := bytes.Replace(data, []byte("\n1000,0.4241\n"), []byte("\n1000,0.4300\n"), 1)
	if bytes.Equal(changed, data) {
		t.Fatal("tc-31: the line to change is not in the file")
	}
	if err := os.WriteFile(p, changed, 0o644); err != nil {
		t.Fatal(err)
	}
	warm := render(openCache(t, cdir, "build-1"))
	sameFiles(t, warm.mapWriter, render(nil).mapWriter)
	for name, want := range map[string]bool{
		"compare/cool-colours/index.html":        false, // lists tc-31
		"compare/white-roof-surfaces/index.html": true,
		"compare/covered-emitter/index.html":     true,
		"compare/textiles-over-skin/index.html":  false, // a reference and skin: never kept
	} {
		if _, ok := warm.mapWriter[name]; !ok {
			t.Errorf("%s: not in the site", name)
		} else if got := warm.src[name] != "" && warm.src[name] == cold.src[name]; got != want {
			t.Errorf("%s: taken from the cache %v, want %v", name, got, want)
		}
	}
}

// TestOverlayOfChangedFiles checks that a material taken from the cache
// whose files changed since (the summary's SHA-256 no longer theirs) is
// not drawn on a comparison: the render stops and says why.
func TestOverlayOfChangedFiles(t *testing.T) {
	lib, err := library.Load(os.DirFS("../.."))
	if err != nil {
		t.Fatal(err)
	}
	b, err := newBuilder(lib, Options{Version: "test"})
	if err != nil {
		t.Fatal(err)
	}
	m := lib.Materials[slices.IndexFunc(lib.Materials, func(m *library.Material) bool { return m.Slug == "tc-31" })]
	s := &evaluate.Summary{Material: m, Inputs: []library.Input{{Path: "content/paints/tc-31/uvvis.csv", SHA256: "0"}}}
	_, err = b.overlayOf(s)
	if err == nil || !strings.Contains(err.Error(), "tc-31.md") || !strings.Contains(err.Error(), "changed while the site was rendered") {
		t.Errorf("overlayOf with a stale summary: %v, want an error naming tc-31.md and the change", err)
	}
	// With the summary's inputs those of the files, it draws them.
	_, inputs, err := evaluate.Optics(lib, m)
	if err != nil {
		t.Fatal(err)
	}
	s.Inputs = inputs
	if o, err := b.overlayOf(s); err != nil || o.r.Empty() || o.a.Empty() {
		t.Errorf("overlayOf: %v, reflectance empty %v, emittance empty %v", err, o.r.Empty(), o.a.Empty())
	}
}

// openCounter counts the Markdown files opened through it (to be read).
type openCounter struct {
	fs.FS
	mu     sync.Mutex
	opened []string
}

func (c *openCounter) Open(name string) (fs.File, error) {
	if strings.HasSuffix(name, ".md") {
		c.mu.Lock()
		c.opened = append(c.opened, name)
		c.mu.Unlock()
	}
	return c.FS.Open(name)
}

// Stat looks without opening, as the CLI's file system does.
func (c *openCounter) Stat(name string) (fs.FileInfo, error) { return fs.Stat(c.FS, name) }

// TestCacheReadsChangedText checks that a render with the cache and a
// front matter cache reads the text of no Markdown file but those of the
// materials it evaluates (for their datasheets): the search index takes
// the others' entries from the cache.
func TestCacheReadsChangedText(t *testing.T) {
	dir, cdir := copyDemo(t), t.TempDir()
	time.Sleep(2100 * time.Millisecond) // old enough to stamp (see library.StampOf)
	fsys := &openCounter{FS: os.DirFS(dir)}
	fc := library.NewFrontCache("build-1")
	render := func() []string {
		t.Helper()
		lib, err := library.LoadWith(fsys, fc)
		if err != nil {
			t.Fatal(err)
		}
		fsys.mu.Lock()
		fsys.opened = nil
		fsys.mu.Unlock()
		c := openCache(t, cdir, "build-1")
		if err := Render(lib, Options{Version: "test", Cache: c}, linkWriter{mapWriter{}}); err != nil {
			t.Fatal(err)
		}
		if err := c.Commit(); err != nil {
			t.Fatal(err)
		}
		return slices.Sorted(slices.Values(fsys.opened))
	}
	render()
	render()
	spec := spectrumOf(t, dir, "kw-21")
	data, err := os.ReadFile(spec)
	if err != nil {
		t.Fatal(err)
	}
	write(t, spec, append(data, '\n'))
	// The changed material's file, and those of the materials a
	// comparison sets against a reference (never kept, see keyOf).
	lib, err := library.Load(os.DirFS(dir))
	if err != nil {
		t.Fatal(err)
	}
	m, _ := lib.Material("kw-21")
	want := []string{m.Path}
	for _, c := range lib.Comparisons {
		if c.Reference != nil || c.Skin != nil {
			for _, x := range c.Materials {
				want = append(want, x.Path)
			}
		}
	}
	slices.Sort(want)
	if len(want) < 2 {
		t.Fatal("the demo has no comparison against a reference")
	}
	if got := render(); !slices.Equal(got, slices.Compact(want)) {
		t.Errorf("Markdown files read by the render: %q, want %q", got, want)
	}
}

// TestCachePartDamaged checks that a kept part of a file made of every
// material (see appendMemo) that is shorter or longer than recorded is made
// afresh.
func TestCachePartDamaged(t *testing.T) {
	fsys := bigLibraryFS(t, 2*pageRows)
	render := func(c *Cache) mapWriter {
		t.Helper()
		out := mapWriter{}
		renderCommit(t, fsys, c, out)
		return out
	}
	cdir := t.TempDir()
	render(openCache(t, cdir, "build-1"))
	base := filepath.Join(cdir, cacheVersion)
	var parts []string
	for key, e := range readEntries(base, "build-1") {
		if len(e.Files) == 1 && e.Files[0].Name == memoPart {
			parts = append(parts, filepath.Join(base, key, "0"))
		}
	}
	if len(parts) < 8 {
		t.Fatalf("%d kept parts, want at least 8 (4 files, 2 parts each)", len(parts))
	}
	for i, p := range parts {
		st, err := os.Stat(p)
		if err != nil {
			t.Fatal(err)
		}
		data, err := os.ReadFile(p)
		if err != nil {
			t.Fatal(err)
		}
		if i%2 == 0 {
			data = data[:len(data)-1]
		} else {
			data = append(data, ' ')
		}
		write(t, p, data)
		// The time recorded kept, so that only the size tells.
		if err := os.Chtimes(p, st.ModTime(), st.ModTime()); err != nil {
			t.Fatal(err)
		}
	}
	sameFiles(t, render(openCache(t, cdir, "build-1")), render(nil))
}

// TestAppendFile checks that appendFile appends a file of the size given
// and refuses one shorter or longer, leaving dst as it was.
func TestAppendFile(t *testing.T) {
	p := filepath.Join(t.TempDir(), "part")
	write(t, p, []byte("12345"))
	for _, tt := range []struct {
		size int64
		ok   bool
	}{{5, true}, {4, false}, {6, false}} {
		got, ok := appendFile([]byte("ab"), p, tt.size)
		want := "ab"
		if tt.ok {
			want = "ab12345"
		}
		if ok != tt.ok || string(got) != want {
			t.Errorf("size %d: %q, %v; want %q, %v", tt.size, got, ok, want, tt.ok)
		}
	}
	if got, ok := appendFile([]byte("ab"), p+".missing", 5); ok || string(got) != "ab" {
		t.Errorf("a missing file: %q, %v", got, ok)
	}
}
