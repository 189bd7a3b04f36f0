package main

import (
	"crypto/sha256"
	"fmt"
	"io/fs"
	"os"
	"path/filepath"
	"sort"
	"strconv"
	"strings"
	"testing"
	"time"

	"skysheet/datasheet/weather"
)

// malformedRoot is the corpus of malformed inputs: every file or folder in
// its sub-folders is one case, with the message it must give in NAME.want
// beside it (see testdata/malformed/README.md).
var malformedRoot = filepath.Join("..", "..", "testdata", "malformed")

// TestMalformed runs every case of the corpus through the reader or verb
// it is meant for: none may panic or take more than its time limit, each
// must give its exit status and every fragment of its .want file, and no
// file of the corpus (or of a site folder the render was told to use) may
// change. go test -run Malformed -update writes the .want files of new
// cases from what the program says; read them and cut each to a stable
// fragment (file:line:column and the key words) before committing.
func TestMalformed(t *testing.T) {
	before := hashTree(t, malformedRoot)
	n := 0
	for _, kind := range []string{"spectra", "jcamp", "weather", "library", "site"} {
		entries, err := os.ReadDir(filepath.Join(malformedRoot, kind))
		if err != nil {
			t.Fatal(err)
		}
		for _, e := range entries {
			if strings.HasSuffix(e.Name(), ".want") {
				continue
			}
			n++
			name := e.Name()
			t.Run(kind+"/"+name, func(t *testing.T) {
				var code int
				var out string
				within(t, 30*time.Second, func() {
					code, out = runMalformed(t, kind, filepath.Join(malformedRoot, kind, name))
				})
				checkMalformed(t, filepath.Join(malformedRoot, kind, name+".want"), code, out)
			})
		}
	}
	if n < 40 {
		t.Errorf("%d cases, want at least 40", n)
	}
	after := hashTree(t, malformedRoot)
	for p, h := range before {
		if after[p] != h {
			t.Errorf("%s changed", p)
		}
	}
	for p := range after {
		if _, ok := before[p]; !ok {
			t.Errorf("%s appeared", p)
		}
	}
}

// runMalformed runs one case and returns the exit status and everything
// it printed, with the corpus path cut to the case's own name.
func runMalformed(t *testing.T, kind, p string) (int, string) {
	t.Helper()
	var code int
	var stdout, stderr string
	switch kind {
	case "spectra", "jcamp":
		code, stdout, stderr = runCLI("figures", p)
	case "weather":
		_, err := weather.Read(os.DirFS(filepath.Dir(p)), filepath.Base(p))
		if err != nil {
			code, stderr = 1, err.Error()
		}
	case "library":
		code, stdout, stderr = runCLI("render", p, "--site", filepath.Join(t.TempDir(), "site"), "--no-cache")
	case "site":
		// A copy of the case is the site folder; a refused render must
		// leave it as it was.
		dst := filepath.Join(t.TempDir(), filepath.Base(p))
		copyTree(t, p, dst)
		before := hashTree(t, dst)
		code, stdout, stderr = runCLI("render", filepath.Join("..", "..", "testdata", "library"), "--site", dst, "--no-cache")
		stderr = strings.ReplaceAll(stderr, filepath.Dir(dst)+string(filepath.Separator), "")
		if code != 0 {
			after := hashTree(t, dst)
			if fmt.Sprint(after) != fmt.Sprint(before) {
				t.Errorf("a refused render changed the site folder")
			}
		}
	}
	out := strings.ReplaceAll(stdout+stderr, filepath.Dir(p)+string(filepath.Separator), "")
	return code, out
}

// checkMalformed compares a case's result with its .want file: a first
// line "exit N", then fragments that must each appear in the output.
func checkMalformed(t *testing.T, wantFile string, code int, out string) {
	t.Helper()
	data, err := os.ReadFile(wantFile)
	if *update && err != nil {
		first, rest, _ := strings.Cut(strings.TrimSpace(out), "\n")
		if strings.HasSuffix(first, "nothing was written:") { // a library's problems follow
			first, _, _ = strings.Cut(strings.TrimSpace(rest), "\n")
		}
		first = strings.TrimPrefix(strings.TrimPrefix(first, "skysheet figures: "), "skysheet render: ")
		if err := os.WriteFile(wantFile, fmt.Appendf(nil, "exit %d\n%s\n", code, first), 0o644); err != nil {
			t.Fatal(err)
		}
		return
	}
	if err != nil {
		t.Fatalf("%v (run go test -run Malformed -update to create it)", err)
	}
	lines := strings.Split(strings.TrimRight(string(data), "\n"), "\n")
	wantCode, err := strconv.Atoi(strings.TrimPrefix(lines[0], "exit "))
	if err != nil || !strings.HasPrefix(lines[0], "exit ") {
		t.Fatalf("%s: first line %q, want \"exit N\"", wantFile, lines[0])
	}
	if code != wantCode {
		t.Errorf("exit %d, want %d\n%s", code, wantCode, out)
	}
	if len(lines) < 2 {
		t.Errorf("%s names no message", wantFile)
	}
	for _, frag := range lines[1:] {
		if !strings.Contains(out, frag) {
			t.Errorf("output lacks %q:\n%.2000s", frag, out)
		}
	}
}

// hashTree returns the SHA-256 of every file below root, by path.
func hashTree(t *testing.T, root string) map[string][sha256.Size]byte {
	t.Helper()
	out := map[string][sha256.Size]byte{}
	st, err := os.Stat(root)
	if err != nil {
		t.Fatal(err)
	}
	if !st.IsDir() {
		data, _ := os.ReadFile(root)
		out["."] = sha256.Sum256(data)
		return out
	}
	err = filepath.WalkDir(root, func(p string, d fs.DirEntry, err error) error {
		if err != nil || d.IsDir() {
			return err
		}
		data, err := os.ReadFile(p)
		rel, _ := filepath.Rel(root, p)
		out[rel] = sha256.Sum256(data)
		return err
	})
	if err != nil {
		t.Fatal(err)
	}
	return out
}

// copyTree copies the file or folder src to dst.
func copyTree(t *testing.T, src, dst string) {
	t.Helper()
	var paths []string
	filepath.WalkDir(src, func(p string, d fs.DirEntry, err error) error {
		if err == nil {
			paths = append(paths, p)
		}
		return err
	})
	sort.Strings(paths)
	for _, p := range paths {
		rel, _ := filepath.Rel(src, p)
		target := filepath.Join(dst, rel)
		st, err := os.Stat(p)
		if err != nil {
			t.Fatal(err)
		}
		if st.IsDir() {
			os.MkdirAll(target, 0o755)
			continue
		}
		data, err := os.ReadFile(p)
		if err != nil {
			t.Fatal(err)
		}
		writeNew(t, target, string(data))
	}
}
