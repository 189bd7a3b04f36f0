package spectra

import (
	"math"
	"math/rand/v2"
	"strings"
	"testing"
)

// TestCursor checks that a cursor reads a piece exactly as Piece.value
// does (the binary search it replaces), at wavelengths in order, repeated,
// going back, at the points and between them, and outside.
func TestCursor(t *testing.T) {
	r := rand.New(rand.NewPCG(5, 6))
	for range 200 {
		n := r.IntN(20)
		p := Piece{}
		x := 100 * r.Float64()
		for range n {
			x += 0.01 + 10*r.Float64()
			p.add(x, r.Float64())
		}
		c := cursor{p: p}
		q := -5.0
		for range 100 {
			switch r.IntN(5) {
			case 0: // back
				q -= 30 * r.Float64()
			case 1: // a point of the piece
				if n > 0 {
					q = p.NM[r.IntN(n)]
				}
			case 2: // the same again
			default:
				q += 10 * r.Float64()
			}
			want, wok := p.value(q)
			got, ok := c.value(q)
			if ok != wok || math.Float64bits(got) != math.Float64bits(want) {
				t.Fatalf("piece %v at %v: %v %v, want %v %v", p.NM, q, got, ok, want, wok)
			}
		}
	}
}

// TestSourceIn checks sourceIn against the rule it implements, written
// with strings built for the purpose: file is the segment's source, or
// one of the names it joins with "+".
func TestSourceIn(t *testing.T) {
	names := []string{"", "a", "b", "ab", "a+b", "+", "++", "a.csv", "b.csv", "a.csv+b.csv", "b.csv+a.csv+c.csv", "aa.csv+a.csv",
		"a.csv+", "+a.csv", "xa.csv+b.csv", "a.csvx+b.csv", "c.csv+a.csv", "a+", "+a", "a++b"}
	for _, seg := range names {
		for _, file := range names {
			want := seg == file || strings.HasPrefix(seg, file+"+") || strings.HasSuffix(seg, "+"+file) ||
				strings.Contains(seg, "+"+file+"+")
			if got := sourceIn(seg, file); got != want {
				t.Errorf("sourceIn(%q, %q) = %v, want %v", seg, file, got, want)
			}
		}
	}
}

// TestWeightReader checks that reading the ASTM G173-03 tables in order
// with a cursor gives At's values to the bit, inside, at and beyond the
// table's ends.
func TestWeightReader(t *testing.T) {
	for _, w := range []Weighting{SolarGlobal(), SolarDirect(), Blackbody{K: 300}} {
		r := newWeightReader(w)
		for nm := 200.0; nm < 5000; nm += 0.37 {
			if got, want := r.at(nm), w.At(nm); math.Float64bits(got) != math.Float64bits(want) {
				t.Fatalf("%s at %g: %v, At %v", w, nm, got, want)
			}
		}
		r = newWeightReader(w)
		for _, nm := range append(append([]float64{100}, w.Knots(0, 1e6)...), 1e6) { // its own points
			if got, want := r.at(nm), w.At(nm); math.Float64bits(got) != math.Float64bits(want) {
				t.Fatalf("%s at %g: %v, At %v", w, nm, got, want)
			}
		}
	}
}
