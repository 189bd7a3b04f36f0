package main

import (
	"bufio"
	"bytes"
	"io/fs"
	"math"
	"os"
	"path"
	"path/filepath"
	"regexp"
	"runtime"
	"strconv"
	"strings"
	"testing"

	"gopkg.in/yaml.v3"
)

// frontMatter is the shape of a material or comparison file's front matter
// as docs/library.md documents it; decoding with KnownFields rejects any
// other key.
type frontMatter struct {
	Title       string   `yaml:"title"`
	Slug        string   `yaml:"slug"`
	Maker       string   `yaml:"maker"`
	Lab         string   `yaml:"lab"`
	ProductCode string   `yaml:"product_code"`
	Category    string   `yaml:"category"`
	Tags        []string `yaml:"tags"`
	Summary     string   `yaml:"summary"`
	License     string   `yaml:"license"`
	Spectra     []struct {
		File       string `yaml:"file"`
		Role       string `yaml:"role"`
		Instrument string `yaml:"instrument"`
		Notes      string `yaml:"notes"`
	} `yaml:"spectra"`
	Measured struct {
		Date       string `yaml:"date"`
		Instrument string `yaml:"instrument"`
		Angle      string `yaml:"angle"`
		Reference  string `yaml:"reference"`
		Operator   string `yaml:"operator"`
		Notes      string `yaml:"notes"`
	} `yaml:"measured"`
	Conditions map[string]any `yaml:"conditions"`
	Claims     []struct {
		Figure    string         `yaml:"figure"`
		Value     float64        `yaml:"value"`
		Tolerance float64        `yaml:"tolerance"`
		Basis     map[string]any `yaml:"basis"`
		Source    string         `yaml:"source"`
	} `yaml:"claims"`
	Compare []string `yaml:"compare"`
}

// config is the documented shape of skysheet.yaml (docs/library.md).
type configFile struct {
	Title       string         `yaml:"title"`
	Description string         `yaml:"description"`
	AllowHTML   bool           `yaml:"allow_html"`
	Lab         string         `yaml:"lab"`
	Publisher   string         `yaml:"publisher"`
	Conditions  map[string]any `yaml:"conditions"`
}

// slugRE: lower-case letters, digits and single hyphens (docs/library.md).
var slugRE = regexp.MustCompile(`^[a-z0-9]+(-[a-z0-9]+)*$`)

func decodeStrict(t *testing.T, name string, data []byte, v any) {
	t.Helper()
	dec := yaml.NewDecoder(bytes.NewReader(data))
	dec.KnownFields(true)
	if err := dec.Decode(v); err != nil {
		t.Fatalf("%s: %v", name, err)
	}
}

// splitFrontMatter returns the YAML between the two leading "---" lines
// and the body after them.
func splitFrontMatter(t *testing.T, name string, data []byte) ([]byte, []byte) {
	t.Helper()
	rest, ok := bytes.CutPrefix(data, []byte("---\n"))
	if !ok {
		t.Fatalf("%s: does not start with ---", name)
	}
	fm, body, ok := bytes.Cut(rest, []byte("\n---\n"))
	if !ok {
		t.Fatalf("%s: front matter is not closed by ---", name)
	}
	return fm, body
}

// spectrumFile is a neutral-format file as read back by the test.
type spectrumFile struct {
	meta   map[string]string
	header string
	x      []float64 // axis as written
	r, t   []float64
}

// readSpectrum reads a generated file strictly: metadata comments, one
// header line, then rows of exactly three numbers.
func readSpectrum(t *testing.T, name string) spectrumFile {
	t.Helper()
	f, err := os.Open(name)
	if err != nil {
		t.Fatal(err)
	}
	defer f.Close()
	s := spectrumFile{meta: map[string]string{}}
	sc := bufio.NewScanner(f)
	line := 0
	for sc.Scan() {
		line++
		text := sc.Text()
		if c, ok := strings.CutPrefix(text, "# "); ok && s.header == "" {
			k, v, ok := strings.Cut(c, ": ")
			if !ok {
				t.Fatalf("%s:%d: comment %q is not \"# key: value\"", name, line, text)
			}
			s.meta[k] = v
			continue
		}
		if s.header == "" {
			s.header = text
			continue
		}
		f := strings.Split(text, ",")
		if len(f) != 3 {
			t.Fatalf("%s:%d: %d cells, want 3", name, line, len(f))
		}
		var v [3]float64
		for i, c := range f {
			if v[i], err = strconv.ParseFloat(c, 64); err != nil {
				t.Fatalf("%s:%d: column %d: %v", name, line, i+1, err)
			}
		}
		s.x, s.r, s.t = append(s.x, v[0]), append(s.r, v[1]), append(s.t, v[2])
	}
	if err := sc.Err(); err != nil {
		t.Fatal(err)
	}
	return s
}

