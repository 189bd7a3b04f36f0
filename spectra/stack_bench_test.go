package spectra

import "testing"

// BenchmarkStack combines three layers of 2,000 points each on offset grids.
func BenchmarkStack(b *testing.B) {
	layer := func(off float64) Optics {
		var nm, r, t []float64
		for x := 250.0 + off; x <= 2500; x += 1.125 {
			nm, r, t = append(nm, x), append(r, 0.1+0.3*float64(int(x)%5)/5), append(t, 0.5)
		}
		return Optics{R: Series{Pieces: []Piece{{NM: nm, V: r}}}, T: Series{Pieces: []Piece{{NM: nm, V: t}}}}
	}
	layers := []Optics{layer(0), layer(0.3), layer(0.7)}
	for b.Loop() {
		if _, err := Stack(layers); err != nil {
			b.Fatal(err)
		}
	}
}
