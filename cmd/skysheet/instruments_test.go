package main

import (
	"encoding/json"
	"math"
	"os"
	"path/filepath"
	"strings"
	"testing"

	"skysheet/datasheet"
	"skysheet/spectra"
)

// runCLI runs one command line and returns its exit status and output.
var demo = func(name string) string { return filepath.Join("..", "..", "testdata", "jcamp", name) }

func figuresJSON(t *testing.T, args ...string) *datasheet.Figures {
	t.Helper()
	code, out, errs := runCLI(append([]string{"figures", "--json"}, args...)...)
	if code != 0 {
		t.Fatalf("exit %d: %s", code, errs)
	}
	var f datasheet.Figures
	if err := json.Unmarshal([]byte(out), &f); err != nil {
		t.Fatalf("%v\n%s", err, out)
	}
	return &f
}

// TestFiguresFromInstrumentExports is the whole path in one command: two
// JCAMP-DX exports (one compressed in nm, one in wavenumbers) plus a
// reference-standard file give one spliced, corrected spectrum and its
// figures, the same as the library path gives.
func TestFiguresFromInstrumentExports(t *testing.T) {
	saved := filepath.Join(t.TempDir(), "w7.csv")
	f := figuresJSON(t, "--reference", demo("reference.csv"), "--save-spectrum", saved, demo("uvvis.jdx"), demo("ftir.jdx"))
	if len(f.Splices) != 1 {
		t.Fatalf("splices %+v", f.Splices)
	}
	r := f.Splices[0]
	// the demo generator made the FTIR file read 0.012 high
	if r.Method != spectra.SpliceOffset || filepath.Base(r.Adjusted) != "ftir.jdx" || math.Abs(r.Value+0.012) > 0.0005 || r.Flagged || r.Tolerance != 0.02 {
		t.Errorf("record %+v", r)
	}
	if c := float64(f.SolarCoverage); c != 1 {
		t.Errorf("solar coverage %g, want 1 (no gap at the junction)", c)
	}
	var notes int
	for _, a := range f.Assumptions {
		if strings.Contains(a, "R = R_rel × R_ref") || strings.HasPrefix(a, "Spliced ") {
			notes++
		}
	}
	if notes != 3 {
		t.Errorf("assumptions %q: want two reference notes and a splice note", f.Assumptions)
	}

	// The same through the library.
	var parts []*spectra.Spectrum
	ref, err := readSpectrumFile(demo("reference.csv"), 0)
	if err != nil {
		t.Fatal(err)
	}
	for _, n := range []string{"uvvis.jdx", "ftir.jdx"} {
		s, err := readSpectrumFile(demo(n), 0)
		if err != nil {
			t.Fatal(err)
		}
		if s, err = spectra.ApplyReference(s, ref); err != nil {
			t.Fatal(err)
		}
		parts = append(parts, s)
	}
	s, err := spectra.Join(parts, spectra.SpliceOptions{})
	if err != nil {
		t.Fatal(err)
	}
	want, err := datasheet.Compute(s, spectra.Resolve(s, spectra.DefaultClosureTol), datasheet.DefaultConditions())
	if err != nil {
		t.Fatal(err)
	}
	for _, k := range [][2]datasheet.Num{{f.SolarReflectance, want.SolarReflectance}, {f.ThermalEmittance, want.ThermalEmittance}, {f.WindowEmittance, want.WindowEmittance}} {
		if k[0] != k[1] {
			t.Errorf("CLI %v, library %v", k[0], k[1])
		}
	}

	// The saved spectrum gives the same figures and keeps the splice record.
	again := figuresJSON(t, saved)
	if again.SolarReflectance != f.SolarReflectance || again.ThermalEmittance != f.ThermalEmittance || len(again.Splices) != 1 || again.Splices[0] != r {
		t.Errorf("saved spectrum: %v %v %+v", again.SolarReflectance, again.ThermalEmittance, again.Splices)
	}
	// Correcting the saved spectrum again is refused.
	if code, _, errs := runCLI("figures", "--reference", demo("reference.csv"), saved); code != 1 || !strings.Contains(errs, "already corrected") {
		t.Errorf("second correction: exit %d, %s", code, errs)
	}
}