// TestGenerateLoads checks that a generated library has the shape
// docs/library.md and docs/format.md ask for: a valid skysheet.yaml, one
// Markdown file per material with strict front matter whose spectra exist,
// two spectra of the stated grids that meet at 2500 nm, physically possible
// values, and comparison pages naming existing slugs.
func TestGenerateLoads(t *testing.T) {
	const n = 250
	dir := t.TempDir()
	if err := Generate(dir, n, 7); err != nil {
		t.Fatal(err)
	}
	data, err := os.ReadFile(filepath.Join(dir, "skysheet.yaml"))
	if err != nil {
		t.Fatal(err)
	}
	var cfg configFile
	decodeStrict(t, "skysheet.yaml", data, &cfg)
	if cfg.Title == "" || !strings.Contains(string(data), "invented") {
		t.Errorf("skysheet.yaml: want a title and the library marked invented, got\n%s", data)
	}

	slugs := map[string]string{} // slug → file
	categories := map[string]int{}
	var compares []frontMatter
	content := filepath.Join(dir, "content")
	err = filepath.WalkDir(content, func(p string, d fs.DirEntry, err error) error {
		if err != nil || d.IsDir() || filepath.Ext(p) != ".md" {
			return err
		}
		rel, _ := filepath.Rel(dir, p)
		data, err := os.ReadFile(p)
		if err != nil {
			return err
		}
		yml, body := splitFrontMatter(t, rel, data)
		var fm frontMatter
		decodeStrict(t, rel, yml, &fm)
		if fm.Title == "" || !slugRE.MatchString(fm.Slug) {
			t.Errorf("%s: title %q, slug %q: want a title and a valid slug", rel, fm.Title, fm.Slug)
		}
		if prev, dup := slugs[fm.Slug]; dup {
			t.Errorf("%s: slug %q already used by %s", rel, fm.Slug, prev)
		}
		slugs[fm.Slug] = rel
		if fm.Compare != nil {
			compares = append(compares, fm)
			return nil
		}
		categories[fm.Category]++
		if strings.TrimSuffix(filepath.Base(p), ".md") != fm.Slug {
			t.Errorf("%s: slug %q differs from the file name", rel, fm.Slug)
		}
		if fm.Maker == "" && fm.Lab == "" {
			t.Errorf("%s: want a maker or a lab", rel)
		}
		for _, s := range []string{fm.Title, fm.Maker, fm.Lab} {
			if !strings.HasSuffix(s, "(invented)") {
				t.Errorf("%s: %q is not marked (invented)", rel, s)
			}
		}
		if !bytes.Contains(body, []byte("**Invented example.**")) || !bytes.Contains(body, []byte("not a certification")) {
			t.Errorf("%s: body lacks the invented-example note or the cautions", rel)
		}
		for _, c := range fm.Claims {
			if c.Figure != "solar_reflectance" && c.Figure != "thermal_emittance" || c.Value <= 0 || c.Value >= 1 || c.Tolerance <= 0 {
				t.Errorf("%s: claim %+v", rel, c)
			}
		}
		if len(fm.Spectra) != 2 {
			t.Fatalf("%s: %d spectra, want 2", rel, len(fm.Spectra))
		}
		var files [2]spectrumFile
		for i, s := range fm.Spectra {
			if path.IsAbs(s.File) || strings.Contains(s.File, "\\") || strings.HasPrefix(path.Clean(s.File), "..") {
				t.Errorf("%s: spectrum path %q leaves the library or is not slash-separated", rel, s.File)
			}
			files[i] = readSpectrum(t, filepath.Join(filepath.Dir(p), filepath.FromSlash(s.File)))
		}
		checkSpectra(t, rel, files[0], files[1])
		return nil
	})
	if err != nil {
		t.Fatal(err)
	}
	if got := len(slugs) - len(compares); got != n {
		t.Errorf("%d materials, want %d", got, n)
	}
	if len(compares) != n/100 {
		t.Errorf("%d comparison pages, want %d (one per hundred materials)", len(compares), n/100)
	}
	for _, c := range compares {
		if len(c.Compare) != 3 {
			t.Errorf("comparison %s: %d entries, want 3", c.Slug, len(c.Compare))
		}
		for _, s := range c.Compare {
			if f, ok := slugs[s]; !ok || strings.HasPrefix(f, filepath.Join("content", "compare")) {
				t.Errorf("comparison %s names %q, which is no material", c.Slug, s)
			}
		}
	}
	for _, f := range families {
		if categories[f.category] == 0 {
			t.Errorf("no material of category %q among %d", f.category, n)
		}
	}
}

