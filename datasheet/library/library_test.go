package library

import (
	"errors"
	"io/fs"
	"os"
	"path/filepath"
	"runtime"
	"strings"
	"testing"
	"testing/fstest"
	"time"

	"skysheet/spectra"
)

// Constant spectra: a band-weighted mean of a constant is that constant
// whatever the weighting (closed form), so the figures are known exactly.
const (
	flatSolar   = "wavelength_nm,R\n280,0.9\n1000,0.9\n2500,0.9\n"
	flatThermal = "wavelength_um,R\n2.6,0.05\n10,0.05\n25,0.05\n" // starts after the solar file: no bridge
)

const goodMaterial = `---
title: Flat white test panel
maker: Test maker (invented)
category: paint
tags: [white, test]
spectra:
  - file: flat/solar.csv
    role: solar
  - file: flat/thermal.csv
    role: thermal
measured:
  date: 2026-01-02
  angle: 8°
conditions: {temperature_k: 290}
claims:
  - figure: solar_reflectance
    value: 0.9
---
# Body

Text.
`

func baseFS() fstest.MapFS {
	return fstest.MapFS{
		"skysheet.yaml":            {Data: []byte("title: Test library\nconditions:\n  temperature_k: 310\n  window_band_um: [8, 14]\n")},
		"content/flat.md":          {Data: []byte(goodMaterial)},
		"content/flat/solar.csv":   {Data: []byte(flatSolar)},
		"content/flat/thermal.csv": {Data: []byte(flatThermal)},
	}
}

// loadRead loads fsys and reads every material's sample, as the
// evaluation step does, and returns the problems of both in file order.
func loadRead(fsys fs.FS) (*Library, error) {
	lib, err := Load(fsys)
	errs := []error{err}
	for _, m := range lib.Materials {
		read := lib.ReadSample
		if m.Stack != nil {
			read = func(m *Material) (*spectra.Spectrum, []Input, error) {
				_, in, err := lib.ReadLayers(m)
				return nil, in, err
			}
		}
		if _, _, err := read(m); err != nil {
			errs = append(errs, err)
		}
	}
	return lib, Join(errs...)
}

func TestLoadMaterial(t *testing.T) {
	lib, err := loadRead(baseFS())
	if err != nil {
		t.Fatal(err)
	}
	if lib.Config.Title != "Test library" {
		t.Errorf("title %q", lib.Config.Title)
	}
	if len(lib.Materials) != 1 {
		t.Fatalf("%d materials", len(lib.Materials))
	}
	m := lib.Materials[0]
	if m.Slug != "flat" || m.Path != "content/flat.md" {
		t.Errorf("slug %q path %q", m.Slug, m.Path)
	}
	// Front matter overrides the config, which overrides the defaults.
	if m.Conditions.TemperatureK != 290 || m.Conditions.WindowBand != (spectra.Interval{Lo: 8000, Hi: 14000}) || m.Conditions.SolarBand != (spectra.Interval{Lo: 280, Hi: 2500}) {
		t.Errorf("conditions %+v", m.Conditions)
	}
	if lib.Config.Conditions.TemperatureK != 310 {
		t.Errorf("config conditions %+v", lib.Config.Conditions)
	}
	if got := m.Front.Conditions.Keys(); len(got) != 1 || got[0] != "temperature_k" {
		t.Errorf("override keys %v", got)
	}
	sample, inputs, err := lib.ReadSample(m)
	if err != nil {
		t.Fatal(err)
	}
	if len(inputs) != 3 || inputs[0] != m.Input || inputs[1].Path != "content/flat/solar.csv" || inputs[2].Path != "content/flat/thermal.csv" {
		t.Fatalf("inputs %+v", inputs)
	}
	if lo, hi := sample.Range(); lo != 280 || hi != 25000 {
		t.Errorf("sample %g–%g nm, want 280–25000", lo, hi)
	}
	if m.Front.Measured.Date != "2026-01-02" || m.Front.Measured.Angle != "8°" {
		t.Errorf("measured %+v", m.Front.Measured)
	}
	if len(m.Front.Claims) != 1 || m.Front.Claims[0].Value != 0.9 {
		t.Errorf("claims %+v", m.Front.Claims)
	}
	if !strings.HasPrefix(string(m.Body), "# Body") || m.BodyLine != 19 {
		t.Errorf("body at line %d: %q", m.BodyLine, m.Body)
	}
}

