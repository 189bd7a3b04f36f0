package colorimetry

import (
	"cmp"
	"errors"
	"fmt"
	"math"
	"slices"
	"sort"
	"strconv"
	"strings"

	"skysheet/spectra"
)

// The errors [Tristimulus] may return, wrapped with the details.
var (
	// ErrNotCovered means the data do not cover 380–780 nm in one piece.
	ErrNotCovered = errors.New("data do not cover 380–780 nm in one piece (no extrapolation into the visible)")
	// ErrInvalid means the series breaks its own rules (lengths, order, finite
	// values) or holds a value beyond ±1e6, which no reflectance or
	// transmittance can be.
	ErrInvalid = errors.New("invalid series")
)

const (
	// edgeTol is how far inside the visible range (nm) data may start or
	// end and still count as covering it; see [Tristimulus].
	edgeTol = 1e-3
	// maxValue bounds the magnitude of a value, so that every result stays
	// finite.
	maxValue = 1e6
)

// XYZ holds CIE 1931 tristimulus values (2° observer) under illuminant
// D65, scaled so that a perfect reflector or transmitter has Y = 100.
type XYZ struct {
	X, Y, Z float64
}

// White returns the D65 white point of the embedded tables: the
// tristimulus values of a perfect reflector by the same 1 nm summation over
// 380–780 nm as [Tristimulus] (Y = 100, X ≈ 95.04, Z ≈ 108.86).
func White() XYZ { return tables().white }

// Tristimulus returns the CIE 1931 2° tristimulus values under illuminant
// D65 of a spectral reflectance or transmittance s (fractions, not
// percent), by 1 nm summation over 380–780 nm as in ASTM E308:
//
//	X = k Σ S(λ) x̄(λ) R(λ),  k = 100 / Σ S(λ) ȳ(λ),  λ = 380, 381, …, 780 nm
//
// (likewise Y and Z), S being D65 and x̄, ȳ, z̄ the CIE 1931 colour-matching
// functions of the embedded tables. R(λ) at each whole nanometre is linear
// between the two points of s around it.
//
// One piece of s must cover the whole range: data that start above 380 nm,
// end below 780 nm or have a gap inside give an error wrapping
// [ErrNotCovered] that names the missing parts; nothing is extrapolated.
// A piece that starts or ends less than 0.001 nm inside the range (the
// rounding of a unit conversion, say 10^7 / 26315.789 cm⁻¹) still counts:
// its end value is held over that sliver. Data reaching exactly 380.0 or
// 780.0 nm, or beyond, need no such allowance.
//
// A piece with unequal numbers of wavelengths and values, wavelengths not
// strictly increasing, or a non-finite value or one beyond ±1e6 among the
// points used gives an error wrapping [ErrInvalid].
func Tristimulus(s spectra.Series) (XYZ, error) {
	t := tables()
	var p *spectra.Piece
	for i := range s.Pieces {
		q := &s.Pieces[i]
		if len(q.NM) != len(q.V) || len(q.NM) == 0 {
			return XYZ{}, fmt.Errorf("colorimetry: %w: piece %d has %d wavelengths and %d values", ErrInvalid, i+1, len(q.NM), len(q.V))
		}
		if p == nil && q.NM[0] <= visLo+edgeTol && q.NM[len(q.NM)-1] >= visHi-edgeTol {
			p = q
		}
	}
	if p == nil {
		return XYZ{}, fmt.Errorf("colorimetry: %w: %s", ErrNotCovered, missing(s))
	}
	if err := check(p); err != nil {
		return XYZ{}, err
	}
	var v [nVis]float64
	nm, val, last := p.NM, p.V, len(p.NM)-1
	j := 0
	for i := range v {
		x := min(max(float64(visLo+i), nm[0]), nm[last])
		for j < last && nm[j+1] <= x {
			j++
		}
		if nm[j] == x {
			v[i] = val[j]
		} else {
			f := (x - nm[j]) / (nm[j+1] - nm[j])
			v[i] = val[j] + f*(val[j+1]-val[j])
		}
	}
	return t.sum(&v), nil
}

