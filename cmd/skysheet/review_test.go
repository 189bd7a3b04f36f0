package main

import (
	"bytes"
	"encoding/json"
	"encoding/xml"
	"os"
	"path/filepath"
	"strings"
	"testing"
)

// Invented spectra with known figures: a constant's weighted mean is the
// constant (closed form), so R = 0.9 gives a solar reflectance of 0.9 and
// R = 0.05 in the infrared an emittance of 0.95.
const (
	reviewSolar   = "wavelength_nm,R\n280,0.9\n1000,0.9\n2400,0.9\n"
	reviewThermal = "wavelength_um,R\n2.5,0.05\n10,0.05\n25,0.05\n"
	reviewShortIR = "wavelength_um,R\n2.5,0.05\n20,0.05\n" // 88 % of the 300 K Planck weighting
	reviewBadRTA  = "wavelength_nm,R,T,A\n280,0.9,0.05,0.1\n2400,0.9,0.05,0.1\n"
)

// material returns a material file naming two spectra files and claims.
func material(title, solar, thermal, claims string) string {
	return "---\ntitle: " + title + "\nmaker: Invented Coatings (invented)\nspectra:\n  - file: " + solar +
		"\n  - file: " + thermal + "\nmeasured: {angle: 8°}\nclaims:\n" + claims + "---\nInvented test material.\n"
}

// writeLibrary writes a library folder of name → content into a
// temporary directory and returns it.
func writeLibrary(t *testing.T, files map[string]string) string {
	t.Helper()
	dir := t.TempDir()
	for name, data := range files {
		p := filepath.Join(dir, filepath.FromSlash(name))
		if err := os.MkdirAll(filepath.Dir(p), 0o755); err != nil {
			t.Fatal(err)
		}
		writeAt(t, p, data)
	}
	return dir
}

// testLibrary returns a library whose one material carries the given claims
// (YAML list items); extra files are added or replace defaults.
func testLibrary(t *testing.T, claims string, extra map[string]string) string {
	files := map[string]string{
		"skysheet.yaml":          "title: Invented test library\n",
		"content/white.md":       material("White panel (invented)", "white/uv.csv", "white/ir.csv", claims),
		"content/white/uv.csv":   reviewSolar,
		"content/white/ir.csv":   reviewThermal,
		"content/short.md":       material("Short-range panel (invented)", "short/uv.csv", "short/ir.csv", "  - {figure: solar_reflectance, value: 0.9, tolerance: 0.01}\n"),
		"content/short/uv.csv":   reviewSolar,
		"content/short/ir.csv":   reviewShortIR,
		"content/compare-all.md": "---\ntitle: All\ncompare: [white, short]\n---\n",
	}
	for k, v := range extra {
		if v == "" {
			delete(files, k)
			continue
		}
		files[k] = v
	}
	return writeLibrary(t, files)
}

const (
	claimGood      = "  - {figure: solar_reflectance, value: 0.9, tolerance: 0.01, source: sheet A (invented)}\n  - {figure: thermal_emittance, value: 0.95}\n"
	claimWrong     = "  - {figure: solar_reflectance, value: 0.95, tolerance: 0.01}\n"
	claimUnchecked = "  - {figure: solar_reflectance, value: 0.9, tolerance: 0.01}\n"
)