func TestInputHash(t *testing.T) {
	// FIPS 180-2, appendix B.1: SHA-256("abc").
	const want = "ba7816bf8f01cfea414140de5dae2223b00361a396177a9cb410ff61f20015ad"
	fsys := baseFS()
	fsys["content/flat/solar.csv"] = &fstest.MapFile{Data: []byte("abc")}
	_, err := loadRead(fsys) // "abc" is not a spectrum: the error is expected
	if err == nil {
		t.Fatal("want an error for a file that is not a spectrum")
	}
	if got := hashInput("x", []byte("abc")).SHA256; got != want {
		t.Errorf("sha256(abc) = %s, want %s", got, want)
	}
	lib, err := loadRead(baseFS())
	if err != nil {
		t.Fatal(err)
	}
	_, inputs, _ := lib.ReadSample(lib.Materials[0])
	if got := inputs[1]; got != hashInput("content/flat/solar.csv", []byte(flatSolar)) {
		t.Errorf("input %+v", got)
	}
}

// errAt describes an expected error: its sentinel, file and line.
type errAt struct {
	err  error
	file string
	line int
	text string // a part of the message users see, "" to skip
}

func checkErrors(t *testing.T, err error, want []errAt) {
	t.Helper()
	var es Errors
	if !errors.As(err, &es) {
		t.Fatalf("error %v (%T), want Errors", err, err)
	}
	if len(es) != len(want) {
		t.Fatalf("got %d errors, want %d:\n%v", len(es), len(want), err)
	}
	for i, w := range want {
		var le *Error
		if !errors.As(es[i], &le) {
			t.Errorf("error %d: %v is not *Error", i, es[i])
			continue
		}
		if !errors.Is(es[i], w.err) || le.File != w.file || le.Line != w.line {
			t.Errorf("error %d: %v; want %v at %s:%d", i, es[i], w.err, w.file, w.line)
		}
		if w.text != "" && !strings.Contains(es[i].Error(), w.text) {
			t.Errorf("error %d: %q does not contain %q", i, es[i], w.text)
		}
	}
}

