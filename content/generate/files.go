package main

import (
	"fmt"
	"math"
	"strconv"
	"strings"
)

// axisKind is the spectral axis a file is written on.
type axisKind int

const (
	axisNM         axisKind = iota // wavelength in nm, ascending
	axisNMDown                     // wavelength in nm, descending (as a scanning instrument runs)
	axisUM                         // wavelength in µm, ascending
	axisWavenumber                 // wavenumber in cm⁻¹, descending (as FTIR software exports)
)

// fileSpec describes one spectrum file of a material: what is written and in
// which of the many shapes instruments export.
type fileSpec struct {
	name       string // relative to the material's folder
	role       string // front matter role
	instrument string // front matter instrument
	axis       axisKind
	axisHeader string      // header of the first column
	lo, hi     float64     // range in the axis unit (nm, µm or cm⁻¹), lo < hi
	step       float64     // step in the axis unit
	delim      string      // ",", "\t", ";" or "  "
	comma      bool        // decimal comma
	percent    bool        // values in percent, header marked "(%)"
	cols       []string    // "R", "T", "A", "u_R"
	meta       [][2]string // "# key: value" lines before the header
	uR         func(nm float64) float64
}

// column header names as written.
func (f fileSpec) header(col string) string {
	if f.percent && col != "u_R" {
		return col + " (%)"
	}
	return col
}

// axisValues returns the axis values in file order and their wavelengths.
func (f fileSpec) axisValues() (xs []string, nms []float64) {
	n := int(math.Round((f.hi-f.lo)/f.step)) + 1
	for i := range n {
		x := f.lo + float64(i)*f.step
		var s string
		var nm float64
		switch f.axis {
		case axisNM, axisNMDown:
			s, nm = strconv.FormatFloat(x, 'f', -1, 64), x
		case axisUM:
			s = strconv.FormatFloat(x, 'f', 2, 64)
			v, _ := strconv.ParseFloat(s, 64)
			nm = v * 1000
		case axisWavenumber:
			s, nm = strconv.FormatFloat(x, 'f', -1, 64), 1e7/x
		}
		xs, nms = append(xs, s), append(nms, nm)
	}
	if f.axis == axisNMDown || f.axis == axisWavenumber {
		for i, j := 0, len(xs)-1; i < j; i, j = i+1, j-1 {
			xs[i], xs[j] = xs[j], xs[i]
			nms[i], nms[j] = nms[j], nms[i]
		}
	}
	return xs, nms
}

// absorptanceOffset is the small systematic offset and ripple of an
// independently measured absorptance (e.g. a centre-mount sample in the
// sphere), so that closure R + T + A = 1 holds only within a tolerance, as
// with real instruments.
func absorptanceOffset(nm float64) float64 {
	return 0.0025 + 0.0015*math.Sin(nm/37) + 0.001*math.Sin(nm/11.3)
}

// render writes the file for the sample model m.
func (f fileSpec) render(m model) []byte {
	var b strings.Builder
	for _, kv := range f.meta {
		fmt.Fprintf(&b, "# %s: %s\n", kv[0], kv[1])
	}
	head := []string{f.axisHeader}
	for _, c := range f.cols {
		head = append(head, f.header(c))
	}
	b.WriteString(strings.Join(head, f.delim) + "\n")
	xs, nms := f.axisValues()
	for i, x := range xs {
		nm := nms[i]
		p := m(nm)
		row := []string{x}
		for _, c := range f.cols {
			var v float64
			switch c {
			case "R":
				v = p.R
			case "T":
				v = p.T
			case "A":
				v = clamp01(1 - p.R - p.T + absorptanceOffset(nm))
			case "u_R":
				row = append(row, f.number(f.uR(nm), false))
				continue
			}
			row = append(row, f.number(v, f.percent))
		}
		b.WriteString(strings.Join(row, f.delim) + "\n")
	}
	return []byte(b.String())
}

// number formats a value: fractions with 4 decimals, percentages with 2.
func (f fileSpec) number(v float64, percent bool) string {
	s := strconv.FormatFloat(v, 'f', 4, 64)
	if percent {
		s = strconv.FormatFloat(100*v, 'f', 2, 64)
	}
	if s == "-0.0000" || s == "-0.00" {
		s = s[1:]
	}
	if f.comma {
		s = strings.Replace(s, ".", ",", 1)
	}
	return s
}
