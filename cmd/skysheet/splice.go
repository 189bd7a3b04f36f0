package main

import (
	"bytes"
	"flag"
	"fmt"
	"io"
	"io/fs"
	"os"
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

// sampleOptions say how the CLI reads the files of one sample.
type sampleOptions struct {
	spectra.SampleOptions
	maxSize int64 // largest file read; 0 means defaultMaxFileSize
}

// sampleFlags adds the splice flags, their names starting with prefix,
// --max-file-size and --reference.
func sampleFlags(fs *flag.FlagSet, prefix string, o *sampleOptions) {
	o.Splice.Tolerance = spectra.DefaultSpliceTol
	fs.TextVar(&o.Splice.Method, prefix+"method", o.Splice.Method, "splice `METHOD` where two files overlap: offset, scale or none")
	fs.StringVar(&o.Splice.Adjust, prefix+"adjust", "", "file whose data the splice adjusts (default: the one reaching longer wavelengths)")
	fs.Float64Var(&o.Splice.JunctionNM, prefix+"junction", 0, "splice junction in nm (default: the middle of the overlap)")
	fs.Float64Var(&o.Splice.Tolerance, prefix+"tol", o.Splice.Tolerance, "flag a splice whose mean mismatch before correction exceeds this")
	o.maxSize = defaultMaxFileSize
	fs.Var(sizeFlag{&o.maxSize}, "max-file-size", "largest input file read, e.g. 64MiB or 1GiB; larger files are refused before they are read")
	fs.StringVar(&o.Reference, "reference", "", "neutral-format file of the reference standard's calibrated reflectance; corrects R = R_rel × R_ref in files that name no reference_file of their own")
}

// validateSample checks the sample flags.
func validateSample(o sampleOptions) error {
	if !(o.Splice.Tolerance > 0 && o.Splice.Tolerance <= 1) {
		return usagef("splice tolerance %g: want 0 < tolerance ≤ 1", o.Splice.Tolerance)
	}
	if o.Splice.JunctionNM < 0 {
		return usagef("junction %g nm: want a positive wavelength", o.Splice.JunctionNM)
	}
	return nil
}

// osFS reads files by the names given on the command line, relative to the
// working folder or absolute: only regular files of at most limit bytes.
type osFS struct{ limit int64 }

func (f osFS) Open(name string) (fs.File, error) { return os.Open(name) }

func (f osFS) ReadFile(name string) ([]byte, error) { return readInputFile(name, f.limit) }

// readSample reads the spectrum files of one sample named on the command
// line (see spectra.ReadSample): each corrected against its reference
// standard (its own reference_file, confined to the data file's folder
// unless the same file is given with --reference; see resolveReference),
// else o.Reference, then joined. Errors in a reference standard quote none
// of its content.
func readSample(files []string, o sampleOptions) (*spectra.Spectrum, error) {
	explicit := o.Reference
	o.Resolve = func(file, ref string) (string, error) { return resolveReference(file, ref, explicit) }
	s, err := spectra.ReadSample(osFS{o.maxSize}, files, o.SampleOptions)
	if err != nil {
		return nil, quietReferenceErrors(err)
	}
	return s, nil
}

// inputNames lists the files read for s, for refuseOverwrite.
func inputNames(s *spectra.Spectrum) []string {
	names := make([]string, len(s.Inputs))
	for i, in := range s.Inputs {
		names[i] = in.Name
	}
	return names
}

// readSpectrumFile reads one spectrum file of any supported format: a
// regular file of at most limit bytes (0 means defaultMaxFileSize).
func readSpectrumFile(name string, limit int64) (*spectra.Spectrum, error) {
	data, err := readInputFile(name, limit)
	if err != nil {
		return nil, err
	}
	return spectra.Decode(data, name)
}

// writeSpectrumFile writes s in the neutral format to name, through a
// temporary file, or to w when name is "-".
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
	if err := validateSample(o); err != nil {
		return err
	}
	s, err := readSample(files, o)
	if err != nil {
		return err
	}
	printWarnings(e.stderr, "splice", s)
	if *out != "-" {
		if err := refuseOverwrite(*out, inputNames(s)); err != nil {
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
		fmt.Fprintf(report, "%s: %d points, %s–%s nm, from %s\n", *out, s.Len(), fmtNM(lo), fmtNM(hi), strings.Join(files, " + "))
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
