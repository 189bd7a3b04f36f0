package main

import (
	"errors"
	"fmt"
	"os"
	"path/filepath"
	"strings"

	"skysheet/spectra"
	"skysheet/spectra/msg"
)

// errReferenceOutside is wrapped by the error for a reference_file that
// leaves the folder of the data file naming it.
var errReferenceOutside = errors.New("leaves the folder of the data file")

// resolveReference returns the path of the reference standard that the
// metadata of the data file name (reference_file: f) name. A data file is
// not trusted to name any file on the system: f must lie in name's folder or
// below it, also after following symbolic links, unless it is the very file
// given on the command line with --reference (explicit).
func resolveReference(name, f, explicit string) (string, error) {
	dir := filepath.Dir(name)
	p := filepath.Join(dir, filepath.FromSlash(f))
	if filepath.IsAbs(f) {
		p = filepath.Clean(f)
	}
	if explicit != "" && sameFile(p, explicit) {
		return explicit, nil
	}
	outside := fmt.Errorf("%s %w: put the reference standard in that folder, or give it with --reference %s", msg.Quote(f), errReferenceOutside, p)
	if filepath.IsAbs(f) || !inside(dir, p) {
		return "", outside
	}
	// A symbolic link may lead out of the folder.
	realDir, err1 := filepath.EvalSymlinks(dir)
	realP, err2 := filepath.EvalSymlinks(p)
	if err1 == nil && err2 == nil && !inside(realDir, realP) {
		return "", outside
	}
	return p, nil
}

// inside reports whether path p lies in folder dir or below it.
func inside(dir, p string) bool {
	rel, err := filepath.Rel(dir, p)
	return err == nil && rel != ".." && !strings.HasPrefix(rel, ".."+string(filepath.Separator))
}

// quietReferenceErrors returns err with the content quoted from reference
// standards taken out: a reader's error in a file other than the data file
// it belongs to (see withoutContent).
func quietReferenceErrors(err error) error {
	var errs []error
	if j, ok := err.(interface{ Unwrap() []error }); ok {
		errs = j.Unwrap()
	} else {
		errs = []error{err}
	}
	changed := false
	for i, e := range errs {
		var fe *spectra.FileError
		var pe *spectra.ParseError
		if errors.As(e, &fe) && errors.As(e, &pe) && fe.File != "" && pe.File != fe.File {
			errs[i] = fmt.Errorf("%s: reference standard %w", fe.File, withoutContent(pe))
			changed = true
		}
	}
	if !changed {
		return err
	}
	return errors.Join(errs...)
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
