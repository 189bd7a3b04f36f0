package main

import (
	"errors"
	"io"
	"io/fs"
	"os"
	"path/filepath"
	"strings"
	"syscall"
	"testing"
	"time"
)

// within runs f and fails the test if it takes longer than d: a read that
// blocks (a named pipe opened for reading) must fail the test, not hang it.
func within(t *testing.T, d time.Duration, f func()) {
	t.Helper()
	done := make(chan struct{})
	go func() {
		defer close(done)
		f()
	}()
	select {
	case <-done:
	case <-time.After(d):
		t.Fatalf("still running after %v: blocked on a named pipe?", d)
	}
}

// mkfifo makes a named pipe at p or skips the test.
func mkfifo(t *testing.T, p string) {
	t.Helper()
	if err := syscall.Mkfifo(p, 0o644); err != nil {
		t.Skip("no named pipes here:", err)
	}
}

func TestNamedPipeRefused(t *testing.T) {
	t.Run("figures", func(t *testing.T) {
		p := filepath.Join(t.TempDir(), "pipe.csv")
		mkfifo(t, p)
		within(t, 10*time.Second, func() {
			code, _, stderr := runCLI("figures", p)
			if code != 1 || !strings.Contains(stderr, p) || !strings.Contains(stderr, "named pipe") {
				t.Errorf("exit %d, stderr %q", code, stderr)
			}
		})
	})
	t.Run("content file", func(t *testing.T) {
		lib := copyLibrary(t)
		mkfifo(t, filepath.Join(lib, "content", "roof", "pipe.md"))
		within(t, 10*time.Second, func() {
			code, _, stderr := runCLI("render", lib, "--site", filepath.Join(t.TempDir(), "site"))
			if code != 1 || !strings.Contains(stderr, "content/roof/pipe.md") || !strings.Contains(stderr, "named pipe") {
				t.Errorf("exit %d, stderr %q", code, stderr)
			}
		})
	})
	t.Run("spectrum file", func(t *testing.T) {
		lib := copyLibrary(t)
		csv := filepath.Join(lib, "content", "roof", "basalt-uvvis.csv")
		os.Remove(csv)
		mkfifo(t, csv)
		within(t, 10*time.Second, func() {
			code, _, stderr := runCLI("render", lib, "--site", filepath.Join(t.TempDir(), "site"))
			if code != 1 || !strings.Contains(stderr, "content/roof/basalt.md:9") || !strings.Contains(stderr, "basalt-uvvis.csv") || !strings.Contains(stderr, "named pipe") {
				t.Errorf("exit %d, stderr %q", code, stderr)
			}
			// The preview reports it and serves on; a later rebuild is not
			// blocked either.
			s := &preview{dir: lib, version: "test", log: io.Discard}
			for range 2 {
				s.rerender()
				if len(s.failed) != 1 || !strings.Contains(s.failed[0], "named pipe") {
					t.Errorf("preview problems %q", s.failed)
				}
			}
		})
	})
	t.Run("template", func(t *testing.T) {
		lib := copyLibrary(t)
		os.MkdirAll(filepath.Join(lib, "templates"), 0o755)
		mkfifo(t, filepath.Join(lib, "templates", "page.html"))
		within(t, 10*time.Second, func() {
			code, _, stderr := runCLI("render", lib, "--site", filepath.Join(t.TempDir(), "site"))
			if code != 1 || !strings.Contains(stderr, "page.html") || !strings.Contains(stderr, "named pipe") {
				t.Errorf("exit %d, stderr %q", code, stderr)
			}
		})
	})
}

func TestMaxFileSize(t *testing.T) {
	big := "wavelength_nm,R\n" + strings.Repeat("400,0.5\n", 1) + "500,0.5\n" + strings.Repeat("# padding\n", 300)
	name := writeFile(t, "big.csv", big)
	code, _, stderr := runCLI("figures", "--max-file-size", "2KiB", name)
	if code != 1 || !strings.Contains(stderr, name) || !strings.Contains(stderr, "the file is 2.96 KiB, above the limit of 2 KiB; raise the limit with --max-file-size") {
		t.Errorf("figures: exit %d, stderr %q", code, stderr)
	}
	if code, _, _ := runCLI("figures", "--max-file-size", "0", name); code != 2 {
		t.Errorf("a zero limit: exit %d, want 2", code)
	}

	lib := copyLibrary(t)
	code, _, stderr = runCLI("render", lib, "--max-file-size", "1KiB", "--site", filepath.Join(t.TempDir(), "site"))
	if code != 1 || !strings.Contains(stderr, "above the limit of 1 KiB") || !strings.Contains(stderr, "content/") {
		t.Errorf("render: exit %d, stderr %q", code, stderr)
	}
	if code, out, errs := runCLI("review", lib, "--max-file-size", "1KiB"); code != 1 || !strings.Contains(out+errs, "--max-file-size") {
		t.Errorf("review: exit %d\n%s%s", code, out, errs)
	}
	if code, _, stderr := runCLI("render", lib, "--max-file-size", "64MiB", "--site", filepath.Join(t.TempDir(), "site")); code != 0 {
		t.Errorf("render within the limit: exit %d: %s", code, stderr)
	}
}

