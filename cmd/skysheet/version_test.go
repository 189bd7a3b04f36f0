package main

import (
	"bytes"
	"io/fs"
	"os"
	"os/exec"
	"path/filepath"
	"strings"
	"testing"
)

// TestTaggedBuild builds skysheet from a copy of this module committed to a
// fresh git repository and tagged v1.2.3, with version-control stamping on
// (this environment may turn it off with GOFLAGS=-buildvcs=false), and
// checks that "skysheet version" and the footer of a rendered page show the
// tag.
func TestTaggedBuild(t *testing.T) {
	if testing.Short() {
		t.Skip("builds the program: skipped with -short")
	}
	gitBin, err := exec.LookPath("git")
	if err != nil {
		if os.Getenv("CI") != "" {
			t.Fatal("git is needed for this test")
		}
		t.Skip("no git")
	}
	goBin := filepath.Join(os.Getenv("GOROOT"), "bin", "go")
	if _, err := os.Stat(goBin); err != nil {
		if goBin, err = exec.LookPath("go"); err != nil {
			t.Skip("no go command")
		}
	}
	root, err := filepath.Abs(filepath.Join("..", ".."))
	if err != nil {
		t.Fatal(err)
	}
	src := filepath.Join(t.TempDir(), "src")
	copyModule(t, root, src)

	run := func(dir, name string, args ...string) string {
		t.Helper()
		cmd := exec.Command(name, args...)
		cmd.Dir = dir
		cmd.Env = append(os.Environ(), "GOFLAGS=-buildvcs=true",
			"GIT_CONFIG_GLOBAL=/dev/null", "GIT_CONFIG_NOSYSTEM=1",
			"GIT_AUTHOR_NAME=test", "GIT_AUTHOR_EMAIL=test@example.invalid",
			"GIT_COMMITTER_NAME=test", "GIT_COMMITTER_EMAIL=test@example.invalid")
		out, err := cmd.CombinedOutput()
		if err != nil {
			t.Fatalf("%s %s: %v\n%s", name, strings.Join(args, " "), err, out)
		}
		return string(out)
	}
	run(src, gitBin, "init", "-q")
	run(src, gitBin, "add", "-A")
	run(src, gitBin, "commit", "-q", "-m", "release")
	run(src, gitBin, "tag", "v1.2.3")
	bin := filepath.Join(t.TempDir(), "skysheet")
	run(src, goBin, "build", "-buildvcs=true", "-o", bin, "./cmd/skysheet")

	if got := run(src, bin, "version"); strings.TrimSpace(got) != "skysheet v1.2.3" {
		t.Errorf("skysheet version = %q, want %q", got, "skysheet v1.2.3")
	}
	lib := filepath.Join(t.TempDir(), "lib")
	run(src, bin, "init", lib)
	run(src, bin, "render", lib)
	page, err := os.ReadFile(filepath.Join(lib, "site", "index.html"))
	if err != nil {
		t.Fatal(err)
	}
	if !bytes.Contains(page, []byte("by skysheet v1.2.3")) {
		t.Errorf("the index footer does not name skysheet v1.2.3")
	}
}

// copyModule copies what building ./cmd/skysheet needs from the module at
// root to dst: go.mod, go.sum and the Go packages with their embedded
// files, leaving out test data and npm folders.
func copyModule(t *testing.T, root, dst string) {
	t.Helper()
	copyFile := func(rel string) {
		data, err := os.ReadFile(filepath.Join(root, rel))
		if err != nil {
			t.Fatal(err)
		}
		p := filepath.Join(dst, rel)
		if err := os.MkdirAll(filepath.Dir(p), 0o755); err != nil {
			t.Fatal(err)
		}
		if err := os.WriteFile(p, data, 0o644); err != nil {
			t.Fatal(err)
		}
	}
	copyFile("go.mod")
	copyFile("go.sum")
	for _, top := range []string{"cmd", "spectra", "datasheet", "templates"} {
		err := filepath.WalkDir(filepath.Join(root, top), func(p string, d fs.DirEntry, err error) error {
			if err != nil {
				return err
			}
			if d.IsDir() {
				switch d.Name() {
				case "testdata", "node_modules":
					return filepath.SkipDir
				}
				return nil
			}
			if !d.Type().IsRegular() || strings.HasSuffix(p, "_test.go") {
				return nil
			}
			rel, err := filepath.Rel(root, p)
			if err != nil {
				return err
			}
			copyFile(rel)
			return nil
		})
		if err != nil {
			t.Fatal(err)
		}
	}
}
