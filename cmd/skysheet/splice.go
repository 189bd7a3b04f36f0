package main

import (
	"bytes"
	"flag"
	"fmt"
	"io"
	"io/fs"
	"os"
	"path/filepath"
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

// sampleFlags adds the splice flags, their names starting with prefix, and
// --reference.
func sampleFlags(fs *flag.FlagSet, prefix string, o *spectra.SampleOptions) {
	o.Splice.Tolerance = spectra.DefaultSpliceTol
	fs.TextVar(&o.Splice.Method, prefix+"method", o.Splice.Method, "splice `METHOD` where two files overlap: offset, scale or none")
	fs.StringVar(&o.Splice.Adjust, prefix+"adjust", "", "file whose data the splice adjusts (default: the one reaching longer wavelengths)")
	fs.Float64Var(&o.Splice.JunctionNM, prefix+"junction", 0, "splice junction in nm (default: the middle of the overlap)")
	fs.Float64Var(&o.Splice.Tolerance, prefix+"tol", o.Splice.Tolerance, "flag a splice whose mean mismatch before correction exceeds this")
	fs.StringVar(&o.Reference, "reference", "", "neutral-format file of the reference standard's calibrated reflectance; corrects R = R_rel × R_ref in files that name no reference_file of their own")
}

// validateSample checks the sample flags.
func validateSample(o spectra.SampleOptions) error {
	if !(o.Splice.Tolerance > 0 && o.Splice.Tolerance <= 1) {
		return usagef("splice tolerance %g: want 0 < tolerance ≤ 1", o.Splice.Tolerance)
	}
	if o.Splice.JunctionNM < 0 {
		return usagef("junction %g nm: want a positive wavelength", o.Splice.JunctionNM)
	}
	return nil
}

// osFS reads files by the names given on the command line: relative to
// the working folder, or absolute.
type osFS struct{}

func (osFS) Open(name string) (fs.File, error)        { return os.Open(name) }
func (osFS) ReadFile(name string) ([]byte, error)     { return os.ReadFile(name) }
func (osFS) resolve(file, ref string) (string, error) { return resolveBeside(file, ref), nil }

// resolveBeside returns ref, a file named inside file, as a path: ref itself
// when absolute, else relative to file's folder.
func resolveBeside(file, ref string) string {
	if filepath.IsAbs(ref) {
		return ref
	}
	return filepath.Join(filepath.Dir(file), ref)
}

// readSample reads the spectrum files of one sample named on the command
// line (see spectra.ReadSample): each corrected against its reference
// standard (its own reference_file, relative to the file, else
// o.Reference), then joined.
func readSample(files []string, o spectra.SampleOptions) (*spectra.Spectrum, error) {
	o.Resolve = osFS{}.resolve
	return spectra.ReadSample(osFS{}, files, o)
}

// readSpectrumFile reads one spectrum file of any supported format.
func readSpectrumFile(name string) (*spectra.Spectrum, error) {
	data, err := os.ReadFile(name)
	if err != nil {
		return nil, err
	}
	return spectra.Decode(data, name)
}

// writeSpectrumFile writes s in the neutral format to name, or to w when
// name is "-".
func writeSpectrumFile(w io.Writer, name string, s *spectra.Spectrum) error {
	var b bytes.Buffer
	if err := spectra.Write(&b, s); err != nil {
		return err
	}
	if name == "-" {
		_, err := w.Write(b.Bytes())
		return err
	}
	return os.WriteFile(name, b.Bytes(), 0o644)
}

func runSplice(e *env, args []string) error {
	var o spectra.SampleOptions
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
