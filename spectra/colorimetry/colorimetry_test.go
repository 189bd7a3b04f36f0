package colorimetry

import (
	"errors"
	"math"
	"strings"
	"testing"

	"skysheet/spectra"
)

// sampled returns f sampled every step nm from lo to hi as one piece.
func sampled(lo, hi, step float64, f func(nm float64) float64) spectra.Series {
	var p spectra.Piece
	n := int(math.Round((hi - lo) / step))
	for i := 0; i <= n; i++ {
		nm := lo + float64(i)*step
		p.NM = append(p.NM, nm)
		p.V = append(p.V, f(nm))
	}
	return spectra.Series{Pieces: []spectra.Piece{p}}
}

func constant(v float64) func(float64) float64 { return func(float64) float64 { return v } }

func pieces(ps ...spectra.Piece) spectra.Series { return spectra.Series{Pieces: ps} }

func TestTables(t *testing.T) {
	c := tables()
	peak, at := 0.0, 0
	for i, y := range c.ybar {
		if y > peak {
			peak, at = y, visLo+i
		}
	}
	// CIE 015: ȳ(λ) = V(λ), the photopic luminous efficiency, 1 at 555 nm.
	if peak != 1 || at != 555 {
		t.Errorf("ȳ peaks at %g at %d nm, want 1 at 555 nm", peak, at)
	}
	// CIE S 014-2 / ISO 11664-2: D65 relative spectral power is 100 at 560 nm.
	if d := c.d65[560-visLo]; d != 100 {
		t.Errorf("D65 at 560 nm = %g, want 100", d)
	}
}

func TestWhite(t *testing.T) {
	w := White()
	for _, tt := range []struct {
		name      string
		got, want float64
		tol       float64
	}{
		// Y = 100 for the white by the definition of k (ASTM E308).
		{"Y", w.Y, 100, 1e-12},
		// CIE 015:2004 D65, 2° observer: X = 95.047, Z = 108.883, from 1 nm
		// data over 360–830 nm (from memory; the same triple is carried by
		// Debian's python3-colorspacious 1.1.2, colorspacious/illuminants.py,
		// and python3-colormath 3.0.0, colormath/color_constants.py). The
		// embedded tables stop at 380 and 780 nm: the 360–379 nm tail, where
		// D65 ≈ 46–50 and z̄ falls from 0.0065 to about 0.0006 (from memory),
		// holds about 0.02–0.03 of Z, and much less of X, so the tolerances
		// are 0.03 for Z and 0.01 for X.
		{"X", w.X, 95.047, 0.01},
		{"Z", w.Z, 108.883, 0.03},
	} {
		if math.Abs(tt.got-tt.want) > tt.tol {
			t.Errorf("white %s = %.6f, want %.3f ± %g", tt.name, tt.got, tt.want, tt.tol)
		}
	}
	// CIE 015:2004 D65 chromaticity, 2°: x = 0.31271, y = 0.32902 (from memory;
	// IEC 61966-2-1 rounds it to 0.3127, 0.3290).
	x, y, ok := w.Chromaticity()
	if !ok || math.Abs(x-0.31271) > 1e-4 || math.Abs(y-0.32902) > 1e-4 {
		t.Errorf("white chromaticity (%.5f, %.5f), want (0.31271, 0.32902) ± 1e-4", x, y)
	}
}

