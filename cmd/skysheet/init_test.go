package main

import (
	"os"
	"path/filepath"
	"strings"
	"testing"
)

func TestInitThenRender(t *testing.T) {
	dir := filepath.Join(t.TempDir(), "lib")
	if code, out, errs := runCLI("init", dir); code != 0 || !strings.Contains(out, "created a library") || !strings.Contains(out, "skysheet render "+dir) {
		t.Fatalf("init: exit %d: %s %s", code, out, errs)
	}
	code, stdout, stderr := runCLI("render", dir)
	if code != 0 || !strings.Contains(stdout, "1 material") {
		t.Fatalf("render: exit %d: %s %s", code, stdout, stderr)
	}
	page, err := os.ReadFile(filepath.Join(dir, "site", "m", "example-white", "index.html"))
	if err != nil || !strings.Contains(string(page), "Example white coating (invented)") {
		t.Errorf("datasheet: %v", err)
	}
	// A second run refuses the folder, which is no longer empty.
	if code, _, stderr := runCLI("init", dir); code != 2 || !strings.Contains(stderr, "not empty") {
		t.Errorf("non-empty folder: exit %d: %s", code, stderr)
	}
	if code, _, _ := runCLI("init"); code != 2 {
		t.Errorf("no folder: exit %d", code)
	}
}

func TestInitIntoEmptyFolder(t *testing.T) {
	dir := t.TempDir()
	if code, _, errs := runCLI("init", dir); code != 0 {
		t.Fatalf("exit %d: %s", code, errs)
	}
	if _, err := os.Stat(filepath.Join(dir, "skysheet.yaml")); err != nil {
		t.Error(err)
	}
}
