package main

import (
	"os"

	"skysheet/datasheet"
)

// version returns the program's version; see [datasheet.Version].
func version() string { return datasheet.Version() }

// isTerminal reports whether f is a character device (a terminal).
func isTerminal(f *os.File) bool {
	st, err := f.Stat()
	return err == nil && st.Mode()&os.ModeCharDevice != 0
}
