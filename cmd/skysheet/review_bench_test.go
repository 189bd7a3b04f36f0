package main

import (
	"fmt"
	"os"
	"path/filepath"
	"strings"
	"testing"

	"skysheet/datasheet/library"
)

// manyClaims are claims on the material's own conditions and on one
// stated basis, of fractions, the SRI and the cooling figures.
const manyClaims = `  - {figure: solar_reflectance, value: 0.95, tolerance: 0.01}
  - {figure: thermal_emittance, value: 0.95}
  - {figure: solar_reflectance, value: 0.95, basis: {solar_band_nm: [280, 4000]}}
  - {figure: nir_reflectance, value: 0.95, basis: {solar_band_nm: [280, 4000]}}
  - {figure: cooling_power_night_w_m2, value: 100}
  - {figure: sri_medium, value: 120}
`

// copiesLibrary writes a library of n copies of the invented demo material
// PX-2 (content/coatings/px-2), each with the given claims, and returns
// its folder. The spectra are shared by all copies.
func copiesLibrary(tb testing.TB, n int, claims string) string {
	tb.Helper()
	root := filepath.Join("..", "..")
	dir := tb.TempDir()
	write := func(rel string, data []byte) {
		p := filepath.Join(dir, filepath.FromSlash(rel))
		if err := os.MkdirAll(filepath.Dir(p), 0o755); err != nil {
			tb.Fatal(err)
		}
		if err := os.WriteFile(p, data, 0o644); err != nil {
			tb.Fatal(err)
		}
	}
	read := func(rel string) []byte {
		data, err := os.ReadFile(filepath.Join(root, filepath.FromSlash(rel)))
		if err != nil {
			tb.Fatal(err)
		}
		return data
	}
	write("skysheet.yaml", read("skysheet.yaml"))
	for _, f := range []string{"uvvis.csv", "ftir.csv"} {
		write("content/coatings/px-2/"+f, read("content/coatings/px-2/"+f))
	}
	src := string(read("content/coatings/px-2.md"))
	head, rest, ok := strings.Cut(src, "\nclaims:\n")
	if !ok {
		tb.Fatal("px-2.md has no claims")
	}
	_, body, ok := strings.Cut(rest, "\n---\n")
	if !ok {
		tb.Fatal("px-2.md: no end of front matter after the claims")
	}
	for i := 1; i <= n; i++ {
		write(fmt.Sprintf("content/coatings/px2-%04d.md", i), []byte(head+"\nclaims:\n"+claims+"---\n"+body))
	}
	return dir
}

// TestReviewCopies reviews a library of six copies of a demo material
// with six claims each (the step's order and determinism are tested in
// datasheet/evaluate).
func TestReviewCopies(t *testing.T) {
	dir := copiesLibrary(t, 6, manyClaims)
	if code, out, errs := runCLI("review", dir); code != 1 || !strings.Contains(out, "7 files, 0 invalid, 0 failing closure; 36 claims") {
		t.Errorf("review: exit %d\n%s%s", code, out, errs)
	}
}

// BenchmarkReview reads and judges a library of 100 copies of a demo
// material with six claims each, as "skysheet review" does.
func BenchmarkReview(b *testing.B) {
	dir := copiesLibrary(b, 100, manyClaims)
	for b.Loop() {
		fsys, closeFS, err := openLibrary(dir, defaultMaxFileSize)
		if err != nil {
			b.Fatal(err)
		}
		lib, err := library.Load(fsys)
		r := reviewLibrary(dir, lib, err, false)
		closeFS()
		if r.Counts.Claims != 600 {
			b.Fatalf("%d claims, want 600", r.Counts.Claims)
		}
	}
}
