package main

import (
	"errors"
	"fmt"
	"os"
	"path/filepath"
	"strings"

	"skysheet/internal/quote"
	"skysheet/spectra"
)

// errReferenceOutside is wrapped by the error for a reference_file that
// leaves the folder of the data file naming it.
var errReferenceOutside = errors.New("leaves the folder of the data file")

// readReference reads the reference standard that the metadata of the data
// file name (reference_file: f) names. A data file is not trusted to name
// any file on the system: f must lie in name's folder or below it (an
// os.Root refuses symbolic links that lead out), unless it is the very file
// given on the command line with --reference (explicit). The message of a
// file that does not read as a spectrum quotes none of its content. It
// returns the path read, for refuseOverwrite.
func readReference(name, f, explicit string, limit int64) (*spectra.Spectrum, string, error) {
	dir := filepath.Dir(name)
	p := filepath.Join(dir, filepath.FromSlash(f))
	if filepath.IsAbs(f) {
		p = filepath.Clean(f)
	}
	if explicit != "" && sameFile(p, explicit) {
		s, err := readSpectrumFile(explicit, limit)
		return s, explicit, err
	}
	outside := fmt.Errorf("%s: reference_file %s %w: put the reference standard in that folder, or give it with --reference %s", name, quote.Value(f), errReferenceOutside, p)
	rel, err := filepath.Rel(dir, p)
	if filepath.IsAbs(f) || err != nil || rel == ".." || strings.HasPrefix(rel, ".."+string(filepath.Separator)) {
		return nil, p, outside
	}
	root, err := os.OpenRoot(dir)
	if err != nil {
		return nil, p, err
	}
	defer root.Close()
	file, err := root.OpenFile(rel, openNonBlocking, 0)
	if err != nil {
		if strings.Contains(err.Error(), "escapes") {
			return nil, p, outside // a symbolic link out of the folder
		}
		return nil, p, fmt.Errorf("reference standard for %s: %w", name, err)
	}
	defer file.Close()
	data, err := readLimited(file, limit)
	if err != nil {
		return nil, p, fmt.Errorf("reference standard for %s: %s: %w", name, p, err)
	}
	s, err := spectra.Decode(data, p)
	if err != nil {
		return nil, p, fmt.Errorf("reference standard for %s: %w", name, withoutContent(err))
	}
	return s, p, nil
}

// sameFile reports whether the paths a and b name one existing file.
func sameFile(a, b string) bool {
	sa, err := os.Stat(a)
	if err != nil {
		return false
	}
	sb, err := os.Stat(b)
	return err == nil && os.SameFile(sa, sb)
}

// withoutContent returns a reader's error with its place (file, line,
// column) and kind, but without the text it quotes from the file.
func withoutContent(err error) error {
	var pe *spectra.ParseError
	if !errors.As(err, &pe) {
		return err
	}
	inner := pe.Err
	for {
		u := errors.Unwrap(inner)
		if u == nil {
			break
		}
		inner = u
	}
	if inner == pe.Err { // nothing shorter to give: name the kind only
		inner = errors.New("is not a readable spectrum file")
	}
	return &spectra.ParseError{File: pe.File, Line: pe.Line, Column: pe.Column, Err: inner}
}
