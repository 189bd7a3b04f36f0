package main

import (
	"bytes"
	"errors"
	"os"
	"os/exec"
	"os/signal"
	"path/filepath"
	"strconv"
	"strings"
	"sync/atomic"
	"syscall"
	"testing"
	"time"
)

// writeNew writes the file p, creating its folder.
func writeNew(t *testing.T, p, data string) {
	t.Helper()
	if err := os.MkdirAll(filepath.Dir(p), 0o755); err != nil {
		t.Fatal(err)
	}
	writeAt(t, p, data)
}

// siteFiles returns the files of a site tree without the marker.
func siteFiles(tree map[string][]byte) map[string][]byte {
	out := map[string][]byte{}
	for k, v := range tree {
		if k != siteMarker {
			out[k] = v
		}
	}
	return out
}

// sameTree reports the differences between two trees.
func sameTree(t *testing.T, what string, got, want map[string][]byte) {
	t.Helper()
	for name, data := range want {
		g, ok := got[name]
		switch {
		case !ok:
			t.Errorf("%s: %s missing", what, name)
		case !bytes.Equal(g, data):
			t.Errorf("%s: %s differs", what, name)
		}
	}
	for name := range got {
		if _, ok := want[name]; !ok {
			t.Errorf("%s: %s should not be there", what, name)
		}
	}
}

// cleanRender renders lib with version ver into a fresh folder and returns
// its files.
func cleanRender(t *testing.T, lib, ver string) map[string][]byte {
	t.Helper()
	out := filepath.Join(t.TempDir(), "clean")
	if _, err := renderSite(lib, out, ver, &bytes.Buffer{}, false); err != nil {
		t.Fatal(err)
	}
	return readTree(t, out)
}

// siblings lists the names beside the site folder other than the library.
func siblings(t *testing.T, parent string) []string {
	t.Helper()
	entries, err := os.ReadDir(parent)
	if err != nil {
		t.Fatal(err)
	}
	var names []string
	for _, e := range entries {
		names = append(names, e.Name())
	}
	return names
}

// TestRenderKeepsFilesItDidNotWrite renders into a folder that looks like a
// gh-pages checkout: refused until it is marked, then its own files stay.
func TestRenderKeepsFilesItDidNotWrite(t *testing.T) {
	lib := copyLibrary(t)
	out := filepath.Join(t.TempDir(), "pages")
	own := map[string]string{".git/HEAD": "ref: refs/heads/gh-pages\n", "CNAME": "datasheets.example.org\n", ".nojekyll": "", "notes.txt": "keep me", "m/notes.md": "mine too"}
	for name, data := range own {
		writeNew(t, filepath.Join(out, filepath.FromSlash(name)), data)
	}
	before := readTree(t, out)

	code, _, stderr := runCLI("render", lib, "--site", out)
	if code != 1 || !strings.Contains(stderr, "not rendered by skysheet") || !strings.Contains(stderr, siteMarker) {
		t.Fatalf("unmarked folder: exit %d, stderr %q", code, stderr)
	}
	sameTree(t, "after a refused render", readTree(t, out), before)

	writeAt(t, filepath.Join(out, siteMarker), "")
	if code, _, stderr := runCLI("render", lib, "--site", out); code != 0 {
		t.Fatalf("marked folder: exit %d: %s", code, stderr)
	}
	tree := readTree(t, out)
	for name, data := range own {
		if string(tree[name]) != data {
			t.Errorf("%s changed or lost: %q", name, tree[name])
		}
	}
	clean := cleanRender(t, lib, version())
	for name, data := range siteFiles(clean) {
		if !bytes.Equal(tree[name], data) {
			t.Errorf("%s not rendered", name)
		}
	}
	marker := string(tree[siteMarker])
	if !strings.Contains(marker, "\nindex.html\n") || strings.Contains(marker, "notes") || strings.Contains(marker, "CNAME") {
		t.Errorf("marker lists the wrong files:\n%s", marker)
	}

	// A material removed from the library: its pages go, the user's files stay.
	if err := os.Remove(filepath.Join(lib, "content", "roof", "basalt.md")); err != nil {
		t.Fatal(err)
	}
	if err := os.Remove(filepath.Join(lib, "content", "whites-vs-dark.md")); err != nil && !errors.Is(err, os.ErrNotExist) {
		t.Fatal(err)
	}
	if code, _, stderr := runCLI("render", lib, "--site", out); code != 0 {
		t.Fatalf("second render: exit %d: %s", code, stderr)
	}
	tree = readTree(t, out)
	if _, ok := tree["m/basalt/index.html"]; ok {
		t.Error("the page of a removed material is still there")
	}
	if _, err := os.Stat(filepath.Join(out, "m", "basalt")); err == nil {
		t.Error("the emptied folder of a removed material is still there")
	}
	for name, data := range own {
		if string(tree[name]) != data {
			t.Errorf("%s changed or lost by the second render", name)
		}
	}
}

