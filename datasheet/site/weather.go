package site

import (
	"fmt"
	"html/template"
	"math"
	"strconv"

	"skysheet/datasheet"
	"skysheet/datasheet/evaluate"
	"skysheet/datasheet/library"
	"skysheet/spectra"
)

// The figures over a weather series get a page of their own beside the
// datasheet (m/SLUG/weather.html): its charts and monthly table would not
// fit the datasheet's two printed pages. The datasheet says the totals in
// one paragraph and links to it.

// seriesPage is the name of the series page in a material's folder.
const seriesPage = "weather.html"

// seriesLine is what a datasheet says of a material's series figures.
type seriesLine struct {
	Text, Href string
}

// weatherView is the data of a series page.
type weatherView struct {
	Slug, Title, Href    string // the material and its datasheet
	Series, File, SHA256 string
	Period               string
	Key                  []keyFig
	Charts               []chartView
	Months               []monthRow
	Total                monthRow
	Assumptions          []string
	Cautions             []string
}

// monthRow is a row of the monthly table, formatted.
type monthRow struct {
	Period, Hours, Energy, Trapezoid, Below, DegreeHours, MeanDep, Deepest, Air string
}

func fmtFixedNum(v datasheet.Num, digits int) string {
	if isNaN(v) {
		return "n/a"
	}
	return strconv.FormatFloat(float64(v), 'f', digits, 64)
}

func fmtCount(n int) string {
	s := strconv.Itoa(n)
	if n < 10000 {
		return s
	}
	return s[:len(s)-3] + "\u202f" + s[len(s)-3:] // a narrow no-break space groups thousands
}

func monthRowOf(p datasheet.SeriesPeriod) monthRow {
	return monthRow{Period: p.Period, Hours: fmtCount(p.Hours), Energy: fmtFixedNum(p.EnergyKWhM2, 1),
		Trapezoid: fmtFixedNum(p.EnergyTrapezoidKWhM2, 1), Below: fmtCount(p.HoursBelowAir),
		DegreeHours: fmtFixedNum(p.DegreeHoursBelowAir, 0), MeanDep: fmtFixedNum(p.MeanDepressionK, 1),
		Deepest: fmtFixedNum(p.DeepestDepressionK, 1), Air: fmtFixedNum(p.MeanAirC, 1)}
}

// seriesSummary says the totals of w in one sentence.
func seriesSummary(w *datasheet.SeriesFigures) string {
	if isNaN(w.EnergyKWhM2) {
		return fmt.Sprintf("Over the weather series %s the hourly model could not run: %s", w.Series, firstOf(w.Assumptions...))
	}
	return fmt.Sprintf("over %s, %s kWh/m² of cooling held at the air temperature; left to float, %s of %s hours below the air, %s K below it on average.",
		w.Series, fmtFixedNum(w.EnergyKWhM2, 1), fmtCount(w.HoursBelowAir), fmtCount(w.Hours), fmtFixedNum(w.MeanDepressionK, 1))
}

// weatherFiles renders the series page of m, if its figures have a series.
func (b *builder) weatherFiles(m *evaluate.Material) (files, error) {
	w := m.Figures.Weather
	if w == nil {
		return files{}, nil
	}
	name := materialDir(m.Slug) + seriesPage
	p := b.newPage("weather", m.Front.Title+" over "+w.Series, name)
	v := &weatherView{Slug: m.Slug, Title: m.Front.Title, Href: "index.html", Series: w.Series, File: w.File, SHA256: w.SHA256,
		Assumptions: w.Assumptions, Cautions: append(append([]string(nil), w.Cautions...), cautionsOf(m.Figures)...)}
	if len(w.From) >= 19 && len(w.To) >= 19 {
		v.Period = fmt.Sprintf("%s hours, %s %s to %s %s (clock UTC%s)", fmtCount(w.Hours), w.From[:10], w.From[11:16],
			w.To[:10], w.To[11:16], utcOffset(w.From))
	}
	v.Key = []keyFig{
		{Label: "Cooling energy", Value: fmtFixedNum(w.EnergyKWhM2, 1), Unit: "kWh/m²", Note: "panel held at the air temperature; positive part"},
		{Label: "Hours below the air", Value: fmtCount(w.HoursBelowAir), Unit: "h", Note: fmt.Sprintf("free-floating surface, of %s", fmtCount(w.Hours))},
		{Label: "Below the air", Value: fmtFixedNum(w.DegreeHoursBelowAir, 0), Unit: "K·h", Note: "degree-hours, free-floating"},
		{Label: "Mean depression", Value: fmtFixedNum(w.MeanDepressionK, 1), Unit: "K", Note: fmt.Sprintf("air − surface over every hour; deepest %s K", fmtFixedNum(w.DeepestDepressionK, 1))},
	}
	for _, mo := range w.Months {
		v.Months = append(v.Months, monthRowOf(mo))
	}
	v.Total = monthRowOf(datasheet.SeriesPeriod{Period: "Whole series", Hours: w.Hours, EnergyKWhM2: w.EnergyKWhM2,
		EnergyTrapezoidKWhM2: w.EnergyTrapezoidKWhM2, HoursBelowAir: w.HoursBelowAir, DegreeHoursBelowAir: w.DegreeHoursBelowAir,
		MeanDepressionK: w.MeanDepressionK, DeepestDepressionK: w.DeepestDepressionK, MeanAirC: datasheet.Num(math.NaN())})
	v.Total.Air = ""
	var err error
	if v.Charts, err = seriesCharts(w); err != nil {
		return nil, &library.Error{File: m.Path, Err: fmt.Errorf("page %s: %w", name, err)}
	}
	p.W = v
	html, err := b.execute("weather", p)
	if err != nil {
		return nil, &library.Error{File: m.Path, Err: fmt.Errorf("page %s: %w", name, err)}
	}
	return files{name: html}, nil
}

