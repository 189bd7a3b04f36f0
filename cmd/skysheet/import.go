package main

import (
	"fmt"
	"os"
	"path/filepath"
	"strings"

	"skysheet/datasheet/library"
	"skysheet/spectra"
)

func init() {
	register(&command{
		name:    "import",
		args:    "FILE... -o DIR [--material FILE.md]",
		summary: "convert instrument exports (JCAMP-DX .jdx/.dx, or neutral files) into neutral-format files in DIR",
		run:     runImport,
	})
}

func runImport(e *env, args []string) error {
	fs := newFlags(e, commands["import"])
	dir := fs.String("o", "", "output directory (created if missing)")
	material := fs.String("material", "", "also write a material's Markdown `FILE` (e.g. content/coatings/w-7.md) listing the converted files, filled from what they say, with blanks to fill in; never overwrites")
	maxSize := maxFileSizeFlag(fs)
	files, err := parseFlags(fs, args)
	if err != nil {
		return err
	}
	switch {
	case len(files) == 0:
		return usagef("no files to import")
	case *dir == "":
		return usagef("no output directory: give -o DIR")
	}
	outs := map[string]string{}
	names := make([]string, len(files))
	for i, in := range files {
		base := filepath.Base(in)
		out := filepath.Join(*dir, strings.TrimSuffix(base, filepath.Ext(base))+".csv")
		if prev, dup := outs[out]; dup {
			return usagef("%s and %s would both be written to %s", prev, in, out)
		}
		outs[out], names[i] = in, out
	}
	for _, out := range names {
		if err := refuseOverwrite(out, files); err != nil {
			return err
		}
	}
	if *material != "" {
		if err := checkMaterialPath(*material, names); err != nil {
			return err
		}
	}
	specs := make([]*spectra.Spectrum, len(files))
	for i, in := range files {
		if specs[i], err = readSpectrumFile(in, *maxSize); err != nil {
			return err
		}
		keepReferencePath(specs[i], in, *dir)
		if w := spectra.ReferenceWarning(specs[i], in); w != "" {
			specs[i].Warnings = append(specs[i].Warnings, w)
		}
	}
	if err := os.MkdirAll(*dir, 0o755); err != nil {
		return err
	}
	for i, s := range specs {
		if err := writeSpectrumFile(e.stdout, names[i], s); err != nil {
			return err
		}
		lo, hi := s.Range()
		var qs []string
		for _, q := range []spectra.Quantity{spectra.R, spectra.T, spectra.A, spectra.UR, spectra.UT} {
			if s.Has(q) {
				qs = append(qs, q.String())
			}
		}
		fmt.Fprintf(e.stdout, "%s -> %s: %d points, %s–%s nm, %s\n", files[i], names[i], s.Len(), fmtNM(lo), fmtNM(hi), strings.Join(qs, ", "))
		for _, n := range s.Notes {
			fmt.Fprintf(e.stdout, "  note: %s\n", n)
		}
		printWarnings(e.stderr, "import", s)
	}
	if *material != "" {
		d := &materialDraft{path: *material, ins: files, outs: names, specs: specs}
		if err := d.write(); err != nil {
			return err
		}
		fmt.Fprintf(e.stdout, "%s: written; fill in each value starting with %s (skysheet review lists them)\n", *material, library.Blank)
	}
	return nil
}

func absPath(p string) string {
	if a, err := filepath.Abs(p); err == nil {
		return a
	}
	return p
}

// keepReferencePath rewrites a relative reference_file of s, read from in,
// so that it still names the same file from the output directory dir.
func keepReferencePath(s *spectra.Spectrum, in, dir string) {
	for i, f := range s.Meta {
		if strings.ReplaceAll(strings.ToLower(strings.TrimSpace(f.Key)), " ", "_") != spectra.ReferenceKey {
			continue
		}
		v := strings.TrimSpace(f.Value)
		if v == "" || filepath.IsAbs(v) {
			continue
		}
		target := absPath(filepath.Join(filepath.Dir(in), v))
		if rel, err := filepath.Rel(absPath(dir), target); err == nil {
			s.Meta[i].Value = filepath.ToSlash(rel)
		} else {
			s.Meta[i].Value = target
		}
	}
}
