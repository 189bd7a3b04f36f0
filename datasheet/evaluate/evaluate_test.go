package evaluate

import (
	"bytes"
	"encoding/json"
	"errors"
	"fmt"
	"math"
	"os"
	"strings"
	"sync/atomic"
	"testing"
	"testing/fstest"

	"skysheet/datasheet"
	"skysheet/datasheet/library"
	"skysheet/spectra"
)

// Constant spectra: a band-weighted mean of a constant is that constant
// whatever the weighting (closed form), so the figures are known exactly.
const (
	flatSolar   = "wavelength_nm,R\n280,0.9\n1000,0.9\n2500,0.9\n"
	flatThermal = "wavelength_um,R\n2.6,0.05\n10,0.05\n25,0.05\n"
)

const flatMaterial = `---
title: Flat white test panel
maker: Test maker (invented)
spectra:
  - file: flat/solar.csv
  - file: flat/thermal.csv
measured: {angle: 8°}
conditions: {temperature_k: 290}
claims:
  - {figure: solar_reflectance, value: 0.9}
  - {figure: thermal_emittance, value: 0.8, tolerance: 0.02}
  - {figure: solar_reflectance, value: 0.9, basis: {angle_deg: 45}}
---
Text.
`

func baseFS() fstest.MapFS {
	return fstest.MapFS{
		"skysheet.yaml":            {Data: []byte("title: Test library\nconditions:\n  window_band_um: [8, 14]\n")},
		"content/flat.md":          {Data: []byte(flatMaterial)},
		"content/flat/solar.csv":   {Data: []byte(flatSolar)},
		"content/flat/thermal.csv": {Data: []byte(flatThermal)},
	}
}

func load(t *testing.T, fsys fstest.MapFS) *library.Library {
	t.Helper()
	lib, err := library.Load(fsys)
	if err != nil {
		t.Fatal(err)
	}
	return lib
}

func TestFiguresAndVerdicts(t *testing.T) {
	ms, err := All(load(t, baseFS()), Options{})
	if err != nil {
		t.Fatal(err)
	}
	if len(ms) != 1 {
		t.Fatalf("%d materials", len(ms))
	}
	m := ms[0]
	f := m.Figures
	for _, tc := range []struct {
		name      string
		got, want float64
		tol       float64
	}{
		{"solar reflectance", float64(f.SolarReflectance), 0.9, 1e-12},  // mean of a constant (closed form)
		{"thermal emittance", float64(f.ThermalEmittance), 0.95, 1e-12}, // 1 − R for an opaque sample, Kirchhoff
		{"window emittance", float64(f.WindowEmittance), 0.95, 1e-12},   // same
		{"solar coverage", float64(f.SolarCoverage), 1, 1e-12},          // data cover 280–2500 nm
		{"temperature used", f.Conditions.TemperatureK, 290, 0},         // front matter override
		{"window band used", f.Conditions.WindowBand.Hi, 14000, 0},      // config override, 14 µm
	} {
		if math.Abs(tc.got-tc.want) > tc.tol {
			t.Errorf("%s = %v, want %v", tc.name, tc.got, tc.want)
		}
	}
	// The sample and the optics the page draws.
	if lo, hi := m.Sample.Range(); lo != 280 || hi != 25000 {
		t.Errorf("sample %g–%g nm", lo, hi)
	}
	if v, ok := m.Optics.A.At(10000); !ok || math.Abs(v-0.95) > 1e-12 {
		t.Errorf("A(10 µm) = %v, want 0.95", v)
	}
	if len(m.Inputs) != 3 || m.Inputs[0].Path != "content/flat.md" || m.Inputs[2].Path != "content/flat/thermal.csv" {
		t.Errorf("inputs %+v", m.Inputs)
	}

	vs := m.Verdicts
	for i, tt := range []struct {
		status   datasheet.Status
		computed float64 // NaN: not computed
	}{
		// A band-weighted mean of a constant is the constant (closed
		// form): R = 0.9 gives 0.9, and opaque R = 0.05 an emittance of
		// 1 − 0.05 = 0.95 (Kirchhoff's law).
		{datasheet.Supported, 0.9},
		{datasheet.NotSupported, 0.95},
		// The claim's 45° is compared with the 8° written under measured:
		// more than 10° apart.
		{datasheet.CannotCheck, 0.9},
	} {
		if i >= len(vs) {
			t.Fatalf("%d verdicts, want 3", len(vs))
		}
		v := vs[i]
		got := float64(v.Computed)
		if v.Status != tt.status || math.IsNaN(got) != math.IsNaN(tt.computed) || math.Abs(got-tt.computed) > 1e-9 {
			t.Errorf("claim %d: %v, computed %g; want %v, %g (%s)", i+1, v.Status, got, tt.status, tt.computed, v.Reason)
		}
	}
	if len(vs) != 3 {
		t.Errorf("%d verdicts, want 3", len(vs))
	}
}

