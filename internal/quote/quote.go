// Package quote cuts values taken from input files to a readable length
// before they are quoted in error messages, so that a 10 MB cell does not put
// 10 MB on a terminal. Every reader (spectra, JCAMP-DX, weather series,
// library front matter and config) quotes offending values with [Value].
package quote

import "strconv"

// MaxRunes is the number of characters of a value kept by [Cut].
const MaxRunes = 40

// Cut returns s cut to [MaxRunes] characters, with "…" appended when
// something was cut.
func Cut(s string) string {
	n := 0
	for i := range s {
		if n == MaxRunes {
			return s[:i] + "…"
		}
		n++
	}
	return s
}

// Value returns s cut by [Cut] and quoted as Go's %q verb quotes it: control
// characters and invalid UTF-8 escaped, printable Unicode kept.
func Value(s string) string {
	return strconv.Quote(Cut(s))
}
