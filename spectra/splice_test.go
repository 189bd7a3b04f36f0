package spectra

import (
	"errors"
	"fmt"
	"math"
	"os"
	"path/filepath"
	"strings"
	"testing"
)

// rSpectrum writes a neutral-format spectrum with R = f(nm) from lo to hi in
// steps of step (and u_R when u > 0).
func rSpectrum(t *testing.T, name string, lo, hi, step float64, f func(nm float64) float64, u float64) *Spectrum {
	t.Helper()
	var b strings.Builder
	if u > 0 {
		fmt.Fprintf(&b, "# u_R: %g\n", u)
	}
	b.WriteString("wavelength_nm,R\n")
	for nm := lo; nm <= hi+1e-9; nm += step {
		fmt.Fprintf(&b, "%g,%.17g\n", nm, f(nm))
	}
	s, err := Parse(strings.NewReader(b.String()), name)
	if err != nil {
		t.Fatal(err)
	}
	return s
}

func line(nm float64) float64 { return 0.3 + 1e-4*(nm-1000) }

func TestSplice(t *testing.T) {
	for _, tt := range []struct {
		name       string
		b          func(nm float64) float64
		opt        SpliceOptions
		adjusted   string
		value      float64 // closed form
		mismatch   float64 // closed form: |b − a| is constant for an offset
		junction   float64
		flagged    bool
		restoreTol float64
	}{
		// c = mean(f − g) = −0.03 for g = f + 0.03 (least squares, closed form)
		{"offset adjusts the longer part", func(nm float64) float64 { return line(nm) + 0.03 }, SpliceOptions{}, "b.csv", -0.03, 0.03, 2500, true, 1e-12},
		// the first part gains +0.03
		{"offset adjusts the named part", func(nm float64) float64 { return line(nm) + 0.01 }, SpliceOptions{Adjust: "dir/a.csv", JunctionNM: 2200}, "a.csv", 0.01, 0.01, 2200, false, 1e-12},
		// k = Σfg/Σg² = 1/1.1 for g = 1.1 f (least squares, closed form)
		{"scale", func(nm float64) float64 { return 1.1 * line(nm) }, SpliceOptions{Method: SpliceScale, Tolerance: 0.1}, "b.csv", 1 / 1.1, math.NaN(), 2500, false, 1e-12},
		{"none", func(nm float64) float64 { return line(nm) + 0.005 }, SpliceOptions{Method: SpliceNone}, "b.csv", 0, 0.005, 2500, false, math.NaN()},
	} {
		t.Run(tt.name, func(t *testing.T) {
			a := rSpectrum(t, "a.csv", 1000, 3000, 10, line, 0.004)
			b := rSpectrum(t, "b.csv", 2000, 5000, 8, tt.b, 0.004)
			target := line // the fixed part's curve
			if tt.adjusted == "a.csv" {
				target = tt.b
			}
			out, rec, err := splice(b, a, tt.opt) // order does not matter
			if err != nil {
				t.Fatal(err)
			}
			if rec.Adjusted != tt.adjusted || rec.Quantity != R || rec.Method != tt.opt.Method || rec.Points < 100 {
				t.Errorf("record %+v", rec)
			}
			if math.Abs(rec.Value-tt.value) > 1e-12 || math.Abs(rec.JunctionNM-tt.junction) > 1e-9 || rec.Flagged != tt.flagged {
				t.Errorf("value %.15g junction %g flagged %v, want %.15g %g %v", rec.Value, rec.JunctionNM, rec.Flagged, tt.value, tt.junction, tt.flagged)
			}
			if !math.IsNaN(tt.mismatch) && (math.Abs(rec.MismatchMean-tt.mismatch) > 1e-12 || math.Abs(rec.MismatchMax-tt.mismatch) > 1e-12) {
				t.Errorf("mismatch %g, %g, want %g", rec.MismatchMean, rec.MismatchMax, tt.mismatch)
			}
			if rec.OverlapNM != [2]float64{2000, 3000} {
				t.Errorf("overlap %v", rec.OverlapNM)
			}
			if len(out.Segments) != 1 || len(out.Splices) != 1 || len(out.Notes) != 1 || out.Splices[0] != rec {
				t.Fatalf("%d segments, splices %v, notes %q", len(out.Segments), out.Splices, out.Notes)
			}
			if lo, hi := out.Range(); lo != 1000 || hi != 5000 {
				t.Errorf("range %g–%g", lo, hi)
			}
			g := out.Segments[0]
			for i, nm := range g.NM {
				if i > 0 && !(nm > g.NM[i-1]) {
					t.Fatalf("wavelengths not increasing at %g", nm)
				}
				if !math.IsNaN(tt.restoreTol) && math.Abs(g.Values[R][i]-target(nm)) > tt.restoreTol {
					t.Fatalf("R(%g) = %.15g, want %.15g restored", nm, g.Values[R][i], target(nm))
				}
				if nm == tt.junction && math.Abs(g.Values[R][i]-target(nm)) > 1e-12 {
					t.Errorf("junction value %g, want the fixed part's %g", g.Values[R][i], target(nm))
				}
			}
			if tt.opt.Method == SpliceScale {
				for i, nm := range g.NM {
					if want := map[bool]float64{true: 0.004 / 1.1, false: 0.004}[nm > tt.junction]; math.Abs(g.Values[UR][i]-want) > 1e-15 {
						t.Fatalf("u_R(%g) = %g, want %g scaled with R", nm, g.Values[UR][i], want)
					}
				}
			}
			if a.Segments[0].Values[R][0] != line(1000) || b.Segments[0].Values[R][0] != tt.b(2000) {
				t.Error("inputs modified")
			}
			checkRoundTrip(t, out)
		})
	}
}

