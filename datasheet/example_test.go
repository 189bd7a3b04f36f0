package datasheet_test

import (
	"fmt"
	"strings"

	"skysheet/datasheet"
	"skysheet/spectra"
)

func ExampleCompute() {
	in := "wavelength_um,R\n0.28,0.95\n2.5,0.95\n2.5001,0.04\n25,0.04\n"
	s, _ := spectra.Parse(strings.NewReader(in), "flat.csv")
	f, _ := datasheet.Compute(s, datasheet.DefaultConditions())
	fmt.Printf("R_sol %.3f, ε %.3f\n", f.SolarReflectance, f.ThermalEmittance)
	// Output: R_sol 0.950, ε 0.960
}
