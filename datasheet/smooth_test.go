package datasheet

import (
	"math"
	"testing"
)

// The interpolant against functions of Go's math package (the reference),
// each analytic near its interval, so that 18 points resolve it to
// rounding.
func TestSmoothFit(t *testing.T) {
	for _, tc := range []struct {
		name      string
		f, df     func(float64) float64
		lo, hi    float64
		tol, dtol float64 // relative, of the values and of the slopes
		converges bool
	}{
		{"exp", math.Exp, math.Exp, 0, 1, 1e-14, 1e-12, true},
		{"sin", math.Sin, math.Cos, -1, 2, 1e-14, 1e-12, true},
		{"Bose-Einstein 1/(e^(x/T)−1), x = 1439 K (10 µm), 250–330 K",
			func(t float64) float64 { return 1 / math.Expm1(1439/t) },
			func(t float64) float64 { e := math.Exp(1439 / t); return e * 1439 / (t * t) / ((e - 1) * (e - 1)) },
			250, 330, 1e-13, 1e-11, true},
		// Runge's function: its poles at ±i/5 make the coefficients fall
		// only as ρ^−j, ρ = (1 + √26)/5 ≈ 1.22 (Trefethen, ATAP, ch. 8,
		// from memory): 18 points are far from enough.
		{"Runge 1/(1+25x²)", func(x float64) float64 { return 1 / (1 + 25*x*x) }, nil, -1, 1, 0, 0, false},
	} {
		t.Run(tc.name, func(t *testing.T) {
			p := newSmoothFit(tc.f, tc.lo, tc.hi)
			if got := p.converged(1e-13); got != tc.converges {
				t.Fatalf("converged = %v, want %v (last coefficients %g, %g)", got, tc.converges, p.c[len(p.c)-2], p.c[len(p.c)-1])
			}
			if !tc.converges {
				return
			}
			var big, dbig float64
			for i := 0; i <= 100; i++ {
				x := tc.lo + (tc.hi-tc.lo)*float64(i)/100
				big, dbig = math.Max(big, math.Abs(tc.f(x))), math.Max(dbig, math.Abs(tc.df(x)))
			}
			for i := 0; i <= 100; i++ {
				x := tc.lo + (tc.hi-tc.lo)*float64(i)/100
				want, got := tc.f(x), p.at(x)
				if math.Abs(got-want) > tc.tol*big {
					t.Errorf("at %g: %.17g, want %.17g (math)", x, got, want)
				}
				dwant, dgot := tc.df(x), p.slope(x)
				if math.Abs(dgot-dwant) > tc.dtol*dbig {
					t.Errorf("slope at %g: %.17g, want %.17g (math)", x, dgot, dwant)
				}
			}
		})
	}
}
