package main

import (
	"encoding/json"
	"fmt"
	"io"
	"strconv"
	"strings"
	"text/tabwriter"

	"skysheet/datasheet"
	"skysheet/datasheet/evaluate"
)

// stackLayer is one layer of --stack: its files and, when given, its
// thickness and conductivity.
type stackLayer struct {
	files     []string
	conductor *datasheet.Conductor
}

// parseStack reads the value of --stack: layers top first, separated by
// commas; a layer's files joined by "+"; optionally "@D:K" after a layer,
// its thickness D in mm and conductivity K in W m⁻¹ K⁻¹. File names
// holding ",", "+" or "@" cannot be given this way.
func parseStack(v string) ([]stackLayer, error) {
	var out []stackLayer
	for i, part := range strings.Split(v, ",") {
		part = strings.TrimSpace(part)
		files, cond, hasCond := strings.Cut(part, "@")
		var l stackLayer
		for _, f := range strings.Split(files, "+") {
			if f = strings.TrimSpace(f); f == "" {
				return nil, fmt.Errorf("--stack layer %d: an empty file name in %q: want FILE[+FILE...][@MM:K], layers separated by commas", i+1, part)
			}
			l.files = append(l.files, f)
		}
		if hasCond {
			ds, ks, ok := strings.Cut(cond, ":")
			d, errD := strconv.ParseFloat(strings.TrimSpace(ds), 64)
			k, errK := strconv.ParseFloat(strings.TrimSpace(ks), 64)
			if !ok || errD != nil || errK != nil {
				return nil, fmt.Errorf("--stack layer %d: %q after @: want thickness in mm and conductivity in W m⁻¹ K⁻¹, e.g. @3:0.04", i+1, cond)
			}
			if !(d > 0 && d <= 1000) || !(k > 0 && k <= 1000) {
				return nil, fmt.Errorf("--stack layer %d: thickness %g mm, conductivity %g W m⁻¹ K⁻¹: want 0 < d ≤ 1000 mm and 0 < k ≤ 1000", i+1, d, k)
			}
			l.conductor = &datasheet.Conductor{ThicknessM: d / 1000, ConductivityWmK: k}
		}
		out = append(out, l)
	}
	if len(out) < 2 {
		return nil, fmt.Errorf("--stack: want at least two layers separated by commas, top first, e.g. --stack cover.csv,emitter.csv")
	}
	return out, nil
}

// runStack reads the layers of --stack, computes the stack and prints its
// figures as runFigures prints a sample's.
func runStack(e *env, stack []stackLayer, so sampleOptions, c datasheet.Conditions, save string, asJSON bool) error {
	layers := make([]datasheet.Layer, len(stack))
	var names, inputs []string
	for i, l := range stack {
		s, err := readSample(l.files, so)
		if err != nil {
			return err
		}
		printWarnings(e.stderr, "figures", s)
		layers[i] = datasheet.Layer{Name: strings.Join(l.files, " + "), Sample: s, Conductor: l.conductor}
		names = append(names, layers[i].Name)
		inputs = append(inputs, inputNames(s)...)
	}
	if save != "" && save != "-" {
		if err := refuseOverwrite(save, append(inputs, c.Sky.File, c.Weather.File)); err != nil {
			return err
		}
	}
	m, err := evaluate.Stack(layers, c)
	if err != nil {
		return err
	}
	if save != "" {
		if err := writeSpectrumFile(e.stdout, save, m.Sample); err != nil {
			return err
		}
	}
	if asJSON {
		enc := json.NewEncoder(rawWriter(e.stdout))
		enc.SetIndent("", "  ")
		return enc.Encode(m.Figures)
	}
	printFigures(e.stdout, []string{"stack of " + strings.Join(names, " over ")}, m.Figures)
	return nil
}

// printStack writes a stack's layers and its emitter with and without the
// layers above.
func printStack(w io.Writer, st *datasheet.StackReport, f *datasheet.Figures) {
	fmt.Fprintln(w, "\nLayers, top first:")
	tw := tabwriter.NewWriter(w, 0, 0, 2, ' ', 0)
	fmt.Fprintln(tw, "  layer\tthickness\tconductivity\tsunlight absorbed here\talone: R sol\tT sol\tthermal ε")
	for i, l := range st.Layers {
		d, k := "—", "—"
		if !isNaNNum(l.ThicknessMM) {
			d, k = fmt.Sprintf("%g mm", float64(l.ThicknessMM)), fmt.Sprintf("%g W m⁻¹ K⁻¹", float64(l.ConductivityWmK))
		}
		fmt.Fprintf(tw, "  %d. %s\t%s\t%s\t%s\t%s\t%s\t%s\n", i+1, l.Name, d, k, fmtFixed(l.SolarAbsorbed, 4),
			fmtFixed(l.SolarReflectance, 4), fmtFixed(l.SolarTransmittance, 4), fmtFixed(l.ThermalEmittance, 4))
	}
	tw.Flush()
	u := st.Uncovered
	fmt.Fprintf(w, "\nBottom layer with the layers above (h_eff %.2f W m⁻² K⁻¹) and alone (h %g W m⁻² K⁻¹):\n", float64(st.HEffWm2K), float64(st.HWm2K))
	tw = tabwriter.NewWriter(w, 0, 0, 2, ' ', 0)
	fmt.Fprintln(tw, "  \twith the layers above\talone")
	fmt.Fprintf(tw, "  net cooling power at ambient, sun\t%s\t%s\n", fmtUnit(f.CoolingPowerWm2, "W/m²"), fmtUnit(u.CoolingPowerWm2, "W/m²"))
	fmt.Fprintf(tw, "  net cooling power at ambient, night\t%s\t%s\n", fmtUnit(f.CoolingPowerNightWm2, "W/m²"), fmtUnit(u.CoolingPowerNightWm2, "W/m²"))
	fmt.Fprintf(tw, "  equilibrium, sun\t%s\t%s\n", fmtDepression(f.EquilibriumDeltaK), fmtDepression(u.EquilibriumDeltaK))
	fmt.Fprintf(tw, "  equilibrium, night\t%s\t%s\n", fmtDepression(f.EquilibriumDeltaNightK), fmtDepression(u.EquilibriumDeltaNightK))
	tw.Flush()
}

func isNaNNum(v datasheet.Num) bool { return v != v }
