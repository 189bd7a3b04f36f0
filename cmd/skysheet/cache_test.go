package main

import (
	"bytes"
	"context"
	"crypto/sha256"
	"encoding/hex"
	"errors"
	"io"
	"io/fs"
	"os"
	"path/filepath"
	"runtime"
	"strconv"
	"strings"
	"testing"
	"time"

	"skysheet/datasheet/library"
)

// renderCached renders lib into out with version ver and the render cache,
// and returns what it printed and how many materials it took from the
// cache.
func renderCached(t *testing.T, lib, out, ver string) (string, int) {
	t.Helper()
	var log bytes.Buffer
	res, err := renderInto(context.Background(), lib, out, renderOptions{version: ver, progress: &log, cache: true})
	if err != nil {
		t.Fatalf("render: %v (%s)", err, log.String())
	}
	return log.String(), res.reused
}

func inode(t *testing.T, p string) os.FileInfo {
	t.Helper()
	st, err := os.Stat(p)
	if err != nil {
		t.Fatal(err)
	}
	return st
}

// TestRenderCache follows a library through the renders of a working day:
// each site must be the one a render without cache gives.
func TestRenderCache(t *testing.T) {
	lib := copyLibrary(t)
	out := filepath.Join(t.TempDir(), "site")
	page := filepath.Join(out, "m", "frostline", "index.html")
	check := func(step string, reused, want int) {
		t.Helper()
		if reused != want {
			t.Errorf("%s: %d materials from the cache, want %d", step, reused, want)
		}
		sameTree(t, step, siteFiles(readTree(t, out)), siteFiles(cleanRender(t, lib, "v1")))
	}

	_, n := renderCached(t, lib, out, "v1")
	check("first render", n, 0)
	if st, err := os.Stat(filepath.Join(lib, cacheDir, "CACHEDIR.TAG")); err != nil || st.Size() == 0 {
		t.Errorf("the cache folder has no tag: %v", err)
	}

	before := inode(t, page)
	_, n = renderCached(t, lib, out, "v1")
	check("nothing changed", n, 3)
	if !os.SameFile(before, inode(t, page)) {
		t.Error("nothing changed, yet the datasheet was written again")
	}

	// One spectrum changes: that material only is evaluated again.
	spec := filepath.Join(lib, "content", "films", "clearview.csv")
	data, err := os.ReadFile(spec)
	if err != nil {
		t.Fatal(err)
	}
	writeAt(t, spec, string(data)+"\n")
	_, n = renderCached(t, lib, out, "v1")
	check("one spectrum changed", n, 2)

	// A datasheet edited in place in the site (it is the cache's copy
	// too): the cache sees it changed and renders that material again.
	f, err := os.OpenFile(page, os.O_WRONLY, 0)
	if err != nil {
		t.Fatal(err)
	}
	f.WriteAt([]byte("<!-- edited by hand -->"), 0)
	f.Close()
	_, n = renderCached(t, lib, out, "v1")
	check("a site page edited in place", n, 2)

	// Another version: nothing is taken from the cache.
	_, n = renderCached(t, lib, out, "v2")
	if n != 0 {
		t.Errorf("another version: %d materials from the cache", n)
	}
	_, n = renderCached(t, lib, out, "v1")
	check("back to the first version", n, 0)

	// The cache deleted: a full render, the same site.
	if err := os.RemoveAll(filepath.Join(lib, cacheDir)); err != nil {
		t.Fatal(err)
	}
	_, n = renderCached(t, lib, out, "v1")
	check("cache deleted", n, 0)

	// --no-cache neither reads nor writes it.
	os.RemoveAll(filepath.Join(lib, cacheDir))
	if code, _, stderr := runCLI("render", lib, "--site", out, "--no-cache"); code != 0 {
		t.Fatalf("--no-cache: exit %d: %s", code, stderr)
	}
	if _, err := os.Stat(filepath.Join(lib, cacheDir)); !errors.Is(err, os.ErrNotExist) {
		t.Errorf("--no-cache made the cache folder: %v", err)
	}
}