func TestNoClaims(t *testing.T) {
	fsys := baseFS()
	fsys["content/flat.md"].Data = []byte("---\ntitle: Flat\nmaker: M (invented)\nspectra: [{file: flat/solar.csv}]\n---\n")
	ms, err := All(load(t, fsys), Options{})
	if err != nil {
		t.Fatal(err)
	}
	// An empty list, not nil: it is written as [] in JSON.
	if vs := ms[0].Verdicts; vs == nil || len(vs) != 0 {
		t.Errorf("no claims: %#v", vs)
	}
}

// manyFS is a library of n materials that differ in their spectra and
// claims, so that a mix-up shows.
func manyFS(n int) fstest.MapFS {
	fsys := fstest.MapFS{"skysheet.yaml": {Data: []byte("title: Many\n")}}
	for i := range n {
		r := 0.5 + float64(i)/(2*float64(n))
		fsys[fmt.Sprintf("content/m%03d.md", i)] = &fstest.MapFile{Data: fmt.Appendf(nil, `---
title: Panel %d (invented)
maker: Test maker (invented)
spectra: [{file: m%03d/uv.csv}, {file: m%03d/ir.csv}]
claims:
  - {figure: solar_reflectance, value: 0.7}
  - {figure: cooling_power_night_w_m2, value: 90}
  - {figure: sri_medium, value: 50, basis: {solar_band_nm: [280, 4000]}}
---
`, i, i, i)}
		fsys[fmt.Sprintf("content/m%03d/uv.csv", i)] = &fstest.MapFile{Data: fmt.Appendf(nil, "wavelength_nm,R\n280,%g\n2500,%g\n", r, r)}
		fsys[fmt.Sprintf("content/m%03d/ir.csv", i)] = &fstest.MapFile{Data: fmt.Appendf(nil, "wavelength_um,R\n2.6,%g\n25,%g\n", 1-r, 1-r)}
	}
	return fsys
}

// TestOrder checks that the summaries come in library order, equal to
// evaluating one material at a time, whatever the number of workers and
// the order in which they finish.
func TestOrder(t *testing.T) {
	lib := load(t, manyFS(9))
	one, err := Library(lib, Options{Workers: 1}, nil)
	if err != nil {
		t.Fatal(err)
	}
	want, _ := json.Marshal(one)
	for _, workers := range []int{2, 5, 64} {
		var done atomic.Int32
		progress := 0
		got, err := Library(lib, Options{Workers: workers, Progress: func(d, total int) {
			if d != progress+1 || total != 9 {
				t.Errorf("progress %d/%d after %d", d, total, progress)
			}
			progress = d
		}}, func(m *Material) error {
			done.Add(1)
			return nil
		})
		if err != nil {
			t.Fatal(err)
		}
		if data, _ := json.Marshal(got); !bytes.Equal(data, want) {
			t.Errorf("%d workers: summaries differ from one worker's", workers)
		}
		for i, s := range got {
			if s.Material != lib.Materials[i] {
				t.Errorf("%d workers: summary %d is %s", workers, i, s.Path)
			}
		}
		if done.Load() != 9 || progress != 9 {
			t.Errorf("%d workers: %d callbacks, progress %d", workers, done.Load(), progress)
		}
	}
}