// TestSpliceLeastSquares checks that the fitted offset and factor minimise
// the sum of squared differences on noisy data: moving either away from the
// fit in both directions raises the sum (the definition of least squares).
func TestSpliceLeastSquares(t *testing.T) {
	n := noise(3)
	a := rSpectrum(t, "a.csv", 1000, 3000, 10, func(nm float64) float64 { return line(nm) + 0.01*n() }, 0)
	b := rSpectrum(t, "b.csv", 2000, 5000, 7, func(nm float64) float64 { return 0.97*line(nm) + 0.02 + 0.01*n() }, 0)
	f, g := compare(a.Series(R), b.Series(R), 2000, 3000)
	for _, m := range []SpliceMethod{SpliceOffset, SpliceScale} {
		_, rec, err := splice(a, b, SpliceOptions{Method: m})
		if err != nil {
			t.Fatal(err)
		}
		sse := func(p float64) float64 {
			s := 0.0
			for i := range f {
				d := g[i] + p - f[i]
				if m == SpliceScale {
					d = p*g[i] - f[i]
				}
				s += d * d
			}
			return s
		}
		best := sse(rec.Value)
		for _, h := range []float64{-1e-4, 1e-4} {
			if sse(rec.Value+h) <= best {
				t.Errorf("%s: sum of squares %g at the fit %g, %g at %g", m, best, rec.Value, sse(rec.Value+h), rec.Value+h)
			}
		}
		if rec.ResidualMean >= rec.MismatchMean {
			t.Errorf("%s: residual %g not below mismatch %g", m, rec.ResidualMean, rec.MismatchMean)
		}
	}
}