// TestRenderCacheCopies follows renders whose site is on another file
// system than the cache (hard links fail, the files are copied): a
// re-render keeps the copies it made, and a copy edited in the site is
// copied again.
func TestRenderCacheCopies(t *testing.T) {
	linkFile = func(string, string) error { return errors.New("invalid cross-device link") }
	defer func() { linkFile = os.Link }()
	lib := copyLibrary(t)
	out := filepath.Join(t.TempDir(), "site")
	page := filepath.Join(out, "m", "frostline", "index.html")
	want := siteFiles(cleanRender(t, lib, "v1"))

	renderCached(t, lib, out, "v1") // fills the cache
	_, n := renderCached(t, lib, out, "v1")
	if n != 3 {
		t.Errorf("second render: %d materials from the cache, want 3", n)
	}
	sameTree(t, "copies", siteFiles(readTree(t, out)), want)
	before := inode(t, page)
	_, n = renderCached(t, lib, out, "v1")
	if n != 3 {
		t.Errorf("third render: %d materials from the cache, want 3", n)
	}
	sameTree(t, "copies kept", siteFiles(readTree(t, out)), want)
	if !os.SameFile(before, inode(t, page)) {
		t.Error("nothing changed, yet the copy of the datasheet was written again")
	}

	// The copy edited in place, at the same size: copied again.
	f, err := os.OpenFile(page, os.O_WRONLY, 0)
	if err != nil {
		t.Fatal(err)
	}
	f.WriteAt([]byte("<!-- edited by hand -->"), 0)
	f.Close()
	renderCached(t, lib, out, "v1")
	sameTree(t, "an edited copy", siteFiles(readTree(t, out)), want)
}

// TestRenderCacheLocked checks that a render finding the cache held by
// another one goes without it, and says so.
func TestRenderCacheLocked(t *testing.T) {
	lib := copyLibrary(t)
	out := filepath.Join(t.TempDir(), "site")
	renderCached(t, lib, out, "v1")
	lock := filepath.Join(lib, cacheDir, "lock")
	writeAt(t, lock, strconv.Itoa(os.Getpid())+"\nother\n") // a live process
	log, n := renderCached(t, lib, out, "v1")
	if n != 0 || !strings.Contains(log, "rendering without the cache") || !strings.Contains(log, "another render is using it") {
		t.Errorf("locked cache: %d from the cache, log %q", n, log)
	}
	if data, _ := os.ReadFile(lock); !strings.Contains(string(data), "other") {
		t.Error("the other render's lock was taken")
	}
	sameTree(t, "locked cache", siteFiles(readTree(t, out)), siteFiles(cleanRender(t, lib, "v1")))
}

// TestRenderCacheSwapInterrupted checks the swap of a site whose unchanged
// files stayed in place: a crash during it is finished by the next render,
// and a commit folder whose site has gone is not taken for a whole site.
func TestRenderCacheSwapInterrupted(t *testing.T) {
	lib := copyLibrary(t)
	parent := t.TempDir()
	out := filepath.Join(parent, "site")
	renderCached(t, lib, out, "v1")
	os.Remove(filepath.Join(lib, "content", "whites-vs-dark.md"))
	want := siteFiles(cleanRender(t, lib, "v1"))

	crash := errors.New("simulated crash")
	swapHook = func(step string) error {
		if step == "move" {
			return crash
		}
		return nil
	}
	_, err := renderInto(context.Background(), lib, out, renderOptions{version: "v1", progress: &bytes.Buffer{}, cache: true})
	swapHook = nil
	if !errors.Is(err, crash) {
		t.Fatalf("render: %v, want the simulated crash", err)
	}
	if _, n := renderCached(t, lib, out, "v1"); n != 3 {
		t.Errorf("after the crash: %d from the cache, want 3", n)
	}
	sameTree(t, "after recovery", siteFiles(readTree(t, out)), want)

	// A crash at the commit, then the site deleted by hand: the commit
	// folder lacks the files that stayed in place, and says so.
	swapHook = func(step string) error {
		if step == "commit" {
			return crash
		}
		return nil
	}
	writeAt(t, filepath.Join(lib, "content", "roof", "basalt.md"), strings.Replace(readFile(t, filepath.Join(lib, "content", "roof", "basalt.md")), "title:", "title: Renamed", 1))
	_, err = renderInto(context.Background(), lib, out, renderOptions{version: "v1", progress: &bytes.Buffer{}, cache: true})
	swapHook = nil
	if !errors.Is(err, crash) {
		t.Fatalf("render: %v, want the simulated crash", err)
	}
	if err := os.RemoveAll(out); err != nil {
		t.Fatal(err)
	}
	err = recoverSite(out, &bytes.Buffer{})
	if err == nil || !strings.Contains(err.Error(), "render again") {
		t.Errorf("recovering a partial commit without its site: %v", err)
	}
}