// utcOffset returns the offset of an RFC 3339 time, "+02:00" ("Z" as
// "+00:00").
func utcOffset(t string) string {
	if len(t) < 20 || t[len(t)-1] == 'Z' {
		return "+00:00"
	}
	return t[len(t)-6:]
}

// seriesCharts returns the charts of a series page: the daily energy and
// the typical day's power and temperatures.
func seriesCharts(w *datasheet.SeriesFigures) ([]chartView, error) {
	var out []chartView
	for _, f := range []func(*datasheet.SeriesFigures) (*chartView, error){dailyChart, typicalPowerChart, typicalTempChart} {
		cv, err := f(w)
		if err != nil {
			return nil, err
		}
		if cv != nil {
			out = append(out, *cv)
		}
	}
	return out, nil
}

// dailyChart plots the cooling energy of each day of the series.
func dailyChart(w *datasheet.SeriesFigures) (*chartView, error) {
	var pc spectra.Piece
	hi := 0.0
	for i, d := range w.Days {
		if isNaN(d.EnergyKWhM2) {
			continue
		}
		pc.NM, pc.V = append(pc.NM, float64(i+1)), append(pc.V, float64(d.EnergyKWhM2))
		hi = math.Max(hi, float64(d.EnergyKWhM2))
	}
	if len(pc.NM) < 2 {
		return nil, nil
	}
	p := plot{width: chartW, height: chartH, xName: "Day of the series", yName: "Cooling energy (kWh/m² per day)",
		xLo: 1, xHi: pc.NM[len(pc.NM)-1], xFmt: "0", yFmt: "1", noLegend: true}
	p.yLo, p.yHi, p.yTicks = coolingRange(0, hi, 6)
	p.lines = []line{{name: "Cooling energy per day", color: colR, width: 1.5, fill: true, pieces: []spectra.Piece{pc}}}
	best, worst := w.Days[0], w.Days[0]
	for _, d := range w.Days {
		if d.EnergyKWhM2 > best.EnergyKWhM2 {
			best = d
		}
		if d.EnergyKWhM2 < worst.EnergyKWhM2 {
			worst = d
		}
	}
	caption := fmt.Sprintf("Cooling energy of each day of %s (day 1 is %s), panel held at the air temperature, positive part of the net power summed hour by hour. "+
		"Most: %s kWh/m² on %s; least: %s kWh/m² on %s.", w.Series, w.Days[0].Period,
		fmtFixedNum(best.EnergyKWhM2, 2), best.Period, fmtFixedNum(worst.EnergyKWhM2, 2), worst.Period)
	svg, err := p.svg("Daily cooling energy chart. " + caption)
	if err != nil {
		return nil, err
	}
	return &chartView{ID: "chart-daily", Title: "Cooling energy per day", Caption: caption, SVG: template.HTML(svg)}, nil
}

// typicalPowerChart plots the net cooling power of the typical day.
func typicalPowerChart(w *datasheet.SeriesFigures) (*chartView, error) {
	var pw, sun spectra.Piece
	lo, hi := math.Inf(1), math.Inf(-1)
	for _, h := range w.TypicalDay.Hours {
		if isNaN(h.PowerWm2) {
			continue
		}
		pw.NM, pw.V = append(pw.NM, float64(h.Hour)), append(pw.V, float64(h.PowerWm2))
		lo, hi = math.Min(lo, float64(h.PowerWm2)), math.Max(hi, float64(h.PowerWm2))
		sun.NM, sun.V = append(sun.NM, float64(h.Hour)), append(sun.V, float64(h.SunWm2)/10)
	}
	if len(pw.NM) < 2 {
		return nil, nil
	}
	for _, v := range sun.V {
		hi = math.Max(hi, v)
	}
	p := plot{width: chartW, height: chartH, xName: "Hour of the day", yName: "Power (W/m²)",
		xLo: 0, xHi: 23, xTicks: []float64{0, 6, 12, 18, 23}, xFmt: "0", yFmt: "0"}
	p.yLo, p.yHi, p.yTicks = coolingRange(lo, hi, 6)
	p.rules = []rule{{at: 0, color: colAxis}}
	p.lines = []line{
		{name: "Net cooling power at air temperature", color: colR, width: 2, pieces: []spectra.Piece{pw}},
		{name: "Sun ÷ 10 (global horizontal)", color: colT, width: 1.5, dash: []float64{5, 3}, pieces: []spectra.Piece{sun}},
	}
	caption := fmt.Sprintf("The typical day of %s (the mean of each hour of the clock over %s, the warmest month): net cooling power of a panel held "+
		"at the air temperature (positive: it cools), and the sun on a horizontal surface divided by 10.", w.Series, w.TypicalDay.Month)
	svg, err := p.svg("Typical day power chart. " + caption)
	if err != nil {
		return nil, err
	}
	return &chartView{ID: "chart-day-power", Title: "Typical day: power", Caption: caption, SVG: template.HTML(svg)}, nil
}