// TestErrors checks that a material whose spectra cannot be read is
// reported at the front-matter entry naming the file, that the others are
// still evaluated, and that a callback's error is the material's.
func TestErrors(t *testing.T) {
	fsys := manyFS(4)
	fsys["content/m001/ir.csv"].Data = []byte("wavelength_um,R\n2.6,0.1\n3,x\n")
	fsys["content/m003/uv.csv"].Data = []byte("wavelength_nm,T\n280,0.1\n")
	lib := load(t, fsys)
	sums, err := Library(lib, Options{Workers: 3}, func(m *Material) error {
		if m.Slug == "m002" {
			return &library.Error{File: m.Path, Err: errors.New("page failed")}
		}
		return nil
	})
	var es library.Errors
	if !errors.As(err, &es) || len(es) != 3 {
		t.Fatalf("errors %v, want 3", err)
	}
	for i, want := range []struct {
		file         string
		line, col    int
		spectrumLine int // line of the spectrum file's ParseError; 0: none
	}{
		// spectra: [{file: m001/uv.csv}, {file: m001/ir.csv}] on line 4.
		{"content/m001.md", 4, 39, 3},
		{"content/m002.md", 0, 0, 0},
		{"content/m003.md", 4, 18, 2},
	} {
		var le *library.Error
		var pe *spectra.ParseError
		if !errors.As(es[i], &le) || le.File != want.file || le.Line != want.line || le.Column != want.col ||
			want.spectrumLine != 0 && (!errors.As(es[i], &pe) || pe.Line != want.spectrumLine) {
			t.Errorf("error %d: %v, want %s:%d:%d", i, es[i], want.file, want.line, want.col)
		}
	}
	if len(sums) != 1 || sums[0].Slug != "m000" {
		t.Errorf("summaries %v, want m000 only", sums)
	}
}

// TestSample checks the evaluation of one sample outside a library.
func TestSample(t *testing.T) {
	s, err := spectra.Parse(strings.NewReader(flatSolar), "solar.csv")
	if err != nil {
		t.Fatal(err)
	}
	m, err := Sample(s, datasheet.DefaultConditions())
	if err != nil {
		t.Fatal(err)
	}
	if math.Abs(float64(m.Figures.SolarReflectance)-0.9) > 1e-12 || m.Verdicts == nil || m.Material != nil {
		t.Errorf("sample: %+v", m.Summary)
	}
	c := datasheet.DefaultConditions()
	c.TemperatureK = -1
	if _, err := Sample(s, c); err == nil {
		t.Error("bad conditions accepted")
	}
}

// BenchmarkDemo reads and evaluates the demo library at the repository
// root: what "skysheet review" does before writing its report.
func BenchmarkDemo(b *testing.B) {
	fsys := os.DirFS("../..")
	for b.Loop() {
		lib, err := library.Load(fsys)
		if err != nil {
			b.Fatal(err)
		}
		if _, err := Library(lib, Options{}, nil); err != nil {
			b.Fatal(err)
		}
	}
}

// TestWarnings checks that a splice whose mismatch exceeds its tolerance
// is a warning of the material, and that review shows it.
func TestWarnings(t *testing.T) {
	fsys := baseFS()
	// R = 0.9 to 2600 nm, then R = 0.5 from 2400 nm: a mean mismatch of
	// 0.4 in the overlap, above the default 0.02.
	fsys["content/flat/thermal.csv"].Data = []byte("wavelength_nm,R\n2400,0.5\n25000,0.5\n")
	fsys["content/flat/solar.csv"].Data = []byte("wavelength_nm,R\n280,0.9\n1000,0.9\n2600,0.9\n")
	ms, err := All(load(t, fsys), Options{})
	if err != nil {
		t.Fatal(err)
	}
	if w := ms[0].Warnings; len(w) != 1 || !strings.Contains(w[0], "splice of R at 2500 nm leaves a mean mismatch of 0.4000 before correction, above 0.02") {
		t.Errorf("warnings %q", w)
	}
	if w := load(t, baseFS()); len(w.Materials) != 1 {
		t.Fatal("base library")
	}
	plain, _ := All(load(t, baseFS()), Options{})
	if len(plain[0].Warnings) != 0 {
		t.Errorf("no splice, warnings %q", plain[0].Warnings)
	}
}