// checkSpectra checks one material's two files against the grids the
// generator promises and against physics: 0 ≤ R, T and R + T ≤ 1.
func checkSpectra(t *testing.T, name string, uv, ir spectrumFile) {
	t.Helper()
	for _, tt := range []struct {
		what        string
		f           spectrumFile
		header      string
		rows        int
		first, step float64
	}{
		{"UV-Vis-NIR", uv, "wavelength_nm,R,T", 2251, 250, 1}, // 250–2500 nm every 1 nm
		{"FTIR", ir, "wavenumber_cm-1,R,T", 1801, 4000, -2},   // 4000–400 cm⁻¹ every 2 cm⁻¹
	} {
		if tt.f.header != tt.header || len(tt.f.x) != tt.rows {
			t.Errorf("%s %s: header %q and %d rows, want %q and %d", name, tt.what, tt.f.header, len(tt.f.x), tt.header, tt.rows)
			continue
		}
		if !strings.Contains(tt.f.meta["sample"], "synthetic data, not a measurement") || tt.f.meta["u_R"] == "" {
			t.Errorf("%s %s: metadata %v: want the sample marked synthetic and u_R", name, tt.what, tt.f.meta)
		}
		for k, x := range tt.f.x {
			if want := tt.first + float64(k)*tt.step; x != want {
				t.Fatalf("%s %s row %d: axis %g, want %g", name, tt.what, k+1, x, want)
			}
			if r, tr := tt.f.r[k], tt.f.t[k]; r < 0 || tr < 0 || r+tr > 1+1e-9 {
				t.Fatalf("%s %s row %d: R = %g, T = %g: want 0 ≤ R, T and R + T ≤ 1", name, tt.what, k+1, r, tr)
			}
		}
	}
	if len(uv.x) > 0 && len(ir.x) > 0 && uv.x[len(uv.x)-1] != 1e7/ir.x[0] {
		t.Errorf("%s: the files do not meet: UV-Vis-NIR ends at %g nm, FTIR starts at %g nm", name, uv.x[len(uv.x)-1], 1e7/ir.x[0])
	}
}

// TestGenerateDeterministic checks that the same seed writes the same
// bytes, whatever the number of threads, and another seed other bytes.
func TestGenerateDeterministic(t *testing.T) {
	gen := func(seed uint64, procs int) map[string][]byte {
		defer runtime.GOMAXPROCS(runtime.GOMAXPROCS(procs))
		dir := t.TempDir()
		if err := Generate(dir, 120, seed); err != nil {
			t.Fatal(err)
		}
		files := map[string][]byte{}
		err := filepath.WalkDir(dir, func(p string, d fs.DirEntry, err error) error {
			if err != nil || d.IsDir() {
				return err
			}
			rel, _ := filepath.Rel(dir, p)
			files[rel], err = os.ReadFile(p)
			return err
		})
		if err != nil {
			t.Fatal(err)
		}
		return files
	}
	a, b, c := gen(3, 1), gen(3, 4), gen(4, 4)
	if len(a) != len(b) {
		t.Fatalf("seed 3 wrote %d files with 1 thread and %d with 4", len(a), len(b))
	}
	for name, data := range a {
		if !bytes.Equal(data, b[name]) {
			t.Errorf("%s differs between two runs with seed 3", name)
		}
	}
	same := 0
	for name, data := range a {
		if bytes.Equal(data, c[name]) {
			same++
		}
	}
	if same > 3 { // the comparison pages may coincide; spectra must not
		t.Errorf("seeds 3 and 4 wrote %d identical files, want different libraries", same)
	}
}