func TestStrictFrontMatter(t *testing.T) {
	for _, tc := range []struct {
		name, from, to string
		want           []errAt
	}{
		{"unknown top key", "category: paint", "categroy: paint",
			[]errAt{{ErrUnknownKey, "content/flat.md", 4, `unknown key: "categroy" (did you mean "category"?)`}}},
		{"unknown nested key", "  angle: 8°", "  angel: 8°",
			[]errAt{{ErrUnknownKey, "content/flat.md", 13, `did you mean "angle"?`}}},
		{"unknown spectra key", "    role: thermal", "    rol: thermal",
			[]errAt{{ErrUnknownKey, "content/flat.md", 10, `did you mean "role"?`}}},
		{"unknown condition", "{temperature_k: 290}", "{temperatur_k: 290}",
			[]errAt{{ErrUnknownKey, "content/flat.md", 14, `did you mean "temperature_k"?`}}},
		{"far unknown key", "category: paint", "zzzzzzzzzz: paint",
			[]errAt{{ErrUnknownKey, "content/flat.md", 4, "nearest known key"}}},
		{"repeated key", "category: paint", "category: paint\ncategory: film",
			[]errAt{{ErrDuplicateKey, "content/flat.md", 5, "first at line 4"}}},
		{"wrong type", "{temperature_k: 290}", "{temperature_k: hot}",
			[]errAt{{ErrType, "content/flat.md", 14, ""}}},
		{"wrong array length", "{temperature_k: 290}", "{window_band_um: [8]}",
			[]errAt{{ErrType, "content/flat.md", 14, "want a list of 2 numbers"}}},
		{"bad condition", "{temperature_k: 290}", "{temperature_k: -5}",
			[]errAt{{ErrConditions, "content/flat.md", 14, "temperature"}}},
		{"band too long", "{temperature_k: 290}", "{thermal_band_um: [2.5, 1e9]}",
			[]errAt{{ErrConditions, "content/flat.md", 14, "1000 µm"}}},
		{"no title", "title: Flat white test panel\n", "",
			[]errAt{{ErrMissing, "content/flat.md", 1, "title"}}},
		{"no maker", "maker: Test maker (invented)\n", "",
			[]errAt{{ErrMissing, "content/flat.md", 1, "maker"}}},
		{"bad slug", "category: paint", "slug: Flat White\ncategory: paint",
			[]errAt{{ErrBadSlug, "content/flat.md", 4, `"flat-white"`}}},
		{"yaml syntax", "tags: [white, test]", "tags: [white, test",
			[]errAt{{ErrSyntax, "content/flat.md", 5, ""}}},
		{"missing spectrum", "file: flat/solar.csv", "file: flat/nothere.csv",
			[]errAt{{ErrSpectrum, "content/flat.md", 7, "content/flat/nothere.csv: file does not exist (content/flat/ holds solar.csv, thermal.csv)"}}},
		{"misspelled spectrum", "file: flat/solar.csv", "file: flat/solr.csv",
			[]errAt{{ErrSpectrum, "content/flat.md", 7, `content/flat/solr.csv: file does not exist (did you mean "flat/solar.csv"?)`}}},
		{"spectrum in another case", "file: flat/solar.csv", "file: ./flat/SOLAR.csv",
			[]errAt{{ErrSpectrum, "content/flat.md", 7, `(did you mean "flat/solar.csv"?)`}}},
		{"spectrum in a missing folder", "file: flat/solar.csv", "file: flot/solar.csv",
			[]errAt{{ErrSpectrum, "content/flat.md", 7, "content/flot/solar.csv: file does not exist"}}},
		{"escaping spectrum", "file: flat/solar.csv", "file: ../../outside.csv",
			[]errAt{{ErrEscapes, "content/flat.md", 7, `"../../outside.csv"`}}},
		{"absolute spectrum", "file: flat/solar.csv", "file: /etc/passwd",
			[]errAt{{ErrEscapes, "content/flat.md", 7, "absolute"}}},
		{"backslash spectrum", "file: flat/solar.csv", `file: flat\solar.csv`,
			[]errAt{{ErrPath, "content/flat.md", 7, "forward slashes"}}},
		{"two errors in one file", "category: paint", "categroy: paint\nslg: x",
			[]errAt{{ErrUnknownKey, "content/flat.md", 4, ""}, {ErrUnknownKey, "content/flat.md", 5, ""}}},
	} {
		t.Run(tc.name, func(t *testing.T) {
			fsys := baseFS()
			src := strings.Replace(goodMaterial, tc.from, tc.to, 1)
			if src == goodMaterial {
				t.Fatalf("%q not found", tc.from)
			}
			fsys["content/flat.md"] = &fstest.MapFile{Data: []byte(src)}
			_, err := loadRead(fsys)
			checkErrors(t, err, tc.want)
		})
	}
}

// TestClaimErrors checks that a claim naming a figure the tool does not
// compute, or a malformed claim, is a content error at the place in the
// front matter that is wrong, with the nearest figure key.
func TestClaimErrors(t *testing.T) {
	for _, tc := range []struct {
		name, claims string
		want         []errAt
		column       int
	}{
		{"misspelled figure", "  - {figure: solar_reflectence, value: 0.9}\n",
			[]errAt{{ErrUnknownFigure, "content/flat.md", 16, `claim 1 names "solar_reflectence" (did you mean "solar_reflectance"?)`}}, 14},
		{"far figure", "  - figure: zzzz\n    value: 0.9\n",
			[]errAt{{ErrUnknownFigure, "content/flat.md", 16, `nearest figure`}}, 13},
		{"second claim", "  - {figure: solar_reflectance, value: 0.9}\n  - {figure: window_emitance, value: 0.9}\n",
			[]errAt{{ErrUnknownFigure, "content/flat.md", 17, `claim 2 names "window_emitance" (did you mean "window_emittance"?)`}}, 14},
		{"not a number", "  - {figure: solar_reflectance, value: .nan}\n",
			[]errAt{{ErrClaim, "content/flat.md", 16, "not a finite number"}}, 40},
		{"bad basis", "  - figure: solar_reflectance\n    value: 0.9\n    basis: {solar_band_nm: [2500, 280]}\n",
			[]errAt{{ErrClaim, "content/flat.md", 18, "solar_band_nm"}}, 12},
	} {
		t.Run(tc.name, func(t *testing.T) {
			fsys := baseFS()
			src := strings.Replace(goodMaterial, "  - figure: solar_reflectance\n    value: 0.9\n", tc.claims, 1)
			fsys["content/flat.md"] = &fstest.MapFile{Data: []byte(src)}
			lib, err := Load(fsys)
			checkErrors(t, err, tc.want)
			var le *Error
			if errors.As(err, &le) && le.Column != tc.column {
				t.Errorf("column %d, want %d", le.Column, tc.column)
			}
			if len(lib.Materials) != 0 {
				t.Error("the material was accepted")
			}
		})
	}
}

