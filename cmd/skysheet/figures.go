package main

import (
	"encoding/json"
	"fmt"
	"io"
	"math"
	"slices"
	"strconv"
	"strings"
	"text/tabwriter"

	"skysheet/datasheet"
	"skysheet/datasheet/evaluate"
	"skysheet/spectra"
)

func init() {
	register(&command{
		name:    "figures",
		args:    "FILE... | --stack LAYER,LAYER...",
		summary: "compute solar and thermal figures of one sample from its spectrum files, or of a stack of layers",
		run:     runFigures,
	})
}

func runFigures(e *env, args []string) error {
	c := datasheet.DefaultConditions()
	fs := newFlags(e, commands["figures"])
	conditionFlags(fs, &c)
	asJSON := fs.Bool("json", false, "print one JSON object instead of a table")
	asCSV := fs.Bool("csv", false, "print the figures as CSV: one row per figure, full precision, units in the column names")
	var so sampleOptions
	sampleFlags(fs, "splice-", &so)
	save := fs.String("save-spectrum", "", "also write the joined, corrected spectrum to this file in the neutral format")
	var claims []datasheet.Claim
	fs.Func("claim", "judge a claimed `FIGURE=VALUE[±TOL]` (e.g. thermal_emittance=0.95±0.02; repeatable) and print the verdicts instead of the figures; the solar/thermal/window band, solar spectrum and temperature flags given become the claim's stated basis", func(s string) error {
		c, err := parseClaim(s)
		claims = append(claims, c)
		return err
	})
	deltaE := fs.String("delta-e", "", "with --claim of color_lab: the colour difference it is judged by, cie76 (CIE 1976 ΔE*ab, the default) or ciede2000")
	angle := fs.Float64("angle", 0, "with --claim: the angle of incidence the claim is stated at, degrees")
	strict := fs.Bool("strict", false, "with --claim: also fail when a claim cannot be checked")
	stackSpec := fs.String("stack", "", "compute a stack of layers instead of one sample: `LAYER,LAYER...` top first, each layer FILE[+FILE...] with optionally @MM:K, its thickness in mm and conductivity in W m⁻¹ K⁻¹ (e.g. cover.csv@3:0.04,emitter-uv.csv+emitter-ir.csv)")
	files, err := parseFlags(fs, args)
	if err != nil {
		return err
	}
	var stack []stackLayer
	if *stackSpec != "" {
		if len(files) > 0 {
			return usagef("--stack names the files of every layer: give no other files")
		}
		if len(claims) > 0 {
			return usagef("--claim does not go with --stack; put the stack in a library to judge its claims")
		}
		if stack, err = parseStack(*stackSpec); err != nil {
			return usagef("%v", err)
		}
	} else if len(files) == 0 {
		return usagef("no spectrum files given")
	}
	if *asJSON && *asCSV {
		return usagef("--json and --csv: give one")
	}
	if len(claims) > 0 && *asCSV {
		return usagef("--csv prints figures, not the verdicts of --claim")
	}
	if len(claims) == 0 && (*angle != 0 || *strict || *deltaE != "") {
		return usagef("--angle, --strict and --delta-e go with --claim")
	}
	if len(claims) > 0 {
		b := claimBasis(fs, &c, *angle)
		for i := range claims {
			claims[i].Basis = b
			if len(claims[i].Values) == 3 {
				claims[i].DeltaE = *deltaE
			}
			if err := claims[i].Validate(); err != nil {
				return usagef("--claim %v", err)
			}
		}
	}
	// Bad conditions are bad usage; a bad sky file is bad data.
	plain := c
	plain.Sky, plain.Weather = datasheet.SkyChoice{}, datasheet.WeatherChoice{}
	if err := plain.Validate(); err != nil {
		return usagef("%v", err)
	}
	if err := loadSky(&c, so.maxSize); err != nil {
		return err
	}
	if err := loadWeather(&c, so.maxSize); err != nil {
		return err
	}
	if err := c.Validate(); err != nil {
		return err
	}
	if err := validateSample(so); err != nil {
		return err
	}
	if stack != nil {
		return runStack(e, stack, so, c, *save, *asJSON)
	}
	s, err := readSample(files, so)
	if err != nil {
		return err
	}
	printWarnings(e.stderr, "figures", s)
	if *save != "" && *save != "-" {
		if err := refuseOverwrite(*save, append(inputNames(s), c.Sky.File, c.Weather.File)); err != nil {
			return err
		}
	}
	if *save != "" {
		if err := writeSpectrumFile(e.stdout, *save, s); err != nil {
			return err
		}
	}
	m, err := evaluate.Sample(s, c, claims...)
	if err != nil {
		return err
	}
	if len(claims) > 0 {
		return printClaims(e, files, m, *asJSON, *strict)
	}
	f := m.Figures
	if *asCSV {
		return f.WriteCSV(rawWriter(e.stdout))
	}
	if *asJSON {
		enc := json.NewEncoder(rawWriter(e.stdout))
		enc.SetIndent("", "  ")
		return enc.Encode(f)
	}
	printFigures(e.stdout, files, f)
	return nil
}

