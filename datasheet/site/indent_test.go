package site

import (
	"bytes"
	"encoding/json"
	"strings"
	"testing"
)

// TestIndentJSON checks indentJSON against the standard library's
// json.Indent (the reference here) on hand-made documents with empty
// containers, nesting, escapes and punctuation inside strings, and
// marshalIndent against json.MarshalIndent on every demo material's
// figures.
func TestIndentJSON(t *testing.T) {
	for _, src := range []string{`{}`, `[]`, `{"a":[]}`, `{"a":{},"b":[1,2,{"c":null}]}`, `"x"`, `12`,
		`{"s":"a,b:{c}[d]\"e\\","t":["\u003c,",true,false]}`, `[[[]],[{}],{"k":[1]}]`, `{"":""}`} {
		var want bytes.Buffer
		if err := json.Indent(&want, []byte(src), "", "  "); err != nil {
			t.Fatalf("%s: %v", src, err)
		}
		if got := indentJSON(nil, []byte(src)); !bytes.Equal(got, want.Bytes()) {
			t.Errorf("%s:\n%s\nwant\n%s", src, got, want.Bytes())
		}
	}
	// Every JSON file of the test library's site, written by
	// marshalIndent, is json.Indent of its own compact form.
	n := 0
	for name, data := range renderTest(t, testLibrary(t), Options{}) {
		if !strings.HasSuffix(name, ".json") {
			continue
		}
		var compact, want bytes.Buffer
		if err := json.Compact(&compact, data); err != nil {
			t.Fatalf("%s: %v", name, err)
		}
		if err := json.Indent(&want, compact.Bytes(), "", "  "); err != nil {
			t.Fatal(err)
		}
		want.Write(bytes.TrimPrefix(data, bytes.TrimRight(data, "\n"))) // the trailing newline, if any
		if !bytes.Equal(data, want.Bytes()) {
			t.Errorf("%s differs from json.Indent", name)
		}
		n++
	}
	if n < 3 {
		t.Fatalf("only %d JSON files compared", n)
	}
}

func FuzzIndentJSON(f *testing.F) {
	for _, s := range []string{`{"a":[1,{"b":"c,d"}],"e":{}}`, `[]`, `"\\\""`} {
		f.Add([]byte(s))
	}
	f.Fuzz(func(t *testing.T, src []byte) {
		var compact bytes.Buffer
		if json.Compact(&compact, src) != nil {
			return
		}
		var want bytes.Buffer
		if err := json.Indent(&want, compact.Bytes(), "", "  "); err != nil {
			return
		}
		if got := indentJSON(nil, compact.Bytes()); !bytes.Equal(got, want.Bytes()) {
			t.Errorf("%q: %q, want %q", compact.Bytes(), got, want.Bytes())
		}
	})
}
