package main

import (
	"fmt"
	"io"
	"unicode/utf8"
)

// escapeWriter is how every verb's text output reaches a terminal: titles,
// file names and values read from files may hold control characters (an
// escape sequence that clears the screen or recolours it, a carriage return
// that hides the start of a line). It writes C0 controls other than newline
// and tab, DEL and the C1 controls as visible escapes (\x1b, \u009b), and
// every byte that is not UTF-8 as \xNN; normal Unicode text passes.
//
// Output that is data rather than text for a person (JSON, JUnit XML, a
// spectrum written to standard output) is written through rawWriter
// instead, byte for byte.
type escapeWriter struct {
	w       io.Writer
	pending []byte // the start of a UTF-8 sequence cut by the end of a Write
}

// escaping returns w wrapped in an escapeWriter, unless it is one already.
func escaping(w io.Writer) io.Writer {
	if _, ok := w.(*escapeWriter); ok || w == nil {
		return w
	}
	return &escapeWriter{w: w}
}

// rawWriter returns the writer below an escapeWriter, for data output.
func rawWriter(w io.Writer) io.Writer {
	if e, ok := w.(*escapeWriter); ok {
		return e.w
	}
	return w
}

func (e *escapeWriter) Write(p []byte) (int, error) {
	n := len(p)
	if len(e.pending) > 0 {
		p = append(e.pending, p...)
		e.pending = nil
	}
	// Keep a sequence cut by the end of p for the next Write.
	if i := lastRuneStart(p); i >= 0 && !utf8.FullRune(p[i:]) {
		e.pending = append([]byte(nil), p[i:]...)
		p = p[:i]
	}
	_, err := e.w.Write(appendEscaped(nil, p))
	return n, err
}

// Flush writes a sequence held back at the end of the output, escaped.
func (e *escapeWriter) Flush() error {
	if len(e.pending) == 0 {
		return nil
	}
	p := e.pending
	e.pending = nil
	var out []byte
	for _, c := range p {
		out = fmt.Appendf(out, `\x%02x`, c)
	}
	_, err := e.w.Write(out)
	return err
}

// lastRuneStart returns the index of the last byte of p that may start a
// UTF-8 sequence, among its last three bytes, or -1.
func lastRuneStart(p []byte) int {
	for i := len(p) - 1; i >= 0 && i >= len(p)-3; i-- {
		if utf8.RuneStart(p[i]) {
			if p[i] >= 0xC0 {
				return i
			}
			return -1
		}
	}
	return -1
}

// appendEscaped appends p to dst with control characters and bytes that are
// not UTF-8 escaped.
func appendEscaped(dst, p []byte) []byte {
	for len(p) > 0 {
		r, size := utf8.DecodeRune(p)
		switch {
		case r == utf8.RuneError && size == 1:
			dst = fmt.Appendf(dst, `\x%02x`, p[0])
		case r == '\n' || r == '\t':
			dst = append(dst, byte(r))
		case r < 0x20 || r == 0x7f:
			dst = fmt.Appendf(dst, `\x%02x`, r)
		case r >= 0x80 && r < 0xa0:
			dst = fmt.Appendf(dst, `\u%04x`, r)
		default:
			dst = append(dst, p[:size]...)
		}
		p = p[size:]
	}
	return dst
}

// flushAll flushes the escapeWriters among ws.
func flushAll(ws ...io.Writer) {
	for _, w := range ws {
		if e, ok := w.(*escapeWriter); ok {
			e.Flush()
		}
	}
}