// printFigures writes the human-readable report.
func printFigures(w io.Writer, files []string, f *datasheet.Figures) {
	fmt.Fprintf(w, "Sample: %s\n\n", strings.Join(files, " + "))
	withU := false
	for _, x := range f.Figures {
		withU = withU || x.Uncertainty != nil
	}
	tw := tabwriter.NewWriter(w, 0, 0, 2, ' ', 0)
	if withU {
		fmt.Fprintln(tw, "Figure\tValue\tu noise\tu together\tu worst\tu known for\tBand\tWeighting\tCoverage")
	} else {
		fmt.Fprintln(tw, "Figure\tValue\tBand\tWeighting\tCoverage")
	}
	var missing []string
	for _, x := range f.Figures {
		v := fmtFigure(x, x.Value)
		switch {
		case x.Reason != "":
			v += " (see below)"
			missing = append(missing, fmt.Sprintf("%s: n/a, %s", x.Label, x.Reason))
		case x.Partial:
			v += " (partial data)"
		}
		for _, n := range f.NotesFor(x.Key) {
			v += " [" + n.Code + "]"
		}
		fmt.Fprintf(tw, "%s\t%s\t", x.Label, v)
		if withU {
			if u := x.Uncertainty; u != nil {
				fmt.Fprintf(tw, "±%s\t±%s\t±%s\t%s\t", fmtUncertainty(x, u.Uncorrelated), fmtUncertainty(x, u.Correlated),
					fmtUncertainty(x, u.WorstCase), fmtPercent(u.Reach))
			} else {
				fmt.Fprint(tw, "\t\t\t\t")
			}
		}
		fmt.Fprintf(tw, "%s\t%s\t%s\n", x.BandText(), x.Weighting, fmtPercent(x.Coverage))
	}
	tw.Flush()
	for _, m := range missing {
		fmt.Fprintf(w, "  - %s\n", m)
	}
	if slices.ContainsFunc(f.Figures, func(x datasheet.Figure) bool { return x.Partial }) {
		fmt.Fprintf(w, "  Partial data: the data cover %g–%g %% of the figure's weighting; below %g %% a figure is not given.\n",
			100*datasheet.Rules.MinShownCoverage, 100*datasheet.Rules.MinCoverage, 100*datasheet.Rules.MinShownCoverage)
	}
	for _, n := range f.ModelNotes {
		fmt.Fprintf(w, "  [%s] %s\n", n.Code, n.Text)
	}
	printColor(w, f.Color)
	cl := f.Closure
	fmt.Fprintln(w)
	switch {
	case !cl.OK:
		fmt.Fprintf(w, "Closure: FAILS (tolerance %g)\n", cl.Tolerance)
		for _, p := range cl.Problems {
			fmt.Fprintf(w, "  - %s\n", p)
		}
	case cl.Checked:
		fmt.Fprintf(w, "Closure: holds; |R+T+A-1| at most %.4f (at %s nm), tolerance %g\n", cl.Residual, fmtNM(cl.ResidualNM), cl.Tolerance)
	default:
		fmt.Fprintf(w, "Closure: R, T and A were not all measured; R+T ≤ 1 and no negative values, tolerance %g\n", cl.Tolerance)
	}
	if o := f.Origins.Text(); o != "" {
		fmt.Fprintf(w, "R, T and A: %s\n", o)
	}
	printSplices(w, f.Splices)
	if !math.IsNaN(float64(f.ThermalEmittance)) {
		fmt.Fprintf(w, "Emittance: %s\n", f.EmittanceBasis.Words())
	}
	printCooling(w, f)
	if f.Stack != nil {
		printStack(w, f.Stack, f)
	}
	printSeries(w, f.Weather)
	fmt.Fprintln(w, "\nAssumptions:")
	for _, a := range f.Assumptions {
		if a != "Sky: "+f.Sky.Description { // printed above
			fmt.Fprintf(w, "  - %s\n", a)
		}
	}
	c := f.Conditions
	fmt.Fprintln(w, "\nConditions:")
	fmt.Fprintf(w, "  solar band %s, ASTM G173-03 %s spectrum\n", c.Text("solar_band_nm"), c.SolarSpectrum)
	fmt.Fprintf(w, "  thermal band %s, window band %s, blackbody at %s\n", c.Text("thermal_band_um"), c.Text("window_band_um"), c.Text("temperature_k"))
	fmt.Fprintf(w, "  closure tolerance %s\n", c.Text("closure_tolerance"))
	fmt.Fprintf(w, "  cooling: air %s, dew point %s, sun %s, h %s, exchange band %s, sky %s\n",
		c.Text("ambient_k"), c.Text("dew_point_c"), c.Text("irradiance_w_m2"), c.Text("h_w_m2k"), c.Text("exchange_band_um"), c.Sky)
	if c.HourOfDay.On || c.StationPressure.On {
		fmt.Fprintf(w, "  terms of the clear-sky correlation: hour of day %s, station pressure %s\n", c.Text("hour_of_day"), c.Text("station_pressure_hpa"))
	}
	if c.Weather.File != "" {
		fmt.Fprintf(w, "  weather series %s\n", c.Weather)
	}
	printProvenance(w, f.Provenance)
	if len(f.Cautions) > 0 {
		fmt.Fprintln(w, "\nCautions:")
		for _, x := range f.Cautions {
			fmt.Fprintf(w, "  - %s\n", x)
		}
	}
}

