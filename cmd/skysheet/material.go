package main

import (
	"encoding/json"
	"errors"
	"fmt"
	"io/fs"
	"os"
	"path/filepath"
	"regexp"
	"slices"
	"strings"

	"skysheet/datasheet/library"
	"skysheet/spectra"
)

// materialDraft is what import --material writes: a material's Markdown
// file, with front matter filled from what the imported files say and
// blanks (library.Blank) for the rest.
type materialDraft struct {
	path  string   // the Markdown file to write
	ins   []string // the files imported, as given
	outs  []string // the neutral files written, as given
	specs []*spectra.Spectrum
}

// checkMaterialPath checks, before anything is written, that the Markdown
// file md may be written: it ends in .md, does not exist, and the converted
// files outs lie in its folder or below (a material names its spectra
// relative to itself).
func checkMaterialPath(md string, outs []string) error {
	if !strings.EqualFold(filepath.Ext(md), ".md") {
		return usagef("--material %s: want a Markdown file name ending in .md, e.g. content/coatings/w-7.md", md)
	}
	if _, err := os.Lstat(md); err == nil {
		return usagef("--material %s already exists and is never overwritten: remove it or name another file", md)
	} else if !errors.Is(err, fs.ErrNotExist) {
		return err
	}
	for _, out := range outs {
		if _, err := relativeTo(md, out); err != nil {
			return usagef("--material %s: %v", md, err)
		}
	}
	return nil
}

// relativeTo returns the slash-separated path of file relative to the folder
// of the Markdown file md, or an error when file does not lie in it.
func relativeTo(md, file string) (string, error) {
	rel, err := filepath.Rel(absPath(filepath.Dir(md)), absPath(file))
	if err != nil || rel == ".." || strings.HasPrefix(rel, ".."+string(filepath.Separator)) {
		return "", fmt.Errorf("%s does not lie in the folder of the Markdown file or below it (give -o DIR inside %s)", file, filepath.Dir(md))
	}
	return filepath.ToSlash(rel), nil
}

// write writes the Markdown file, refusing to replace one that appeared
// meanwhile.
func (d *materialDraft) write() error {
	text, err := d.text()
	if err != nil {
		return err
	}
	if err := os.MkdirAll(filepath.Dir(d.path), 0o755); err != nil {
		return err
	}
	f, err := os.OpenFile(d.path, os.O_WRONLY|os.O_CREATE|os.O_EXCL, 0o644)
	if err != nil {
		if errors.Is(err, fs.ErrExist) {
			return fmt.Errorf("%s already exists and is never overwritten", d.path)
		}
		return err
	}
	if _, err := f.WriteString(text); err != nil {
		f.Close()
		os.Remove(d.path)
		return err
	}
	return f.Close()
}

// yq writes s as a YAML double-quoted scalar (JSON's string syntax is a
// subset of it).
func yq(s string) string {
	b, _ := json.Marshal(s)
	return string(b)
}

// blank is a blank to fill in, saying what belongs there.
func blank(what string) string { return yq(library.Blank + ": " + what) }

// text returns the Markdown file.
func (d *materialDraft) text() (string, error) {
	var b strings.Builder
	w := func(format string, a ...any) { fmt.Fprintf(&b, format, a...) }
	names := make([]string, len(d.ins))
	for i, in := range d.ins {
		names[i] = filepath.Base(in)
	}
	w("---\n")
	w("# Written by skysheet import from %s. Each value starting with %s is a blank:\n", strings.Join(names, ", "), library.Blank)
	w("# skysheet review and render report it until it is filled in (or, where it says so, its line deleted).\n")
	if t := d.title(); t != "" {
		w("title: %s\n", yq(t))
	} else {
		w("title: %s\n", blank("the material's name as shown on its page"))
	}
	w("maker: %s\n", blank("who made the material (or replace this line by lab: who made or measured it)"))
	w("product_code: %s\n", blank("the maker's product code, or delete this line"))
	w("category: %s\n", blank("one word such as paint, coating, film, fabric, membrane"))
	w("tags: [%s]\n", blank("a few words, or delete this line"))
	w("summary: %s\n", blank("one sentence on what the material is"))
	w("license: %s\n", blank("the licence of these data, e.g. CC-BY-4.0"))
	w("spectra:\n")
	for i, s := range d.specs {
		rel, err := relativeTo(d.path, d.outs[i])
		if err != nil {
			return "", err
		}
		w("  - file: %s\n", yq(rel))
		w("    role: %s\n", yq(role(s)))
		if v := meta(s, "instrument"); v != "" {
			w("    instrument: %s\n", yq(v))
		}
		w("    notes: %s\n", yq(importNote(names[i], s)))
	}
	w("measured:\n")
	field := func(key string, vals []string, what string) {
		if v := joinPerFile(vals, names); v != "" {
			w("  %s: %s\n", key, yq(v))
		} else {
			w("  %s: %s\n", key, blank(what))
		}
	}
	field("date", d.each(func(s *spectra.Spectrum) string { return meta(s, "date") }), "when it was measured, e.g. 2026-03-12")
	field("instrument", d.each(func(s *spectra.Spectrum) string { return meta(s, "instrument") }), "the instruments and accessories used")
	field("angle", d.each(angleOf), "the angle of incidence, e.g. 8°")
	refs := d.each(referenceOf)
	if std := d.uncalibrated(refs); std != "" {
		w("  reference: %s\n", blank("the files say the reflectance is relative to "+std+" but name no calibration of it; add reference_file: with the standard's calibrated reflectance to each data file and the standard's file beside them, then name the standard here"))
	} else {
		field("reference", refs, "the reference standard, or \"none (absolute measurement)\"")
	}
	w("  operator: %s\n", blank("who measured, or delete this line"))
	w("---\n\n")
	w("%s: what the material is, how the sample was made and measured, and what to look for in its spectra.\n", library.Blank)
	return b.String(), nil
}