func TestSpliceErrors(t *testing.T) {
	a := rSpectrum(t, "a.csv", 1000, 3000, 10, line, 0)
	short := mustParse(t, "a.csv", "wavelength_nm,R,T\n1000,0.3,0.1\n2000,0.4,0.1\n3000,,0.1\n")
	tOnly, err := Parse(strings.NewReader("wavelength_nm,T\n2000,0.1\n4000,0.1\n"), "t.csv")
	if err != nil {
		t.Fatal(err)
	}
	for _, tt := range []struct {
		name string
		b    *Spectrum
		opt  SpliceOptions
		err  error
	}{
		{"no overlap", rSpectrum(t, "b.csv", 3000, 4000, 10, line, 0), SpliceOptions{}, errNoOverlap},
		{"nested", rSpectrum(t, "b.csv", 1500, 2500, 10, line, 0), SpliceOptions{}, errNested},
		{"junction outside", rSpectrum(t, "b.csv", 2000, 4000, 10, line, 0), SpliceOptions{JunctionNM: 3500}, errJunction},
		{"adjust unknown", rSpectrum(t, "b.csv", 2000, 4000, 10, line, 0), SpliceOptions{Adjust: "c.csv"}, errAdjust},
		{"nothing in common", tOnly, SpliceOptions{}, errNoCommon},
		{"one point in the overlap", mustParse(t, "b.csv", "wavelength_nm,R\n2000,0.4\n4000,0.5\n"), SpliceOptions{}, errShortOverlap},
		{"negative scale", rSpectrum(t, "b.csv", 2000, 4000, 10, func(nm float64) float64 { return -0.01 }, 0), SpliceOptions{Method: SpliceScale}, errScale},
		{"bad method", rSpectrum(t, "b.csv", 2000, 4000, 10, line, 0), SpliceOptions{Method: 7}, errSpliceMethod},
	} {
		t.Run(tt.name, func(t *testing.T) {
			first := a
			if tt.err == errShortOverlap {
				first = short // R measured at 1000 and 2000 nm only
			}
			if _, _, err := splice(first, tt.b, tt.opt); !errors.Is(err, tt.err) {
				t.Errorf("err = %v, want %v", err, tt.err)
			}
		})
	}
	if err := new(SpliceMethod).UnmarshalText([]byte("shift")); !errors.Is(err, errSpliceMethod) {
		t.Errorf("UnmarshalText: %v", err)
	}
}

func TestJoin(t *testing.T) {
	uv := rSpectrum(t, "uv.csv", 300, 1000, 10, line, 0)
	nir := rSpectrum(t, "nir.csv", 900, 2500, 10, func(nm float64) float64 { return line(nm) - 0.002 }, 0)
	ir := rSpectrum(t, "ir.csv", 2500, 5000, 50, line, 0)
	far := rSpectrum(t, "far.csv", 6000, 8000, 50, line, 0)
	out, err := Join([]*Spectrum{far, ir, nir, uv}, SpliceOptions{})
	if err != nil {
		t.Fatal(err)
	}
	// uv+nir spliced at 950 nm, ir touches at 2500 nm, far leaves a gap.
	if len(out.Segments) != 2 || len(out.Splices) != 1 {
		t.Fatalf("%d segments, %d splices", len(out.Segments), len(out.Splices))
	}
	r := out.Splices[0]
	if r.Adjusted != "nir.csv" || r.JunctionNM != 950 || math.Abs(r.Value-0.002) > 1e-12 {
		t.Errorf("record %+v", r)
	}
	if lo, hi := out.Range(); lo != 300 || hi != 8000 {
		t.Errorf("range %g–%g", lo, hi)
	}
	if len(out.Sources) != 4 {
		t.Errorf("sources %v", out.Sources)
	}
	if _, err := Join([]*Spectrum{uv, nir}, SpliceOptions{JunctionNM: 2000}); !errors.Is(err, errJunction) {
		t.Errorf("junction in no overlap: %v", err)
	}
	if _, err := Join([]*Spectrum{uv, nir}, SpliceOptions{Adjust: "x.csv"}); !errors.Is(err, errAdjust) {
		t.Errorf("adjust naming no file: %v", err)
	}
	one, err := Join([]*Spectrum{uv}, SpliceOptions{})
	if err != nil || one != uv {
		t.Errorf("one part: %v", err)
	}
	out, err = Join([]*Spectrum{uv, nir}, SpliceOptions{Adjust: "uv.csv", JunctionNM: 920})
	if err != nil || out.Splices[0].Adjusted != "uv.csv" || out.Splices[0].JunctionNM != 920 {
		t.Errorf("adjust and junction: %v %+v", err, out.Splices)
	}
}