// printColor writes the screen colour of the reflectance (and of the
// transmittance) with its note, or why there is none.
func printColor(w io.Writer, c datasheet.Colors) {
	for _, x := range []*datasheet.Color{&c.Reflectance, c.Transmittance} {
		switch {
		case x == nil:
		case x.Reason != "":
			fmt.Fprintf(w, "\nColour of the %s: n/a, %s.\n", x.Of, x.Reason)
		default:
			fmt.Fprintf(w, "\nColour of the %s on screen: sRGB %s. %s\n", x.Of, x.SRGB, x.Note)
		}
	}
}

// printCooling writes the sky, the cooling figures, the SRI and the
// sensitivity table in words.
func printCooling(w io.Writer, f *datasheet.Figures) {
	c := f.Conditions
	fmt.Fprintf(w, "\nSky: %s\n", f.Sky.Description)
	fmt.Fprintf(w, "\nCooling of a horizontal surface, air at %g K, h %g W m⁻² K⁻¹, sun %g W/m²:\n", c.AmbientK, c.HWm2K, c.IrradianceWm2)
	t := f.CoolingTerms
	tw := tabwriter.NewWriter(w, 0, 0, 2, ' ', 0)
	fmt.Fprintln(tw, "  \twith sun\tat night")
	fmt.Fprintf(tw, "  net cooling power at ambient\t%s\t%s\n", fmtUnit(f.CoolingPowerWm2, "W/m²"), fmtUnit(f.CoolingPowerNightWm2, "W/m²"))
	fmt.Fprintf(tw, "  equilibrium\t%s\t%s\n", fmtDepression(f.EquilibriumDeltaK), fmtDepression(f.EquilibriumDeltaNightK))
	fmt.Fprintf(tw, "  surface temperature\t%s\t%s\n", fmtUnit(t.EquilibriumK, "K"), fmtUnit(t.EquilibriumNightK, "K"))
	tw.Flush()
	fmt.Fprintf(w, "  At ambient the surface radiates %s, absorbs %s from the sky and %s of sunlight.\n",
		fmtUnit(t.RadiatedWm2, "W/m²"), fmtUnit(t.AtmosphericWm2, "W/m²"), fmtUnit(t.SolarWm2, "W/m²"))
	if len(t.HeldBands) > 0 {
		fmt.Fprintf(w, "  Emittance held constant beyond the data over %s: %s of blackbody power (%s of the band).\n",
			fmtBands(t.HeldBands), fmtUnit(f.HeldPowerWm2, "W/m²"), fmtPercent(t.HeldShare))
		u := t.HeldUncertainty
		if p, ok := u["cooling_power_night_w_m2"]; ok {
			fmt.Fprintf(w, "  With 0.9 to 1 there instead (standard uncertainty of the extrapolation): ±%s at night", fmtUnit(p, "W/m²"))
			if d, ok := u["equilibrium_delta_night_k"]; ok {
				fmt.Fprintf(w, ", ±%s on the night equilibrium", fmtUnit(d, "K"))
			}
			fmt.Fprintln(w, ".")
		}
	}
	if len(f.Sensitivity) > 0 {
		fmt.Fprintln(w, "\nSensitivity (change of the figures when one condition changes):")
		tw = tabwriter.NewWriter(w, 0, 0, 2, ' ', 0)
		fmt.Fprintln(tw, "  change\tpower, sun\tpower, night\tbelow ambient, sun\tbelow ambient, night\t")
		for _, r := range f.Sensitivity {
			name := r.Parameter
			switch r.Parameter {
			case "h_w_m2k":
				name = "h"
			case "dew_point_c":
				name = "dew point"
			}
			fmt.Fprintf(tw, "  %s %+g %s\t%s\t%s\t%s\t%s\t%s\n", name, r.Change, r.Unit,
				fmtSigned(r.DeltaDayWm2, "W/m²"), fmtSigned(r.DeltaNightWm2, "W/m²"),
				fmtSigned(r.DeltaEquilibriumDayK, "K"), fmtSigned(r.DeltaEquilibriumNightK, "K"), r.Note)
		}
		tw.Flush()
	}
	s := f.SRI
	fmt.Fprintf(w, "\nSolar Reflectance Index (ASTM E1980, solar absorptance %s, thermal emittance %s): low wind %s, medium %s, high %s\n",
		fmtFixed(s.SolarAbsorptance, 4), fmtFixed(s.ThermalEmittance, 4), fmtFixed(s.Low, 1), fmtFixed(s.Medium, 1), fmtFixed(s.High, 1))
	if s.Translucent {
		fmt.Fprintln(w, "  NOT APPLICABLE AS IS: solar transmittance above 0.01.")
	}
	fmt.Fprintf(w, "  %s\n", s.Note)
}

