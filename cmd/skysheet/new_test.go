package main

import (
	"os"
	"path/filepath"
	"strings"
	"testing"
)

func TestNewThenBuild(t *testing.T) {
	dir := filepath.Join(t.TempDir(), "lib")
	if code, out, errs := runCLI("new", dir); code != 0 || !strings.Contains(out, "created a library") {
		t.Fatalf("new: exit %d: %s %s", code, out, errs)
	}
	out := filepath.Join(dir, "public")
	code, stdout, stderr := runCLI("build", dir, "-o", out)
	if code != 0 || !strings.Contains(stdout, "1 material") {
		t.Fatalf("build: exit %d: %s %s", code, stdout, stderr)
	}
	page, err := os.ReadFile(filepath.Join(out, "m", "example-white", "index.html"))
	if err != nil || !strings.Contains(string(page), "Example white coating (invented)") {
		t.Errorf("datasheet: %v", err)
	}
	// A second run refuses the folder, which is no longer empty.
	if code, _, stderr := runCLI("new", dir); code != 2 || !strings.Contains(stderr, "not empty") {
		t.Errorf("non-empty folder: exit %d: %s", code, stderr)
	}
	if code, _, _ := runCLI("new"); code != 2 {
		t.Errorf("no folder: exit %d", code)
	}
}

func TestNewIntoEmptyFolder(t *testing.T) {
	dir := t.TempDir()
	if code, _, errs := runCLI("new", dir); code != 0 {
		t.Fatalf("exit %d: %s", code, errs)
	}
	if _, err := os.Stat(filepath.Join(dir, "skysheet.yaml")); err != nil {
		t.Error(err)
	}
}