// TestReadLimitedSizeLies reads a file whose size, as the system reports
// it, is 0 while it holds more: the read itself is bounded.
func TestReadLimitedSizeLies(t *testing.T) {
	f, err := os.Open("/proc/self/status")
	if err != nil {
		t.Skip("no /proc here")
	}
	defer f.Close()
	if st, err := f.Stat(); err != nil || st.Size() != 0 {
		t.Skip("/proc/self/status tells its size here")
	}
	if _, err := readLimited(f, 100); !errors.Is(err, errTooLarge) {
		t.Errorf("error %v, want errTooLarge", err)
	}
}

// TestInputFSFileGrows checks that a file growing past the limit after it
// was opened fails the read.
func TestInputFSFileGrows(t *testing.T) {
	dir := t.TempDir()
	writeAt(t, filepath.Join(dir, "a.csv"), "0123456789")
	root, err := os.OpenRoot(dir)
	if err != nil {
		t.Fatal(err)
	}
	defer root.Close()
	fsys := newInputFS(root, 64)
	f, err := fsys.Open("a.csv")
	if err != nil {
		t.Fatal(err)
	}
	defer f.Close()
	if err := os.WriteFile(filepath.Join(dir, "a.csv"), []byte(strings.Repeat("x", 1000)), 0o644); err != nil {
		t.Fatal(err)
	}
	if _, err := io.ReadAll(f); !errors.Is(err, errTooLarge) {
		t.Errorf("error %v, want errTooLarge", err)
	}
	if _, err := fsys.Open("../x"); err == nil {
		t.Error("a path out of the folder was opened")
	}
}

func TestSizeFlag(t *testing.T) {
	for _, tc := range []struct {
		in   string
		want int64
	}{
		{"64MiB", 64 << 20}, {"1GiB", 1 << 30}, {"1.5 KiB", 1536}, {"100", 100}, {"2m", 2 << 20}, {"10KB", 10 << 10},
	} {
		var n int64
		if err := (sizeFlag{&n}).Set(tc.in); err != nil || n != tc.want {
			t.Errorf("%q: %d, %v; want %d", tc.in, n, err, tc.want)
		}
	}
	for _, bad := range []string{"", "-1", "0", "MiB", "1TiB5", "NaN"} {
		var n int64
		if err := (sizeFlag{&n}).Set(bad); err == nil {
			t.Errorf("%q accepted as %d", bad, n)
		}
	}
}

// TestWriteFileAtomic checks that a failed write (a full disk, say) leaves
// the old file whole and no temporary file behind.
func TestWriteFileAtomic(t *testing.T) {
	dir := t.TempDir()
	p := filepath.Join(dir, "out.csv")
	writeAt(t, p, "old content\n")
	full := &os.PathError{Op: "write", Path: p, Err: syscall.ENOSPC}
	err := writeFileAtomic(p, func(w io.Writer) error {
		io.WriteString(w, "half of the new")
		return full
	})
	if !errors.Is(err, syscall.ENOSPC) {
		t.Errorf("error %v, want ENOSPC", err)
	}
	if data, _ := os.ReadFile(p); string(data) != "old content\n" {
		t.Errorf("old file now %q", data)
	}
	if entries, _ := os.ReadDir(dir); len(entries) != 1 {
		t.Errorf("%d entries in the folder, want 1", len(entries))
	}
	if err := writeFileAtomic(p, func(w io.Writer) error {
		_, err := io.WriteString(w, "new\n")
		return err
	}); err != nil {
		t.Fatal(err)
	}
	if data, _ := os.ReadFile(p); string(data) != "new\n" {
		t.Errorf("new file %q", data)
	}
	if st, _ := os.Stat(p); st.Mode().Perm() != 0o644 {
		t.Errorf("mode %v", st.Mode())
	}
}

// TestOutputIsNotAnInput checks that splice, figures --save-spectrum and
// import refuse to write over one of their inputs, by any name.
func TestOutputIsNotAnInput(t *testing.T) {
	dir := t.TempDir()
	a := filepath.Join(dir, "a.csv")
	b := filepath.Join(dir, "b.csv")
	writeAt(t, a, "wavelength_nm,R\n300,0.5\n1000,0.5\n")
	writeAt(t, b, "wavelength_nm,R\n900,0.5\n2500,0.5\n")
	link := filepath.Join(dir, "link.csv")
	hard := filepath.Join(dir, "hard.csv")
	if err := os.Symlink(a, link); err != nil {
		t.Skip("no symbolic links:", err)
	}
	if err := os.Link(b, hard); err != nil {
		t.Skip("no hard links:", err)
	}
	for _, args := range [][]string{
		{"splice", a, b, "-o", a},
		{"splice", a, b, "-o", link},
		{"splice", a, b, "-o", hard},
		{"splice", a, b, "-o", filepath.Join(dir, ".", "b.csv")},
		{"figures", "--save-spectrum", link, a, b},
		{"figures", "--save-spectrum", b, a, b},
		{"import", "-o", dir, hard},
	} {
		code, _, stderr := runCLI(args...)
		if code != 2 || !strings.Contains(stderr, "would destroy it") {
			t.Errorf("%v: exit %d, stderr %q", args, code, stderr)
		}
	}
	if data, _ := os.ReadFile(a); string(data) != "wavelength_nm,R\n300,0.5\n1000,0.5\n" {
		t.Errorf("a.csv changed: %q", data)
	}
	if data, _ := os.ReadFile(b); string(data) != "wavelength_nm,R\n900,0.5\n2500,0.5\n" {
		t.Errorf("b.csv changed: %q", data)
	}
	// A new output is fine, and leaves no temporary file.
	if code, _, stderr := runCLI("splice", a, b, "-o", filepath.Join(dir, "joined.csv")); code != 0 {
		t.Errorf("splice: exit %d: %s", code, stderr)
	}
	entries, _ := os.ReadDir(dir)
	if len(entries) != 5 {
		t.Errorf("%d entries, want a, b, link, hard and joined", len(entries))
	}
}

