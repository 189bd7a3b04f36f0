package site

import (
	"bytes"
	"encoding/json"
	"slices"
	"strings"
	"testing"
	"unicode"
	"unicode/utf8"

	"skysheet/datasheet/evaluate"
	"skysheet/datasheet/library"
)

func TestSearchWords(t *testing.T) {
	for _, tt := range []struct{ in, want string }{
		{"Rutile TiO₂ (the *pigment*) in BW-93.", "rutile tio₂ pigment bw-93"},
		{"R = 0.95, at 8° and 300 K; see [notes](x.md)", "see notes x.md"},
		{"-- ## What to look for --", "look"},
	} {
		if got := strings.Join(searchWords(tt.in), " "); got != tt.want {
			t.Errorf("searchWords(%q) = %q, want %q", tt.in, got, tt.want)
		}
	}
}

// searchWordsSplit is searchWords as the whole text split at once: what
// wordsOf must yield, word for word.
func searchWordsSplit(text string) []string {
	var out []string
	for _, f := range strings.FieldsFunc(strings.ToLower(text), func(r rune) bool {
		return !(unicode.IsLetter(r) || unicode.IsNumber(r) || r == '-' || r == '.' || r == ',')
	}) {
		w := strings.Trim(f, "-.,")
		if utf8.RuneCountInString(w) < 3 || stopWords[w] || !strings.ContainsFunc(w, unicode.IsLetter) {
			continue
		}
		out = append(out, w)
	}
	return out
}

func FuzzSearchWords(f *testing.F) {
	for _, s := range []string{"Rutile TiO₂ (the *pigment*) in BW-93.", "ÀÉÎ ǅungla ΣΑΣ İstanbul", "a\xffb\xc3cde-.,fgh", "ⅫⅪ ⓐⓑⓒ ＡＢＣ", "--x--yz--"} {
		f.Add(s)
	}
	f.Fuzz(func(t *testing.T, text string) {
		got, want := searchWords(text), searchWordsSplit(text)
		if !slices.Equal(got, want) {
			t.Fatalf("searchWords(%q) = %q, split at once %q", text, got, want)
		}
		for w := range wordsOf(text) { // stopping early is allowed
			_ = w
			break
		}
	})
}

// TestSearchIndex checks the search index of the test library: one entry
// per material, finding each by title, maker, lab, product code,
// category, tag and a word of its notes, a few hundred bytes each; and the
// search box on every page pointing at the site's root.
func TestSearchIndex(t *testing.T) {
	out := renderTest(t, testLibrary(t), Options{})
	data, ok := bytes.CutPrefix(out[searchIndexName], []byte("window.skysheetSearchIndex = "))
	if !ok {
		t.Fatalf("%s: %.60q", searchIndexName, out[searchIndexName])
	}
	var idx [][4]string
	if err := json.Unmarshal(data, &idx); err != nil {
		t.Fatal(err)
	}
	lib := testLibrary(t)
	if len(idx) != len(lib.Materials) {
		t.Errorf("%d entries for %d materials", len(idx), len(lib.Materials))
	}
	find := func(q string) []string {
		var slugs []string
		for _, e := range idx {
			if strings.Contains(strings.ToLower(e[1]+" "+e[2]+" "+e[3]), strings.ToLower(q)) {
				slugs = append(slugs, e[0])
			}
		}
		return slugs
	}
	for q, want := range map[string]string{
		"frostline":        "frostline", // title
		"paint works":      "frostline", // maker
		"northfield":       "clearview", // lab
		"FL-1":             "frostline", // product code
		"transparent":      "clearview", // tag
		"thin":             "clearview", // notes
		"zzqx-not-a-thing": "",
	} {
		if got := strings.Join(find(q), " "); got != want {
			t.Errorf("%q finds %q, want %q", q, got, want)
		}
	}
	for _, e := range idx {
		if b, _ := json.Marshal(e); len(b) > 600 {
			t.Errorf("%s: %d bytes", e[0], len(b))
		}
	}
	for name, page := range out {
		if !strings.HasSuffix(name, ".html") {
			continue
		}
		root := strings.Repeat("../", strings.Count(name, "/"))
		if want := `<form class="site-search" role="search" data-root="` + root + `" hidden>`; !bytes.Contains(page, []byte(want)) {
			t.Errorf("%s lacks %s", name, want)
		}
	}
}

// TestSearchNotesCapped checks that long notes add at most maxNoteBytes of
// words to a material's entry, keeping the first ones.
func TestSearchNotesCapped(t *testing.T) {
	var body strings.Builder
	for i := range 500 {
		body.WriteString("word" + strings.Repeat("x", i%7) + string(rune('a'+i%26)) + string(rune('a'+i/26)) + " ")
	}
	m := &evaluate.Summary{Material: &library.Material{Slug: "long", Front: library.FrontMatter{Title: "Long notes", Maker: "Maker",
		Category: "paint", Tags: []string{"white"}}}}
	e := searchEntry(m, []byte(body.String()))
	if !strings.HasPrefix(e[3], "paint white wordaa ") {
		t.Errorf("words %.40q…", e[3])
	}
	if n := len(e[3]) - len("paint white "); n > maxNoteBytes {
		t.Errorf("notes add %d bytes, want at most %d", n, maxNoteBytes)
	}
}
