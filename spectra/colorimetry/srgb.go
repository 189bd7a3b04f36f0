package colorimetry

import (
	"fmt"
	"math"
	"sync"
)

// SRGB is a colour for display in sRGB (IEC 61966-2-1).
type SRGB struct {
	// R, G, B are the encoded values, in [0, 1] after clipping.
	R, G, B float64
	// Linear holds the linear-light red, green and blue before clipping.
	Linear [3]float64
	// Clip holds, per channel, how far the linear value lay outside
	// [0, 1]: negative below 0, positive above 1, 0 within (a rounding
	// residue up to 1e-9 is clipped silently).
	Clip [3]float64
	// Clipped reports that some channel lay outside [0, 1]: the colour is
	// out of the sRGB gamut and shown clipped.
	Clipped bool
}

// gamutTol is the rounding residue of the linear values tolerated without
// reporting a clip (a perfect reflector comes out at 1 ± a few 1e-16).
const gamutTol = 1e-9

// The chromaticities (x, y) that define sRGB in IEC 61966-2-1 (those of
// ITU-R BT.709): red, green, blue primaries and the D65 reference white.
var srgbChroma = [4][2]float64{{0.64, 0.33}, {0.30, 0.60}, {0.15, 0.06}, {0.3127, 0.3290}}

type srgbConv struct {
	fromXYZ [3][3]float64 // XYZ (Y = 1) → linear RGB
	scale   [3]float64    // sRGB white / white of the tables, per X, Y, Z
}

var srgbOnce = sync.OnceValue(func() *srgbConv {
	from, white := srgbMatrix()
	w := tables().white
	return &srgbConv{fromXYZ: from, scale: [3]float64{white[0] / w.X, 1 / w.Y, white[2] / w.Z}}
})

// srgbMatrix returns the XYZ → linear RGB matrix derived from the
// chromaticities of the primaries and the white (the matrix whose columns,
// the primaries' XYZ, add up to the white with Y = 1), and that white.
func srgbMatrix() ([3][3]float64, [3]float64) {
	xyz := func(c [2]float64) [3]float64 { return [3]float64{c[0] / c[1], 1, (1 - c[0] - c[1]) / c[1]} }
	white := xyz(srgbChroma[3])
	var p [3][3]float64 // columns: primaries with Y = 1
	for j := range 3 {
		col := xyz(srgbChroma[j])
		for i := range 3 {
			p[i][j] = col[i]
		}
	}
	pi := inverse(p)
	var s [3]float64 // Y of each primary in the white
	for i := range 3 {
		s[i] = pi[i][0]*white[0] + pi[i][1]*white[1] + pi[i][2]*white[2]
	}
	var to [3][3]float64
	for i := range 3 {
		for j := range 3 {
			to[i][j] = p[i][j] * s[j]
		}
	}
	return inverse(to), white
}

// inverse returns the inverse of the 3×3 matrix m by cofactors.
func inverse(m [3][3]float64) [3][3]float64 {
	var c [3][3]float64
	for i := range 3 {
		for j := range 3 {
			r0, r1 := (i+1)%3, (i+2)%3
			c0, c1 := (j+1)%3, (j+2)%3
			c[j][i] = m[r0][c0]*m[r1][c1] - m[r0][c1]*m[r1][c0]
		}
	}
	det := m[0][0]*c[0][0] + m[0][1]*c[1][0] + m[0][2]*c[2][0]
	for i := range 3 {
		for j := range 3 {
			c[i][j] /= det
		}
	}
	return c
}

// SRGB returns c for display in sRGB, by IEC 61966-2-1: linear RGB from
// the standard's primaries and D65 white, then the standard's transfer
// function (12.92·v up to 0.0031308, 1.055·v^(1/2.4) − 0.055 above).
//
// First X, Y, Z are each scaled by the ratio of the sRGB white (D65 at
// x = 0.3127, y = 0.3290) to [White], the white of the embedded tables
// (they differ by less than 0.05 %, from the 380–780 nm truncation and the
// tables' rounding), so that a perfect reflector shows as sRGB white
// #ffffff and a grey as R = G = B. The matrix is derived from the
// chromaticities at full precision; IEC 61966-2-1 prints it rounded to four
// decimals.
//
// A channel outside [0, 1] is clipped to it, each channel on its own (hue
// is not preserved); [SRGB.Clip] and [SRGB.Clipped] report it.
func (c XYZ) SRGB() SRGB {
	k := srgbOnce()
	v := [3]float64{c.X * k.scale[0], c.Y * k.scale[1], c.Z * k.scale[2]}
	var out SRGB
	var enc [3]float64
	for i, row := range k.fromXYZ {
		lin := row[0]*v[0] + row[1]*v[1] + row[2]*v[2]
		out.Linear[i] = lin
		clipped := min(max(lin, 0), 1)
		if math.Abs(lin-clipped) > gamutTol {
			out.Clip[i] = lin - clipped
			out.Clipped = true
		}
		enc[i] = encode(clipped)
	}
	out.R, out.G, out.B = enc[0], enc[1], enc[2]
	return out
}

// encode applies the sRGB transfer function to a linear value in [0, 1].
func encode(v float64) float64 {
	if v <= 0.0031308 {
		return 12.92 * v
	}
	return 1.055*math.Pow(v, 1/2.4) - 0.055
}

// Hex returns the colour as "#rrggbb", each channel rounded to 8 bits.
func (c SRGB) Hex() string {
	b := func(v float64) int { return int(math.Round(v * 255)) }
	return fmt.Sprintf("#%02x%02x%02x", b(c.R), b(c.G), b(c.B))
}