func TestYAMLSyntaxLines(t *testing.T) {
	// The YAML text starts on file line 2 of a content file; each case
	// puts its fault on a known YAML line.
	for _, tc := range []struct {
		yaml string
		line int // file line
	}{
		{"title: x\n  bad: indent\n", 3},
		{"a: b\nc: [1\n", 3},
		{"- a\nb: c\n", 3},
		{"a: b\n\tc: d\n", 3},
		{"a:\n  - b\n c: d\n", 4},
		{"a: @x\n", 2},
		{"a: b: c\n", 2},
	} {
		_, err := doc{file: "f.md", offset: 1}.parse([]byte(tc.yaml))
		var le *Error
		if !errors.As(err, &le) || !errors.Is(err, ErrSyntax) || le.Line != tc.line {
			t.Errorf("%q: %v, want a syntax error on line %d", tc.yaml, err, tc.line)
		}
	}
}

func TestStrictConfig(t *testing.T) {
	for _, tc := range []struct {
		name, config string
		want         []errAt
	}{
		{"unknown key", "title: x\ntitel: y\n", []errAt{{ErrUnknownKey, "skysheet.yaml", 2, `did you mean "title"?`}}},
		{"unknown condition", "conditions:\n  solar_band: [280, 2500]\n", []errAt{{ErrUnknownKey, "skysheet.yaml", 2, `did you mean "solar_band_nm"?`}}},
		{"bad url", "site_address: example/site\n", []errAt{{ErrType, "skysheet.yaml", 1, "absolute http"}}},
		{"bad spectrum", "conditions: {solar_spectrum: noon}\n", []errAt{{ErrConditions, "skysheet.yaml", 1, "noon"}}},
		{"not a mapping", "- a\n- b\n", []errAt{{ErrType, "skysheet.yaml", 1, "want a mapping"}}},
		{"allow_html not bool", "allow_html: perhaps\n", []errAt{{ErrType, "skysheet.yaml", 1, ""}}},
	} {
		t.Run(tc.name, func(t *testing.T) {
			fsys := baseFS()
			fsys["skysheet.yaml"] = &fstest.MapFile{Data: []byte(tc.config)}
			lib, err := loadRead(fsys)
			checkErrors(t, err, tc.want)
			if lib == nil || len(lib.Materials) != 1 {
				t.Errorf("materials should still load when the config is bad")
			}
		})
	}
}

func TestConfigDefaults(t *testing.T) {
	fsys := baseFS()
	fsys["skysheet.yaml"] = &fstest.MapFile{Data: []byte("site_address: https://example.org/lib\nallow_html: true\n")}
	lib, err := loadRead(fsys)
	if err != nil {
		t.Fatal(err)
	}
	c := lib.Config
	if c.Title != "Material library" || c.SiteAddress != "https://example.org/lib/" || !c.AllowHTML || c.Conditions.TemperatureK != 300 {
		t.Errorf("%+v", c)
	}
}

