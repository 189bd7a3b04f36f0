package msg

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

// Quote returns s cut by [Cut] and quoted as Go's %q verb quotes it: control
// characters and invalid UTF-8 escaped, printable Unicode kept.
func Quote(s string) string {
	return strconv.Quote(Cut(s))
}
