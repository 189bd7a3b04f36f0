package main

import (
	"errors"
	"fmt"
	"io"
	"io/fs"
	"math"
	"os"
	"path/filepath"
	"strconv"
	"strings"
)

func init() {
	register(&command{
		name:    "init",
		args:    "DIR",
		summary: "set up a small library in DIR (new or empty) that renders at once",
		run:     runInit,
	})
}

func runInit(e *env, args []string) error {
	fl := newFlags(e, commands["init"])
	pos, err := parseFlags(fl, args)
	if err != nil {
		return err
	}
	if len(pos) != 1 {
		return usagef("want one folder, got %d", len(pos))
	}
	dir := pos[0]
	entries, err := os.ReadDir(dir)
	switch {
	case errors.Is(err, fs.ErrNotExist):
	case err != nil:
		return usagef("%s: %v", dir, err)
	case len(entries) > 0:
		return usagef("%s is not empty: give a new or empty folder", dir)
	}
	for name, data := range scaffold() {
		p := filepath.Join(dir, filepath.FromSlash(name))
		if err := os.MkdirAll(filepath.Dir(p), 0o755); err != nil {
			return err
		}
		if err := writeFileAtomic(p, func(w io.Writer) error {
			_, err := io.WriteString(w, data)
			return err
		}); err != nil {
			return err
		}
	}
	fmt.Fprintf(e.stdout, "created a library in %s; next:\n  skysheet render %s   # writes %s\n  skysheet preview %s\n",
		dir, dir, filepath.Join(dir, siteDir), dir)
	return nil
}

// scaffold returns the files of a library set up by init.
func scaffold() map[string]string {
	return map[string]string{
		// What render writes inside the library: the site and the render
		// cache, neither of them worth keeping under version control.
		".gitignore": "/" + siteDir + "/\n/" + cacheDir + "/\n",
		"skysheet.yaml": `# Site configuration. Every key is optional; unknown keys are errors.
title: My material library
description: Datasheets computed from measured spectra.
# site_address: https://example.org/library/   # where the site will be published
# lab: Name of the measuring lab
# publisher: Name of the publisher
allow_html: false       # raw HTML in Markdown bodies is dropped unless true
conditions:             # library defaults; a material may override them
  solar_band_nm: [280, 2500]
  solar_spectrum: global  # ASTM G173-03 global tilt, or direct
  thermal_band_um: [2.5, 25]
  window_band_um: [8, 13]
  temperature_k: 300
`,
		"content/example-white.md": `---
title: Example white coating (invented)
maker: Example maker (invented)
product_code: EX-1
category: paint
tags: [white, example]
summary: A made-up sample to show the format; replace it with your own.
license: CC0-1.0
spectra:
  - file: example-white/spectrum.csv
    role: solar and thermal
    instrument: invented; the spectrum was generated, not measured
measured:
  date: 2026-01-01
  angle: "8°"
  reference: diffuse white standard
---
This page is an **example**. Write the description of the material here in
Markdown: tables and footnotes work.

| Layer | Thickness |
| --- | --- |
| Top coat | 250 µm |
`,
		"content/example-white/spectrum.csv": exampleSpectrum(),
		"templates/README.txt": `Put *.html files here to override the default templates, file by file or
block by block ({{define "site-footer"}}...{{end}}), and style.css or site.js
to replace the default assets. See docs/library.md.
`,
	}
}

// exampleSpectrum is an invented white coating: high reflectance in the
// solar range, low in the thermal infrared, on one wavelength axis.
func exampleSpectrum() string {
	var b strings.Builder
	b.WriteString("# sample: invented example white (generated, not a measurement)\n")
	b.WriteString("wavelength_nm,R\n")
	row := func(nm, r float64) {
		b.WriteString(strconv.FormatFloat(nm, 'f', -1, 64) + "," + strconv.FormatFloat(math.Round(r*10000)/10000, 'f', -1, 64) + "\n")
	}
	for nm := 280.0; nm < 2500; nm += 20 {
		r := 0.93 - 0.85*math.Exp(-(nm-280)/25) - 0.06*math.Exp(-math.Pow((nm-1700)/60, 2))
		row(nm, r)
	}
	for nm := 2500.0; nm <= 25000; nm += 250 {
		r := 0.06 + 0.3*math.Exp(-(nm-2500)/600) + 0.04*math.Exp(-math.Pow((nm-9500)/700, 2))
		row(nm, r)
	}
	return b.String()
}