func TestLibraryErrors(t *testing.T) {
	t.Run("no config", func(t *testing.T) {
		fsys := baseFS()
		delete(fsys, "skysheet.yaml")
		_, err := loadRead(fsys)
		checkErrors(t, err, []errAt{{ErrNoConfig, "skysheet.yaml", 0, ""}})
	})
	t.Run("no content", func(t *testing.T) {
		_, err := loadRead(fstest.MapFS{"skysheet.yaml": {Data: []byte("title: x\n")}})
		checkErrors(t, err, []errAt{{ErrMissing, "content", 0, "content/"}})
	})
	t.Run("no front matter", func(t *testing.T) {
		fsys := baseFS()
		fsys["content/notes.md"] = &fstest.MapFile{Data: []byte("# Notes\n")}
		_, err := loadRead(fsys)
		checkErrors(t, err, []errAt{{ErrNoFrontMatter, "content/notes.md", 1, ""}})
	})
	t.Run("unclosed", func(t *testing.T) {
		fsys := baseFS()
		fsys["content/notes.md"] = &fstest.MapFile{Data: []byte("---\ntitle: x\n")}
		_, err := loadRead(fsys)
		checkErrors(t, err, []errAt{{ErrUnclosed, "content/notes.md", 1, ""}})
	})
	t.Run("errors of several files in file order", func(t *testing.T) {
		fsys := baseFS()
		fsys["content/b.md"] = &fstest.MapFile{Data: []byte("---\ntitle: b\n---\n")}
		fsys["content/a.md"] = &fstest.MapFile{Data: []byte("---\ntitel: a\n---\n")}
		_, err := loadRead(fsys)
		checkErrors(t, err, []errAt{
			{ErrUnknownKey, "content/a.md", 2, ""},
			{ErrMissing, "content/a.md", 1, "title"},
			{ErrMissing, "content/a.md", 1, "maker"},
			{ErrMissing, "content/a.md", 1, "spectra"},
			{ErrMissing, "content/b.md", 1, "maker"},
			{ErrMissing, "content/b.md", 1, "spectra"},
		})
	})
	t.Run("duplicate slug", func(t *testing.T) {
		fsys := baseFS()
		fsys["content/sub/flat.md"] = &fstest.MapFile{Data: []byte(strings.Replace(goodMaterial, "file: flat/", "file: ../flat/", 2))}
		lib, err := loadRead(fsys)
		checkErrors(t, err, []errAt{{ErrDuplicateSlug, "content/sub/flat.md", 1, "content/flat.md"}})
		if len(lib.Materials) != 1 {
			t.Errorf("%d materials", len(lib.Materials))
		}
	})
	t.Run("spectrum parse error", func(t *testing.T) {
		fsys := baseFS()
		fsys["content/flat/solar.csv"] = &fstest.MapFile{Data: []byte("wavelength_nm,R\n280,0.9\n290,x\n")}
		_, err := loadRead(fsys)
		checkErrors(t, err, []errAt{{ErrSpectrum, "content/flat.md", 7, "content/flat/solar.csv:3: column 2 (R): \"x\" is not a number"}})
		var pe *spectra.ParseError
		if !errors.As(err, &pe) || pe.Line != 3 {
			t.Errorf("want the spectrum's ParseError at line 3: %v", err)
		}
	})
	t.Run("overlapping spectra are spliced", func(t *testing.T) {
		fsys := baseFS()
		fsys["content/flat/thermal.csv"] = &fstest.MapFile{Data: []byte("wavelength_nm,R\n2000,0.05\n25000,0.05\n")}
		lib, err := loadRead(fsys)
		if err != nil {
			t.Fatal(err)
		}
		if s, _, _ := lib.ReadSample(lib.Materials[0]); len(s.Splices) == 0 {
			t.Errorf("overlapping files were not spliced: %+v", s.Splices)
		}
	})
	t.Run("unreadable reference standard", func(t *testing.T) {
		fsys := baseFS()
		f := fsys["content/flat/thermal.csv"]
		fsys["content/flat/thermal.csv"] = &fstest.MapFile{Data: append([]byte("# reference_file: ../../../outside.csv\n"), f.Data...)}
		_, err := loadRead(fsys)
		checkErrors(t, err, []errAt{{ErrEscapes, "content/flat.md", 9, ""}})
	})
}

