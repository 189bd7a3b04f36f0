package datasheet

import (
	"math/rand/v2"
	"sort"
	"testing"
)

// TestNMCursor checks nmCursor.find against a binary search of the whole
// list (sort.SearchFloat64s) for wavelengths read in order, repeated,
// going back and jumping ahead.
func TestNMCursor(t *testing.T) {
	r := rand.New(rand.NewPCG(7, 8))
	for range 100 {
		var nm []float64
		x := 0.0
		for range r.IntN(40) {
			x += 0.5 + r.Float64()
			nm = append(nm, x)
		}
		c := nmCursor{nm: nm}
		q := -1.0
		for range 200 {
			switch r.IntN(6) {
			case 0:
				q -= 5 * r.Float64()
			case 1:
				q += 20 * r.Float64()
			case 2:
				if len(nm) > 0 {
					q = nm[r.IntN(len(nm))]
				}
			case 3:
			default:
				q += r.Float64()
			}
			want := sort.SearchFloat64s(nm, q)
			got, ok := c.find(q)
			if got != want || ok != (want < len(nm) && nm[want] == q) {
				t.Fatalf("find(%v) in %v = %d %v, want %d", q, nm, got, ok, want)
			}
		}
	}
}