func TestClosedForms(t *testing.T) {
	// L* of a constant reflector ρ: Y/Yn = ρ, so L* = 116∛ρ − 16 above
	// (6/29)³ and (29/3)³·ρ below, with a* = b* = 0 (CIE 015:2004 §8.2.1).
	lstar := func(rho float64) float64 {
		if rho > 216.0/24389 {
			return 116*math.Cbrt(rho) - 16
		}
		return 24389.0 / 27 * rho
	}
	for _, tt := range []struct {
		name string
		s    spectra.Series
		rho  float64 // the constant value, so L* = lstar(rho), Y = 100 rho
		tol  float64
	}{
		{"perfect reflector", sampled(380, 780, 1, constant(1)), 1, 1e-12},
		{"perfect absorber", sampled(380, 780, 1, constant(0)), 0, 1e-12},
		{"constant 0.5", sampled(380, 780, 1, constant(0.5)), 0.5, 1e-12},
		{"constant 0.5, two points 250–2500 nm", sampled(250, 2500, 2250, constant(0.5)), 0.5, 1e-12},
		{"constant 0.2, 0.37 nm steps", sampled(300, 900, 0.37, constant(0.2)), 0.2, 1e-12},
		{"constant 0.005, linear part of L*", sampled(380, 780, 5, constant(0.005)), 0.005, 1e-12},
		{"constant 0.5 from 380.0005 nm (held)", sampled(380.0005, 779.9995, 399.999, constant(0.5)), 0.5, 1e-12},
	} {
		t.Run(tt.name, func(t *testing.T) {
			c, err := Tristimulus(tt.s)
			if err != nil {
				t.Fatal(err)
			}
			lab := c.Lab()
			if math.Abs(lab.L-lstar(tt.rho)) > tt.tol || math.Abs(lab.A) > tt.tol || math.Abs(lab.B) > tt.tol {
				t.Errorf("L*a*b* = %v, want (%.12f, 0, 0)", lab, lstar(tt.rho))
			}
			if math.Abs(c.Luminous()-tt.rho) > tt.tol {
				t.Errorf("luminous = %.15f, want %g", c.Luminous(), tt.rho)
			}
			x, y, ok := c.Chromaticity()
			wx, wy, _ := White().Chromaticity()
			if tt.rho > 0 && (!ok || math.Abs(x-wx) > 1e-12 || math.Abs(y-wy) > 1e-12) {
				t.Errorf("chromaticity (%g, %g, %v), want the white's (%g, %g)", x, y, ok, wx, wy)
			}
			if tt.rho == 0 && ok {
				t.Errorf("black has chromaticity (%g, %g)", x, y)
			}
		})
	}
	// The perfect reflector exactly: its sums are the white's, term by term.
	c, _ := Tristimulus(sampled(380, 780, 1, constant(1)))
	if lab := c.Lab(); lab != (Lab{100, 0, 0}) {
		t.Errorf("perfect reflector L*a*b* = %v, want exactly (100, 0, 0)", lab)
	}
	if c, _ := Tristimulus(sampled(380, 780, 1, constant(0))); c.Lab() != (Lab{}) {
		t.Errorf("perfect absorber L*a*b* = %v, want exactly (0, 0, 0)", c.Lab())
	}
}

// TestLinearData checks the interpolation: data linear in λ give the same
// colour from two points as from 1 nm steps (linear interpolation is exact
// for a linear function).
func TestLinearData(t *testing.T) {
	f := func(nm float64) float64 { return 0.1 + 0.8*(nm-300)/600 }
	want, err := Tristimulus(sampled(380, 780, 1, f))
	if err != nil {
		t.Fatal(err)
	}
	for _, s := range []spectra.Series{
		sampled(300, 900, 600, f),
		sampled(300, 900, 7, f),
		sampled(379.5, 780.5, 0.5, f),
	} {
		got, err := Tristimulus(s)
		if err != nil {
			t.Fatal(err)
		}
		if math.Abs(got.X-want.X) > 1e-10 || math.Abs(got.Y-want.Y) > 1e-10 || math.Abs(got.Z-want.Z) > 1e-10 {
			t.Errorf("%d points: %v, want %v", len(s.Pieces[0].NM), got, want)
		}
	}
}

