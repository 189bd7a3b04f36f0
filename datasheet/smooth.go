package datasheet

import (
	"math"
	"sync"
)

// smoothFit is the polynomial interpolant of a smooth function f at the n
// Chebyshev points of [lo, hi], kept as its Chebyshev series
// Σ c_j T_j(x), x = (2t − lo − hi)/(hi − lo) (Trefethen, Approximation
// Theory and Approximation Practice, 2013, ch. 3–4, from memory). For a
// function analytic near [lo, hi] the coefficients fall geometrically and
// the interpolant is as accurate as the last few of them are small (ibid.
// ch. 8): converged reports whether they have fallen below a relative
// tolerance.
type smoothFit struct {
	lo, hi float64
	c      []float64
}

// chebyshevNodes returns cos(π(k + ½)/n) for k = 0 … n−1 and the matrix
// cos(π j (k + ½)/n), row j, of the discrete cosine transform that turns
// values at those points into coefficients.
var chebyshevNodes = sync.OnceValues(func() ([]float64, [][]float64) {
	const n = smoothPoints
	x := make([]float64, n)
	m := make([][]float64, n)
	for k := range n {
		x[k] = math.Cos(math.Pi * (float64(k) + 0.5) / n)
	}
	for j := range n {
		m[j] = make([]float64, n)
		for k := range n {
			m[j][k] = math.Cos(math.Pi * float64(j) * (float64(k) + 0.5) / n)
		}
	}
	return x, m
})

// smoothPoints is the number of points of a smoothFit.
const smoothPoints = 18

// newSmoothFit interpolates f at the smoothPoints Chebyshev points of
// [lo, hi].
func newSmoothFit(f func(float64) float64, lo, hi float64) *smoothFit {
	x, m := chebyshevNodes()
	n := len(x)
	v := make([]float64, n)
	for k, xk := range x {
		v[k] = f((hi+lo)/2 + (hi-lo)/2*xk)
	}
	c := make([]float64, n)
	for j := range n {
		var s float64
		for k, vk := range v {
			s += vk * m[j][k]
		}
		c[j] = 2 * s / float64(n)
	}
	c[0] /= 2
	return &smoothFit{lo: lo, hi: hi, c: c}
}

// converged reports whether the last two coefficients are below tol times
// the largest: the interpolant then resolves f to about that relative
// accuracy.
func (p *smoothFit) converged(tol float64) bool {
	var big float64
	for _, c := range p.c {
		big = math.Max(big, math.Abs(c))
	}
	n := len(p.c)
	return math.Abs(p.c[n-1])+math.Abs(p.c[n-2]) <= tol*big
}

// covers reports whether t lies in [lo, hi].
func (p *smoothFit) covers(t float64) bool { return t >= p.lo && t <= p.hi }

// at returns the interpolant at t (Clenshaw's recurrence).
func (p *smoothFit) at(t float64) float64 {
	x := (2*t - p.lo - p.hi) / (p.hi - p.lo)
	var b1, b2 float64
	for j := len(p.c) - 1; j >= 1; j-- {
		b1, b2 = 2*x*b1-b2+p.c[j], b1
	}
	return x*b1 - b2 + p.c[0]
}

// slope returns the derivative of the interpolant at t.
func (p *smoothFit) slope(t float64) float64 {
	// The derivative's coefficients: d_{j−1} = d_{j+1} + 2 j c_j, with d_0
	// halved (the standard recurrence, e.g. Press et al., Numerical
	// Recipes, 3rd ed., 2007, §5.9, from memory).
	n := len(p.c)
	d := make([]float64, n+1)
	for j := n - 1; j >= 1; j-- {
		d[j-1] = d[j+1] + 2*float64(j)*p.c[j]
	}
	d[0] /= 2
	q := smoothFit{lo: p.lo, hi: p.hi, c: d[:n-1]}
	return q.at(t) * 2 / (p.hi - p.lo)
}