// TestWarningsShown checks that the plausibility warnings of the readers
// reach the user of figures, splice and import, and fail nothing.
func TestWarningsShown(t *testing.T) {
	grouped := writeFile(t, "grouped.tsv", "wavelength_nm\tR\n1.000\t0.5\n2.500\t0.5\n")
	for _, args := range [][]string{
		{"figures", grouped},
		{"import", "-o", t.TempDir(), grouped},
	} {
		code, out, errs := runCLI(args...)
		if !strings.Contains(errs, "warning: "+grouped+": every value of the spectral axis is written like 2.500") {
			t.Errorf("%v: exit %d, no warning\n%s%s", args, code, out, errs)
		}
	}
	// figures --json carries them too, and the exit status stays 0.
	pct := writeFile(t, "pct.csv", "wavelength_nm,R (%)\n280,0.9\n2500,0.9\n")
	code, out, errs := runCLI("figures", "--json", pct)
	if code != 0 || !strings.Contains(errs, "warning: "+pct+": column 2 (R (%)) is marked as percent") ||
		!strings.Contains(out, `"warnings": [`) || !strings.Contains(out, "fractions in a percent column?") {
		t.Errorf("exit %d\n%s%s", code, out, errs)
	}
}

// TestInputFSDeepPaths checks the paths inputFS reaches through a folder
// two levels down: the same files and listings as through the root, errors
// that name the whole path, a symbolic link out of the library refused,
// and the root alone after Close.
func TestInputFSDeepPaths(t *testing.T) {
	dir, outside := t.TempDir(), t.TempDir()
	if err := os.MkdirAll(filepath.Join(dir, "content", "film", "a"), 0o755); err != nil {
		t.Fatal(err)
	}
	writeAt(t, filepath.Join(dir, "content", "film", "a", "r.csv"), "1,2\n")
	writeAt(t, filepath.Join(dir, "content", "film", "a.md"), "---\ntitle: a\n---\n")
	writeAt(t, filepath.Join(outside, "secret.csv"), "3,4\n")
	if err := os.Symlink(filepath.Join(outside, "secret.csv"), filepath.Join(dir, "content", "film", "a", "link.csv")); err != nil {
		t.Skip("no symbolic links here:", err)
	}
	root, err := os.OpenRoot(dir)
	if err != nil {
		t.Fatal(err)
	}
	defer root.Close()
	fsys := newInputFS(root, 64)
	check := func(when string) {
		if data, err := fs.ReadFile(fsys, "content/film/a/r.csv"); err != nil || string(data) != "1,2\n" {
			t.Errorf("%s: read %q, %v", when, data, err)
		}
		if st, err := fsys.Stat("content/film/a.md"); err != nil || st.Name() != "a.md" || st.Size() != 17 {
			t.Errorf("%s: stat %v, %v", when, st, err)
		}
		if es, err := fsys.ReadDir("content/film/a"); err != nil || len(es) != 2 || es[0].Name() != "link.csv" || es[1].Name() != "r.csv" {
			t.Errorf("%s: listing %v, %v", when, es, err)
		}
		for _, op := range []func(string) error{
			func(p string) error { _, err := fsys.Open(p); return err },
			func(p string) error { _, err := fsys.Stat(p); return err },
		} {
			var pe *fs.PathError
			if err := op("content/film/a/none.csv"); !errors.As(err, &pe) || pe.Path != "content/film/a/none.csv" {
				t.Errorf("%s: missing file: error %v, want one naming content/film/a/none.csv", when, err)
			}
			if err := op("content/film/a/link.csv"); err == nil {
				t.Errorf("%s: a link out of the library was followed", when)
			}
		}
	}
	check("first")
	if fsys.subs["content/film"] == nil {
		t.Error("content/film was not opened as a folder of its own")
	}
	check("again")
	fsys.Close()
	check("after Close")
	if len(fsys.subs) != 0 {
		t.Errorf("%d folders opened after Close", len(fsys.subs))
	}
}