// TestRenderRefusesToReplaceForeignFile checks that a render that would
// write over a file skysheet did not write changes nothing.
func TestRenderRefusesToReplaceForeignFile(t *testing.T) {
	lib := copyLibrary(t)
	out := filepath.Join(t.TempDir(), "site")
	writeNew(t, filepath.Join(out, siteMarker), "")
	writeAt(t, filepath.Join(out, "index.html"), "my own page")
	before := readTree(t, out)
	code, _, stderr := runCLI("render", lib, "--site", out)
	if code != 1 || !strings.Contains(stderr, filepath.Join(out, "index.html")+" was not written by skysheet") {
		t.Errorf("exit %d, stderr %q", code, stderr)
	}
	sameTree(t, "after the refused render", readTree(t, out), before)
	if names := siblings(t, filepath.Dir(out)); len(names) != 1 {
		t.Errorf("left beside the site: %v", names)
	}
}

// TestRenderMarkerPaths checks that a marker naming a path outside the
// site folder is refused, not followed.
func TestRenderMarkerPaths(t *testing.T) {
	lib := copyLibrary(t)
	parent := t.TempDir()
	out := filepath.Join(parent, "site")
	victim := filepath.Join(parent, "victim.txt")
	writeAt(t, victim, "keep")
	writeNew(t, filepath.Join(out, siteMarker), markerHeader+"\n../victim.txt\n")
	code, _, stderr := runCLI("render", lib, "--site", out)
	if code != 1 || !strings.Contains(stderr, `"../victim.txt" is not a file path inside the site folder`) {
		t.Errorf("exit %d, stderr %q", code, stderr)
	}
	if data, _ := os.ReadFile(victim); string(data) != "keep" {
		t.Error("a file outside the site folder was touched")
	}
}

// TestRenderRecoversInterruptedSwap stops the swap of a new site at every
// kind of step, as a crash would, and checks that the site folder always
// holds a site and that the next run finishes the swap.
func TestRenderRecoversInterruptedSwap(t *testing.T) {
	for _, tc := range []struct {
		step string
		n    int // stop before the n-th call of this step
	}{
		{"commit", 1},
		{"delete", 1},
		{"move", 1},
		{"move", 6},
		{"marker", 1},
	} {
		t.Run(tc.step+"-"+strconv.Itoa(tc.n), func(t *testing.T) {
			lib := copyLibrary(t)
			parent := t.TempDir()
			out := filepath.Join(parent, "site")
			if _, err := renderSite(lib, out, "v1", &bytes.Buffer{}, false); err != nil {
				t.Fatal(err)
			}
			writeAt(t, filepath.Join(out, "notes.txt"), "kept")
			// v2 drops a material (files to delete) and changes a title.
			os.Remove(filepath.Join(lib, "content", "roof", "basalt.md"))
			os.Remove(filepath.Join(lib, "content", "whites-vs-dark.md"))
			want := siteFiles(cleanRender(t, lib, "v2"))
			want["notes.txt"] = []byte("kept")

			calls := 0
			crash := errors.New("simulated crash")
			swapHook = func(step string) error {
				if step == tc.step {
					if calls++; calls == tc.n {
						return crash
					}
				}
				return nil
			}
			_, err := renderSite(lib, out, "v2", &bytes.Buffer{}, false)
			swapHook = nil
			if !errors.Is(err, crash) {
				t.Fatalf("render: %v, want the simulated crash", err)
			}
			if _, err := os.Stat(filepath.Join(out, siteMarker)); err != nil {
				t.Errorf("no site at the path after the crash: %v", err)
			}
			// The lock of the crashed run is released by its deferred
			// unlock here; a killed process leaves it, which
			// TestRenderStaleLock covers.
			var log bytes.Buffer
			if err := recoverSite(out, &log); err != nil {
				t.Fatal(err)
			}
			if !strings.Contains(log.String(), "finishing an interrupted render") {
				t.Errorf("recovery said %q", log.String())
			}
			sameTree(t, "after recovery", siteFiles(readTree(t, out)), want)
			if names := siblings(t, parent); len(names) != 1 {
				t.Errorf("left beside the site: %v", names)
			}
			// And a plain render afterwards works.
			if _, err := renderSite(lib, out, "v3", &bytes.Buffer{}, false); err != nil {
				t.Fatal(err)
			}
		})
	}
}