// TestGenerateRefuses checks bad arguments and a non-empty output folder,
// which is left as it was.
func TestGenerateRefuses(t *testing.T) {
	dir := t.TempDir()
	keep := filepath.Join(dir, "notes.txt")
	if err := os.WriteFile(keep, []byte("mine"), 0o644); err != nil {
		t.Fatal(err)
	}
	if err := Generate(dir, 10, 1); err == nil {
		t.Error("Generate into a non-empty folder: no error")
	}
	if got, err := os.ReadFile(keep); err != nil || string(got) != "mine" {
		t.Errorf("the existing file was changed: %q, %v", got, err)
	}
	if ents, _ := os.ReadDir(dir); len(ents) != 1 {
		t.Errorf("the folder holds %d entries after a refused run, want 1", len(ents))
	}
	if err := Generate(t.TempDir(), 0, 1); err == nil {
		t.Error("Generate of 0 materials: no error")
	}
	for _, args := range [][]string{{}, {"-n", "0", "-o", t.TempDir()}, {"-o", t.TempDir(), "extra"}} {
		if err := run(args, &bytes.Buffer{}, &bytes.Buffer{}); err == nil {
			t.Errorf("run %q: no error", args)
		}
	}
}

// TestFamiliesPlausible checks the noise-free models of each family against
// general knowledge of such surfaces, over many draws.
func TestFamiliesPlausible(t *testing.T) {
	// mean of R (or of 1 − R − T, emit) over [lo, hi] nm, plain average on a 1 % grid.
	mean := func(v variant, lo, hi float64, emit bool) float64 {
		var s float64
		for k := range 101 {
			nm := lo * math.Pow(hi/lo, float64(k)/100)
			r, tr := v.at(nm)
			if emit {
				s += 1 - r - tr
			} else {
				s += r
			}
		}
		return s / 101
	}
	for _, tt := range []struct {
		family       string
		lo, hi       float64 // band, nm
		emit         bool
		wantMin, max float64
		source       string
	}{
		// Rutile titania absorbs below its band gap, ≈ 3.0 eV ≈ 410 nm (from memory).
		{"paint", 300, 360, false, 0, 0.2, "titania UV absorption"},
		// White paints reflect 0.8–0.95 of visible light (common practice, no source).
		{"paint", 450, 700, false, 0.8, 0.96, "white paint, visible"},
		// Polymer binders are strongly emissive in 8–13 µm (common practice, no source).
		{"paint", 8000, 13000, true, 0.8, 1, "binder emittance"},
		{"coating", 450, 700, false, 0.85, 0.99, "white coating, visible"},
		// Bare metals have a low thermal emittance, well under 0.3 (common practice, no source).
		{"metal", 8000, 13000, true, 0, 0.3, "metal emittance"},
		// Black, grey and dark near-infrared-reflective paints reflect under 0.4 of
		// visible light (common practice, no source).
		{"dark", 450, 600, false, 0, 0.4, "dark paint, visible"},
		// Silver reflects over 0.9 of visible light (common practice, no source).
		{"film", 500, 700, false, 0.85, 1, "silvered film, visible"},
	} {
		t.Run(tt.family+" "+tt.source, func(t *testing.T) {
			var fam *family
			for k := range families {
				if families[k].category == tt.family {
					fam = &families[k]
				}
			}
			if fam == nil {
				t.Fatalf("no family %q", tt.family)
			}
			for i := range 200 {
				m := describe(11, 1000, i)
				if m.fam != fam {
					continue
				}
				if got := mean(m.v, tt.lo, tt.hi, tt.emit); got < tt.wantMin || got > tt.max {
					t.Errorf("%s (%s): mean over %g–%g nm = %.3f, want %g..%g", m.slug, m.v.kind, tt.lo, tt.hi, got, tt.wantMin, tt.max)
				}
			}
		})
	}
}