func readFile(t *testing.T, p string) string {
	t.Helper()
	data, err := os.ReadFile(p)
	if err != nil {
		t.Fatal(err)
	}
	return string(data)
}

func TestRenderRefusesSiteInCache(t *testing.T) {
	lib := copyLibrary(t)
	code, _, stderr := runCLI("render", lib, "--site", filepath.Join(lib, cacheDir, "site"))
	if code != 2 || !strings.Contains(stderr, "render cache") {
		t.Errorf("site in the cache: exit %d, %q", code, stderr)
	}
}

// TestPreviewCache checks that preview renders through the same cache and
// serves the same files as without it.
func TestPreviewCache(t *testing.T) {
	lib := copyLibrary(t)
	plain, problems := (&preview{dir: lib, version: "test", log: io.Discard}).render()
	if problems != nil {
		t.Fatal(problems)
	}
	if _, err := os.Stat(filepath.Join(lib, cacheDir)); !errors.Is(err, os.ErrNotExist) {
		t.Errorf("a preview without the cache made its folder: %v", err)
	}
	s := &preview{dir: lib, version: "test", log: io.Discard, cache: true}
	for i := range 2 {
		files, problems := s.render()
		if problems != nil {
			t.Fatal(problems)
		}
		sameTree(t, "preview "+strconv.Itoa(i+1), files, plain)
	}
	if _, err := os.Stat(filepath.Join(lib, cacheDir, "v1", "index")); err != nil {
		t.Errorf("the preview left no cache index: %v", err)
	}
}

// TestRenderFrontCache: the front matter of the Markdown files is kept in
// the render cache and taken from it while unchanged; a changed file, a
// damaged cache or one of another build gives the site a render without
// cache gives.
func TestRenderFrontCache(t *testing.T) {
	lib := copyLibrary(t)
	out := filepath.Join(t.TempDir(), "site")
	front := filepath.Join(lib, cacheDir, frontCacheFile)
	render := func(step string, wantFronts int) {
		t.Helper()
		var log bytes.Buffer
		res, err := renderInto(context.Background(), lib, out, renderOptions{version: "v1", progress: &log, cache: true})
		if err != nil {
			t.Fatalf("%s: %v (%s)", step, err, log.String())
		}
		if res.fronts != wantFronts {
			t.Errorf("%s: %d front matters from the cache, want %d", step, res.fronts, wantFronts)
		}
		sameTree(t, step, siteFiles(readTree(t, out)), siteFiles(cleanRender(t, lib, "v1")))
	}
	render("first render", 0)
	render("nothing changed", 3) // two materials and the comparison; basalt sets conditions:

	md := filepath.Join(lib, "content", "films", "clearview.md")
	data, err := os.ReadFile(md)
	if err != nil {
		t.Fatal(err)
	}
	writeAt(t, md, strings.Replace(string(data), "title: ", "title: Renamed ", 1))
	render("a title changed", 2)
	render("after the change", 3)

	kept, err := os.ReadFile(front)
	if err != nil {
		t.Fatal(err)
	}
	damaged := bytes.Clone(kept)
	damaged[len(damaged)/2] ^= 1
	writeAt(t, front, string(damaged))
	render("damaged", 0)
	render("after the damage", 3)

	// Another build's cache, though whole, is not taken.
	fc := library.NewFrontCache("another build")
	library.LoadWith(os.DirFS(lib), fc)
	var other bytes.Buffer
	if _, err := fc.WriteTo(&other); err != nil || fc.Hits() != 0 {
		t.Fatal(err, fc.Hits())
	}
	writeAt(t, front, other.String())
	render("another build", 0)
	render("after another build", 3)
}