// printSeries writes the figures over a weather series: totals, months,
// the model's assumptions and its cautions.
func printSeries(w io.Writer, f *datasheet.SeriesFigures) {
	if f == nil {
		return
	}
	fmt.Fprintf(w, "\nOver the weather series %s (%s, sha256 %s), %d hours from %s to %s:\n", f.Series, f.File, f.SHA256, f.Hours, f.From, f.To)
	fmt.Fprintf(w, "  held at the air temperature: %s of cooling (hourly sum; trapezoid rule %s)\n",
		fmtEnergy(f.EnergyKWhM2), fmtEnergy(f.EnergyTrapezoidKWhM2))
	fmt.Fprintf(w, "  free-floating: %d hours below the air, %s K·h; mean depression %s, deepest %s\n",
		f.HoursBelowAir, fmtFixed(f.DegreeHoursBelowAir, 0), fmtUnit(f.MeanDepressionK, "K"), fmtUnit(f.DeepestDepressionK, "K"))
	if len(f.Months) > 0 {
		tw := tabwriter.NewWriter(w, 0, 0, 2, ' ', tabwriter.AlignRight)
		fmt.Fprintln(tw, "  month\thours\tenergy kWh/m²\thours below air\tK·h below air\tmean depression K\tdeepest K\tmean air °C\t")
		for _, m := range f.Months {
			fmt.Fprintf(tw, "  %s\t%d\t%s\t%d\t%s\t%s\t%s\t%s\t\n", m.Period, m.Hours, fmtFixed(m.EnergyKWhM2, 2), m.HoursBelowAir,
				fmtFixed(m.DegreeHoursBelowAir, 0), fmtFixed(m.MeanDepressionK, 2), fmtFixed(m.DeepestDepressionK, 2), fmtFixed(m.MeanAirC, 1))
		}
		tw.Flush()
	}
	fmt.Fprintln(w, "  Model:")
	for _, a := range f.Assumptions {
		fmt.Fprintf(w, "    - %s\n", a)
	}
	fmt.Fprintln(w, "  Cautions:")
	for _, a := range f.Cautions {
		fmt.Fprintf(w, "    - %s\n", a)
	}
}

