package spectra_test

import (
	"fmt"

	"skysheet/spectra"
)

// A cover that passes 80 % and reflects 10 % over a substrate that reflects
// half and passes 30 %.
func ExampleStack() {
	layer := func(r, t float64) spectra.Optics {
		nm := []float64{300, 2500}
		return spectra.Optics{
			R: spectra.Series{Pieces: []spectra.Piece{{NM: nm, V: []float64{r, r}}}},
			T: spectra.Series{Pieces: []spectra.Piece{{NM: nm, V: []float64{t, t}}}},
		}
	}
	s, err := spectra.Stack([]spectra.Optics{layer(0.1, 0.8), layer(0.5, 0.3)})
	if err != nil {
		fmt.Println(err)
		return
	}
	r, _ := s.R.At(500)
	t, _ := s.T.At(500)
	a1, _ := s.Absorbed[0].At(500)
	a2, _ := s.Absorbed[1].At(500)
	fmt.Printf("R %.4f, T %.4f, absorbed in the cover %.4f, in the substrate %.4f\n", r, t, a1, a2)
	// Output: R 0.4368, T 0.2526, absorbed in the cover 0.1421, in the substrate 0.1684
}
