package main

import (
	"encoding/json"
	"fmt"
	"io"
	"math"
	"os"
	"strings"
	"text/tabwriter"

	"skysheet/datasheet"
	"skysheet/spectra"
)

func init() {
	register(&command{
		name:    "figures",
		args:    "FILE...",
		summary: "compute solar and thermal figures of one sample from its spectrum files",
		run:     runFigures,
	})
}

func runFigures(e *env, args []string) error {
	c := datasheet.DefaultConditions()
	fs := newFlags(e, commands["figures"])
	conditionFlags(fs, &c)
	asJSON := fs.Bool("json", false, "print one JSON object instead of a table")
	files, err := parseFlags(fs, args)
	if err != nil {
		return err
	}
	if len(files) == 0 {
		return usagef("no spectrum files given")
	}
	if err := c.Validate(); err != nil {
		return usagef("%v", err)
	}
	s, err := readSample(files)
	if err != nil {
		return err
	}
	f, err := datasheet.Compute(s, c)
	if err != nil {
		return err
	}
	if *asJSON {
		enc := json.NewEncoder(e.stdout)
		enc.SetIndent("", "  ")
		return enc.Encode(f)
	}
	printFigures(e.stdout, files, f)
	return nil
}

// readSample reads and merges the spectrum files of one sample.
func readSample(files []string) (*spectra.Spectrum, error) {
	parts := make([]*spectra.Spectrum, 0, len(files))
	for _, name := range files {
		data, err := os.ReadFile(name)
		if err != nil {
			return nil, err
		}
		s, err := spectra.Decode(data, name)
		if err != nil {
			return nil, err
		}
		parts = append(parts, s)
	}
	return spectra.Merge(parts...)
}

// printFigures writes the human-readable report.
func printFigures(w io.Writer, files []string, f *datasheet.Figures) {
	fmt.Fprintf(w, "Sample: %s\n\n", strings.Join(files, " + "))
	tw := tabwriter.NewWriter(w, 0, 0, 2, ' ', 0)
	fmt.Fprintln(tw, "Figure\tValue\tBand\tWeighting\tCoverage")
	for _, x := range f.Figures {
		fmt.Fprintf(tw, "%s\t%s\t%s\t%s\t%s\n", x.Label, fmtValue(x.Value, x.Unit), fmtBand(x.Band, x.BandUnit), x.Weighting, fmtPercent(x.Coverage))
	}
	tw.Flush()
	cl := f.Closure
	fmt.Fprintln(w)
	switch {
	case !cl.OK:
		fmt.Fprintf(w, "Closure: FAILS (tolerance %g)\n", cl.Tolerance)
		for _, p := range cl.Problems {
			fmt.Fprintf(w, "  - %s\n", p)
		}
	case cl.Checked:
		fmt.Fprintf(w, "Closure: holds; |R+T+A-1| at most %.4f (at %g nm), tolerance %g\n", cl.Residual, cl.ResidualNM, cl.Tolerance)
	default:
		fmt.Fprintf(w, "Closure: R, T and A were not all measured; R+T ≤ 1 and no negative values, tolerance %g\n", cl.Tolerance)
	}
	fmt.Fprintln(w, "\nAssumptions:")
	for _, a := range f.Assumptions {
		fmt.Fprintf(w, "  - %s\n", a)
	}
	c := f.Conditions
	fmt.Fprintln(w, "\nConditions:")
	fmt.Fprintf(w, "  solar band %g–%g nm, ASTM G173-03 %s spectrum\n", c.SolarBandNM[0], c.SolarBandNM[1], c.SolarSpectrum)
	fmt.Fprintf(w, "  thermal band %g–%g µm, window band %g–%g µm, blackbody at %g K\n", c.ThermalBandUM[0], c.ThermalBandUM[1], c.WindowBandUM[0], c.WindowBandUM[1], c.TemperatureK)
	fmt.Fprintf(w, "  closure tolerance %g\n", c.ClosureTol)
	printProvenance(w, f.Provenance)
}

// printProvenance writes what is needed to reproduce the figures.
func printProvenance(w io.Writer, p datasheet.Provenance) {
	fmt.Fprintln(w, "\nProvenance:")
	fmt.Fprintf(w, "  software: %s\n", p.Software)
	for _, in := range p.Inputs {
		fmt.Fprintf(w, "  input: %s sha256 %s\n", in.Name, in.SHA256)
	}
	for _, ws := range p.Weightings {
		fmt.Fprintf(w, "  weighting: %s — %s", ws.Name, ws.Version)
		if ws.SHA256 != "" {
			fmt.Fprintf(w, ", sha256 %s", ws.SHA256)
		}
		fmt.Fprintln(w)
	}
	st := p.Settings
	fmt.Fprintf(w, "  settings: closure tolerance %g; Planck grid step %g nm; %s; figures schema %d\n",
		st.ClosureTolerance, st.PlanckStepNM, st.Integration, st.Schema)
}

func fmtValue(v datasheet.Num, unit string) string {
	if math.IsNaN(float64(v)) {
		return "n/a"
	}
	if unit == "" {
		return fmt.Sprintf("%.4f", float64(v))
	}
	return fmt.Sprintf("%.1f %s", float64(v), unit)
}

func fmtBand(b [2]float64, unit string) string {
	if unit == "" {
		return ""
	}
	return fmt.Sprintf("%g–%g %s", b[0], b[1], unit)
}

func fmtPercent(v datasheet.Num) string {
	if math.IsNaN(float64(v)) {
		return ""
	}
	return fmt.Sprintf("%.1f %%", 100*float64(v))
}
