package main

import (
	"bytes"
	"flag"
	"fmt"
	"io"
	"strings"

	"skysheet/spectra"
)

func init() {
	register(&command{
		name:    "splice",
		args:    "FILE FILE... -o OUT",
		summary: "join the spectrum files of one sample, splicing where two instruments overlap, into one neutral-format file",
		run:     runSplice,
	})
}

// sampleOptions says how the files of one sample are read and joined.
type sampleOptions struct {
	splice    spectra.SpliceOptions
	reference string   // reference-standard file for files that name none
	maxSize   int64    // largest file read; 0 means defaultMaxFileSize
	read      []string // every file read by readSampleWith, for refuseOverwrite
}

// methodFlag is a flag holding a splice method.
type methodFlag struct{ m *spectra.SpliceMethod }

func (f methodFlag) String() string {
	if f.m == nil {
		return ""
	}
	return f.m.String()
}

func (f methodFlag) Set(s string) error {
	m, err := spectra.ParseSpliceMethod(s)
	if err != nil {
		return err
	}
	*f.m = m
	return nil
}

// sampleFlags adds the splice flags, their names starting with prefix, and
// --reference.
func sampleFlags(fs *flag.FlagSet, prefix string, o *sampleOptions) {
	o.splice.Tolerance = spectra.DefaultSpliceTol
	fs.Var(methodFlag{&o.splice.Method}, prefix+"method", "splice method where two files overlap: offset, scale or none")
	fs.StringVar(&o.splice.Adjust, prefix+"adjust", "", "file whose data the splice adjusts (default: the one reaching longer wavelengths)")
	fs.Float64Var(&o.splice.JunctionNM, prefix+"junction", 0, "splice junction in nm (default: the middle of the overlap)")
	fs.Float64Var(&o.splice.Tolerance, prefix+"tol", o.splice.Tolerance, "flag a splice whose mean mismatch before correction exceeds this")
	o.maxSize = defaultMaxFileSize
	fs.Var(sizeFlag{&o.maxSize}, "max-file-size", "largest input file read, e.g. 64MiB or 1GiB; larger files are refused before they are read")
	fs.StringVar(&o.reference, "reference", "", "neutral-format file of the reference standard's calibrated reflectance; corrects R = R_rel × R_ref in files that name no reference_file of their own")
}

func (o sampleOptions) validate() error {
	if !(o.splice.Tolerance > 0 && o.splice.Tolerance <= 1) {
		return usagef("splice tolerance %g: want 0 < tolerance ≤ 1", o.splice.Tolerance)
	}
	if o.splice.JunctionNM < 0 {
		return usagef("junction %g nm: want a positive wavelength", o.splice.JunctionNM)
	}
	return nil
}

// readSpectrumFile reads one spectrum file of any supported format: a
// regular file of at most limit bytes (0 means defaultMaxFileSize).
func readSpectrumFile(name string, limit int64) (*spectra.Spectrum, error) {
	if limit <= 0 {
		limit = defaultMaxFileSize
	}
	data, err := readInputFile(name, limit)
	if err != nil {
		return nil, err
	}
	return spectra.Decode(data, name)
}

// readSampleWith reads the spectrum files of one sample, corrects each
// against its reference standard (the file's own reference_file, relative
// to the file and inside its folder (see readReference), else o.reference)
// and joins them with spectra.Join.
func readSampleWith(files []string, o *sampleOptions) (*spectra.Spectrum, error) {
	refs := map[string]*spectra.Spectrum{}
	parts := make([]*spectra.Spectrum, 0, len(files))
	for _, name := range files {
		s, err := readSpectrumFile(name, o.maxSize)
		o.read = append(o.read, name)
		if err != nil {
			return nil, err
		}
		ref := o.reference
		if f, ok := spectra.ReferenceFile(s); ok {
			r, p, err := readReference(name, f, o.reference, o.maxSize)
			o.read = append(o.read, p)
			if err != nil {
				return nil, err
			}
			ref = p
			refs[ref] = r
		}
		if ref != "" {
			r, ok := refs[ref]
			if !ok {
				o.read = append(o.read, ref)
				if r, err = readSpectrumFile(ref, o.maxSize); err != nil {
					return nil, fmt.Errorf("reference standard for %s: %w", name, err)
				}
				refs[ref] = r
			}
			if s, err = spectra.ApplyReference(s, r); err != nil {
				return nil, err
			}
		}
		parts = append(parts, s)
	}
	return spectra.Join(parts, o.splice)
}

// writeSpectrumFile writes s in the neutral format to name, or to w when
// name is "-".
func writeSpectrumFile(w io.Writer, name string, s *spectra.Spectrum) error {
	var b bytes.Buffer
	if err := spectra.Write(&b, s); err != nil {
		return err
	}
	if name == "-" {
		_, err := rawWriter(w).Write(b.Bytes())
		return err
	}
	return writeFileAtomic(name, func(f io.Writer) error {
		_, err := f.Write(b.Bytes())
		return err
	})
}

func runSplice(e *env, args []string) error {
	var o sampleOptions
	fs := newFlags(e, commands["splice"])
	sampleFlags(fs, "", &o)
	out := fs.String("o", "", "output file in the neutral format (- for standard output)")
	files, err := parseFlags(fs, args)
	if err != nil {
		return err
	}
	switch {
	case len(files) < 2:
		return usagef("want at least two spectrum files")
	case *out == "":
		return usagef("no output file: give -o OUT")
	}
	if err := o.validate(); err != nil {
		return err
	}
	s, err := readSampleWith(files, &o)
	if err != nil {
		return err
	}
	printWarnings(e.stderr, "splice", s)
	if *out != "-" {
		if err := refuseOverwrite(*out, o.read); err != nil {
			return err
		}
	}
	if err := writeSpectrumFile(e.stdout, *out, s); err != nil {
		return err
	}
	report := e.stdout
	if *out == "-" {
		report = e.stderr
	} else {
		lo, hi := s.Range()
		fmt.Fprintf(report, "%s: %d points, %g–%g nm, from %s\n", *out, s.Len(), lo, hi, strings.Join(files, " + "))
	}
	printSplices(report, s.Splices)
	return nil
}

// printWarnings writes the plausibility warnings of s, one a line.
func printWarnings(w io.Writer, verb string, s *spectra.Spectrum) {
	for _, x := range s.Warnings {
		fmt.Fprintf(w, "skysheet %s: warning: %s\n", verb, x)
	}
}

// printSplices writes one line per splice record.
func printSplices(w io.Writer, rs []spectra.SpliceRecord) {
	if len(rs) == 0 {
		return
	}
	fmt.Fprintln(w, "\nSplices (mismatch = mean and max |Δ| in the overlap):")
	for _, r := range rs {
		var did string
		switch r.Method {
		case spectra.SpliceOffset:
			did = fmt.Sprintf("offset %+.4f applied to %s", r.Value, r.Adjusted)
		case spectra.SpliceScale:
			did = fmt.Sprintf("factor %.4f applied to %s", r.Value, r.Adjusted)
		default:
			did = "no adjustment"
		}
		status := "ok"
		if r.Flagged {
			status = fmt.Sprintf("FLAGGED: mean mismatch above %g", r.Tolerance)
		}
		fmt.Fprintf(w, "  - %s at %.6g nm (overlap %.6g–%.6g nm): %s; mismatch before %.4f mean, %.4f max; after %.4f mean, %.4f max; %s\n",
			r.Quantity, r.JunctionNM, r.OverlapNM[0], r.OverlapNM[1], did, r.MismatchMean, r.MismatchMax, r.ResidualMean, r.ResidualMax, status)
	}
}
