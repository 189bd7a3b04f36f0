// Command genlib writes an invented library of N materials for skysheet's
// benchmarks: skysheet.yaml and, under content/, one Markdown file per
// material with two spectrum files in the neutral column format — a
// UV-Vis-NIR file (250–2500 nm every 1 nm, 2251 rows) and an FTIR file
// (4000–400 cm⁻¹ every 2 cm⁻¹, 1801 rows) — plus one comparison page per
// hundred materials.
//
//	go run ./bench/genlib -n 1000 -o /tmp/lib1000 [-seed 1]
//
// Everything it writes is invented: the makers, the products and the
// spectra, which are synthetic data, not measurements; every file says so.
// The output depends only on -n and -seed (the same bytes every time, in
// any number of threads).
//
// # The spectra
//
// Each material is drawn from one of seven families, each a small model
// evaluated from 250 nm to 25 µm so that the two files meet at 2500 nm
// without a step:
//
//   - white paints (rutile titania) and white coatings (barium sulfate,
//     porous polymer) and dark paints (black, grey, near-infrared
//     reflective): an optically thick Kubelka–Munk layer (Kubelka and Munk
//     1931) with the Saunderson (1942) surface correction; absorption from a
//     pigment edge, C–H and water overtones in the near infrared and the
//     binder's bands in the thermal infrared, scattering falling with
//     wavelength;
//   - silvered polyester films: a silver mirror seen twice through the film;
//   - sheet metal: high infrared reflectance, aluminium's dip near 830 nm;
//   - transparent covers: a polyethylene film (transparent in the thermal
//     infrared but for its C–H bands) or float glass (Fe²⁺ band near
//     1050 nm, opaque past about 4.5 µm, silicate reststrahlen peaks);
//   - white fabrics: scattering fibres and open area that transmits.
//
// Parameters are drawn per material; Gaussian noise (larger at the ends of
// each range) and a small step at the UV-Vis-NIR detector change-over at
// 860 nm are added, and values are kept within 0..1 with R + T ≤ 1. A third
// of the materials state invented claims, some of them optimistic.
package main

import (
	"errors"
	"flag"
	"fmt"
	"io"
	"os"
	"time"
)

func main() {
	err := run(os.Args[1:], os.Stdout, os.Stderr)
	var ue usageError
	switch {
	case err == nil:
	case errors.Is(err, flag.ErrHelp):
		os.Exit(2)
	case errors.As(err, &ue):
		fmt.Fprintln(os.Stderr, "genlib:", err)
		os.Exit(2)
	default:
		fmt.Fprintln(os.Stderr, "genlib:", err)
		os.Exit(1)
	}
}

// usageError marks bad usage: exit status 2.
type usageError string

func (e usageError) Error() string { return string(e) }

func run(args []string, stdout, stderr io.Writer) error {
	fl := flag.NewFlagSet("genlib", flag.ContinueOnError)
	fl.SetOutput(stderr)
	n := fl.Int("n", 1000, "number of materials")
	out := fl.String("o", "", "output folder: created, or empty (required)")
	seed := fl.Uint64("seed", 1, "seed: the same -n and -seed give the same files")
	if err := fl.Parse(args); err != nil {
		return err
	}
	if *out == "" || fl.NArg() > 0 || *n < 1 {
		return usageError("usage: genlib -n N -o DIR [-seed S] (N ≥ 1)")
	}
	start := time.Now()
	if err := Generate(*out, *n, *seed); err != nil {
		return err
	}
	fmt.Fprintf(stdout, "wrote %d invented materials to %s in %.1f s\n", *n, *out, time.Since(start).Seconds())
	return nil
}