// TestReaderWarnings checks that the readers' warnings about a file, here
// reflectance relative to a standard with none applied, are the material's.
func TestReaderWarnings(t *testing.T) {
	fsys := baseFS()
	fsys["content/flat/solar.csv"].Data = append([]byte("# sampling procedure: relative to reference standard RS-0\n"), fsys["content/flat/solar.csv"].Data...)
	ms, err := All(load(t, fsys), Options{})
	if err != nil {
		t.Fatal(err)
	}
	if w := ms[0].Warnings; len(w) != 1 || !strings.Contains(w[0], "content/flat/solar.csv: its sampling procedure says \"relative to reference standard\"") {
		t.Errorf("warnings %q", w)
	}
}

// TestEmittanceFrontMatter checks that a material's front matter states
// the emittance basis of files that state none, that a file's own
// statement wins, and that a bad basis is a content error naming the file.
func TestEmittanceFrontMatter(t *testing.T) {
	for _, tt := range []struct {
		name, measured, thermal string
		want                    spectra.EmittanceBasis
		from                    string
	}{
		{"default", "{angle: 8°}", flatThermal, spectra.EmittanceNearNormal, "default for FTIR data"},
		{"front matter", "{angle: 8°, emittance: hemispherical}", flatThermal, spectra.EmittanceHemispherical, "stated in content/flat.md"},
		{"file wins", "{emittance: hemispherical}", "# emittance: near-normal\n" + flatThermal, spectra.EmittanceNearNormal, "stated in content/flat/thermal.csv"},
	} {
		t.Run(tt.name, func(t *testing.T) {
			fsys := baseFS()
			fsys["content/flat.md"].Data = []byte(strings.Replace(flatMaterial, "measured: {angle: 8°}", "measured: "+tt.measured, 1))
			fsys["content/flat/thermal.csv"].Data = []byte(tt.thermal)
			ms, err := All(load(t, fsys), Options{})
			if err != nil {
				t.Fatal(err)
			}
			if b := ms[0].Figures.EmittanceBasis; b.Data != tt.want || b.From != tt.from {
				t.Errorf("basis %+v, want %v %s", b, tt.want, tt.from)
			}
		})
	}
	fsys := baseFS()
	fsys["content/flat.md"].Data = []byte(strings.Replace(flatMaterial, "measured: {angle: 8°}", "measured: {emittance: sideways}", 1))
	if _, err := library.Load(fsys); err == nil || !strings.Contains(err.Error(), "content/flat.md") || !strings.Contains(err.Error(), "want near-normal or hemispherical") {
		t.Errorf("bad basis: %v", err)
	}
}

// TestPlausibilityWarnings checks that the readers' plausibility warnings
// are warnings of the material, in its figures and its summary, and stop
// nothing.
func TestPlausibilityWarnings(t *testing.T) {
	fsys := baseFS()
	fsys["content/flat/solar.csv"].Data = []byte("wavelength_nm,R (%)\n280,0.9\n2500,0.9\n")
	ms, err := All(load(t, fsys), Options{})
	if err != nil {
		t.Fatal(err)
	}
	w := ms[0].Warnings
	if len(w) != 1 || !strings.HasPrefix(w[0], "content/flat/solar.csv: column 2 (R (%))") || !strings.Contains(w[0], "fractions in a percent column?") {
		t.Errorf("warnings %q", w)
	}
	if fw := ms[0].Figures.Warnings; len(fw) != 1 || fw[0] != w[0] {
		t.Errorf("figures' warnings %q", fw)
	}
}