func TestCoverage(t *testing.T) {
	half := constant(0.5)
	piece := func(lo, hi float64) spectra.Piece { return sampled(lo, hi, (hi-lo)/10, half).Pieces[0] }
	for _, tt := range []struct {
		name    string
		s       spectra.Series
		err     error
		missing string // part of the message naming what is missing
	}{
		{"exactly 380–780 nm", pieces(piece(380, 780)), nil, ""},
		{"beyond both ends", pieces(piece(250, 2500)), nil, ""},
		{"several pieces, one covers", pieces(piece(200, 300), piece(350, 800), piece(900, 2500)), nil, ""},
		{"starts 0.0005 nm inside", pieces(piece(380.0005, 780)), nil, ""},
		{"ends 0.001 nm inside", pieces(piece(380, 779.999)), nil, ""},
		{"empty", spectra.Series{}, ErrNotCovered, "no data at 380–780 nm"},
		{"starts at 400 nm", pieces(piece(400, 2500)), ErrNotCovered, "no data at 380–400 nm"},
		{"starts 0.002 nm inside", pieces(piece(380.002, 2500)), ErrNotCovered, "no data at 380–380.002 nm"},
		{"ends at 700 nm", pieces(piece(250, 700)), ErrNotCovered, "no data at 700–780 nm"},
		{"gap", pieces(piece(250, 500), piece(510, 2500)), ErrNotCovered, "no data at 500–510 nm"},
		{"gap and short", pieces(piece(390, 500), piece(510, 700)), ErrNotCovered, "no data at 380–390 nm, 500–510 nm, 700–780 nm"},
		{"infrared only", pieces(piece(2500, 25000)), ErrNotCovered, "no data at 380–780 nm"},
		{"touching pieces", pieces(piece(250, 500), piece(500, 2500)), ErrNotCovered, "split between separate pieces at 500 nm"},
		{"NaN value inside", pieces(spectra.Piece{NM: []float64{300, 500, 900}, V: []float64{0.5, math.NaN(), 0.5}}), ErrInvalid, "500 nm"},
		{"NaN value outside is not used", pieces(spectra.Piece{NM: []float64{300, 380, 780, 900}, V: []float64{math.NaN(), 0.5, 0.5, math.Inf(1)}}), nil, ""},
		{"value beyond 1e6", pieces(spectra.Piece{NM: []float64{300, 900}, V: []float64{0.5, 2e6}}), ErrInvalid, "900 nm"},
		{"not increasing", pieces(spectra.Piece{NM: []float64{300, 600, 500, 900}, V: []float64{0.5, 0.5, 0.5, 0.5}}), ErrInvalid, "point 3"},
		{"lengths differ", pieces(spectra.Piece{NM: []float64{300, 900}, V: []float64{0.5}}), ErrInvalid, "piece 1"},
		{"empty piece", pieces(spectra.Piece{}), ErrInvalid, "piece 1"},
	} {
		t.Run(tt.name, func(t *testing.T) {
			c, err := Tristimulus(tt.s)
			if !errors.Is(err, tt.err) {
				t.Fatalf("error %v, want %v", err, tt.err)
			}
			if err != nil {
				if !strings.Contains(err.Error(), tt.missing) {
					t.Errorf("error %q does not say %q", err, tt.missing)
				}
				return
			}
			// Every accepted case is a constant 0.5.
			if math.Abs(c.Luminous()-0.5) > 1e-12 {
				t.Errorf("luminous %g, want 0.5", c.Luminous())
			}
		})
	}
}

func TestSRGB(t *testing.T) {
	// The sRGB transfer function of IEC 61966-2-1 (from memory; the same
	// formula is in Debian's python3-colorspacious 1.1.2,
	// colorspacious/basics.py): 12.92·v to 0.0031308, then
	// 1.055·v^(1/2.4) − 0.055.
	enc := func(v float64) float64 {
		if v <= 0.0031308 {
			return 12.92 * v
		}
		return 1.055*math.Pow(v, 1/2.4) - 0.055
	}
	// A grey ramp: a constant reflector ρ has linear R = G = B = ρ.
	for _, rho := range []float64{0, 0.001, 0.003, 0.004, 0.01, 0.18, 0.5, 0.9, 1} {
		c, err := Tristimulus(sampled(300, 900, 2, constant(rho)))
		if err != nil {
			t.Fatal(err)
		}
		s := c.SRGB()
		for i, v := range s.Linear {
			if math.Abs(v-rho) > 1e-12 {
				t.Errorf("ρ = %g: linear %c = %.15f, want %g", rho, "RGB"[i], v, rho)
			}
		}
		for i, v := range []float64{s.R, s.G, s.B} {
			if math.Abs(v-enc(rho)) > 1e-12 {
				t.Errorf("ρ = %g: %c = %.15f, want %.15f", rho, "RGB"[i], v, enc(rho))
			}
		}
		if s.Clipped {
			t.Errorf("ρ = %g: clipped %v", rho, s.Clip)
		}
	}
	for _, tt := range []struct {
		rho     float64
		hex     string
		clipped bool
	}{
		{1, "#ffffff", false}, // sRGB white, 255·1
		{0, "#000000", false},
		// 0.5 → 1.055·0.5^(1/2.4) − 0.055 = 0.7353569…, ·255 = 187.5 → 188 = 0xbc
		{0.5, "#bcbcbc", false},
		{1.05, "#ffffff", true}, // above the white: out of gamut, clipped
	} {
		c, _ := Tristimulus(sampled(380, 780, 1, constant(tt.rho)))
		s := c.SRGB()
		if s.Hex() != tt.hex || s.Clipped != tt.clipped {
			t.Errorf("ρ = %g: %s clipped %v, want %s clipped %v", tt.rho, s.Hex(), s.Clipped, tt.hex, tt.clipped)
		}
		if tt.clipped && math.Abs(s.Clip[0]-0.05) > 1e-12 {
			t.Errorf("ρ = %g: clip %v, want 0.05 on each channel", tt.rho, s.Clip)
		}
	}
}

