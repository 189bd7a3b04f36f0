package main

import (
	"flag"
	"fmt"
	"slices"
	"strconv"
	"strings"

	"skysheet/datasheet"
	"skysheet/datasheet/evaluate"
	"skysheet/spectra/msg"
)

// parseClaim reads a claim written on the command line:
// FIGURE=VALUE, FIGURE=VALUE±TOL (also +- or +/- for ±), e.g.
// "thermal_emittance=0.95±0.02"; a colour as its components separated by
// commas, the tolerance being a colour difference: "color_lab=52,24.5,18±2".
// Errors are bad usage.
func parseClaim(s string) (datasheet.Claim, error) {
	key, val, ok := strings.Cut(s, "=")
	key, val = strings.TrimSpace(key), strings.TrimSpace(val)
	if !ok || key == "" || val == "" {
		return datasheet.Claim{}, fmt.Errorf("%s: want FIGURE=VALUE or FIGURE=VALUE±TOL, e.g. thermal_emittance=0.95±0.02", msg.Quote(s))
	}
	keys := datasheet.FigureKeys()
	if !slices.Contains(keys, key) {
		best, close := msg.Nearest(key, keys)
		if close {
			return datasheet.Claim{}, fmt.Errorf("%s: no figure %s; did you mean %q?", msg.Quote(s), msg.Quote(key), best)
		}
		return datasheet.Claim{}, fmt.Errorf("%s: no figure %s; known figures: %s", msg.Quote(s), msg.Quote(key), strings.Join(keys, ", "))
	}
	c := datasheet.Claim{Figure: key}
	for _, pm := range []string{"±", "+/-", "+-"} {
		if v, tol, ok := strings.Cut(val, pm); ok {
			t, err := strconv.ParseFloat(strings.TrimSpace(tol), 64)
			if err != nil {
				return datasheet.Claim{}, fmt.Errorf("%s: tolerance %s is not a number", msg.Quote(s), msg.Quote(strings.TrimSpace(tol)))
			}
			c.Tolerance, val = t, strings.TrimSpace(v)
			break
		}
	}
	if strings.Contains(val, ",") { // a colour: L*,a*,b* or x,y
		for _, part := range strings.Split(val, ",") {
			v, err := strconv.ParseFloat(strings.TrimSpace(part), 64)
			if err != nil {
				return datasheet.Claim{}, fmt.Errorf("%s: value %s is not a number", msg.Quote(s), msg.Quote(strings.TrimSpace(part)))
			}
			c.Values = append(c.Values, v)
		}
		if err := c.Validate(); err != nil {
			return datasheet.Claim{}, err
		}
		return c, nil
	}
	v, err := strconv.ParseFloat(val, 64)
	if err != nil {
		return datasheet.Claim{}, fmt.Errorf("%s: value %s is not a number (write a fraction as 0.95, not 95 %%)", msg.Quote(s), msg.Quote(val))
	}
	c.Value = v
	if err := c.Validate(); err != nil {
		return datasheet.Claim{}, err
	}
	return c, nil
}

// claimBasis returns the basis that the condition flags given on the
// command line state for a claim, and sets those conditions of c back to
// the defaults: the figures are computed on the defaults, and each claim
// on its stated basis, as for a claim of a library (angle is the claim's
// angle of incidence, 0 when not stated).
func claimBasis(fs *flag.FlagSet, c *datasheet.Conditions, angle float64) datasheet.Basis {
	d := datasheet.DefaultConditions()
	b := datasheet.Basis{AngleDeg: angle}
	fs.Visit(func(f *flag.Flag) {
		switch f.Name {
		case "solar-band":
			b.SolarBandNM = []float64{c.SolarBand.Lo, c.SolarBand.Hi}
			c.SolarBand = d.SolarBand
		case "solar-spectrum":
			b.SolarSpectrum = c.SolarSpectrum.String()
			c.SolarSpectrum = d.SolarSpectrum
		case "thermal-band":
			lo, hi := c.ThermalBand.UM()
			b.ThermalBandUM = []float64{lo, hi}
			c.ThermalBand = d.ThermalBand
		case "window-band":
			lo, hi := c.WindowBand.UM()
			b.WindowBandUM = []float64{lo, hi}
			c.WindowBand = d.WindowBand
		case "temperature":
			b.TemperatureK = c.TemperatureK
			c.TemperatureK = d.TemperatureK
		}
	})
	return b
}

// printClaims prints the verdicts of the claims judged on one sample as
// "skysheet review" prints a material's, and returns errSilentFailure when
// the sample fails as a library's material would (a claim not supported,
// closure failing, or with strict a claim that cannot be checked).
func printClaims(e *env, files []string, m *evaluate.Material, asJSON, strict bool) error {
	name := strings.Join(files, " + ")
	cl := m.Figures.Closure
	rm := reviewMaterial{Path: name, Errors: []string{}, Inputs: m.Inputs, Closure: &cl, Verdicts: m.Verdicts, Warnings: m.Warnings}
	r := &reviewReport{Library: name, Software: "skysheet " + datasheet.Version(), Strict: strict, OK: !rm.failed(strict),
		Materials: []reviewMaterial{rm}}
	r.Counts.Add(m.Verdicts...)
	if asJSON {
		if err := writeReviewJSON(rawWriter(e.stdout), r); err != nil {
			return err
		}
	} else {
		ew := &errWriter{w: e.stdout}
		ew.printf("Claims on one sample, reviewed by %s\n", r.Software)
		writeMaterialText(ew, rm, name)
		ew.printf("\n")
		writeResultText(ew, r)
		if ew.err != nil {
			return ew.err
		}
	}
	if !r.OK {
		return errSilentFailure
	}
	return nil
}
