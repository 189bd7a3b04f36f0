package spectra

import (
	"math"
	"math/rand/v2"
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
