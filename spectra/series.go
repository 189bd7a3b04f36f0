package spectra

import (
	"math"
	"sort"
	"strconv"
	"strings"
)

// Piece is a run of points with strictly increasing wavelengths (nm); the
// value is linear between points and undefined outside [NM[0], NM[last]].
type Piece struct {
	NM, V []float64
}

// Series is a quantity over wavelength: pieces in increasing order that do
// not overlap. Nothing is interpolated between pieces.
type Series struct {
	Pieces []Piece
}

// Empty reports whether the series has no points.
func (s Series) Empty() bool { return len(s.Pieces) == 0 }

// Range returns the first and last wavelength of the series.
func (s Series) Range() (lo, hi float64) {
	if s.Empty() {
		return math.NaN(), math.NaN()
	}
	last := s.Pieces[len(s.Pieces)-1]
	return s.Pieces[0].NM[0], last.NM[len(last.NM)-1]
}

// At returns the value at nm, linear within a piece, and false where no
// piece covers nm.
func (s Series) At(nm float64) (float64, bool) {
	for _, p := range s.Pieces {
		if nm >= p.NM[0] && nm <= p.NM[len(p.NM)-1] {
			return p.at(nm), true
		}
	}
	return math.NaN(), false
}

// cursor reads a piece at wavelengths that mostly increase, as
// [Piece.value] does, walking on from the last point found instead of
// searching from the start: reading a piece at each of n wavelengths in
// order costs O(n) rather than O(n log n).
type cursor struct {
	p Piece
	i int // the first point at or after the last wavelength read
}

// value is p.value(nm), the same arithmetic on the same points.
func (c *cursor) value(nm float64) (float64, bool) {
	p := c.p
	if len(p.NM) == 0 || nm < p.NM[0] || nm > p.NM[len(p.NM)-1] {
		return math.NaN(), false
	}
	if c.i > 0 && p.NM[c.i-1] >= nm { // gone back: search again
		c.i = 0
	}
	i := c.i
	for p.NM[i] < nm { // stops inside: nm ≤ the last point
		i++
	}
	c.i = i
	if p.NM[i] == nm {
		return p.V[i], true
	}
	f := (nm - p.NM[i-1]) / (p.NM[i] - p.NM[i-1])
	return p.V[i-1] + f*(p.V[i]-p.V[i-1]), true
}

// at interpolates within the piece; nm must lie inside it.
func (p Piece) at(nm float64) float64 {
	i := sort.SearchFloat64s(p.NM, nm)
	if i < len(p.NM) && p.NM[i] == nm {
		return p.V[i]
	}
	if i == 0 || i == len(p.NM) {
		panic("spectra: interpolation outside piece")
	}
	f := (nm - p.NM[i-1]) / (p.NM[i] - p.NM[i-1])
	return p.V[i-1] + f*(p.V[i]-p.V[i-1])
}

// Interval is a closed wavelength range in nm.
type Interval struct{ Lo, Hi float64 }

// IntervalUM returns the interval lo–hi given in µm.
func IntervalUM(lo, hi float64) Interval { return Interval{shiftDecimal(lo, 3), shiftDecimal(hi, 3)} }

// UM returns the interval's ends in µm.
//
// IntervalUM and UM move the decimal point of the shortest decimal form
// instead of multiplying by 1000, so that 8.7 µm is 8700 nm and back
// exactly: the product can carry float noise into what is written.
func (iv Interval) UM() (lo, hi float64) { return shiftDecimal(iv.Lo, -3), shiftDecimal(iv.Hi, -3) }

// decimalClean returns x rounded to 15 significant digits: the value that
// decimal inputs multiplied by a decimal factor describe, without the
// float noise of the product (88112 × 0.001 gives 88.11200000000001;
// 88.112 is meant). No instrument reports 15 significant digits.
func decimalClean(x float64) float64 {
	if x == 0 || math.IsNaN(x) || math.IsInf(x, 0) {
		return x
	}
	v, err := strconv.ParseFloat(strconv.FormatFloat(x, 'g', 15, 64), 64)
	if err != nil {
		return x
	}
	return v
}

// fmtNum writes a computed number for a message: to 12 significant
// digits, which no data exceed, so that float noise does not show.
func fmtNum(x float64) string { return strconv.FormatFloat(x, 'g', 12, 64) }

// shiftDecimal returns x × 10^by, computed on x's shortest decimal form.
func shiftDecimal(x float64, by int) float64 {
	if x == 0 || math.IsNaN(x) || math.IsInf(x, 0) {
		return x * math.Pow10(by)
	}
	s := strconv.FormatFloat(x, 'e', -1, 64)
	i := strings.IndexByte(s, 'e')
	exp, err := strconv.Atoi(s[i+1:])
	if err != nil {
		return x * math.Pow10(by)
	}
	v, err := strconv.ParseFloat(s[:i]+"e"+strconv.Itoa(exp+by), 64)
	if err != nil {
		return x * math.Pow10(by)
	}
	return v
}

// Covered returns the parts of [lo, hi] that the series covers.
func (s Series) Covered(lo, hi float64) []Interval {
	var out []Interval
	for _, p := range s.Pieces {
		a, b := math.Max(lo, p.NM[0]), math.Min(hi, p.NM[len(p.NM)-1])
		if b > a {
			out = append(out, Interval{a, b})
		}
	}
	return out
}

// mapValues returns a series on the same points with f applied to every value.
func (s Series) mapValues(f func(nm, v float64) float64) Series {
	out := Series{Pieces: make([]Piece, len(s.Pieces))}
	for i, p := range s.Pieces {
		v := make([]float64, len(p.V))
		for j := range v {
			v[j] = f(p.NM[j], p.V[j])
		}
		out.Pieces[i] = Piece{NM: p.NM, V: v}
	}
	return out
}
