package main

import (
	"bytes"
	"io"
	"math"
	"strings"
	"testing"
)

// TestLibraryUpToDate fails when the committed demo library differs from what
// the generator writes, or when a claim no longer shows what it is meant to.
func TestLibraryUpToDate(t *testing.T) {
	var out, errs bytes.Buffer
	if code := run([]string{"-check", "-root", "../.."}, &out, &errs); code != 0 {
		t.Fatalf("generate -check exited %d (run `go run ./content/generate` from the root):\n%s\n%s", code, errs.String(), out.String())
	}
}

func TestLibraryDeterministic(t *testing.T) {
	a, b := library(), library()
	if len(a) != len(b) {
		t.Fatalf("%d files, then %d", len(a), len(b))
	}
	for i := range a {
		if a[i].path != b[i].path || !bytes.Equal(a[i].data, b[i].data) {
			t.Errorf("%s differs between two runs", a[i].path)
		}
	}
}

// contractKeys are the top-level front matter keys of the content contract
// (docs/demo.md); the generator must write no other.
var contractKeys = map[string]bool{"title": true, "slug": true, "maker": true, "lab": true, "product_code": true,
	"category": true, "tags": true, "summary": true, "license": true, "spectra": true, "measured": true,
	"conditions": true, "claims": true, "compare": true, "stack": true, "reference": true, "skin": true}

func TestFrontMatterKeys(t *testing.T) {
	for _, f := range library() {
		if !strings.HasSuffix(f.path, ".md") {
			continue
		}
		text := string(f.data)
		if !strings.HasPrefix(text, "---\n") {
			t.Errorf("%s: no front matter", f.path)
			continue
		}
		front, _, ok := strings.Cut(text[4:], "\n---\n")
		if !ok {
			t.Errorf("%s: front matter not closed", f.path)
			continue
		}
		for i, line := range strings.Split(front, "\n") {
			if line == "" || line[0] == ' ' {
				continue
			}
			key, _, _ := strings.Cut(line, ":")
			if !contractKeys[key] {
				t.Errorf("%s:%d: key %q is not in the content contract", f.path, i+2, key)
			}
		}
		if !strings.Contains(text, "invented") || !strings.Contains(text, "not a measurement") {
			t.Errorf("%s: does not say the data are invented and not a measurement", f.path)
		}
	}
}

func TestYAMLString(t *testing.T) {
	cases := []struct{ in, want string }{
		{"Brindlewhite Paints (invented)", "Brindlewhite Paints (invented)"},
		{"8°", "8°"},
		{"a: b", `"a: b"`},
		{"yes", `"yes"`},
		{"0.5", `"0.5"`},
		{"2026-03-12", `"2026-03-12"`},
		{"50 % RH", `"50 % RH"`},
		{"[x]", `"[x]"`},
	}
	for _, c := range cases {
		if got := yamlString(c.in); got != c.want {
			t.Errorf("yamlString(%q) = %s, want %s", c.in, got, c.want)
		}
	}
}

func TestKubelkaMunk(t *testing.T) {
	for _, c := range []struct {
		k, s, x float64
		tol     float64
	}{
		{0, 10, 0.3, 1e-12}, {0.01, 100, 0.3, 1e-12}, {1, 5, 0.2, 1e-12}, {50, 20, 0.1, 1e-12}, {0.5, 300, 0.4, 1e-12},
	} {
		r, tr := kmSlab(c.k, c.s, c.x)
		if c.k == 0 {
			// Kubelka–Munk closed form for a non-absorbing layer:
			// R = SX/(1+SX), T = 1/(1+SX), so R + T = 1.
			sx := c.s * c.x
			if math.Abs(r-sx/(1+sx)) > c.tol || math.Abs(tr-1/(1+sx)) > c.tol {
				t.Errorf("k=0 s=%g x=%g: R=%g T=%g, want %g %g", c.s, c.x, r, tr, sx/(1+sx), 1/(1+sx))
			}
			continue
		}
		// Kubelka's hyperbolic form, R = 1 / (a + b coth(bSX)), an
		// independent algebraic form of the same solution.
		a := 1 + c.k/c.s
		b := math.Sqrt(a*a - 1)
		want := 1 / (a + b/math.Tanh(b*c.s*c.x))
		if math.Abs(r-want) > c.tol {
			t.Errorf("k=%g s=%g x=%g: R=%.15g, want %.15g", c.k, c.s, c.x, r, want)
		}
		if r+tr >= 1 {
			t.Errorf("k=%g s=%g x=%g: R+T=%g, an absorbing layer must lose light", c.k, c.s, c.x, r+tr)
		}
	}
	// Thick layer: R tends to R∞, and R∞ satisfies the Kubelka–Munk
	// remission function (1−R∞)²/(2R∞) = K/S.
	for _, q := range []float64{1e-4, 0.01, 0.3, 5} {
		rinf := kmInfinite(q, 1)
		if got := (1 - rinf) * (1 - rinf) / (2 * rinf); math.Abs(got-q) > 1e-9*math.Max(1, q) {
			t.Errorf("K/S=%g: remission function of R∞=%g is %g", q, rinf, got)
		}
		if r, _ := kmSlab(q, 1, 1e4); math.Abs(r-rinf) > 1e-12 {
			t.Errorf("K/S=%g: thick layer R=%g, want R∞=%g", q, r, rinf)
		}
	}
}

func TestSurfacesAndSlabs(t *testing.T) {
	// Normal-incidence Fresnel reflectance of glass n = 1.5:
	// ((1.5−1)/(1.5+1))² = 0.04 (closed form).
	if got := fresnel(1.5); math.Abs(got-0.04) > 1e-15 {
		t.Errorf("fresnel(1.5) = %g, want 0.04", got)
	}
	// A non-absorbing incoherent slab: T = (1−r)/(1+r), R = 2r/(1+r)
	// (closed form of the geometric series of internal reflections).
	for _, r := range []float64{0.04, 0.2, 0.5} {
		rs, ts := incoherentSlab(r, 1)
		if math.Abs(ts-(1-r)/(1+r)) > 1e-14 || math.Abs(rs-2*r/(1+r)) > 1e-14 {
			t.Errorf("r=%g: R=%g T=%g, want %g %g", r, rs, ts, 2*r/(1+r), (1-r)/(1+r))
		}
	}
	// Saunderson with no surface reflection changes nothing.
	if r, tr := saunderson(0.7, 0.2, 0, 0); r != 0.7 || tr != 0.2 {
		t.Errorf("saunderson without surfaces: %g %g", r, tr)
	}
	// A layer on a perfect mirror with no absorption reflects everything.
	if got := onBacking(0.3, 0.7, 1); math.Abs(got-1) > 1e-15 {
		t.Errorf("lossless layer on a perfect mirror: R=%g", got)
	}
}

// TestModelsPhysical checks every model stays physical over the whole range.
func TestModelsPhysical(t *testing.T) {
	for _, m := range materials() {
		for nm := 250.0; nm <= 25000; nm += 1 {
			p := m.model(nm)
			if !(p.R >= 0 && p.T >= 0 && p.R+p.T <= 1) {
				t.Fatalf("%s at %g nm: R=%g T=%g", m.path, nm, p.R, p.T)
			}
		}
	}
}

func TestRunRefusesNonRoot(t *testing.T) {
	if code := run([]string{"-root", t.TempDir()}, io.Discard, io.Discard); code != 2 {
		t.Errorf("exit %d for a folder without go.mod, want 2", code)
	}
}
