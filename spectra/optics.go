package spectra

import (
	"fmt"
	"math"
	"strconv"
	"strings"
)

// DefaultClosureTol is the default tolerance on |R+T+A−1|, and on how far
// R+T may exceed 1 or a value fall below 0 (common practice, no source).
const DefaultClosureTol = 0.02

// Optics is a sample's complete set of R, T and A, each derived where it was
// not measured, with the assumptions that took and the closure check.
type Optics struct {
	R, T, A Series // A is also the spectral emittance (Kirchhoff's law)
	UR, UT  Series // standard uncertainties of R and T; empty when unknown
	// Origin[q] says how quantity q (R, T or A) was obtained: measured,
	// derived from the other two, assumed 0, or several of these over
	// different ranges.
	Origin      [3]Origin
	Closure     Closure
	Assumptions []string
}

// Origin says how [Resolve] obtained a quantity; the flags combine when it
// was obtained differently over different ranges.
type Origin uint8

// The origins of a quantity.
const (
	Measured    Origin = 1 << iota // read from the data
	Derived                        // 1 minus the other two (for a stack: from its layers)
	AssumedZero                    // transmittance not measured: taken as 0, the sample opaque
)

// String writes the origin in words, e.g. "measured", "derived",
// "measured and assumed 0"; "" when none.
func (o Origin) String() string {
	var parts []string
	for _, x := range []struct {
		f Origin
		w string
	}{{Measured, "measured"}, {Derived, "derived"}, {AssumedZero, "assumed 0"}} {
		if o&x.f != 0 {
			parts = append(parts, x.w)
		}
	}
	return strings.Join(parts, " and ")
}

// Closure is the result of checking R+T+A = 1 and 0 ≤ R, T, A.
type Closure struct {
	Tolerance float64
	// Checked is true when R, T and A were all measured at some wavelength,
	// so that |R+T+A−1| could be tested; Points counts those wavelengths.
	Checked bool
	Points  int
	// Residual is the largest |R+T+A−1| found, at ResidualNM.
	Residual, ResidualNM float64
	// Excess is the largest R+T−1 (positive means R+T > 1), at ExcessNM.
	Excess, ExcessNM float64
	// Min is the most negative measured value, of quantity MinOf, at MinNM.
	Min, MinNM float64
	MinOf      Quantity
	// Problems lists each failed test in one sentence; empty means closure
	// holds within Tolerance.
	Problems []string
}

// OK reports whether closure holds within the tolerance.
func (c Closure) OK() bool { return len(c.Problems) == 0 }