func TestReviewExitCodes(t *testing.T) {
	shortUnchecked := map[string]string{"content/short.md": material("Short", "short/uv.csv", "short/ir.csv", "  - {figure: thermal_emittance, value: 0.95}\n")}
	for _, tt := range []struct {
		name  string
		claim string
		extra map[string]string
		args  []string
		code  int
		out   string // in stdout+stderr
	}{
		{"all supported", claimGood, nil, nil, 0, "Result: consistent."},
		{"not supported", claimWrong, nil, nil, 1, "0.0500 below the claimed 0.9500"},
		{"cannot be checked passes", claimGood, shortUnchecked, nil, 0, "cannot be checked: thermal_emittance 0.95"},
		{"cannot be checked fails with --strict", claimGood, shortUnchecked, []string{"--strict"}, 1, "with --strict"},
		{"strict, all supported", claimGood, nil, []string{"--strict"}, 0, "Result: consistent."},
		{"invalid front matter", claimGood, map[string]string{"content/bad.md": "---\ntitel: Bad\n---\n"}, nil, 1, `content/bad.md:2:1: unknown key: "titel"`},
		{"invalid spectrum", claimGood, map[string]string{"content/white/ir.csv": "wavelength_um,R\n2.5,0.05\n25,abc\n"}, nil, 1, `"abc" is not a number`},
		{"malformed claim", "  - {figure: solar_reflectance, value: 0.9, tolerance: -1}\n", nil, nil, 1, "content/white.md:9:56: bad claim: claim 1: solar_reflectance: tolerance -1"},
		{"unknown figure", "  - {figure: solar_reflectence, value: 0.9}\n", nil, nil, 1,
			`content/white.md:9:14: no such figure: claim 1 names "solar_reflectence" (did you mean "solar_reflectance"?)`},
		{"percent column of fractions warns", "", map[string]string{"content/white/ir.csv": "wavelength_um,R (%)\n2.5,0.95\n25,0.95\n"}, nil, 0,
			"[!] warning: content/white/ir.csv: column 2 (R (%)) is marked as percent but every value is at most 1.05"},
		{"µm labelled nm warns", "", map[string]string{"content/white/ir.csv": "wavelength_nm,R\n2.5,0.05\n25,0.05\n"}, nil, 0,
			"µm values labelled nm?"},
		{"flagged splice warns", "", map[string]string{"content/white/ir.csv": "wavelength_um,R\n2.3,0.5\n25,0.5\n"}, nil, 0, "[!] warning: The splice of R at 2350 nm leaves a mean mismatch of 0.4000"},
		{"closure fails", claimUnchecked, map[string]string{"content/white/uv.csv": reviewBadRTA}, nil, 1, "closure fails"},
		{"no config", claimGood, map[string]string{"skysheet.yaml": ""}, nil, 1, "no skysheet.yaml"},
		{"json", claimWrong, nil, []string{"--format", "json"}, 1, `"status": "not supported"`},
		{"junit", claimGood, nil, []string{"--format=junit"}, 0, "<testsuites"},
		{"bad format", claimGood, nil, []string{"--format", "yaml"}, 2, `--format "yaml": want text, json or junit`},
		{"bad flag", claimGood, nil, []string{"--nope"}, 2, "flag provided but not defined"},
		{"two folders", claimGood, nil, []string{"."}, 2, "one library folder at most"},
	} {
		t.Run(tt.name, func(t *testing.T) {
			dir := testLibrary(t, tt.claim, tt.extra)
			code, out, errs := runCLI(append([]string{"review", dir}, tt.args...)...)
			if code != tt.code {
				t.Errorf("exit %d, want %d\nstdout: %s\nstderr: %s", code, tt.code, out, errs)
			}
			if !strings.Contains(out+errs, tt.out) {
				t.Errorf("output lacks %q\nstdout: %s\nstderr: %s", tt.out, out, errs)
			}
		})
	}
}

func TestReviewUsage(t *testing.T) {
	for _, tt := range []struct {
		name string
		args []string
		code int
		out  string
	}{
		{"missing folder", []string{"review", filepath.Join(t.TempDir(), "nope")}, 2, "is not a library folder"},
		{"a file, not a folder", []string{"review", "review.go"}, 2, "is not a library folder"},
		{"help", []string{"review", "-h"}, 0, "-strict"},
	} {
		code, out, errs := runCLI(tt.args...)
		if code != tt.code || !strings.Contains(out+errs, tt.out) {
			t.Errorf("%s: exit %d (want %d), output %q lacks %q", tt.name, code, tt.code, out+errs, tt.out)
		}
	}
}

func TestReviewDefaultFolder(t *testing.T) {
	dir := testLibrary(t, claimGood, nil)
	t.Chdir(dir)
	if code, out, errs := runCLI("review"); code != 0 || !strings.Contains(out, "content/white.md — White panel (invented)") {
		t.Errorf("review in the library folder: exit %d\n%s%s", code, out, errs)
	}
}

func TestReviewRefusesEscapingSymlink(t *testing.T) {
	outside := t.TempDir()
	writeAt(t, filepath.Join(outside, "ir.csv"), reviewThermal)
	dir := testLibrary(t, claimGood, map[string]string{"content/white/ir.csv": ""})
	if err := os.Symlink(filepath.Join(outside, "ir.csv"), filepath.Join(dir, "content", "white", "ir.csv")); err != nil {
		t.Skip("no symbolic links here:", err)
	}
	code, out, _ := runCLI("review", dir)
	if code != 1 || !strings.Contains(out, "content/white/ir.csv") {
		t.Errorf("a spectrum outside the library was read: exit %d\n%s", code, out)
	}
}

func TestReviewJSONRoundTrip(t *testing.T) {
	dir := testLibrary(t, claimGood+claimWrong+"  - {figure: solar_reflectance, value: 90}\n  - {figure: solar_transmittance, value: 0.1}\n",
		map[string]string{"content/bad.md": "---\ntitle: Bad\n---\n"})
	code, out, errs := runCLI("review", "--format", "json", dir)
	if code != 1 {
		t.Fatalf("exit %d, want 1: %s", code, errs)
	}
	var r reviewReport
	if err := json.Unmarshal([]byte(out), &r); err != nil {
		t.Fatal(err)
	}
	var again bytes.Buffer
	if err := writeReviewJSON(&again, &r); err != nil {
		t.Fatal(err)
	}
	if again.String() != out {
		t.Errorf("JSON does not round-trip:\n%s\n---\n%s", out, again.String())
	}
	c := r.Counts
	if c.Claims != 6 || c.Supported != 3 || c.NotSupported != 2 || c.CannotCheck != 1 || c.InvalidFiles != 1 || r.OK {
		t.Errorf("counts %+v, ok %v", c, r.OK)
	}
	var white *reviewMaterial
	for i := range r.Materials {
		if r.Materials[i].Slug == "white" {
			white = &r.Materials[i]
		}
	}
	if white == nil || len(white.Inputs) != 3 || white.Inputs[0].Path != "content/white.md" || len(white.Inputs[1].SHA256) != 64 {
		t.Fatalf("white material or its inputs missing: %+v", white)
	}
}