// uncalibrated returns the standards named by the files measured relative
// to one without applying it (see [spectra.ReferenceWarning]); "" when
// there is none.
func (d *materialDraft) uncalibrated(refs []string) string {
	var out []string
	for i, s := range d.specs {
		if spectra.ReferenceWarning(s, "") != "" && !slices.Contains(out, or(refs[i], "a reference standard")) {
			out = append(out, or(refs[i], "a reference standard"))
		}
	}
	return strings.Join(out, " and ")
}

// each returns f of every spectrum.
func (d *materialDraft) each(f func(*spectra.Spectrum) string) []string {
	out := make([]string, len(d.specs))
	for i, s := range d.specs {
		out[i] = f(s)
	}
	return out
}

// joinPerFile joins what the files say: once when they agree, else each
// with its file's name; "" when no file says anything.
func joinPerFile(vals, names []string) string {
	var known []string
	for _, v := range vals {
		if v != "" && !slices.Contains(known, v) {
			known = append(known, v)
		}
	}
	switch {
	case len(known) == 0:
		return ""
	case len(known) == 1 && !slices.Contains(vals, ""):
		return known[0]
	}
	var parts []string
	for i, v := range vals {
		if v != "" {
			parts = append(parts, v+" ("+names[i]+")")
		}
	}
	return strings.Join(parts, "; ")
}

// meta returns the first of the metadata keys of s with a value.
func meta(s *spectra.Spectrum, keys ...string) string {
	for _, k := range keys {
		if v, ok := s.Get(k); ok && strings.TrimSpace(v) != "" {
			return strings.TrimSpace(v)
		}
	}
	return ""
}

// title is the material's name from the files' titles or sample names:
// the one they agree on, or their common start ("white coating W-7, UV" and
// "white coating W-7, FTIR" give "white coating W-7"); "" when none.
func (d *materialDraft) title() string {
	ts := d.each(func(s *spectra.Spectrum) string { return meta(s, "title", "sample") })
	common := ts[0]
	for _, t := range ts[1:] {
		n := 0
		for n < len(common) && n < len(t) && common[n] == t[n] {
			n++
		}
		common = common[:n]
	}
	if common != ts[0] {
		// Cut back to the last whole word.
		if i := strings.LastIndexAny(common, " ,;:(/"); i >= 0 {
			common = common[:i]
		}
	}
	common = strings.TrimRight(common, " ,;:-–—(/")
	if len(common) < 3 {
		return ""
	}
	return common
}

// role guesses the role of a file from its range: solar up to 4 µm,
// thermal from 2 µm.
func role(s *spectra.Spectrum) string {
	lo, hi := s.Range()
	switch {
	case hi <= 4000:
		return "solar"
	case lo >= 2000:
		return "thermal"
	}
	return "solar and thermal"
}

// importNote says where a converted file came from and in which units it
// was written.
func importNote(name string, s *spectra.Spectrum) string {
	lo, hi := s.Range()
	var qs []string
	for _, q := range []spectra.Quantity{spectra.R, spectra.T, spectra.A, spectra.UR, spectra.UT} {
		if s.Has(q) {
			qs = append(qs, q.String())
		}
	}
	note := fmt.Sprintf("converted from %s: %s–%s nm, %s", name, fmtNM(lo), fmtNM(hi), strings.Join(qs, ", "))
	xu, yu := meta(s, "x units"), meta(s, "y units")
	if xu != "" || yu != "" {
		note += fmt.Sprintf("; exported in %s and %s, converted to nm and fractions", or(xu, "nm"), or(yu, "fractions"))
	}
	return note
}

func or(s, def string) string {
	if s == "" {
		return def
	}
	return s
}

// angleRE finds an angle in free text: "8 deg incidence", "8°", "12 degrees".
var angleRE = regexp.MustCompile(`(?i)\b(\d+(?:\.\d+)?)\s*(?:°|deg\b|degrees?\b)`)

// angleOf returns the angle of incidence the metadata of s give, as "8°".
func angleOf(s *spectra.Spectrum) string {
	if v := meta(s, "angle of incidence", "angle"); v != "" {
		return v
	}
	for _, f := range s.Meta {
		if m := angleRE.FindStringSubmatch(f.Value); m != nil && strings.Contains(strings.ToLower(f.Key), "sampling") {
			return m[1] + "°"
		}
	}
	return ""
}

// standardRE finds the standard named after "relative to".
var standardRE = regexp.MustCompile(`(?i)relative to\s+((?:an?\s+|the\s+)?[^,;.]+)`)

// referenceOf returns the reference standard the metadata of s name.
func referenceOf(s *spectra.Spectrum) string {
	if v := meta(s, "reference standard", "reference"); v != "" {
		return v
	}
	if v := meta(s, spectra.ReferenceKey, "reference file"); v != "" {
		return "calibrated reflectance in " + v
	}
	for _, f := range s.Meta {
		if m := standardRE.FindStringSubmatch(f.Value); m != nil {
			return strings.TrimSpace(m[1])
		}
	}
	return ""
}
