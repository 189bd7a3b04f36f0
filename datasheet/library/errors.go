package library

import (
	"errors"
	"fmt"
	"sort"
	"strings"
)

// The errors an [*Error] may wrap.
var (
	ErrNoConfig        = errors.New("no skysheet.yaml: not a library folder")
	ErrNoFrontMatter   = errors.New("no front matter: want a first line \"---\", YAML, then a closing \"---\"")
	ErrUnclosed        = errors.New("front matter is not closed: want a line \"---\" after the YAML")
	ErrSyntax          = errors.New("bad YAML")
	ErrUnknownKey      = errors.New("unknown key")
	ErrDuplicateKey    = errors.New("key given twice")
	ErrType            = errors.New("wrong type")
	ErrMissing         = errors.New("missing required key")
	ErrBadSlug         = errors.New("bad slug")
	ErrDuplicateSlug   = errors.New("slug already used")
	ErrPath            = errors.New("bad path")
	ErrEscapes         = errors.New("path leaves the library folder")
	ErrUnknownMaterial = errors.New("no material with this slug")
	ErrConditions      = errors.New("bad conditions")
	ErrSpectrum        = errors.New("cannot read spectrum")
	ErrWeather         = errors.New("cannot read weather series")
	ErrNotAllowed      = errors.New("key not allowed here")
	ErrUnknownFigure   = errors.New("no such figure")
	ErrClaim           = errors.New("bad claim")
	ErrBlank           = errors.New("blank not filled in")
)

// Error is a problem at a place in a library file. Line and Column are
// 1-based; zero means unknown.
type Error struct {
	File   string
	Line   int
	Column int
	Err    error
}

func (e *Error) Error() string {
	var b strings.Builder
	b.WriteString(e.File)
	if e.Line > 0 {
		fmt.Fprintf(&b, ":%d", e.Line)
		if e.Column > 0 {
			fmt.Fprintf(&b, ":%d", e.Column)
		}
	}
	b.WriteString(": ")
	b.WriteString(e.Err.Error())
	return b.String()
}

func (e *Error) Unwrap() error { return e.Err }

// Errors is every problem found in a library, in file order.
type Errors []error

// Error returns the errors one per line.
func (es Errors) Error() string {
	lines := make([]string, len(es))
	for i, e := range es {
		lines[i] = e.Error()
	}
	return strings.Join(lines, "\n")
}

// Unwrap returns the errors, so that [errors.Is] and [errors.As] look at
// each of them.
func (es Errors) Unwrap() []error { return es }

// errorf returns an *Error wrapping sentinel with a message.
func errorf(file string, line, col int, sentinel error, format string, a ...any) *Error {
	msg := fmt.Sprintf(format, a...)
	if msg == "" {
		return &Error{File: file, Line: line, Column: col, Err: sentinel}
	}
	return &Error{File: file, Line: line, Column: col, Err: fmt.Errorf("%w: %s", sentinel, msg)}
}

// Join returns the problems in errs as one Errors in file order: the
// config first, then the other files by path, each file's problems in the
// order given. Each of errs may be nil, an Errors or a single error (one
// that is not an *Error sorts with the config). Join returns nil when
// there are no problems.
func Join(errs ...error) error {
	var all Errors
	for _, err := range errs {
		var es Errors
		switch {
		case err == nil:
		case errors.As(err, &es):
			all = append(all, es...)
		default:
			all = append(all, err)
		}
	}
	if len(all) == 0 {
		return nil
	}
	file := func(err error) string {
		var e *Error
		if errors.As(err, &e) && e.File != ConfigFile {
			return e.File
		}
		return ""
	}
	sort.SliceStable(all, func(i, j int) bool { return file(all[i]) < file(all[j]) })
	return all
}
