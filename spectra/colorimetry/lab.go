package colorimetry

import "math"

// Lab holds CIE 1976 L*, a*, b* (CIELAB) coordinates.
type Lab struct {
	L, A, B float64
}

// The constants of CIE 015:2004 §8.2.1 in their exact rational form:
// ε = (6/29)³ splits the cube root from the linear part near black, where
// L* = κ·Y/Yn with κ = (29/3)³.
const (
	labEps   = 216.0 / 24389
	labKappa = 24389.0 / 27
)

// Lab returns the CIE 1976 L*, a*, b* of c with the D65 white point of the
// embedded tables ([White]) as reference white:
//
//	L* = 116 f(Y/Yn) − 16,  a* = 500 (f(X/Xn) − f(Y/Yn)),  b* = 200 (f(Y/Yn) − f(Z/Zn))
//
// with f(t) = ∛t above (6/29)³ and (κt + 16)/116 below (CIE 015:2004). A
// perfect reflector gives exactly L* = 100, a* = b* = 0, and a perfect
// absorber L* = 0.
func (c XYZ) Lab() Lab {
	w := tables().white
	tx, ty, tz := c.X/w.X, c.Y/w.Y, c.Z/w.Z
	fx, fy, fz := labF(tx), labF(ty), labF(tz)
	// L* from its own closed form on each side, 116∛t − 16 or κt, so that
	// t = 1 and t = 0 give 100 and 0 without rounding.
	l := labKappa * ty
	if ty > labEps {
		l = 116*math.Cbrt(ty) - 16
	}
	return Lab{L: l, A: 500 * (fx - fy), B: 200 * (fy - fz)}
}

func labF(t float64) float64 {
	if t > labEps {
		return math.Cbrt(t)
	}
	return (labKappa*t + 16) / 116
}

// DeltaE76 returns the CIE 1976 colour difference ΔE*ab between a and b:
// the Euclidean distance in L*a*b*.
func DeltaE76(a, b Lab) float64 {
	return math.Sqrt(sq(a.L-b.L) + sq(a.A-b.A) + sq(a.B-b.B))
}

// DeltaE2000 returns the CIEDE2000 colour difference ΔE00 between a and b
// (CIE 142-2001) with the parametric factors kL = kC = kH = 1, following
// the equations and conventions of G. Sharma, W. Wu and E. N. Dalal, "The
// CIEDE2000 color-difference formula: implementation notes, supplementary
// test data, and mathematical observations", Color Research & Application
// 30(1), 21–30 (2005): hue angles in degrees in [0, 360), a hue of 0 where
// the chroma C′ is 0, and the mean hue taken the short way round the
// circle. The result is symmetric in a and b.
func DeltaE2000(a, b Lab) float64 {
	// Eq. 2–7: C*ab, its mean, G, a′, C′ and h′.
	cMean := (math.Hypot(a.A, a.B) + math.Hypot(b.A, b.B)) / 2
	g := 0.5 * (1 - pow7Ratio(cMean))
	a1, a2 := (1+g)*a.A, (1+g)*b.A
	c1, c2 := math.Hypot(a1, a.B), math.Hypot(a2, b.B)
	h1, h2 := hueDeg(a.B, a1), hueDeg(b.B, a2)

	// Eq. 8–11: ΔL′, ΔC′, Δh′, ΔH′.
	dL := b.L - a.L
	dC := c2 - c1
	var dh float64
	if c1*c2 != 0 {
		dh = h2 - h1
		switch {
		case dh > 180:
			dh -= 360
		case dh < -180:
			dh += 360
		}
	}
	dH := 2 * math.Sqrt(c1*c2) * math.Sin(rad(dh/2))

	// Eq. 12–14: the means L̄′, C̄′, h̄′.
	lBar := (a.L + b.L) / 2
	cBar := (c1 + c2) / 2
	hBar := h1 + h2
	if c1*c2 != 0 {
		switch {
		case math.Abs(h1-h2) <= 180:
			hBar /= 2
		case hBar < 360:
			hBar = (hBar + 360) / 2
		default:
			hBar = (hBar - 360) / 2
		}
	}

	// Eq. 15–22: the weighting functions and the rotation term.
	t := 1 - 0.17*math.Cos(rad(hBar-30)) + 0.24*math.Cos(rad(2*hBar)) +
		0.32*math.Cos(rad(3*hBar+6)) - 0.20*math.Cos(rad(4*hBar-63))
	dTheta := 30 * math.Exp(-sq((hBar-275)/25))
	rC := 2 * pow7Ratio(cBar)
	sL := 1 + 0.015*sq(lBar-50)/math.Sqrt(20+sq(lBar-50))
	sC := 1 + 0.045*cBar
	sH := 1 + 0.015*cBar*t
	rT := -math.Sin(rad(2*dTheta)) * rC

	l, c, h := dL/sL, dC/sC, dH/sH
	return math.Sqrt(l*l + c*c + h*h + rT*c*h)
}

// pow7Ratio returns √(C⁷ / (C⁷ + 25⁷)), written so that it neither
// overflows for large C nor divides by zero at C = 0.
func pow7Ratio(c float64) float64 {
	if c == 0 {
		return 0
	}
	r := 25 / c
	return 1 / math.Sqrt(1+r*r*r*r*r*r*r)
}

// hueDeg returns atan2(b, a) in degrees in [0, 360), and 0 where a = b = 0.
func hueDeg(b, a float64) float64 {
	if a == 0 && b == 0 {
		return 0
	}
	h := math.Atan2(b, a) * 180 / math.Pi
	if h < 0 {
		h += 360
	}
	if h >= 360 { // −tiny + 360 rounds to 360
		h = 0
	}
	return h
}

func rad(deg float64) float64 { return deg * math.Pi / 180 }

func sq(x float64) float64 { return x * x }