// The commonly used JUnit XML shape, mirrored independently of the writer.
type junitShape struct {
	XMLName  xml.Name `xml:"testsuites"`
	Tests    int      `xml:"tests,attr"`
	Failures int      `xml:"failures,attr"`
	Errors   int      `xml:"errors,attr"`
	Skipped  int      `xml:"skipped,attr"`
	Suites   []struct {
		Name     string `xml:"name,attr"`
		Tests    int    `xml:"tests,attr"`
		Failures int    `xml:"failures,attr"`
		Errors   int    `xml:"errors,attr"`
		Skipped  int    `xml:"skipped,attr"`
		Cases    []struct {
			Name      string `xml:"name,attr"`
			Classname string `xml:"classname,attr"`
			Failure   []struct {
				Message string `xml:"message,attr"`
				Type    string `xml:"type,attr"`
				Text    string `xml:",chardata"`
			} `xml:"failure"`
			Error []struct {
				Message string `xml:"message,attr"`
				Text    string `xml:",chardata"`
			} `xml:"error"`
			Skipped []struct {
				Message string `xml:"message,attr"`
			} `xml:"skipped"`
		} `xml:"testcase"`
	} `xml:"testsuite"`
}

func TestReviewJUnitShape(t *testing.T) {
	shortUnchecked := material("Short", "short/uv.csv", "short/ir.csv", "  - {figure: thermal_emittance, value: 0.95}\n")
	for _, tt := range []struct {
		name                               string
		args                               []string
		tests, failures, errors, skipped   int
		wantFailureIn, wantFailureContains string
	}{
		// Suites: skysheet.yaml (1 case), compare-all.md (1), bad.md (1),
		// short.md (read, closure, 1 claim), white.md (read, closure, 3 claims).
		{"default", nil, 11, 1, 1, 1, "content/white.md", "0.0500 below the claimed 0.9500"},
		{"strict", []string{"--strict"}, 11, 2, 1, 0, "content/short.md", "cannot be checked"},
	} {
		t.Run(tt.name, func(t *testing.T) {
			dir := testLibrary(t, claimGood+claimWrong, map[string]string{"content/bad.md": "---\ntitle: Bad\n---\n", "content/short.md": shortUnchecked})
			code, out, errs := runCLI(append([]string{"review", "--format", "junit", dir}, tt.args...)...)
			if code != 1 {
				t.Fatalf("exit %d, want 1: %s", code, errs)
			}
			if !strings.HasPrefix(out, "<?xml") {
				t.Errorf("no XML declaration: %.40s", out)
			}
			var j junitShape
			if err := xml.Unmarshal([]byte(out), &j); err != nil {
				t.Fatal(err)
			}
			if j.Tests != tt.tests || j.Failures != tt.failures || j.Errors != tt.errors || j.Skipped != tt.skipped {
				t.Errorf("totals tests=%d failures=%d errors=%d skipped=%d, want %d %d %d %d",
					j.Tests, j.Failures, j.Errors, j.Skipped, tt.tests, tt.failures, tt.errors, tt.skipped)
			}
			// The attributes agree with the elements.
			var tests, failures, errors, skipped int
			found := false
			for _, s := range j.Suites {
				var st, sf, se, ss int
				for _, c := range s.Cases {
					st++
					sf += len(c.Failure)
					se += len(c.Error)
					ss += len(c.Skipped)
					if c.Name == "" || c.Classname == "" {
						t.Errorf("%s: testcase without name or classname", s.Name)
					}
					for _, f := range c.Failure {
						if s.Name == tt.wantFailureIn && strings.Contains(f.Message, tt.wantFailureContains) {
							found = true
						}
					}
				}
				if st != s.Tests || sf != s.Failures || se != s.Errors || ss != s.Skipped {
					t.Errorf("suite %s: attributes %d/%d/%d/%d, elements %d/%d/%d/%d", s.Name, s.Tests, s.Failures, s.Errors, s.Skipped, st, sf, se, ss)
				}
				tests, failures, errors, skipped = tests+st, failures+sf, errors+se, skipped+ss
			}
			if tests != j.Tests || failures != j.Failures || errors != j.Errors || skipped != j.Skipped {
				t.Errorf("testsuites totals do not add up")
			}
			if !found {
				t.Errorf("no failure in %s containing %q:\n%s", tt.wantFailureIn, tt.wantFailureContains, out)
			}
		})
	}
}