// check reports a piece whose wavelengths are not finite and strictly
// increasing, or whose values used for 380–780 nm are not finite or lie
// beyond ±maxValue.
func check(p *spectra.Piece) error {
	nm, last := p.NM, len(p.NM)-1
	bad := func(k int) error {
		return fmt.Errorf("colorimetry: %w: wavelengths not finite and strictly increasing at point %d (%g nm)", ErrInvalid, k+1, nm[k])
	}
	if math.IsInf(nm[0], 0) || math.IsNaN(nm[0]) {
		return bad(0)
	}
	for k := 1; k <= last; k++ {
		if !(nm[k] > nm[k-1]) { // also false for NaN
			return bad(k)
		}
	}
	if math.IsInf(nm[last], 0) {
		return bad(last)
	}
	// The sum uses the points from the last at or below 380 nm to the
	// first at or above 780 nm.
	lo := max(sort.SearchFloat64s(nm, math.Nextafter(visLo, math.Inf(1)))-1, 0)
	hi := min(sort.SearchFloat64s(nm, visHi), last)
	for k := lo; k <= hi; k++ {
		if v := p.V[k]; !(math.Abs(v) <= maxValue) {
			return fmt.Errorf("colorimetry: %w: value %g at %s nm (want a finite fraction)", ErrInvalid, v, fmtNM(nm[k]))
		}
	}
	return nil
}

// missing describes which parts of 380–780 nm no single piece of s covers.
func missing(s spectra.Series) string {
	type span struct{ lo, hi float64 }
	var cov []span
	for _, p := range s.Pieces {
		a, b := max(visLo, p.NM[0]), min(visHi, p.NM[len(p.NM)-1])
		if b >= a {
			cov = append(cov, span{a, b})
		}
	}
	slices.SortFunc(cov, func(a, b span) int { return cmp.Compare(a.lo, b.lo) })
	var gaps, joins []string
	at := float64(visLo)
	for i, c := range cov {
		if c.lo > at {
			gaps = append(gaps, fmtNM(at)+"–"+fmtNM(c.lo)+" nm")
		} else if i > 0 {
			joins = append(joins, fmtNM(c.lo)+" nm")
		}
		at = max(at, c.hi)
	}
	if at < visHi {
		gaps = append(gaps, fmtNM(at)+"–"+fmtNM(visHi)+" nm")
	}
	if len(gaps) == 0 {
		return "split between separate pieces at " + strings.Join(joins, ", ")
	}
	return "no data at " + strings.Join(gaps, ", ")
}

// fmtNM formats a wavelength in nm without trailing zeros.
func fmtNM(x float64) string { return strconv.FormatFloat(x, 'f', -1, 64) }

// Luminous returns the luminous (photopic) reflectance or transmittance
// under D65, Y/100, as a fraction.
func (c XYZ) Luminous() float64 { return c.Y / 100 }

// Chromaticity returns the CIE 1931 chromaticity coordinates
// x = X/(X+Y+Z), y = Y/(X+Y+Z), and false where X+Y+Z ≤ 0 (black has no
// chromaticity).
func (c XYZ) Chromaticity() (x, y float64, ok bool) {
	sum := c.X + c.Y + c.Z
	if !(sum > 0) {
		return 0, 0, false
	}
	return c.X / sum, c.Y / sum, true
}

// Coverage returns the share of the luminous weight of 380–780 nm (the
// ASTM E308 weights of ȳ under D65 at the whole nanometres, Σ = 100) that
// falls inside some piece of s: 1 when the data cover the range, less when
// they start late, stop early or leave gaps. It tells how much is missing,
// not that a colour can be computed: that needs one piece over the whole
// range ([Tristimulus]).
func Coverage(s spectra.Series) float64 {
	t := tables()
	var in float64
	for i := range nVis {
		nm := float64(visLo + i)
		for _, p := range s.Pieces {
			if len(p.NM) > 0 && p.NM[0] <= nm+edgeTol && p.NM[len(p.NM)-1] >= nm-edgeTol {
				in += t.wy[i]
				break
			}
		}
	}
	return min(in/100, 1)
}
