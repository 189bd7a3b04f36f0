package main

import (
	"os"
	"path/filepath"
	"regexp"
	"strings"
	"testing"
)

// TestImportMaterialRoundTrip imports two instrument exports into a new
// library with --material, checks that review lists the blanks, fills
// them as a lab would, and renders: the page shows the instrument and the
// dates the files give.
func TestImportMaterialRoundTrip(t *testing.T) {
	lib := filepath.Join(t.TempDir(), "lib")
	if code, _, errs := runCLI("init", lib); code != 0 {
		t.Fatalf("init: %s", errs)
	}
	dir := filepath.Join(lib, "content", "coatings", "w-7")
	md := filepath.Join(lib, "content", "coatings", "w-7.md")
	code, out, errs := runCLI("import", demo("uvvis.jdx"), demo("ftir.jdx"), "-o", dir, "--material", md)
	if code != 0 || !strings.Contains(out, md+": written") {
		t.Fatalf("import: exit %d\n%s%s", code, out, errs)
	}
	written, err := os.ReadFile(md)
	if err != nil {
		t.Fatal(err)
	}
	text := string(written)
	for _, want := range []string{
		`title: "invented white coating W-7"`,
		`  - file: "w-7/uvvis.csv"` + "\n" + `    role: "solar"` + "\n" + `    instrument: "invented double-beam UV-Vis-NIR spectrophotometer UV-1 with 150 mm sphere"`,
		`  - file: "w-7/ftir.csv"` + "\n" + `    role: "thermal"`,
		"exported in 1/CM and %REFLECTANCE, converted to nm and fractions",
		`  date: "2031/04/02 (uvvis.jdx); 2031/04/03 (ftir.jdx)"`,
		`  angle: "8° (uvvis.jdx); 12° (ftir.jdx)"`,
		`  reference: "FILL IN: the files say the reflectance is relative to reference standard RS-0`,
	} {
		if !strings.Contains(text, want) {
			t.Errorf("the material file lacks %q:\n%s", want, text)
		}
	}

	// Never overwritten: a second import stops before writing anything.
	code, _, errs = runCLI("import", demo("uvvis.jdx"), "-o", dir, "--material", md)
	if code != 2 || !strings.Contains(errs, "already exists and is never overwritten") {
		t.Errorf("second import: exit %d, %s", code, errs)
	}
	if again, _ := os.ReadFile(md); string(again) != text {
		t.Error("the material file changed")
	}

	code, out, _ = runCLI("review", lib)
	if n := strings.Count(out, "blank not filled in"); code != 1 || n != 9 {
		t.Errorf("review before filling in: exit %d, %d blanks, want 9:\n%s", code, n, out)
	}
	for _, want := range []string{"w-7.md:5:8: blank not filled in: maker: who made the material", "blank not filled in: in the text"} {
		if !strings.Contains(out, want) {
			t.Errorf("review lacks %q:\n%s", want, out)
		}
	}

	// Fill in the blanks, delete the optional ones, and give the reference
	// standard's calibration that the files name.
	fill := map[string]string{
		"maker":        `maker: "Test maker (invented)"`,
		"category":     "category: coating",
		"summary":      "summary: Test coating (invented).",
		"license":      "license: MIT",
		"  reference":  "  reference: reference standard RS-0 (invented)",
		"product_code": "", "tags": "", "  operator": "",
	}
	keyRE := regexp.MustCompile(`^(\s*[a-z_]+):`)
	var lines []string
	for _, l := range strings.Split(text, "\n") {
		if strings.Contains(l, "FILL IN") {
			if strings.HasPrefix(l, "FILL IN") {
				l = "An invented coating imported for a test."
			} else if m := keyRE.FindStringSubmatch(l); m != nil {
				l = fill[m[1]]
				if l == "" {
					continue
				}
			}
		}
		lines = append(lines, l)
	}
	if err := os.WriteFile(md, []byte(strings.Join(lines, "\n")), 0o644); err != nil {
		t.Fatal(err)
	}
	ref, err := os.ReadFile(demo("reference.csv"))
	if err != nil {
		t.Fatal(err)
	}
	if err := os.WriteFile(filepath.Join(dir, "reference.csv"), ref, 0o644); err != nil {
		t.Fatal(err)
	}
	for _, f := range []string{"uvvis.csv", "ftir.csv"} {
		p := filepath.Join(dir, f)
		data, err := os.ReadFile(p)
		if err != nil {
			t.Fatal(err)
		}
		if err := os.WriteFile(p, append([]byte("# reference_file: reference.csv\n"), data...), 0o644); err != nil {
			t.Fatal(err)
		}
	}

	code, out, errs = runCLI("review", lib)
	if code != 0 || strings.Contains(out, "FILL IN") || strings.Contains(out, "warning") {
		t.Fatalf("review after filling in: exit %d\n%s%s", code, out, errs)
	}
	if code, _, errs := runCLI("render", lib); code != 0 {
		t.Fatalf("render: %s", errs)
	}
	page, err := os.ReadFile(filepath.Join(lib, "site", "m", "w-7", "index.html"))
	if err != nil {
		t.Fatal(err)
	}
	for _, want := range []string{
		"invented double-beam UV-Vis-NIR spectrophotometer UV-1 with 150 mm sphere",
		"invented FTIR spectrometer IR-2 with gold-coated sphere",
		"2031/04/02 (uvvis.jdx); 2031/04/03 (ftir.jdx)",
		"8° (uvvis.jdx); 12° (ftir.jdx)",
	} {
		if !strings.Contains(string(page), want) {
			t.Errorf("the page lacks %q", want)
		}
	}
	figs, err := os.ReadFile(filepath.Join(lib, "site", "m", "w-7", "figures.json"))
	if err != nil {
		t.Fatal(err)
	}
	// 0.8836 with the reference applied, as "figures --reference" gives
	// (TestRelativeWithoutReference); 0.902 without.
	if !strings.Contains(string(figs), `"solar_reflectance": 0.883`) {
		t.Errorf("figures.json: the reference standard was not applied")
	}
}

func TestImportMaterialUsage(t *testing.T) {
	tmp := t.TempDir()
	for _, tt := range []struct {
		name, out, md, want string
	}{
		{"not Markdown", filepath.Join(tmp, "a", "w"), filepath.Join(tmp, "a", "w.txt"), "ending in .md"},
		{"spectra outside", filepath.Join(tmp, "b"), filepath.Join(tmp, "c", "w.md"), "does not lie in the folder of the Markdown file"},
	} {
		code, _, errs := runCLI("import", demo("uvvis.jdx"), "-o", tt.out, "--material", tt.md)
		if code != 2 || !strings.Contains(errs, tt.want) {
			t.Errorf("%s: exit %d, %s", tt.name, code, errs)
		}
		if _, err := os.Stat(tt.out); err == nil {
			t.Errorf("%s: %s was written", tt.name, tt.out)
		}
	}
}
