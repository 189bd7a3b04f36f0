package spectra_test

import (
	"fmt"

	"skysheet/spectra"
)

func ExampleDecode_jcamp() {
	// Five points of percent reflectance in DIF form with a DUP count: the
	// second line repeats the last ordinate of the first (the Y-check).
	const file = `##TITLE=invented white tile (example data)
##JCAMP-DX=4.24
##XUNITS=NANOMETERS
##YUNITS=%REFLECTANCE
##XFACTOR=1
##YFACTOR=0.1
##FIRSTX=400
##LASTX=800
##NPOINTS=5
##XYDATA=(X++(Y..Y))
400 I00J0T $$ 900, then +10 twice: 910, 920
600 I20%T   $$ Y-check 920, then +0 twice: 920, 920
800 I20
##END=
`
	s, err := spectra.Decode([]byte(file), "tile.jdx")
	if err != nil {
		fmt.Println(err)
		return
	}
	title, _ := s.Get("title")
	fmt.Println(title)
	r := s.Series(spectra.R).Pieces[0]
	for i := range r.NM {
		fmt.Printf("%g nm: R = %.2f\n", r.NM[i], r.V[i])
	}
	// Output:
	// invented white tile (example data)
	// 400 nm: R = 0.90
	// 500 nm: R = 0.91
	// 600 nm: R = 0.92
	// 700 nm: R = 0.92
	// 800 nm: R = 0.92
}