func fmtEnergy(v datasheet.Num) string {
	if math.IsNaN(float64(v)) {
		return "n/a"
	}
	return fmt.Sprintf("%.2f kWh/m²", float64(v))
}

// fmtFigure formats a value in the figure's unit as the figure's kind
// writes it for a reader (a temperature difference as where the surface
// settles).
func fmtFigure(x datasheet.Figure, v datasheet.Num) string {
	if x.Components != nil {
		return x.Text()
	}
	return x.Kind().Words(float64(v), x.Unit)
}

// fmtUncertainty formats an uncertainty: as the value for a fraction, one
// digit finer for the others.
func fmtUncertainty(x datasheet.Figure, v datasheet.Num) string {
	switch {
	case math.IsNaN(float64(v)):
		return "n/a"
	case x.Kind() == datasheet.KindFraction:
		return fmt.Sprintf("%.4f", float64(v))
	case x.Unit == "":
		return fmt.Sprintf("%.2f", float64(v))
	}
	return fmt.Sprintf("%.2f %s", float64(v), x.Unit)
}

func fmtUnit(v datasheet.Num, unit string) string {
	if math.IsNaN(float64(v)) {
		return "n/a"
	}
	return fmt.Sprintf("%.1f %s", float64(v), unit)
}

// fmtDepression says T_amb − T_eq in words.
func fmtDepression(v datasheet.Num) string {
	return datasheet.KindTemperatureDifference.Words(float64(v), "K")
}

func fmtSigned(v datasheet.Num, unit string) string {
	if math.IsNaN(float64(v)) {
		return "n/a"
	}
	return fmt.Sprintf("%+.2f %s", float64(v), unit)
}

func fmtFixed(v datasheet.Num, digits int) string {
	if math.IsNaN(float64(v)) {
		return "n/a"
	}
	return strconv.FormatFloat(float64(v), 'f', digits, 64)
}

func fmtBands(b []spectra.Interval) string {
	parts := make([]string, len(b))
	for i, x := range b {
		// Band ends from the data, to 0.01 nm.
		lo, hi := spectra.Interval{Lo: math.Round(x.Lo*100) / 100, Hi: math.Round(x.Hi*100) / 100}.UM()
		parts[i] = fmt.Sprintf("%g–%g µm", lo, hi)
	}
	return strings.Join(parts, ", ")
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

// fmtNM writes a wavelength from the data to 0.01 nm.
func fmtNM(nm float64) string { return strconv.FormatFloat(math.Round(nm*100)/100, 'f', -1, 64) }

func fmtPercent(v datasheet.Num) string {
	if math.IsNaN(float64(v)) {
		return ""
	}
	return fmt.Sprintf("%.1f %%", 100*float64(v))
}