// Resolve completes R, T and A at every measured wavelength:
//   - A = 1 − R − T where A is not measured;
//   - T = 1 − R − A where R and A are measured but T is not;
//   - T = 0 (opaque) where only R or only A is measured, said as an
//     assumption;
//   - R = 1 − T − A where only T and A (or only A) are measured.
//
// Where R, T and A are all measured it checks |R+T+A−1| ≤ tol; everywhere it
// checks R+T ≤ 1+tol, R+A ≤ 1+tol where T is derived, and that no value is
// below −tol. The spectrum's processing notes come first among the
// assumptions; Origin says which quantities were derived.
func Resolve(s *Spectrum, tol float64) Optics {
	o := Optics{Closure: Closure{Tolerance: tol, Min: math.Inf(1), Excess: math.Inf(-1)}}
	c := &o.Closure
	var opaque, derivedA, derivedR, derivedT, noRA spans
	var measured [3]bool
	// overRA is the largest R+A−1 where T is derived from them, at overRANM.
	overRA, overRANM := math.Inf(-1), 0.0
	for _, g := range s.Segments {
		// Every piece holds at most one point per wavelength of the
		// segment: sized once, they never grow.
		pr, pt, pa := newPiece(len(g.NM)), newPiece(len(g.NM)), newPiece(len(g.NM))
		var pur, put Piece
		if g.Values[UR] != nil {
			pur = newPiece(len(g.NM))
		}
		if g.Values[UT] != nil {
			put = newPiece(len(g.NM))
		}
		pieces := [numQuantities]*Piece{&pr, &pt, &pa, &pur, &put}
		src := [numQuantities]cursor{}
		for q := range src {
			src[q] = cursor{p: segmentPiece(g, Quantity(q))}
		}
		for _, nm := range g.NM {
			var v [numQuantities]float64
			var has [numQuantities]bool
			for q := range v {
				v[q], has[q] = src[q].value(nm)
			}
			for _, q := range []Quantity{R, T, A} {
				if has[q] && v[q] < c.Min {
					c.Min, c.MinNM, c.MinOf = v[q], nm, q
				}
			}
			for _, q := range []Quantity{R, T, A} {
				measured[q] = measured[q] || has[q]
			}
			r, t, a := v[R], v[T], v[A]
			switch {
			case has[R] && has[T] && has[A]:
				c.Checked = true
				c.Points++
				if res := math.Abs(r + t + a - 1); res > c.Residual || c.Points == 1 {
					c.Residual, c.ResidualNM = res, nm
				}
			case has[R] && has[T]:
				a = 1 - r - t
				derivedA.add(nm)
			case has[R] && has[A]:
				t = 1 - r - a
				derivedT.add(nm)
				if ex := r + a - 1; ex > overRA {
					overRA, overRANM = ex, nm
				}
			case has[R]:
				t, a = 0, 1-r
				opaque.add(nm)
				derivedA.add(nm)
			case has[T] && has[A]:
				r = 1 - t - a
				derivedR.add(nm)
			case has[A]:
				t, r = 0, 1-a
				opaque.add(nm)
				derivedR.add(nm)
			default: // only T, or nothing: R and A unknown here
				if has[T] {
					pt.add(nm, t)
					noRA.add(nm)
				}
				continue
			}
			if ex := r + t - 1; ex > c.Excess {
				c.Excess, c.ExcessNM = ex, nm
			}
			pr.add(nm, r)
			pt.add(nm, t)
			pa.add(nm, a)
			if has[UR] {
				pur.add(nm, v[UR])
			}
			if has[UT] {
				put.add(nm, v[UT])
			}
		}
		for q, p := range []*Series{&o.R, &o.T, &o.A, &o.UR, &o.UT} {
			if len(pieces[q].NM) > 1 {
				p.Pieces = append(p.Pieces, *pieces[q])
			}
		}
	}
	if math.IsInf(c.Min, 1) {
		c.Min = 0
	}
	if math.IsInf(c.Excess, -1) {
		c.Excess = 0
	}
	for q, d := range []spans{derivedR, derivedT, derivedA} {
		if measured[q] {
			o.Origin[q] |= Measured
		}
		if !d.empty() {
			o.Origin[q] |= Derived
		}
	}
	if !opaque.empty() {
		o.Origin[T] |= AssumedZero
	}
	lo, hi := s.Range()
	whole := func(sp spans) bool { return sp.first == lo && sp.last == hi && !s.Has(T) }
	o.Assumptions = append(o.Assumptions, s.Notes...)
	switch {
	case opaque.empty():
	case whole(opaque):
		o.Assumptions = append(o.Assumptions, "No transmittance was measured: the sample is taken as opaque (T = 0).")
	default:
		o.Assumptions = append(o.Assumptions, fmt.Sprintf("Transmittance was not measured over %s: taken as 0 (opaque) there.", opaque))
	}
	if !derivedA.empty() {
		o.Assumptions = append(o.Assumptions, fmt.Sprintf("Absorptance derived as A = 1 − R − T over %s.", derivedA))
	}
	if !derivedT.empty() {
		o.Assumptions = append(o.Assumptions, fmt.Sprintf("Transmittance derived as T = 1 − R − A over %s.", derivedT))
	}
	if !derivedR.empty() {
		o.Assumptions = append(o.Assumptions, fmt.Sprintf("Reflectance derived as R = 1 − T − A over %s.", derivedR))
	}
	if !noRA.empty() {
		o.Assumptions = append(o.Assumptions, fmt.Sprintf("Only transmittance was measured over %s: R and A are unknown there.", noRA))
	}
	o.Assumptions = append(o.Assumptions, "Spectral emittance equals spectral absorptance (Kirchhoff's law).")
	if c.Checked && c.Residual > tol {
		c.Problems = append(c.Problems, fmt.Sprintf("|R+T+A−1| reaches %.4f at %s nm (tolerance %g).", c.Residual, fmtNM(c.ResidualNM), tol))
	}
	if c.Excess > tol {
		c.Problems = append(c.Problems, fmt.Sprintf("R+T exceeds 1 by %.4f at %s nm (tolerance %g).", c.Excess, fmtNM(c.ExcessNM), tol))
	}
	if overRA > tol {
		c.Problems = append(c.Problems, fmt.Sprintf("R+A exceeds 1 by %.4f at %s nm (tolerance %g), so T = 1 − R − A is negative there.", overRA, fmtNM(overRANM), tol))
	}
	if c.Min < -tol {
		c.Problems = append(c.Problems, fmt.Sprintf("%s is %.4f at %s nm, below −%g.", c.MinOf, c.Min, fmtNM(c.MinNM), tol))
	}
	return o
}

// segmentPiece returns quantity q of one segment without empty cells, for
// reading only: it may share the segment's slices.
func segmentPiece(g Segment, q Quantity) Piece {
	n := 0
	for _, x := range g.Values[q] {
		if !math.IsNaN(x) {
			n++
		}
	}
	switch n {
	case 0:
		return Piece{}
	case len(g.NM): // no gaps: the segment's own slices, only read
		return Piece{NM: g.NM[:n:n], V: g.Values[q][:n:n]}
	}
	p := newPiece(n)
	for i, x := range g.Values[q] {
		if !math.IsNaN(x) {
			p.add(g.NM[i], x)
		}
	}
	return p
}

// newPiece returns an empty piece with room for n points.
func newPiece(n int) Piece {
	return Piece{NM: make([]float64, 0, n), V: make([]float64, 0, n)}
}

func (p *Piece) add(nm, v float64) {
	p.NM = append(p.NM, nm)
	p.V = append(p.V, v)
}

// value returns the value at nm and whether the piece covers nm.
func (p Piece) value(nm float64) (float64, bool) {
	if len(p.NM) == 0 || nm < p.NM[0] || nm > p.NM[len(p.NM)-1] {
		return math.NaN(), false
	}
	return p.at(nm), true
}

// spans records the wavelength range over which something happened.
type spans struct {
	first, last float64
	n           int
}

func (s *spans) add(nm float64) {
	if s.n == 0 {
		s.first = nm
	}
	s.last = nm
	s.n++
}

func (s spans) empty() bool { return s.n == 0 }

func (s spans) String() string { return fmtNM(s.first) + "–" + fmtNM(s.last) + " nm" }

func fmtNM(nm float64) string { return strconv.FormatFloat(math.Round(nm*100)/100, 'f', -1, 64) }
