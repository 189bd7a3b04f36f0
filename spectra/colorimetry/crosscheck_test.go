package colorimetry

import (
	"bytes"
	"encoding/json"
	"math"
	"math/rand/v2"
	"os"
	"os/exec"
	"path/filepath"
	"testing"

	"skysheet/spectra"
)

// crossSpectra are the test inputs of TestCrossCheck: smooth reflectance
// and transmittance shapes on various grids (generated here; the oracle is
// the library, not these shapes).
func crossSpectra() []struct {
	name string
	s    spectra.Series
} {
	logistic := func(lo, hi, mid, width float64) func(float64) float64 {
		return func(nm float64) float64 { return lo + (hi-lo)/(1+math.Exp(-(nm-mid)/width)) }
	}
	gauss := func(base, peak, mid, width float64) func(float64) float64 {
		return func(nm float64) float64 { return base + peak*math.Exp(-math.Pow((nm-mid)/width, 2)) }
	}
	type named = struct {
		name string
		s    spectra.Series
	}
	out := []named{
		{"saturated red", sampled(250, 2500, 1, logistic(0.04, 0.9, 600, 8))},
		{"out-of-gamut green", sampled(300, 1100, 0.5, gauss(0.01, 0.85, 520, 12))},
		{"narrow blue", sampled(280, 900, 2, gauss(0.02, 0.8, 450, 10))},
		{"terracotta-like", sampled(300, 2500, 5, logistic(0.08, 0.55, 585, 25))},
		{"yellow", sampled(350, 800, 1, logistic(0.05, 0.85, 500, 12))},
		{"slate-like", sampled(300, 2500, 1, func(nm float64) float64 { return 0.10 + 0.02*math.Sin(nm/40) + 0.3/(1+math.Exp(-(nm-720)/30)) })},
		{"blue glass transmittance", sampled(300, 2500, 2, gauss(0.05, 0.7, 470, 60))},
		{"fluorescent-looking, above 1", sampled(380, 780, 1, gauss(0.85, 0.3, 560, 40))},
		{"near black, linear part of L*", sampled(250, 2500, 10, constant(0.004))},
		{"irregular grid", irregular(logistic(0.2, 0.7, 650, 40))},
	}
	for _, rho := range []float64{0.02, 0.05, 0.1, 0.2, 0.35, 0.5, 0.65, 0.8, 0.95, 1} {
		out = append(out, named{"grey " + fmtNM(rho), sampled(250, 2500, 1, constant(rho))})
	}
	return out
}

// irregular samples f at 1.7–3.1 nm steps from 300 to 900 nm.
func irregular(f func(float64) float64) spectra.Series {
	var p spectra.Piece
	r := rand.New(rand.NewPCG(3, 4))
	for nm := 300.0; nm < 900; nm += 1.7 + 1.4*r.Float64() {
		p.NM = append(p.NM, nm)
		p.V = append(p.V, f(nm))
	}
	return spectra.Series{Pieces: []spectra.Piece{p}}
}