// TestSRGBMatrix compares the matrix derived from the sRGB chromaticities
// with the one IEC 61966-2-1:1999 prints to four decimals, as carried by
// Debian's python3-colorspacious 1.1.2 (colorspacious/basics.py, "the exact
// matrix specified in IEC 61966-2-1:1999"). The standard inverted its
// forward matrix after rounding that to four decimals and rounded again
// (from memory), so the printed inverse differs from the exact one by up to
// 4e-4 (3.2406 against 3.24097).
func TestSRGBMatrix(t *testing.T) {
	iec := [3][3]float64{
		{3.2406, -1.5372, -0.4986},
		{-0.9689, 1.8758, 0.0415},
		{0.0557, -0.2040, 1.0570},
	}
	m, white := srgbMatrix()
	for i := range 3 {
		for j := range 3 {
			if math.Abs(m[i][j]-iec[i][j]) > 4e-4 {
				t.Errorf("M[%d][%d] = %.7f, IEC 61966-2-1 %.4f", i, j, m[i][j], iec[i][j])
			}
		}
	}
	// The white maps to R = G = B = 1 (the definition of the matrix).
	for i, row := range m {
		if v := row[0]*white[0] + row[1]*white[1] + row[2]*white[2]; math.Abs(v-1) > 1e-14 {
			t.Errorf("white → %c = %.17f, want 1", "RGB"[i], v)
		}
	}
}

func TestDeltaE76(t *testing.T) {
	for _, tt := range []struct {
		a, b Lab
		want float64
	}{
		{Lab{50, 0, 0}, Lab{50, 0, 0}, 0},
		{Lab{50, 0, 0}, Lab{50, 3, 4}, 5},       // 3-4-5 right triangle
		{Lab{10, 1, 1}, Lab{22, 1, -8}, 15},     // 12-9-15
		{Lab{0, 0, 0}, Lab{1, 2, 2}, 3},         // √(1+4+4)
		{Lab{100, 0, 0}, Lab{0, 0, 0}, 100},     // white against black
		{Lab{40, -20, 30}, Lab{42, -23, 36}, 7}, // √(4+9+36)
	} {
		if got := DeltaE76(tt.a, tt.b); math.Abs(got-tt.want) > 1e-12 {
			t.Errorf("ΔE*ab(%v, %v) = %g, want %g", tt.a, tt.b, got, tt.want)
		}
	}
}

