package main

import (
	"os"
	"path/filepath"
	"regexp"
	"strings"
	"testing"
)

// oldNames match the verbs, flags, folder, config key and listing paths
// that skysheet's own names replaced; none may appear in the docs or in the
// rendered demo.
var oldNames = []*regexp.Regexp{
	regexp.MustCompile(`public/`),
	regexp.MustCompile(`base_url`),
	regexp.MustCompile(`/category/`),
	regexp.MustCompile(`/tag/`),
	regexp.MustCompile(`skysheet (build|serve|check|new)\b`),
	regexp.MustCompile("`(build|serve|check|new) [\\[A-Z]"), // a verb's synopsis
	regexp.MustCompile(`-o public`),
	regexp.MustCompile(`--h([^-\w]|$)`), // the heat-transfer flag, now --h-conv
}

// findOldNames reports every old name in data, by line.
func findOldNames(t *testing.T, name string, data []byte) {
	t.Helper()
	for i, line := range strings.Split(string(data), "\n") {
		for _, re := range oldNames {
			if m := re.FindString(line); m != "" {
				t.Errorf("%s:%d: old name %q in %q", name, i+1, m, strings.TrimSpace(line))
			}
		}
	}
}

// TestDocsUseCurrentNames checks the README, DEVELOPERS.md and docs/.
func TestDocsUseCurrentNames(t *testing.T) {
	root := filepath.Join("..", "..")
	docs, err := filepath.Glob(filepath.Join(root, "docs", "*.md"))
	if err != nil || len(docs) == 0 {
		t.Fatalf("no docs found: %v", err)
	}
	for _, p := range append([]string{filepath.Join(root, "README.md"), filepath.Join(root, "DEVELOPERS.md")}, docs...) {
		data, err := os.ReadFile(p)
		if err != nil {
			t.Fatal(err)
		}
		rel, _ := filepath.Rel(root, p)
		findOldNames(t, rel, data)
	}
}

// TestDemoSiteUsesCurrentNames renders the demo library and checks every
// file of the site, and its paths.
func TestDemoSiteUsesCurrentNames(t *testing.T) {
	out := filepath.Join(t.TempDir(), "site")
	if code, _, stderr := runCLI("render", "--site", out, "--no-cache", filepath.Join("..", "..")); code != 0 {
		t.Fatalf("render of the demo library exited %d: %s", code, stderr)
	}
	files := readTree(t, out)
	listings := 0
	for name, data := range files {
		findOldNames(t, name, []byte("/"+name))
		findOldNames(t, name, data)
		if strings.HasPrefix(name, "materials/by-category/") || strings.HasPrefix(name, "materials/by-tag/") {
			listings++
		}
	}
	if listings == 0 {
		t.Error("no listing pages under materials/by-category/ or materials/by-tag/")
	}
	if !strings.Contains(string(files["catalog.json"]), `"site_address": "https://library.quillmere.example/"`) {
		t.Error("catalog.json does not carry the demo's site_address")
	}
}
