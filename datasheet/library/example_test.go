package library_test

import (
	"fmt"
	"testing/fstest"

	"skysheet/datasheet/library"
)

func ExampleLoad() {
	fsys := fstest.MapFS{
		"skysheet.yaml": {Data: []byte("title: Example library\n")},
		"content/grey.md": {Data: []byte(`---
title: Grey test panel (invented)
maker: Example maker (invented)
spectra:
  - file: grey.csv
---
A flat grey reflector.
`)},
		"content/grey.csv": {Data: []byte("wavelength_nm,R\n280,0.5\n2500,0.5\n")},
	}
	lib, err := library.Load(fsys)
	if err != nil {
		fmt.Println(err)
		return
	}
	m := lib.Materials[0]
	s, _, err := lib.ReadSample(m)
	if err != nil {
		fmt.Println(err)
		return
	}
	lo, hi := s.Range()
	fmt.Printf("%s: %s, %g–%g nm, solar band %s\n", m.Slug, m.Front.Title, lo, hi, m.Conditions.Text("solar_band_nm"))

	fsys["content/grey.md"].Data = []byte("---\ntitle: Grey\nmakr: x\n---\n")
	_, err = library.Load(fsys)
	fmt.Println(err)
	// Output:
	// grey: Grey test panel (invented), 280–2500 nm, solar band 280–2500 nm
	// content/grey.md:3:1: unknown key: "makr" (did you mean "maker"?)
	// content/grey.md:1: missing required key: maker (or lab: who made or measured the material)
	// content/grey.md:1: missing required key: spectra (a list of spectra files, each with file:, or a stack of layers)
}
