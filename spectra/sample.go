package spectra

import (
	"errors"
	"fmt"
	"io/fs"
	"path"
)

// SampleOptions say how [ReadSample] reads and joins the files of one
// sample. The zero value joins with the default splice options and applies
// only the reference standards the files name themselves.
type SampleOptions struct {
	// Splice chooses how files whose ranges overlap are spliced (see
	// [Join]).
	Splice SpliceOptions
	// Reference is a reference-standard file, read from the same file
	// system, for the files whose metadata name none; "" means none.
	Reference string
	// Resolve returns the name, in the file system, of the reference
	// standard ref named in the metadata of file (under [ReferenceKey]). Nil
	// means ref itself when it is absolute, else ref relative to file's
	// folder. An error is reported as a problem of file.
	Resolve func(file, ref string) (string, error)
}

// FileError is a problem with one file of a sample: reading it, decoding
// it or applying its reference standard.
type FileError struct {
	// Index is the file's position in the list given to [ReadSample], or
	// -1 for a problem joining the files.
	Index int
	// File is the file's name as given, "" when Index is -1.
	File string
	Err  error
}

func (e *FileError) Error() string { return e.Err.Error() }

func (e *FileError) Unwrap() error { return e.Err }

// ReadSample reads the spectrum files of one sample from fsys and returns
// them as one spectrum: each file is decoded by its extension (see
// [Decode]), its reflectance made absolute against the reference standard
// its metadata name or, failing that, opt.Reference (see
// [ApplyReference]), and the files are joined with [Join] and opt.Splice.
// A reference standard named by several files is read once.
//
// The result's Inputs list every file read, data files and reference
// standards, in the order they were read, each with its SHA-256.
//
// Every file is tried: the error, if any, joins (as [errors.Join] does)
// one [*FileError] per file that could not be used, in file order, or is
// a single *FileError with Index -1 when the files could not be joined.
func ReadSample(fsys fs.FS, files []string, opt SampleOptions) (*Spectrum, error) {
	if len(files) == 0 {
		return nil, &FileError{Index: -1, Err: fmt.Errorf("spectra: %w: no files", ErrNoData)}
	}
	resolve := opt.Resolve
	if resolve == nil {
		resolve = func(file, ref string) (string, error) {
			if path.IsAbs(ref) {
				return ref, nil
			}
			return path.Join(path.Dir(file), ref), nil
		}
	}
	refs := map[string]*Spectrum{}
	var inputs []Input
	// read reads and decodes one file, recording it among the inputs.
	read := func(name string) (*Spectrum, error) {
		data, err := fs.ReadFile(fsys, name)
		if err != nil {
			return nil, fmt.Errorf("%s: %w", name, unwrapPath(err))
		}
		in := inputOf(name, data)
		s, err := decode(data, name)
		if err != nil {
			return nil, err
		}
		inputs = append(inputs, in)
		return s, nil
	}
	parts := make([]*Spectrum, 0, len(files))
	var errs []error
	for i, name := range files {
		s, err := read(name)
		if err == nil {
			s, err = withReference(s, name, opt.Reference, resolve, refs, read)
		}
		if err != nil {
			errs = append(errs, &FileError{Index: i, File: name, Err: err})
			continue
		}
		parts = append(parts, s)
	}
	if len(errs) > 0 {
		return nil, errors.Join(errs...)
	}
	s, err := Join(parts, opt.Splice)
	if err != nil {
		return nil, &FileError{Index: -1, Err: err}
	}
	s.Inputs = inputs
	return s, nil
}

// withReference applies to s, read from file name, the reference standard
// its metadata name, else the default one (def, "" for none).
func withReference(s *Spectrum, name, def string, resolve func(file, ref string) (string, error),
	refs map[string]*Spectrum, read func(string) (*Spectrum, error)) (*Spectrum, error) {
	ref := def
	if r, ok := referenceFile(s); ok {
		p, err := resolve(name, r)
		if err != nil {
			return nil, fmt.Errorf("%s: %s %q: %w", name, ReferenceKey, r, err)
		}
		ref = p
	}
	if ref == "" {
		if w := ReferenceWarning(s, name); w != "" {
			s.Warnings = append(s.Warnings, w)
		}
		return s, nil
	}
	r, ok := refs[ref]
	if !ok {
		var err error
		if r, err = read(ref); err != nil {
			return nil, fmt.Errorf("%s: reference standard %w", name, err)
		}
		refs[ref] = r
	}
	return ApplyReference(s, r)
}

// unwrapPath drops the *fs.PathError wrapper, whose path the caller
// names already.
func unwrapPath(err error) error {
	var pe *fs.PathError
	if errors.As(err, &pe) {
		return pe.Err
	}
	return err
}