func TestPaths(t *testing.T) {
	for _, tc := range []struct {
		file, ref, want string
		err             error
	}{
		{"content/a.md", "a/x.csv", "content/a/x.csv", nil},
		{"content/sub/a.md", "../shared/x.csv", "content/shared/x.csv", nil},
		{"content/a.md", "../data/x.csv", "data/x.csv", nil},
		{"content/a.md", "./x.csv", "content/x.csv", nil},
		{"content/a.md", "../../x.csv", "", ErrEscapes},
		{"content/a.md", "a/../../../x.csv", "", ErrEscapes},
		{"content/a.md", "/etc/passwd", "", ErrEscapes},
		{"content/a.md", "C:/data/x.csv", "", ErrEscapes},
		{"content/a.md", `a\x.csv`, "", ErrPath},
		{"content/a.md", "..", "", ErrPath},
	} {
		got, err := resolvePath(tc.file, tc.ref)
		if got != tc.want || !errors.Is(err, tc.err) {
			t.Errorf("resolvePath(%q, %q) = %q, %v; want %q, %v", tc.file, tc.ref, got, err, tc.want, tc.err)
		}
	}
}

func TestComparison(t *testing.T) {
	fsys := baseFS()
	fsys["content/other.md"] = &fstest.MapFile{Data: []byte(strings.Replace(goodMaterial, "file: flat/", "file: flat/", 2))}
	fsys["content/cmp/whites.md"] = &fstest.MapFile{Data: []byte("---\ntitle: Whites\nslug: whites\ncompare: [other, flat]\nsummary: s\n---\nBody\n")}
	lib, err := loadRead(fsys)
	if err != nil {
		t.Fatal(err)
	}
	if len(lib.Comparisons) != 1 || len(lib.Materials) != 2 {
		t.Fatalf("%d comparisons, %d materials", len(lib.Comparisons), len(lib.Materials))
	}
	c := lib.Comparisons[0]
	if c.Slug != "whites" || len(c.Materials) != 2 || c.Materials[0].Slug != "other" || c.Materials[1].Slug != "flat" {
		t.Errorf("comparison %+v", c)
	}

	fsys["content/cmp/whites.md"] = &fstest.MapFile{Data: []byte("---\ntitle: Whites\ncompare:\n  - flat\n  - flatt\ncategory: paint\n---\n")}
	_, err = loadRead(fsys)
	checkErrors(t, err, []errAt{{ErrNotAllowed, "content/cmp/whites.md", 6, "category"}})

	fsys["content/cmp/whites.md"] = &fstest.MapFile{Data: []byte("---\ntitle: Whites\ncompare:\n  - flat\n  - flatt\n---\n")}
	_, err = loadRead(fsys)
	checkErrors(t, err, []errAt{{ErrUnknownMaterial, "content/cmp/whites.md", 5, `did you mean "flat"?`}})
}

func TestHiddenFilesSkipped(t *testing.T) {
	fsys := baseFS()
	fsys["content/.drafts/x.md"] = &fstest.MapFile{Data: []byte("not front matter")}
	fsys["content/.x.md"] = &fstest.MapFile{Data: []byte("not front matter")}
	fsys["content/readme.txt"] = &fstest.MapFile{Data: []byte("not markdown")}
	if _, err := loadRead(fsys); err != nil {
		t.Fatal(err)
	}
}

func TestSlugify(t *testing.T) {
	for _, tc := range []struct{ in, want string }{
		{"Glacier-7", "glacier-7"},
		{"Glacier 7 roof white", "glacier-7-roof-white"},
		{"  --a__b--  ", "a-b"},
		{"µ", ""},
		{"Über Film", "ber-film"},
	} {
		if got := Slugify(tc.in); got != tc.want {
			t.Errorf("Slugify(%q) = %q, want %q", tc.in, got, tc.want)
		}
	}
}

func TestSplitFront(t *testing.T) {
	for _, tc := range []struct {
		name, src, yaml, body string
		line                  int
		err                   error
	}{
		{"plain", "---\na: 1\n---\nbody\n", "a: 1\n", "body\n", 4, nil},
		{"crlf and bom", "\uFEFF---\r\na: 1\r\n---\r\nbody", "a: 1\r\n", "body", 4, nil},
		{"dots close", "---\na: 1\n...\n", "a: 1\n", "", 4, nil},
		{"empty", "---\n---\n", "", "", 3, nil},
		{"no newline after close", "---\na: 1\n---", "a: 1\n", "", 4, nil},
		{"none", "# title\n", "", "", 0, ErrNoFrontMatter},
		{"only fence", "---", "", "", 0, ErrUnclosed},
		{"unclosed", "---\na: 1\n", "", "", 0, ErrUnclosed},
	} {
		t.Run(tc.name, func(t *testing.T) {
			y, b, line, err := splitFront("f.md", []byte(tc.src))
			if !errors.Is(err, tc.err) || string(y) != tc.yaml || string(b) != tc.body || line != tc.line {
				t.Errorf("got %q %q %d %v", y, b, line, err)
			}
		})
	}
}