func TestFiguresSpliceFlags(t *testing.T) {
	ref := demo("reference.csv")
	f := figuresJSON(t, "--reference", ref, "--splice-method", "scale", "--splice-adjust", "uvvis.jdx", "--splice-junction", "2450", "--splice-tol", "0.005", demo("uvvis.jdx"), demo("ftir.jdx"))
	r := f.Splices[0]
	if r.Method != spectra.SpliceScale || filepath.Base(r.Adjusted) != "uvvis.jdx" || r.JunctionNM != 2450 || !r.Flagged || !(r.Value > 1) {
		t.Errorf("record %+v", r)
	}
	code, out, _ := runCLI("figures", "--reference", ref, "--splice-tol", "0.005", demo("uvvis.jdx"), demo("ftir.jdx"))
	if code != 0 || !strings.Contains(out, "FLAGGED") {
		t.Errorf("exit %d, table without the flag:\n%s", code, out)
	}
	for _, args := range [][]string{
		{"--splice-method", "shift"},
		{"--splice-tol", "0"},
		{"--splice-junction", "-5"},
	} {
		if code, _, _ := runCLI(append(append([]string{"figures"}, args...), demo("uvvis.jdx"))...); code != 2 {
			t.Errorf("%v: exit %d, want 2", args, code)
		}
	}
	// Bad data: a junction outside the overlap, a reference that does not
	// cover the data.
	if code, _, errs := runCLI("figures", "--splice-junction", "3000", demo("uvvis.jdx"), demo("ftir.jdx")); code != 1 || !strings.Contains(errs, "junction") {
		t.Errorf("junction outside: exit %d %s", code, errs)
	}
	short := filepath.Join(t.TempDir(), "short.csv")
	os.WriteFile(short, []byte("wavelength_nm,R\n300,0.9\n20000,0.9\n"), 0o644)
	if code, _, errs := runCLI("figures", "--reference", short, demo("uvvis.jdx")); code != 1 || !strings.Contains(errs, "250 nm") || !strings.Contains(errs, "uvvis.jdx") {
		t.Errorf("reference too short: exit %d %s", code, errs)
	}
}

// TestReferenceFromMetadata checks a reference named by a data file's
// reference_file key, relative to the data file: a constant reference of
// 0.5 halves the solar reflectance exactly, since a weighted mean is linear
// in R (closed form).
func TestReferenceFromMetadata(t *testing.T) {
	dir := t.TempDir()
	data := "# sample: invented\n# reference_file: std/half.csv\nwavelength_nm,R\n280,0.80\n700,0.90\n1500,0.86\n2500,0.70\n"
	os.MkdirAll(filepath.Join(dir, "std"), 0o755)
	os.WriteFile(filepath.Join(dir, "std", "half.csv"), []byte("# provenance: invented constant curve for tests\nwavelength_nm,R\n200,0.5\n3000,0.5\n"), 0o644)
	os.WriteFile(filepath.Join(dir, "rel.csv"), []byte(data), 0o644)
	os.WriteFile(filepath.Join(dir, "plain.csv"), []byte(strings.Replace(data, "# reference_file: std/half.csv\n", "", 1)), 0o644)
	half := figuresJSON(t, filepath.Join(dir, "rel.csv"))
	whole := figuresJSON(t, filepath.Join(dir, "plain.csv"))
	if d := float64(half.SolarReflectance) - 0.5*float64(whole.SolarReflectance); math.Abs(d) > 1e-15 {
		t.Errorf("solar reflectance %v, want half of %v", half.SolarReflectance, whole.SolarReflectance)
	}
	if got, ok := half.Figure("solar_reflectance"); !ok || got.Value != half.SolarReflectance {
		t.Errorf("figure list %v", got)
	}
	os.Remove(filepath.Join(dir, "std", "half.csv"))
	if code, _, errs := runCLI("figures", filepath.Join(dir, "rel.csv")); code != 1 || !strings.Contains(errs, "half.csv") {
		t.Errorf("missing reference: exit %d %s", code, errs)
	}
}