// TestDeltaE2000 runs the 34 test pairs of G. Sharma, W. Wu and E. N. Dalal,
// "The CIEDE2000 color-difference formula: implementation notes,
// supplementary test data, and mathematical observations", Color Research &
// Application 30(1), 21–30 (2005), Table 1, as shipped in the test suite of
// the npm package delta-e 0.0.8 (tests/main.js, public domain). The paper
// gives ΔE00 to four decimals, hence the tolerance; each pair is run both
// ways (the formula is symmetric).
func TestDeltaE2000(t *testing.T) {
	for _, tt := range []struct {
		pair int
		a, b Lab
		want float64
	}{
		{1, Lab{50.0000, 2.6772, -79.7751}, Lab{50.0000, 0.0000, -82.7485}, 2.0425},
		{2, Lab{50.0000, 3.1571, -77.2803}, Lab{50.0000, 0.0000, -82.7485}, 2.8615},
		{3, Lab{50.0000, 2.8361, -74.0200}, Lab{50.0000, 0.0000, -82.7485}, 3.4412},
		{4, Lab{50.0000, -1.3802, -84.2814}, Lab{50.0000, 0.0000, -82.7485}, 1.0000},
		{5, Lab{50.0000, -1.1848, -84.8006}, Lab{50.0000, 0.0000, -82.7485}, 1.0000},
		{6, Lab{50.0000, -0.9009, -85.5211}, Lab{50.0000, 0.0000, -82.7485}, 1.0000},
		{7, Lab{50.0000, 0.0000, 0.0000}, Lab{50.0000, -1.0000, 2.0000}, 2.3669},
		{8, Lab{50.0000, -1.0000, 2.0000}, Lab{50.0000, 0.0000, 0.0000}, 2.3669},
		{9, Lab{50.0000, 2.4900, -0.0010}, Lab{50.0000, -2.4900, 0.0009}, 7.1792},
		{10, Lab{50.0000, 2.4900, -0.0010}, Lab{50.0000, -2.4900, 0.0010}, 7.1792},
		{11, Lab{50.0000, 2.4900, -0.0010}, Lab{50.0000, -2.4900, 0.0011}, 7.2195},
		{12, Lab{50.0000, 2.4900, -0.0010}, Lab{50.0000, -2.4900, 0.0012}, 7.2195},
		{13, Lab{50.0000, -0.0010, 2.4900}, Lab{50.0000, 0.0009, -2.4900}, 4.8045},
		{14, Lab{50.0000, -0.0010, 2.4900}, Lab{50.0000, 0.0010, -2.4900}, 4.8045},
		{15, Lab{50.0000, -0.0010, 2.4900}, Lab{50.0000, 0.0011, -2.4900}, 4.7461},
		{16, Lab{50.0000, 2.5000, 0.0000}, Lab{50.0000, 0.0000, -2.5000}, 4.3065},
		{17, Lab{50.0000, 2.5000, 0.0000}, Lab{73.0000, 25.0000, -18.0000}, 27.1492},
		{18, Lab{50.0000, 2.5000, 0.0000}, Lab{61.0000, -5.0000, 29.0000}, 22.8977},
		{19, Lab{50.0000, 2.5000, 0.0000}, Lab{56.0000, -27.0000, -3.0000}, 31.9030},
		{20, Lab{50.0000, 2.5000, 0.0000}, Lab{58.0000, 24.0000, 15.0000}, 19.4535},
		{21, Lab{50.0000, 2.5000, 0.0000}, Lab{50.0000, 3.1736, 0.5854}, 1.0000},
		{22, Lab{50.0000, 2.5000, 0.0000}, Lab{50.0000, 3.2972, 0.0000}, 1.0000},
		{23, Lab{50.0000, 2.5000, 0.0000}, Lab{50.0000, 1.8634, 0.5757}, 1.0000},
		{24, Lab{50.0000, 2.5000, 0.0000}, Lab{50.0000, 3.2592, 0.3350}, 1.0000},
		{25, Lab{60.2574, -34.0099, 36.2677}, Lab{60.4626, -34.1751, 39.4387}, 1.2644},
		{26, Lab{63.0109, -31.0961, -5.8663}, Lab{62.8187, -29.7946, -4.0864}, 1.2630},
		{27, Lab{61.2901, 3.7196, -5.3901}, Lab{61.4292, 2.2480, -4.9620}, 1.8731},
		{28, Lab{35.0831, -44.1164, 3.7933}, Lab{35.0232, -40.0716, 1.5901}, 1.8645},
		{29, Lab{22.7233, 20.0904, -46.6940}, Lab{23.0331, 14.9730, -42.5619}, 2.0373},
		{30, Lab{36.4612, 47.8580, 18.3852}, Lab{36.2715, 50.5065, 21.2231}, 1.4146},
		{31, Lab{90.8027, -2.0831, 1.4410}, Lab{91.1528, -1.6435, 0.0447}, 1.4441},
		{32, Lab{90.9257, -0.5406, -0.9208}, Lab{88.6381, -0.8985, -0.7239}, 1.5381},
		{33, Lab{6.7747, -0.2908, -2.4247}, Lab{5.8714, -0.0985, -2.2286}, 0.6377},
		{34, Lab{2.0776, 0.0795, -1.1350}, Lab{0.9033, -0.0636, -0.5514}, 0.9082},
	} {
		for _, ab := range [][2]Lab{{tt.a, tt.b}, {tt.b, tt.a}} {
			if got := DeltaE2000(ab[0], ab[1]); math.Abs(got-tt.want) > 5e-5 {
				t.Errorf("pair %d: ΔE00(%v, %v) = %.5f, want %.4f", tt.pair, ab[0], ab[1], got, tt.want)
			}
		}
	}
}
