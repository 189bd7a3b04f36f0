package main

import (
	"errors"
	"fmt"
	"io"
	"math"
	"path"
	"text/tabwriter"

	"skysheet/datasheet"
	"skysheet/spectra"
	"skysheet/spectra/colorimetry"
)

// errClaims reports that a claim does not show what the demo means it to.
var errClaims = errors.New("claims do not match their intended findings")

// figuresOf reads a material's generated files back with the spectra
// package, merges them and computes its figures under conditions c.
func figuresOf(m *material, files map[string][]byte, c datasheet.Conditions) (*datasheet.Figures, error) {
	var parts []*spectra.Spectrum
	for _, f := range m.files {
		p := path.Join("content", m.folder(), f.name)
		s, err := spectra.Decode(files[p], p)
		if err != nil {
			return nil, err
		}
		parts = append(parts, s)
	}
	s, err := spectra.Join(parts, spectra.SpliceOptions{})
	if err != nil {
		return nil, err
	}
	return datasheet.Compute(s, spectra.Resolve(s, c.ClosureTol), c)
}

// conditionsOf returns the conditions a material's datasheet uses.
func conditionsOf(m *material) datasheet.Conditions {
	c := datasheet.DefaultConditions()
	if m.closureTol > 0 {
		c.ClosureTol = m.closureTol
	}
	return c
}

// onBasis applies a claim's stated basis to the conditions. A basis the
// conditions cannot take is a mistake in materials.go: it panics.
func onBasis(c datasheet.Conditions, b basis) datasheet.Conditions {
	set := func(key string, v any) {
		if err := c.Set(key, v); err != nil {
			panic(fmt.Sprintf("generate: basis %s: %v", key, err))
		}
	}
	if b.solarBandNM[1] > 0 {
		set("solar_band_nm", b.solarBandNM)
	}
	if b.solarSpectrum != "" {
		set("solar_spectrum", b.solarSpectrum)
	}
	if b.thermalBandUM[1] > 0 {
		set("thermal_band_um", b.thermalBandUM)
	}
	return c
}

// judge tells whether a claim shows what e says, given the computed figure.
func judge(cl claim, f datasheet.Figure, ok bool) bool {
	if cl.values != nil { // a colour: only "supported" is meant
		return ok && cl.expect == expectSupported && len(f.Components) == len(cl.values) && colorDistance(cl, f) <= cl.tolerance
	}
	v, cov := float64(f.Value), float64(f.Coverage)
	tol := math.Max(cl.tolerance, 0.005)
	switch cl.expect {
	case expectSupported:
		return ok && math.Abs(cl.value-v) <= tol && cov > 0.999
	case expectTooHigh:
		return ok && cl.value-v > tol && cl.value <= 1
	case expectPercent:
		return ok && cl.value > 1 && math.Abs(cl.value/100-v) <= tol/100
	case expectPartial:
		// Below 90 % coverage the figure is not given (docs/cooling.md).
		if ok && math.IsNaN(v) && cov < 0.90 {
			return true
		}
		return ok && !math.IsNaN(v) && cov < 0.99 && math.Abs(cl.value-v) <= tol
	case expectUncheckable:
		return !ok || math.IsNaN(v)
	}
	return false
}

// colorDistance is the colour difference between a colour claim and the
// computed figure, by the claim's formula (its own implementation of both
// lives in spectra/colorimetry, tested against published data).
func colorDistance(cl claim, f datasheet.Figure) float64 {
	c := make([]float64, len(f.Components))
	for i, x := range f.Components {
		c[i] = float64(x)
	}
	if len(c) == 3 && cl.deltaE == datasheet.DeltaE2000 {
		return colorimetry.DeltaE2000(colorimetry.Lab{L: c[0], A: c[1], B: c[2]},
			colorimetry.Lab{L: cl.values[0], A: cl.values[1], B: cl.values[2]})
	}
	var d float64
	for i := range c {
		d += (c[i] - cl.values[i]) * (c[i] - cl.values[i])
	}
	return math.Sqrt(d)
}

// verify prints every material's key figures and checks its claims.
func verify(files []output, w io.Writer) error {
	byPath := make(map[string][]byte, len(files))
	for _, f := range files {
		byPath[f.path] = f.data
	}
	tw := tabwriter.NewWriter(w, 0, 0, 2, ' ', tabwriter.AlignRight)
	fmt.Fprintln(tw, "material\tR_sol\tT_sol\tR_uv\tR_vis\tR_nir\tε\tε_win\tcov_th\tclosure\tL*\ta*\tb*\t")
	var bad []string
	for _, m := range materials() {
		f, err := figuresOf(&m, byPath, conditionsOf(&m))
		if err != nil {
			return err
		}
		lab := f.Color.Reflectance.Lab
		fmt.Fprintf(tw, "%s\t%.3f\t%.3f\t%.3f\t%.3f\t%.3f\t%.3f\t%.3f\t%.2f\t%v\t%.1f\t%.1f\t%.1f\t\n", m.folder(),
			f.SolarReflectance, f.SolarTransmittance, f.UVReflectance, f.VisibleReflectance, f.NIRReflectance,
			f.ThermalEmittance, f.WindowEmittance, f.ThermalCoverage, f.Closure.OK, lab[0], lab[1], lab[2])
		if !f.Closure.OK {
			bad = append(bad, fmt.Sprintf("%s: closure fails: %v", m.path, f.Closure.Problems))
		}
		for _, cl := range m.claims {
			fc, err := figuresOf(&m, byPath, onBasis(conditionsOf(&m), cl.basis))
			if err != nil {
				return err
			}
			fig, ok := fc.Figure(cl.figure)
			if !judge(cl, fig, ok) {
				bad = append(bad, fmt.Sprintf("%s: claim %s = %g (±%g) was meant to be %s, computed %.4f (coverage %.3f)",
					m.path, cl.figure, cl.value, cl.tolerance, cl.expect, float64(fig.Value), float64(fig.Coverage)))
			}
		}
	}
	tw.Flush()
	fmt.Fprintln(w)
	fmt.Fprintln(w, "claims (claimed / computed on the claim's basis):")
	for _, m := range materials() {
		for _, cl := range m.claims {
			fc, _ := figuresOf(&m, byPath, onBasis(conditionsOf(&m), cl.basis))
			fig, _ := fc.Figure(cl.figure)
			if cl.values != nil {
				fmt.Fprintf(w, "  %-22s %-20s %v / %s, difference %.2f  meant: %s\n", m.folder(), cl.figure, cl.values,
					fig.Text(), colorDistance(cl, fig), cl.expect)
				continue
			}
			fmt.Fprintf(w, "  %-22s %-20s %7g / %.4f  coverage %.3f  meant: %s\n", m.folder(), cl.figure, cl.value,
				float64(fig.Value), float64(fig.Coverage), cl.expect)
		}
	}
	if len(bad) > 0 {
		for _, b := range bad {
			fmt.Fprintln(w, "  problem:", b)
		}
		return errClaims
	}
	return nil
}