// TestRenderConcurrent starts a second render into the same folder while a
// first one is writing: the second is refused at once, the first finishes.
func TestRenderConcurrent(t *testing.T) {
	lib := copyLibrary(t)
	out := filepath.Join(t.TempDir(), "site")
	var second error
	tried := false
	hook := func(w *dirWriter, n int) {
		if n == 3 && !tried {
			tried = true
			_, second = renderSite(lib, out, "second", &bytes.Buffer{}, false)
		}
	}
	writeHook.Store(&hook)
	defer writeHook.Store(nil)
	if _, err := renderSite(lib, out, "first", &bytes.Buffer{}, false); err != nil {
		t.Fatal(err)
	}
	if !tried || !errors.Is(second, errSiteLocked) || !strings.Contains(second.Error(), "process "+strconv.Itoa(os.Getpid())) {
		t.Errorf("second render: %v, want errSiteLocked naming this process", second)
	}
	if !bytes.Contains(readTree(t, out)["index.html"], []byte("skysheet first")) {
		t.Error("the first render did not finish")
	}
}

// TestRenderStaleLock checks that a lock left by a process that is gone is
// broken, and one held by a running process is not.
func TestRenderStaleLock(t *testing.T) {
	lib := copyLibrary(t)
	parent := t.TempDir()
	out := filepath.Join(parent, "site")
	lock := namesOf(out).lock()

	gone := exec.Command("true")
	if err := gone.Run(); err != nil {
		t.Skip("cannot start a process:", err)
	}
	writeAt(t, lock, strconv.Itoa(gone.Process.Pid)+"\n")
	if _, err := renderSite(lib, out, "v1", &bytes.Buffer{}, false); err != nil {
		t.Fatalf("stale lock not broken: %v", err)
	}
	if _, err := os.Stat(lock); err == nil {
		t.Error("lock left after the render")
	}

	writeAt(t, lock, strconv.Itoa(os.Getpid())+"\n")
	code, _, stderr := runCLI("render", lib, "--site", out)
	if code != 1 || !strings.Contains(stderr, "another render") || !strings.Contains(stderr, lock) {
		t.Errorf("live lock: exit %d, stderr %q", code, stderr)
	}
	if data, _ := os.ReadFile(lock); string(data) != strconv.Itoa(os.Getpid())+"\n" {
		t.Error("a live lock was changed")
	}
}

// TestRenderRemovesStaleTemporaryFolders checks that unfinished renders of
// a killed run are cleaned up, and the site of an older swap put back.
func TestRenderRemovesStaleTemporaryFolders(t *testing.T) {
	lib := copyLibrary(t)
	parent := t.TempDir()
	out := filepath.Join(parent, "site")
	for _, d := range []string{".site.new-0a1b2c", ".site.rendering-123"} {
		writeNew(t, filepath.Join(parent, d, "index.html"), "half")
	}
	writeAt(t, filepath.Join(parent, "other.txt"), "not ours")
	if _, err := renderSite(lib, out, "v1", &bytes.Buffer{}, false); err != nil {
		t.Fatal(err)
	}
	if names := siblings(t, parent); strings.Join(names, " ") != "other.txt site" {
		t.Errorf("beside the site: %v", names)
	}
	// An older version moved the site aside and was killed before the
	// second rename: the site is put back.
	if err := os.Rename(out, filepath.Join(parent, ".site.old-77")); err != nil {
		t.Fatal(err)
	}
	var log bytes.Buffer
	if err := recoverSite(out, &log); err != nil {
		t.Fatal(err)
	}
	if _, err := os.Stat(filepath.Join(out, "index.html")); err != nil || !strings.Contains(log.String(), "putting back") {
		t.Errorf("site not put back: %v, %q", err, log.String())
	}
}

