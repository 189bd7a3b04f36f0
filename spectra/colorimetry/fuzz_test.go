package colorimetry

import (
	"errors"
	"math"
	"regexp"
	"testing"

	"skysheet/spectra"
)

var hexRE = regexp.MustCompile(`^#[0-9a-f]{6}$`)

func finite(v ...float64) bool {
	for _, x := range v {
		if math.IsNaN(x) || math.IsInf(x, 0) {
			return false
		}
	}
	return true
}

// checkXYZ fails t unless everything derived from c is finite and the sRGB
// clip report agrees with the linear values.
func checkXYZ(t *testing.T, c XYZ) {
	t.Helper()
	l := c.Lab()
	if !finite(l.L, l.A, l.B) {
		t.Fatalf("%v: L*a*b* %v", c, l)
	}
	if x, y, ok := c.Chromaticity(); ok && !finite(x, y) {
		t.Fatalf("%v: chromaticity (%g, %g)", c, x, y)
	}
	s := c.SRGB()
	any := false
	for i, v := range []float64{s.R, s.G, s.B} {
		lin, clip := s.Linear[i], s.Clip[i]
		if !finite(lin, clip) || !(v >= 0 && v <= 1) {
			t.Fatalf("%v: sRGB %+v", c, s)
		}
		want := lin - min(max(lin, 0), 1)
		if clip != 0 && clip != want || clip == 0 && math.Abs(want) > gamutTol {
			t.Fatalf("%v: channel %d linear %g, clip %g", c, i, lin, clip)
		}
		any = any || clip != 0
	}
	if any != s.Clipped {
		t.Fatalf("%v: clipped %v with clips %v", c, s.Clipped, s.Clip)
	}
	if !hexRE.MatchString(s.Hex()) {
		t.Fatalf("%v: hex %q", c, s.Hex())
	}
}

// FuzzTristimulus builds a series from the fuzz input (a start, a step,
// values in −0.5…1.5 from byte pairs, optionally split into two pieces)
// and checks that Tristimulus never panics, that it accepts exactly the
// series one piece of which covers 380–780 nm, and that its results are
// sane: finite, 0 ≤ Y ≤ 100 and 0 ≤ L* ≤ 100 for values in [0, 1].
func FuzzTristimulus(f *testing.F) {
	f.Add(300.0, 10.0, uint16(0), []byte{0, 0, 255, 255, 128, 0, 10, 200})
	f.Add(380.0, 400.0, uint16(9), []byte{100, 100, 100, 100})
	f.Add(250.0, 37.5, uint16(3), make([]byte, 200))
	f.Add(380.0005, 0.5, uint16(400), make([]byte, 2000))
	f.Add(379.0, -1.0, uint16(1), []byte{1, 2, 3, 4})
	f.Fuzz(func(t *testing.T, lo, step float64, cut uint16, data []byte) {
		n := len(data) / 2
		if n == 0 || n > 5000 {
			return
		}
		nm, v := make([]float64, n), make([]float64, n)
		inUnit := true
		for i := range n {
			nm[i] = lo + float64(i)*step
			v[i] = float64(int(data[2*i])<<8|int(data[2*i+1]))/65535*2 - 0.5
			inUnit = inUnit && v[i] >= 0 && v[i] <= 1
		}
		s := spectra.Series{Pieces: []spectra.Piece{{NM: nm, V: v}}}
		if c := int(cut); c > 0 && c < n {
			s.Pieces = []spectra.Piece{{NM: nm[:c], V: v[:c]}, {NM: nm[c:], V: v[c:]}}
		}
		covers := false
		valid := true
		for _, p := range s.Pieces {
			for k := range p.NM {
				valid = valid && finite(p.NM[k]) && (k == 0 || p.NM[k] > p.NM[k-1])
			}
			if p.NM[0] <= visLo+edgeTol && p.NM[len(p.NM)-1] >= visHi-edgeTol {
				covers = true
			}
		}
		c, err := Tristimulus(s)
		switch {
		case err != nil && !errors.Is(err, ErrNotCovered) && !errors.Is(err, ErrInvalid):
			t.Fatalf("error %v wraps neither sentinel", err)
		case errors.Is(err, ErrNotCovered) && covers:
			t.Fatalf("%v, but a piece covers 380–780 nm", err)
		case err == nil && !covers:
			t.Fatalf("accepted %v without covering 380–780 nm", s)
		case err == nil && !valid:
			t.Fatalf("accepted a series with wavelengths not increasing")
		case err != nil:
			return
		}
		if !finite(c.X, c.Y, c.Z) {
			t.Fatalf("XYZ %v", c)
		}
		checkXYZ(t, c)
		w := White()
		if l := c.Lab(); inUnit && (c.X < 0 || c.X > w.X || c.Y < 0 || c.Y > w.Y || c.Z < 0 || c.Z > w.Z || l.L < 0 || l.L > 100) {
			t.Fatalf("values in [0, 1] give XYZ %v, L* %g", c, l.L)
		}
	})
}

// FuzzColour checks the conversions of any XYZ and the colour differences
// of any L*a*b* within ±1e6: no panic, finite results, consistent clip
// reports, and ΔE ≥ 0, symmetric, 0 for identical colours.
func FuzzColour(f *testing.F) {
	f.Add(95.0, 100.0, 108.0, 50.0, 2.5, 0.0, 73.0, 25.0, -18.0)
	f.Add(0.0, 0.0, 0.0, 0.0, 0.0, 0.0, 0.0, 0.0, 0.0)
	f.Add(-5.0, 1e6, -3.0, 50.0, 2.49, -0.001, 50.0, -2.49, 0.0009)
	f.Fuzz(func(t *testing.T, x, y, z, l1, a1, b1, l2, a2, b2 float64) {
		if !finite(x, y, z, l1, a1, b1, l2, a2, b2) {
			return
		}
		for _, v := range []float64{x, y, z, l1, a1, b1, l2, a2, b2} {
			if math.Abs(v) > 1e6 {
				return
			}
		}
		checkXYZ(t, XYZ{x, y, z})
		p, q := Lab{l1, a1, b1}, Lab{l2, a2, b2}
		for name, de := range map[string]func(a, b Lab) float64{"ΔE*ab": DeltaE76, "ΔE00": DeltaE2000} {
			d, e := de(p, q), de(q, p)
			if !finite(d) || d < 0 || math.Abs(d-e) > 1e-9*max(1, d) {
				t.Fatalf("%s(%v, %v) = %g, reversed %g", name, p, q, d, e)
			}
			if z := de(p, p); z != 0 {
				t.Fatalf("%s(%v, itself) = %g", name, p, z)
			}
		}
	})
}