// skyT is an invented spectral sky (a zenith transmittance column).
const skyT = "# sample: invented sky transmittance (test data)\nwavelength_nm,T\n2500,0\n7900,0\n8000,0.7\n13000,0.7\n13100,0\n100000,0\n"

func TestSkyFile(t *testing.T) {
	fsys := baseFS()
	fsys["skysheet.yaml"] = &fstest.MapFile{Data: []byte("conditions:\n  sky: skies/dry.csv\n")}
	fsys["skies/dry.csv"] = &fstest.MapFile{Data: []byte(skyT)}
	lib, err := loadRead(fsys)
	if err != nil {
		t.Fatal(err)
	}
	m := lib.Materials[0]
	if m.Conditions.Sky.Spectrum == nil || m.Conditions.Sky.File != "skies/dry.csv" {
		t.Fatalf("sky not loaded: %+v", m.Conditions)
	}
	_, inputs, _ := lib.ReadSample(m)
	if last := inputs[len(inputs)-1]; last != hashInput("skies/dry.csv", []byte(skyT)) {
		t.Errorf("sky input %+v", last)
	}
	// In front matter the path is relative to the Markdown file.
	fsys["content/flat/sky.csv"] = &fstest.MapFile{Data: []byte(skyT)}
	fsys["content/flat.md"] = &fstest.MapFile{Data: []byte(strings.Replace(goodMaterial, "{temperature_k: 290}", "{sky: flat/sky.csv}", 1))}
	lib, err = loadRead(fsys)
	if err != nil {
		t.Fatal(err)
	}
	if _, in, _ := lib.ReadSample(lib.Materials[0]); in[len(in)-1].Path != "content/flat/sky.csv" {
		t.Errorf("inputs %+v", in)
	}
	// A missing sky file is an error at its line.
	fsys["content/flat.md"] = &fstest.MapFile{Data: []byte(strings.Replace(goodMaterial, "{temperature_k: 290}", "{sky: flat/nosky.csv}", 1))}
	_, err = loadRead(fsys)
	checkErrors(t, err, []errAt{{ErrSpectrum, "content/flat.md", 14, "content/flat/nosky.csv"}})
}

// seriesCSV is an invented three-hour weather series.
const seriesCSV = "# Invented, synthetic, not measured: test series.\ntime,air temperature (°C),dew point (°C),global horizontal irradiance (W/m²)\n" +
	"2026-07-01T00:00+02:00,20,10,0\n2026-07-01T01:00+02:00,19,10,0\n2026-07-01T02:00+02:00,18,10,0\n"

func TestWeatherFile(t *testing.T) {
	fsys := baseFS()
	fsys["skysheet.yaml"] = &fstest.MapFile{Data: []byte("conditions:\n  weather: weather/site.csv\n")}
	fsys["weather/site.csv"] = &fstest.MapFile{Data: []byte(seriesCSV)}
	lib, err := loadRead(fsys)
	if err != nil {
		t.Fatal(err)
	}
	m := lib.Materials[0]
	if m.Conditions.Weather.Series == nil || m.Conditions.Weather.File != "weather/site.csv" || len(m.Conditions.Weather.Series.Hours) != 3 {
		t.Fatalf("series not loaded: %+v", m.Conditions.Weather)
	}
	_, inputs, _ := lib.ReadSample(m)
	if last := inputs[len(inputs)-1]; last != hashInput("weather/site.csv", []byte(seriesCSV)) {
		t.Errorf("series input %+v", last)
	}
	// In front matter the path is relative to the Markdown file, and
	// confined to the library.
	fsys["content/flat/site.csv"] = &fstest.MapFile{Data: []byte(seriesCSV)}
	with := func(cond string) {
		fsys["content/flat.md"] = &fstest.MapFile{Data: []byte(strings.Replace(goodMaterial, "{temperature_k: 290}", cond, 1))}
	}
	with("{weather: flat/site.csv}")
	lib, err = loadRead(fsys)
	if err != nil {
		t.Fatal(err)
	}
	if _, in, _ := lib.ReadSample(lib.Materials[0]); in[len(in)-1].Path != "content/flat/site.csv" {
		t.Errorf("inputs %+v", in)
	}
	with("{weather: flat/none.csv}")
	_, err = loadRead(fsys)
	checkErrors(t, err, []errAt{{ErrWeather, "content/flat.md", 14, "content/flat/none.csv"}})
	with("{weather: ../../outside.csv}")
	_, err = loadRead(fsys)
	checkErrors(t, err, []errAt{{ErrEscapes, "content/flat.md", 14, "outside.csv"}})
	// A bad series is named at its own line and column.
	fsys["content/flat/site.csv"] = &fstest.MapFile{Data: []byte(strings.Replace(seriesCSV, "01:00+02:00,19", "03:00+02:00,19", 1))}
	with("{weather: flat/site.csv}")
	_, err = loadRead(fsys)
	checkErrors(t, err, []errAt{{ErrWeather, "content/flat/site.csv", 4, "named at content/flat.md:14"}})
	with("{weather: none}")
	if lib, err = loadRead(fsys); err != nil || lib.Materials[0].Conditions.Weather.Series != nil {
		t.Errorf("weather: none gave %+v, %v", lib.Materials[0].Conditions.Weather, err)
	}
}