// TestRenderInterrupted sends SIGINT to the process in the middle of a
// render: the render stops, the unfinished site is removed, the old one is
// left as it was and the exit status is 130.
func TestRenderInterrupted(t *testing.T) {
	lib := copyLibrary(t)
	parent := t.TempDir()
	out := filepath.Join(parent, "site")
	if _, err := renderSite(lib, out, "v1", &bytes.Buffer{}, false); err != nil {
		t.Fatal(err)
	}
	before := readTree(t, out)
	// Writers run in several goroutines, so more than one may see its fifth
	// write: only the first sends the signal. The test listens for SIGINT
	// itself too, so that a signal arriving after the render has stopped
	// listening cannot end the whole test binary.
	sigs := make(chan os.Signal, 4)
	signal.Notify(sigs, os.Interrupt)
	defer signal.Stop(sigs)
	var fired atomic.Bool
	stopped := make(chan bool, 1)
	hook := func(w *dirWriter, n int) {
		if n < 5 || !fired.CompareAndSwap(false, true) {
			return
		}
		if err := syscall.Kill(os.Getpid(), syscall.SIGINT); err != nil {
			stopped <- false
			return
		}
		for deadline := time.Now().Add(10 * time.Second); time.Now().Before(deadline); time.Sleep(5 * time.Millisecond) {
			if w.isStopped() {
				stopped <- true
				return
			}
		}
		stopped <- false
	}
	writeHook.Store(&hook)
	defer writeHook.Store(nil)
	// Without the cache, as the render before: the render goroutine goes
	// on after the command returns (it only stops writing the site), and
	// cache entries it would still write inside the library folder race
	// with the removal of the test's temporary folders.
	code, _, stderr := runCLI("render", lib, "--site", out, "--no-cache")
	if code != 130 || !strings.Contains(stderr, "interrupted") {
		t.Errorf("exit %d, stderr %q; want 130 and interrupted", code, stderr)
	}
	// The render goroutine may still be in the hook: wait for it.
	select {
	case ok := <-stopped:
		if !ok {
			t.Error("the writer was not stopped")
		}
	case <-time.After(20 * time.Second):
		t.Fatal("the render did not reach its fifth write")
	}
	sameTree(t, "after the interrupted render", readTree(t, out), before)
	if names := siblings(t, parent); len(names) != 1 {
		t.Errorf("left beside the site: %v", names)
	}
}

// TestRenderWritesOnlyWhatChanged re-renders without the cache: files the
// last render wrote with the same bytes stay in place (the same file),
// the rest is written anew, and the site is always the one a render into
// a fresh folder gives.
func TestRenderWritesOnlyWhatChanged(t *testing.T) {
	lib := copyLibrary(t)
	out := filepath.Join(t.TempDir(), "site")
	render := func(step string) {
		t.Helper()
		if _, err := renderSite(lib, out, "v1", &bytes.Buffer{}, false); err != nil {
			t.Fatalf("%s: %v", step, err)
		}
		sameTree(t, step, siteFiles(readTree(t, out)), siteFiles(cleanRender(t, lib, "v1")))
	}
	at := func(rel string) string { return filepath.Join(out, filepath.FromSlash(rel)) }
	// Files are marked by a modification time long past (inode numbers
	// may be reused at once): a file written anew has today's.
	past := time.Date(2001, 1, 1, 0, 0, 0, 0, time.UTC)
	mark := func(rels ...string) {
		t.Helper()
		for _, rel := range rels {
			if err := os.Chtimes(at(rel), past, past); err != nil {
				t.Fatal(err)
			}
		}
	}
	stays := func(step, rel string, want bool) {
		t.Helper()
		if got := inode(t, at(rel)).ModTime().Equal(past); got != want {
			t.Errorf("%s: %s kept in place = %v, want %v", step, rel, got, want)
		}
	}
	tracked := []string{"index.html", "m/frostline/index.html", "m/clearview/index.html"}

	render("first render")
	mark(tracked...)
	render("nothing changed")
	for _, rel := range tracked {
		stays("nothing changed", rel, true)
	}

	// One spectrum changes: its datasheet and the index are written anew,
	// another material's datasheet stays.
	spec := filepath.Join(lib, "content", "films", "clearview.csv")
	data, err := os.ReadFile(spec)
	if err != nil {
		t.Fatal(err)
	}
	writeAt(t, spec, strings.Replace(string(data), "440,0.0800,0.8800", "440,0.1000,0.8600", 1))
	render("one spectrum changed")
	stays("one spectrum changed", "m/clearview/index.html", false)
	stays("one spectrum changed", "m/frostline/index.html", true)

	// A site file edited by hand, or replaced by a link to a file with the
	// same bytes, is written again.
	page := at("m/frostline/index.html")
	f, err := os.OpenFile(page, os.O_WRONLY, 0)
	if err != nil {
		t.Fatal(err)
	}
	f.WriteAt([]byte("<!-- edited by hand -->"), 0)
	f.Close()
	csv := at("materials.csv")
	keep, err := os.ReadFile(csv)
	if err != nil {
		t.Fatal(err)
	}
	elsewhere := filepath.Join(t.TempDir(), "materials.csv")
	writeAt(t, elsewhere, string(keep))
	if err := os.Remove(csv); err != nil {
		t.Fatal(err)
	}
	if err := os.Symlink(elsewhere, csv); err != nil {
		t.Skipf("no symbolic links here: %v", err)
	}
	render("edited by hand")
	if st, err := os.Lstat(csv); err != nil || !st.Mode().IsRegular() {
		t.Errorf("materials.csv, a link before the render, is not a regular file after it: %v", err)
	}
}