func TestImport(t *testing.T) {
	dir := filepath.Join(t.TempDir(), "neutral")
	code, out, errs := runCLI("import", demo("uvvis.jdx"), demo("ftir.jdx"), demo("dif-nm-absorbance.jdx"), "-o", dir)
	if code != 0 {
		t.Fatalf("exit %d: %s", code, errs)
	}
	if !strings.Contains(out, "uvvis.csv: 471 points") || !strings.Contains(out, "ftir.csv: 943 points") || !strings.Contains(out, "T = 10^(−A)") {
		t.Errorf("report:\n%s", out)
	}
	for _, n := range []string{"uvvis", "ftir"} {
		direct, err := readSpectrumFile(demo(n+".jdx"), 0)
		if err != nil {
			t.Fatal(err)
		}
		imported, err := readSpectrumFile(filepath.Join(dir, n+".csv"), 0)
		if err != nil {
			t.Fatal(err)
		}
		a, b := direct.Series(spectra.R).Pieces[0], imported.Series(spectra.R).Pieces[0]
		for i := range a.NM {
			if a.NM[i] != b.NM[i] || a.V[i] != b.V[i] {
				t.Fatalf("%s point %d: (%g, %g), imported (%g, %g)", n, i, a.NM[i], a.V[i], b.NM[i], b.V[i])
			}
		}
		if v, _ := imported.Get("instrument"); !strings.Contains(v, "invented") {
			t.Errorf("%s: instrument %q not carried", n, v)
		}
	}
	abs, err := readSpectrumFile(filepath.Join(dir, "dif-nm-absorbance.csv"), 0)
	if err != nil || len(abs.Notes) != 1 {
		t.Errorf("absorbance note lost: %v %q", err, abs.Notes)
	}
	// Figures of the imported files equal those of the exports.
	f1 := figuresJSON(t, "--reference", demo("reference.csv"), demo("uvvis.jdx"), demo("ftir.jdx"))
	f2 := figuresJSON(t, "--reference", demo("reference.csv"), filepath.Join(dir, "uvvis.csv"), filepath.Join(dir, "ftir.csv"))
	if f1.SolarReflectance != f2.SolarReflectance || f1.ThermalEmittance != f2.ThermalEmittance {
		t.Errorf("figures differ after import: %v %v, %v %v", f1.SolarReflectance, f1.ThermalEmittance, f2.SolarReflectance, f2.ThermalEmittance)
	}

	// A relative reference_file still names the same file after import.
	src := t.TempDir()
	os.WriteFile(filepath.Join(src, "ref.csv"), []byte("wavelength_nm,R\n200,0.5\n3000,0.5\n"), 0o644)
	os.WriteFile(filepath.Join(src, "s.jdx"), []byte("##TITLE=s\n##JCAMP-DX=4.24\n##$REFERENCE FILE=ref.csv\n##XUNITS=NANOMETERS\n##YUNITS=REFLECTANCE\n##XYPOINTS=(XY..XY)\n400, 0.8\n800, 0.9\n##END=\n"), 0o644)
	if code, _, errs := runCLI("import", "-o", dir, filepath.Join(src, "s.jdx")); code != 0 {
		t.Fatalf("exit %d %s", code, errs)
	}
	fromJDX := figuresJSON(t, "--solar-band", "400,800", filepath.Join(src, "s.jdx"))
	// The rewritten path leads out of the imported file's folder: it is
	// read only when given on the command line too (see TestReferenceConfined).
	fromCSV := figuresJSON(t, "--solar-band", "400,800", "--reference", filepath.Join(src, "ref.csv"), filepath.Join(dir, "s.csv"))
	if fromJDX.SolarReflectance != fromCSV.SolarReflectance || float64(fromJDX.SolarReflectance) > 0.5 {
		t.Errorf("reference lost in import: %v vs %v", fromJDX.SolarReflectance, fromCSV.SolarReflectance)
	}

	for _, args := range [][]string{
		{"import", demo("uvvis.jdx")},
		{"import", "-o", dir},
		{"import", "-o", dir, demo("uvvis.jdx"), filepath.Join("x", "uvvis.dx")},
	} {
		if code, _, _ := runCLI(args...); code != 2 {
			t.Errorf("%v: exit %d, want 2", args, code)
		}
	}
	bad := filepath.Join(t.TempDir(), "bad.jdx")
	os.WriteFile(bad, []byte("##TITLE=b\n##JCAMP-DX=4.24\n##XUNITS=NANOMETERS\n##YUNITS=REFLECTANCE\n##FIRSTX=400\n##LASTX=500\n##NPOINTS=3\n##XYDATA=(X++(Y..Y))\n400 0.5 0.6\n##END=\n"), 0o644)
	if code, _, errs := runCLI("import", "-o", dir, bad); code != 1 || !strings.Contains(errs, "bad.jdx:9") {
		t.Errorf("bad file: exit %d %s", code, errs)
	}
}

