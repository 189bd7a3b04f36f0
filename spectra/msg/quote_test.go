package msg

import (
	"strings"
	"testing"
	"unicode/utf8"
)

func TestCut(t *testing.T) {
	long := strings.Repeat("é", 10_000_000/2)
	for _, tc := range []struct {
		name, in, want string
	}{
		{"empty", "", ""},
		{"short", "abc", "abc"},
		{"exactly the limit", strings.Repeat("x", MaxRunes), strings.Repeat("x", MaxRunes)},
		{"one over", strings.Repeat("x", MaxRunes+1), strings.Repeat("x", MaxRunes) + "…"},
		{"multibyte runes are not split", long, strings.Repeat("é", MaxRunes) + "…"},
	} {
		t.Run(tc.name, func(t *testing.T) {
			got := Cut(tc.in)
			if got != tc.want {
				t.Errorf("Cut = %q, want %q", got, tc.want)
			}
			if !utf8.ValidString(got) {
				t.Error("result is not valid UTF-8")
			}
		})
	}
}

func TestValue(t *testing.T) {
	for _, tc := range []struct{ in, want string }{
		{"NaN", `"NaN"`},
		{"a\x1b[31mred", `"a\x1b[31mred"`},
		{"µm", `"µm"`},
		{strings.Repeat("9", 10<<20), `"` + strings.Repeat("9", MaxRunes) + `…"`},
	} {
		if got := Quote(tc.in); got != tc.want {
			t.Errorf("Quote(%.20q) = %s, want %s", tc.in, got, tc.want)
		}
	}
}