// TestExecutableSum: the SHA-256 of the executable is remembered with its
// stamp and taken from the memo while the stamp holds; a changed
// executable, a damaged memo or a file too new to stamp is read.
func TestExecutableSum(t *testing.T) {
	if runtime.GOOS != "linux" && runtime.GOOS != "darwin" {
		t.Skip("no stamps on", runtime.GOOS)
	}
	dir := t.TempDir()
	exe, memo := filepath.Join(dir, "prog"), filepath.Join(dir, "cache", buildFile)
	os.Mkdir(filepath.Dir(memo), 0o755)
	writeAt(t, exe, "program bytes")
	sumOf := func(s string) string { h := sha256.Sum256([]byte(s)); return hex.EncodeToString(h[:]) }
	later := time.Now().Add(time.Minute) // the file is old enough to stamp by then

	// Too new to stamp: read, and not remembered.
	if got, err := executableSum(exe, memo, time.Now()); err != nil || got != sumOf("program bytes") {
		t.Fatalf("sum %s, %v", got, err)
	}
	if _, err := os.Stat(memo); !errors.Is(err, fs.ErrNotExist) {
		t.Fatalf("a file changed just now was remembered: %v", err)
	}
	// Old enough: read and remembered.
	if got, _ := executableSum(exe, memo, later); got != sumOf("program bytes") {
		t.Fatalf("sum %s", got)
	}
	b, err := os.ReadFile(memo)
	if err != nil || !strings.HasSuffix(string(b), sumOf("program bytes")+"\n") {
		t.Fatalf("memo %q, %v", b, err)
	}
	// The memo is what is used: a sum put in it comes back.
	fake := strings.Repeat("ab", sha256.Size)
	writeAt(t, memo, strings.Replace(string(b), sumOf("program bytes"), fake, 1))
	if got, _ := executableSum(exe, memo, later); got != fake {
		t.Errorf("the memo was not used: %s", got)
	}
	// A damaged memo: read again.
	writeAt(t, memo, strings.Replace(string(b), sumOf("program bytes"), "xyz", 1))
	if got, _ := executableSum(exe, memo, later); got != sumOf("program bytes") {
		t.Errorf("damaged memo: %s", got)
	}
	// The executable changed: its stamp moved, read again. (Its size
	// changes too: within one tick of a coarse file system clock the
	// times might not move, a case the stamps' margin keeps out in use.)
	writeAt(t, memo, strings.Replace(string(b), sumOf("program bytes"), fake, 1))
	writeAt(t, exe, "program bytes, new")
	if got, _ := executableSum(exe, memo, later); got != sumOf("program bytes, new") {
		t.Errorf("changed executable: %s", got)
	}
}

// TestRenderCacheKeptLink: a site file that is the cache's very file (a
// hard link of the same device, inode, size and time as recorded) is
// kept on the strength of one look at the site: the cache's path is not
// looked at (here it is gone, and the material still comes from the
// cache); a site file that is another file is not taken for it.
func TestRenderCacheKeptLink(t *testing.T) {
	if runtime.GOOS != "linux" && runtime.GOOS != "darwin" {
		t.Skip("no inodes read on", runtime.GOOS)
	}
	lib := copyLibrary(t)
	out := filepath.Join(t.TempDir(), "site")
	page := filepath.Join(out, "m", "frostline", "index.html")
	want := siteFiles(cleanRender(t, lib, "v1"))
	renderCached(t, lib, out, "v1")

	// The cache's own path to the page removed: the site's link holds it.
	var cached string
	filepath.WalkDir(filepath.Join(lib, cacheDir), func(p string, d fs.DirEntry, err error) error {
		if err == nil && !d.IsDir() && os.SameFile(inode(t, p), inode(t, page)) {
			cached = p
		}
		return nil
	})
	if cached == "" {
		t.Fatal("the site's page is not a link to a cache file")
	}
	if err := os.Remove(cached); err != nil {
		t.Fatal(err)
	}
	if _, n := renderCached(t, lib, out, "v1"); n != 3 {
		t.Errorf("the cache's path gone, the site's link there: %d materials from the cache, want 3", n)
	}
	sameTree(t, "kept by the site's link", siteFiles(readTree(t, out)), want)

	// The site's page replaced by another file of the same bytes, size and
	// time: not the cache's file, whose path is gone, so the material is
	// rendered again.
	data, err := os.ReadFile(page)
	if err != nil {
		t.Fatal(err)
	}
	st := inode(t, page)
	tmp := page + ".tmp"
	writeAt(t, tmp, string(data))
	os.Chtimes(tmp, st.ModTime(), st.ModTime())
	if err := os.Rename(tmp, page); err != nil {
		t.Fatal(err)
	}
	if _, n := renderCached(t, lib, out, "v1"); n != 2 {
		t.Errorf("another file at the page's name: %d materials from the cache, want 2", n)
	}
	sameTree(t, "another file", siteFiles(readTree(t, out)), want)
}