// typicalTempChart plots the air and free-floating surface temperatures of
// the typical day.
func typicalTempChart(w *datasheet.SeriesFigures) (*chartView, error) {
	var air, surf spectra.Piece
	lo, hi := math.Inf(1), math.Inf(-1)
	for _, h := range w.TypicalDay.Hours {
		x := float64(h.Hour)
		if !isNaN(h.AirC) {
			air.NM, air.V = append(air.NM, x), append(air.V, float64(h.AirC))
			lo, hi = math.Min(lo, float64(h.AirC)), math.Max(hi, float64(h.AirC))
		}
		if !isNaN(h.SurfaceC) {
			surf.NM, surf.V = append(surf.NM, x), append(surf.V, float64(h.SurfaceC))
			lo, hi = math.Min(lo, float64(h.SurfaceC)), math.Max(hi, float64(h.SurfaceC))
		}
	}
	if len(air.NM) < 2 {
		return nil, nil
	}
	step := niceStep((hi - lo) / 5)
	p := plot{width: chartW, height: chartH, xName: "Hour of the day", yName: "Temperature (°C)",
		xLo: 0, xHi: 23, xTicks: []float64{0, 6, 12, 18, 23}, xFmt: "0", yFmt: "0",
		yLo: math.Floor(lo/step) * step, yHi: math.Ceil(hi/step) * step}
	p.lines = []line{
		{name: "Air", color: colMark, width: 1.5, dash: []float64{6, 3}, pieces: []spectra.Piece{air}},
		{name: "Free-floating surface", color: colA, width: 2, pieces: []spectra.Piece{surf}},
	}
	caption := fmt.Sprintf("The typical day of %s (%s): air temperature and the steady-state temperature of a free-floating surface, "+
		"hour by hour; below the air line the surface is colder than the air. Thermal mass is neglected: a real surface lags behind.", w.Series, w.TypicalDay.Month)
	svg, err := p.svg("Typical day temperature chart. " + caption)
	if err != nil {
		return nil, err
	}
	return &chartView{ID: "chart-day-temp", Title: "Typical day: temperatures", Caption: caption, SVG: template.HTML(svg)}, nil
}

// seriesRows returns the comparison rows of the figures over a weather
// series: one row per total, for the series of the first material that has
// one; a material over another series (another file hash) or none says so
// instead of a number.
func seriesRows(ms []*evaluate.Summary) []compareRow {
	var ref *datasheet.SeriesFigures
	for _, m := range ms {
		if w := m.Figures.Weather; w != nil {
			ref = w
			break
		}
	}
	if ref == nil {
		return nil
	}
	rows := []struct {
		label string
		cell  func(*datasheet.SeriesFigures) string
	}{
		{"Cooling energy over " + ref.Series + ", held at air (kWh/m²)", func(w *datasheet.SeriesFigures) string { return fmtFixedNum(w.EnergyKWhM2, 1) }},
		{"Hours below the air over " + ref.Series + ", free-floating", func(w *datasheet.SeriesFigures) string { return fmtCount(w.HoursBelowAir) }},
		{"Degree-hours below the air over " + ref.Series + " (K·h)", func(w *datasheet.SeriesFigures) string { return fmtFixedNum(w.DegreeHoursBelowAir, 0) }},
		{"Mean depression over " + ref.Series + " (K)", func(w *datasheet.SeriesFigures) string { return fmtFixedNum(w.MeanDepressionK, 1) }},
	}
	var out []compareRow
	for _, r := range rows {
		row := compareRow{Label: r.label}
		for _, m := range ms {
			w := m.Figures.Weather
			switch {
			case w == nil:
				row.Cells = append(row.Cells, "no series")
			case w.SHA256 != ref.SHA256:
				row.Cells = append(row.Cells, "other series: "+w.Series)
			default:
				row.Cells = append(row.Cells, r.cell(w))
			}
		}
		out = append(out, row)
	}
	return out
}
