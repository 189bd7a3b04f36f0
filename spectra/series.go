package spectra

import (
	"math"
	"sort"
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

// Map returns a series on the same points with f applied to every value.
func (s Series) Map(f func(nm, v float64) float64) Series {
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