// TestCrossCheck converts the colour of several spectra (saturated red,
// out-of-gamut green, a grey ramp and others) from XYZ to L*a*b*,
// chromaticity and sRGB, and the colour differences of random L*a*b* pairs,
// with the general-purpose colour library "colorjs.io" from the npm
// registry (through testdata/color/crosscheck/convert.mjs), and compares.
//
// The library's D65 white is sRGB's (x = 0.3127, y = 0.3290), not the
// white of the embedded tables; the script hands it X/Xn·Xw, Y/Yn, Z/Zn·Zw,
// which gives exactly L*a*b* relative to our white, and is the same
// white-scaled XYZ that [XYZ.SRGB] converts. So every value should agree to
// rounding. It needs node and the library installed (npm ci --prefix
// testdata/color/crosscheck); without them it is skipped, unless CI is set.
func TestCrossCheck(t *testing.T) {
	dir := filepath.Join("..", "..", "testdata", "color", "crosscheck")
	node, err := exec.LookPath("node")
	if err == nil {
		_, err = os.Stat(filepath.Join(dir, "node_modules", "colorjs.io", "package.json"))
	}
	if err != nil {
		if os.Getenv("CI") != "" {
			t.Fatalf("cross-check unavailable in CI: %v (run npm ci --prefix testdata/color/crosscheck)", err)
		}
		t.Skipf("cross-check unavailable: %v (run npm ci --prefix testdata/color/crosscheck)", err)
	}

	type color struct {
		Name  string     `json:"name"`
		XYZ   [3]float64 `json:"xyz"`
		White [3]float64 `json:"white"`
	}
	var in struct {
		Colors []color         `json:"colors"`
		Pairs  [][2][3]float64 `json:"pairs"`
	}
	w := White()
	var ours []XYZ
	for _, sp := range crossSpectra() {
		c, err := Tristimulus(sp.s)
		if err != nil {
			t.Fatalf("%s: %v", sp.name, err)
		}
		ours = append(ours, c)
		in.Colors = append(in.Colors, color{sp.name, [3]float64{c.X, c.Y, c.Z}, [3]float64{w.X, w.Y, w.Z}})
	}
	// Random pairs: some far apart, some close (where CIEDE2000 is meant to
	// be used), some neutral (zero chroma, where hue is undefined).
	r := rand.New(rand.NewPCG(1, 2))
	lab := func() [3]float64 { return [3]float64{100 * r.Float64(), 256*r.Float64() - 128, 256*r.Float64() - 128} }
	for i := range 600 {
		a := lab()
		var b [3]float64
		switch i % 3 {
		case 0:
			b = lab()
		case 1:
			b = [3]float64{a[0] + 4*r.NormFloat64(), a[1] + 4*r.NormFloat64(), a[2] + 4*r.NormFloat64()}
		default:
			a[1], a[2] = 0, 0
			b = [3]float64{a[0] + 10*r.NormFloat64(), 3 * r.NormFloat64(), 3 * r.NormFloat64()}
		}
		in.Pairs = append(in.Pairs, [2][3]float64{a, b})
	}
	input, err := json.Marshal(in)
	if err != nil {
		t.Fatal(err)
	}

	cmd := exec.Command(node, filepath.Join(dir, "convert.mjs"))
	cmd.Stdin = bytes.NewReader(input)
	var stderr bytes.Buffer
	cmd.Stderr = &stderr
	out, err := cmd.Output()
	if err != nil {
		t.Fatalf("node: %v\n%s", err, stderr.String())
	}
	var theirs struct {
		Colors []struct {
			Name    string
			Lab     [3]float64
			XY      [2]float64
			Linear  [3]float64
			SRGB    [3]float64
			Hex     string
			InGamut bool
		}
		Pairs []struct{ DE76, DE2000 float64 }
	}
	if err := json.Unmarshal(out, &theirs); err != nil {
		t.Fatal(err)
	}
	if len(theirs.Colors) != len(in.Colors) || len(theirs.Pairs) != len(in.Pairs) {
		t.Fatalf("library returned %d colours and %d pairs, want %d and %d", len(theirs.Colors), len(theirs.Pairs), len(in.Colors), len(in.Pairs))
	}

	near := func(got, want, tol float64) bool { return math.Abs(got-want) <= tol }
	var clipped, inGamut int
	for i, th := range theirs.Colors {
		t.Run(th.Name, func(t *testing.T) {
			c := ours[i]
			l := c.Lab()
			// L*a*b* to 1e-9: rounding of the white scaling and of ∛.
			for k, v := range [3]float64{l.L, l.A, l.B} {
				if !near(v, th.Lab[k], 1e-9) {
					t.Errorf("L*a*b*[%d] = %.12f, library %.12f", k, v, th.Lab[k])
				}
			}
			// Chromaticity of a plain ratio: the library's input is scaled
			// by the white ratio, so compare it with ours scaled the same.
			x, y, ok := c.Chromaticity()
			k := srgbOnce().scale
			sx, sy, _ := XYZ{c.X * k[0], c.Y * k[1], c.Z * k[2]}.Chromaticity()
			if !ok || !near(sx, th.XY[0], 1e-12) || !near(sy, th.XY[1], 1e-12) {
				t.Errorf("chromaticity of the white-scaled XYZ (%.12f, %.12f), library %v", sx, sy, th.XY)
			}
			// And ours unscaled lies within the white difference (< 1e-4).
			if !near(x, th.XY[0], 1e-4) || !near(y, th.XY[1], 1e-4) {
				t.Errorf("chromaticity (%.6f, %.6f), library %v", x, y, th.XY)
			}
			s := c.SRGB()
			for k := range 3 {
				if !near(s.Linear[k], th.Linear[k], 1e-12) {
					t.Errorf("linear %c = %.15f, library %.15f", "RGB"[k], s.Linear[k], th.Linear[k])
				}
			}
			for k, v := range [3]float64{s.R, s.G, s.B} {
				if !near(v, th.SRGB[k], 1e-12) {
					t.Errorf("encoded %c = %.15f, library %.15f", "RGB"[k], v, th.SRGB[k])
				}
			}
			if s.Hex() != th.Hex {
				t.Errorf("hex %s, library %s", s.Hex(), th.Hex)
			}
			if s.Clipped == th.InGamut {
				t.Errorf("clipped %v (%v), library in gamut %v", s.Clipped, s.Clip, th.InGamut)
			}
		})
		if th.InGamut {
			inGamut++
		} else {
			clipped++
		}
	}
	// The set must exercise both sides of the gamut check.
	if clipped < 3 || inGamut < 10 {
		t.Errorf("%d colours out of gamut and %d in, want at least 3 and 10", clipped, inGamut)
	}
	for i, th := range theirs.Pairs {
		p := in.Pairs[i]
		a, b := Lab{p[0][0], p[0][1], p[0][2]}, Lab{p[1][0], p[1][1], p[1][2]}
		if got := DeltaE76(a, b); !near(got, th.DE76, 1e-12*max(1, got)) {
			t.Errorf("ΔE*ab(%v, %v) = %.15f, library %.15f", a, b, got, th.DE76)
		}
		if got := DeltaE2000(a, b); !near(got, th.DE2000, 1e-9) {
			t.Errorf("ΔE00(%v, %v) = %.12f, library %.12f", a, b, got, th.DE2000)
		}
	}
}
