package main

import (
	"fmt"
	"path"
	"regexp"
	"strconv"
	"strings"
)

// material is one demo material: its front matter, body, files and model.
type material struct {
	path        string // .md path relative to content/
	slug        string // written only when set (the default comes from the file name)
	title       string
	maker, lab  string
	productCode string
	category    string
	tags        []string
	summary     string
	license     string
	files       []fileSpec
	measured    measured
	closureTol  float64 // a per-material closure tolerance, or 0 for the library's
	weather     string  // a demo weather series under content/weather/ ("inland-dry.csv"), or ""
	claims      []claim
	body        string
	model       model
}

// measured is the front matter "measured:" block.
type measured struct{ date, instrument, angle, reference, operator, notes string }

// claim is a claimed figure and what the demo means it to show.
type claim struct {
	figure    string
	value     float64
	values    []float64 // a colour's components, written instead of value
	deltaE    string    // the colour difference of an L*a*b* claim, "" for the default
	tolerance float64
	basis     basis
	source    string
	expect    expectation
}

// basis is a claim's stated basis; zero fields are left out.
type basis struct {
	solarBandNM   [2]float64
	solarSpectrum string
	thermalBandUM [2]float64
}

// expectation is what a reviewer recomputing the claim should find.
type expectation int

const (
	expectSupported   expectation = iota // within tolerance of the computed figure
	expectTooHigh                        // above the computed figure by more than the tolerance
	expectPercent                        // written in percent for a fraction
	expectPartial                        // computed from data covering only part of the band
	expectUncheckable                    // the data needed to compute it are missing
)

func (e expectation) String() string {
	return [...]string{"supported", "too high", "percent for a fraction", "partial coverage", "cannot be checked"}[e]
}

// folder is where the material's spectrum files are written, relative to
// content/.
func (m *material) folder() string { return strings.TrimSuffix(m.path, ".md") }

// plain matches strings that YAML reads back unchanged without quotes.
var plain = regexp.MustCompile(`^[A-Za-z0-9(][A-Za-z0-9 ._()/,+°µ–—-]*[A-Za-z0-9)°.]$`)

// dateLike matches strings YAML would read as a timestamp.
var dateLike = regexp.MustCompile(`^[0-9]{4}-[0-9]{1,2}-[0-9]{1,2}`)

// yamlString writes s as a YAML scalar, double-quoted when needed.
func yamlString(s string) string {
	switch strings.ToLower(s) {
	case "true", "false", "yes", "no", "on", "off", "null", "~", "":
		return strconv.Quote(s)
	}
	if plain.MatchString(s) && !dateLike.MatchString(s) && !strings.Contains(s, ": ") && !strings.Contains(s, " #") {
		if _, err := strconv.ParseFloat(s, 64); err != nil {
			return s
		}
	}
	return strconv.Quote(s)
}

func yamlNumber(v float64) string { return strconv.FormatFloat(v, 'g', -1, 64) }

func yamlPair(b [2]float64) string { return "[" + yamlNumber(b[0]) + ", " + yamlNumber(b[1]) + "]" }

// markdown renders the material's Markdown file: strict front matter in the
// order of the content contract, then the body.
func (m *material) markdown() []byte {
	var b strings.Builder
	w := func(format string, a ...any) { fmt.Fprintf(&b, format, a...) }
	w("---\n")
	w("title: %s\n", yamlString(m.title))
	if m.slug != "" {
		w("slug: %s\n", yamlString(m.slug))
	}
	if m.maker != "" {
		w("maker: %s\n", yamlString(m.maker))
	}
	if m.lab != "" {
		w("lab: %s\n", yamlString(m.lab))
	}
	w("product_code: %s\n", yamlString(m.productCode))
	w("category: %s\n", yamlString(m.category))
	tags := make([]string, len(m.tags))
	for i, t := range m.tags {
		tags[i] = yamlString(t)
	}
	w("tags: [%s]\n", strings.Join(tags, ", "))
	w("summary: %s\n", yamlString(m.summary))
	w("license: %s\n", yamlString(m.license))
	w("spectra:\n")
	for _, f := range m.files {
		w("  - file: %s\n", yamlString(path.Join(path.Base(m.folder()), f.name)))
		w("    role: %s\n", yamlString(f.role))
		w("    instrument: %s\n", yamlString(f.instrument))
	}
	w("measured:\n")
	w("  date: %s\n", m.measured.date)
	w("  instrument: %s\n", yamlString(m.measured.instrument))
	w("  angle: %s\n", yamlString(m.measured.angle))
	w("  reference: %s\n", yamlString(m.measured.reference))
	w("  operator: %s\n", yamlString(m.measured.operator))
	w("  notes: %s\n", yamlString(m.measured.notes))
	var conds []string
	if m.closureTol > 0 {
		conds = append(conds, "closure_tolerance: "+yamlNumber(m.closureTol))
	}
	if m.weather != "" {
		// Relative to the Markdown file, which sits in content/KIND/.
		conds = append(conds, "weather: "+yamlString("../weather/"+m.weather))
	}
	if len(conds) > 0 {
		w("conditions: {%s}\n", strings.Join(conds, ", "))
	}
	if len(m.claims) > 0 {
		w("claims:\n")
		for _, c := range m.claims {
			w("  - figure: %s\n", c.figure)
			if c.values != nil {
				var vs []string
				for _, v := range c.values {
					vs = append(vs, yamlNumber(v))
				}
				w("    values: [%s]\n", strings.Join(vs, ", "))
			} else {
				w("    value: %s\n", yamlNumber(c.value))
			}
			if c.tolerance > 0 {
				w("    tolerance: %s\n", yamlNumber(c.tolerance))
			}
			if c.deltaE != "" {
				w("    delta_e: %s\n", c.deltaE)
			}
			var parts []string
			if c.basis.solarBandNM[1] > 0 {
				parts = append(parts, "solar_band_nm: "+yamlPair(c.basis.solarBandNM))
			}
			if c.basis.solarSpectrum != "" {
				parts = append(parts, "solar_spectrum: "+c.basis.solarSpectrum)
			}
			if c.basis.thermalBandUM[1] > 0 {
				parts = append(parts, "thermal_band_um: "+yamlPair(c.basis.thermalBandUM))
			}
			if len(parts) > 0 {
				w("    basis: {%s}\n", strings.Join(parts, ", "))
			}
			w("    source: %s\n", yamlString(c.source))
		}
	}
	w("---\n\n")
	b.WriteString(strings.TrimSpace(m.body))
	b.WriteString("\n")
	return []byte(b.String())
}

// comparison is a comparison page.
type comparison struct {
	path      string
	title     string
	summary   string
	slugs     []string
	reference string // slug of the reference material, or ""
	skin      string // slug of the skin-like surface, or ""
	body      string
}

func (c *comparison) markdown() []byte {
	var b strings.Builder
	fmt.Fprintf(&b, "---\ntitle: %s\ncompare: [%s]\n", yamlString(c.title), strings.Join(c.slugs, ", "))
	if c.reference != "" {
		fmt.Fprintf(&b, "reference: %s\n", c.reference)
	}
	if c.skin != "" {
		fmt.Fprintf(&b, "skin: %s\n", c.skin)
	}
	fmt.Fprintf(&b, "summary: %s\n---\n\n%s\n", yamlString(c.summary), strings.TrimSpace(c.body))
	return []byte(b.String())
}
