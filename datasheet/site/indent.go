package site

import "encoding/json"

// marshalIndent is json.MarshalIndent(v, "", "  "), the same bytes, with
// the indentation done by indentJSON instead of json.Indent's scanner
// (which re-checks what json.Marshal has just written).
func marshalIndent(v any) ([]byte, error) {
	b, err := json.Marshal(v)
	if err != nil {
		return nil, err
	}
	return indentJSON(make([]byte, 0, len(b)+len(b)/2), b), nil
}

// indentJSON appends to dst the compact JSON src (as json.Marshal writes
// it: no space outside strings) indented as json.Indent(dst, src, "",
// "  ") indents it: each element on a line of its own, two spaces a level,
// ": " after a key, and empty objects and arrays kept as {} and [].
func indentJSON(dst, src []byte) []byte {
	var in indenter
	return in.indent(dst, src)
}

// indenter is indentJSON fed a document in pieces: where it stands after
// the last piece.
type indenter struct {
	depth                   int
	open, inString, escaped bool
}

// indent appends src, the next piece of the document, indented.
func (in *indenter) indent(dst, src []byte) []byte {
	newline := func(depth int) {
		dst = append(dst, '\n')
		for range depth {
			dst = append(dst, ' ', ' ')
		}
	}
	depth, open, inString, escaped := in.depth, in.open, in.inString, in.escaped
	for _, c := range src {
		if inString {
			dst = append(dst, c)
			switch {
			case escaped:
				escaped = false
			case c == '\\':
				escaped = true
			case c == '"':
				inString = false
			}
			continue
		}
		if open && c != '}' && c != ']' {
			// The first element of an object or array.
			open = false
			depth++
			newline(depth)
		}
		switch c {
		case '"':
			inString = true
			dst = append(dst, c)
		case '{', '[':
			open = true
			dst = append(dst, c)
		case ',':
			dst = append(dst, c)
			newline(depth)
		case ':':
			dst = append(dst, c, ' ')
		case '}', ']':
			if open {
				open = false // empty: {} or []
			} else {
				depth--
				newline(depth)
			}
			dst = append(dst, c)
		default:
			dst = append(dst, c)
		}
	}
	in.depth, in.open, in.inString, in.escaped = depth, open, inString, escaped
	return dst
}