// statCountingFS counts the fs.Stat calls made through it, by path.
type statCountingFS struct {
	fstest.MapFS
	stats map[string]int
}

func (c *statCountingFS) Stat(name string) (fs.FileInfo, error) {
	c.stats[name]++
	return c.MapFS.Stat(name)
}

// TestLoadStatsListedFiles: a spectrum file that listing content/ met as
// a regular file is known from the listing; one outside content/, or met
// as something else, is asked for.
func TestLoadStatsListedFiles(t *testing.T) {
	fsys := baseFS()
	fsys["content/flat.md"] = &fstest.MapFile{Data: []byte(strings.Replace(goodMaterial, "file: flat/thermal.csv", "file: ../data/thermal.csv", 1))}
	fsys["data/thermal.csv"] = fsys["content/flat/thermal.csv"]
	fsys["content/flat/solar-data.csv"] = fsys["content/flat/solar.csv"]
	fsys["content/flat/solar.csv"] = &fstest.MapFile{Data: []byte("solar-data.csv"), Mode: fs.ModeSymlink}
	c := &statCountingFS{MapFS: fsys, stats: map[string]int{}}
	lib, err := Load(c)
	if err != nil || len(lib.Materials) != 1 {
		t.Fatal(err)
	}
	if n := c.stats["data/thermal.csv"]; n != 1 {
		t.Errorf("a file outside content/: %d stats, want 1", n)
	}
	if n := c.stats["content/flat/solar.csv"]; n != 1 {
		t.Errorf("a file listed as a link: %d stats, want 1", n)
	}
	fsys["content/flat/solar.csv"] = fsys["content/flat/solar-data.csv"]
	c.stats = map[string]int{}
	if _, err := Load(c); err != nil {
		t.Fatal(err)
	}
	if n := c.stats["content/flat/solar.csv"]; n != 0 {
		t.Errorf("a regular file listed: %d stats, want 0", n)
	}
}

func TestStampOf(t *testing.T) {
	if runtime.GOOS != "linux" && runtime.GOOS != "darwin" {
		t.Skip("no stamps on", runtime.GOOS)
	}
	p := filepath.Join(t.TempDir(), "f")
	if err := os.WriteFile(p, []byte("x"), 0o644); err != nil {
		t.Fatal(err)
	}
	fi, err := os.Stat(p)
	if err != nil {
		t.Fatal(err)
	}
	if _, ok := StampOf(fi, time.Now()); ok {
		t.Error("a file changed just now has a stamp")
	}
	st, ok := StampOf(fi, time.Now().Add(stampMargin+time.Second))
	if !ok || st.Size != 1 || st.Ino == 0 || st.Change == 0 {
		t.Errorf("stamp %+v, %v", st, ok)
	}
	dir, _ := os.Stat(filepath.Dir(p))
	if _, ok := StampOf(dir, time.Now().Add(time.Hour)); ok {
		t.Error("a folder has a stamp")
	}
}