func TestSpliceCommand(t *testing.T) {
	out := filepath.Join(t.TempDir(), "w7.csv")
	code, report, errs := runCLI("splice", "--reference", demo("reference.csv"), demo("ftir.jdx"), demo("uvvis.jdx"), "-o", out)
	if code != 0 {
		t.Fatalf("exit %d: %s", code, errs)
	}
	if !strings.Contains(report, "offset -0.01") || !strings.Contains(report, "ftir.jdx") {
		t.Errorf("report:\n%s", report)
	}
	s, err := readSpectrumFile(out, 0)
	if err != nil {
		t.Fatal(err)
	}
	if len(s.Splices) != 1 || len(s.Notes) != 3 || len(s.Segments) != 1 {
		t.Errorf("written spectrum: %d splices, %d notes, %d segments", len(s.Splices), len(s.Notes), len(s.Segments))
	}
	if v, _ := s.Get("reference_applied"); !strings.HasSuffix(v, "reference.csv") {
		t.Errorf("reference_applied = %q", v)
	}
	code, stdout, _ := runCLI("splice", "--method", "none", demo("uvvis.jdx"), demo("ftir.jdx"), "-o", "-")
	if code != 0 || !strings.HasPrefix(stdout, "# title: invented white coating") {
		t.Errorf("to stdout: exit %d\n%.200s", code, stdout)
	}
	for _, args := range [][]string{
		{"splice", demo("uvvis.jdx"), "-o", out},
		{"splice", demo("uvvis.jdx"), demo("ftir.jdx")},
		{"splice", "--method", "glue", demo("uvvis.jdx"), demo("ftir.jdx"), "-o", out},
	} {
		if code, _, _ := runCLI(args...); code != 2 {
			t.Errorf("%v: exit %d, want 2", args, code)
		}
	}
	if code, _, errs := runCLI("splice", "--adjust", "other.jdx", demo("uvvis.jdx"), demo("ftir.jdx"), "-o", out); code != 1 || !strings.Contains(errs, "other.jdx") {
		t.Errorf("adjust naming no file: exit %d %s", code, errs)
	}
}

// TestRelativeWithoutReference checks that files measured relative to a
// reference standard warn when used or imported without one, and do not
// when the standard is given.
func TestRelativeWithoutReference(t *testing.T) {
	files := []string{demo("uvvis.jdx"), demo("ftir.jdx")}
	const warning = `its sampling procedure says "relative to reference standard" but no reference standard is applied`
	code, out, errs := runCLI(append([]string{"figures", "--json"}, files...)...)
	if code != 0 {
		t.Fatalf("exit %d: %s", code, errs)
	}
	for _, f := range files {
		if !strings.Contains(errs, "warning: "+f+": "+warning) {
			t.Errorf("no warning for %s in\n%s", f, errs)
		}
	}
	if !strings.Contains(out, `"solar_reflectance": 0.902`) {
		t.Errorf("relative R: want solar reflectance 0.902… (what the warning is about) in\n%s", out)
	}
	code, _, errs = runCLI(append([]string{"figures", "--reference", demo("reference.csv")}, files...)...)
	if code != 0 || strings.Contains(errs, warning) {
		t.Errorf("with --reference: exit %d, stderr %s", code, errs)
	}
	code, _, errs = runCLI("import", files[0], "-o", t.TempDir())
	if code != 0 || !strings.Contains(errs, "skysheet import: warning: "+files[0]+": "+warning) {
		t.Errorf("import: exit %d, stderr %s", code, errs)
	}
}