func TestSpliceRecordJSON(t *testing.T) {
	r := SpliceRecord{Quantity: T, JunctionNM: 2499.6, OverlapNM: [2]float64{2399.2, 2600}, Method: SpliceScale, Adjusted: "ftir.jdx",
		Fixed: "uvvis.jdx", Value: 0.98, MismatchMean: 0.012, MismatchMax: 0.02, ResidualMean: 0.001, ResidualMax: 0.004, Points: 90, Tolerance: 0.02}
	b, err := r.MarshalJSON()
	if err != nil {
		t.Fatal(err)
	}
	want := `{"quantity":"T","junction_nm":2499.6,"overlap_nm":[2399.2,2600],"method":"scale","adjusted":"ftir.jdx","fixed":"uvvis.jdx","offset_or_scale":0.98,"mismatch_mean":0.012,"mismatch_max":0.02,"residual_mean":0.001,"residual_max":0.004,"points":90,"tolerance":0.02,"flagged":false}`
	if string(b) != want {
		t.Errorf("JSON\n got %s\nwant %s", b, want)
	}
	back, err := decodeSpliceRecord(string(b))
	if err != nil || back != r {
		t.Errorf("read back %+v, %v", back, err)
	}
	for _, bad := range []string{`{"quantity":"u_R","method":"offset"}`, `{"quantity":"R","method":"shift"}`, `{`} {
		if _, err := decodeSpliceRecord(bad); err == nil {
			t.Errorf("%s accepted", bad)
		}
	}
}

// TestDemoInstruments runs the demo exports through the whole path: the
// invented UV-Vis-NIR (nm, DIFDUP) and FTIR (1/CM, SQZ, percent) files,
// corrected against the invented reference standard and spliced. The
// generator made the FTIR file read demoStep higher than the UV-Vis-NIR one
// and added noise of at most 0.0004 and 0.0012: the splice must find that
// step and every corrected point must lie on the generating curve within
// the noise, the step's residual and the files' 1e-5 quantisation.
func TestDemoInstruments(t *testing.T) {
	read := func(name string) *Spectrum {
		data, err := os.ReadFile(filepath.Join("..", "testdata", "jcamp", name))
		if err != nil {
			t.Fatal(err)
		}
		s, err := Decode(data, name)
		if err != nil {
			t.Fatal(err)
		}
		return s
	}
	ref := read("reference.csv")
	var parts []*Spectrum
	for _, name := range []string{"ftir.jdx", "uvvis.jdx"} {
		s, err := ApplyReference(read(name), ref)
		if err != nil {
			t.Fatal(err)
		}
		parts = append(parts, s)
	}
	out, err := Join(parts, SpliceOptions{})
	if err != nil {
		t.Fatal(err)
	}
	if len(out.Splices) != 1 {
		t.Fatalf("splices %+v", out.Splices)
	}
	r := out.Splices[0]
	step := math.Abs(r.Value + demoStep)
	if r.Adjusted != "ftir.jdx" || r.Fixed != "uvvis.jdx" || step > 0.0005 || r.Flagged || math.Abs(r.MismatchMean-demoStep) > 0.0005 {
		t.Errorf("record %+v, want an offset of −%g on ftir.jdx", r, demoStep)
	}
	if lo, hi := out.Range(); lo != 250 || math.Abs(hi-25000) > 1e-9 || len(out.Segments) != 1 {
		t.Errorf("range %g–%g in %d segments", lo, hi, len(out.Segments))
	}
	g := out.Segments[0]
	for i, nm := range g.NM {
		tol := 0.0004 + 1e-5
		if nm > r.JunctionNM {
			tol = 0.0012 + step + 1e-5
		}
		if d := math.Abs(g.Values[R][i] - demoR(nm)); d > tol {
			t.Fatalf("R(%g) = %.5f, generated from %.5f (off by %.5f > %.5f)", nm, g.Values[R][i], demoR(nm), d, tol)
		}
	}
}
