package site

import (
	"bytes"
	"encoding/json"
	"iter"
	"slices"
	"strings"
	"unicode"
	"unicode/utf8"

	"skysheet/datasheet/evaluate"
)

// searchIndexName is the script holding the library-wide search index, at
// the site's root. A script rather than JSON: a page opened from file://
// may load a script but not fetch a file.
const searchIndexName = "search.js"

// maxNoteBytes caps the words a material's notes add to the search index,
// so that the index stays a few hundred bytes per material.
const maxNoteBytes = 240

// stopWords are left out of the notes' words (common English words that
// would match nearly every material).
var stopWords = map[string]bool{}

func init() {
	for _, w := range strings.Fields(`the and for are but not you all any can has had her was one our out his how its may who did
		get let put say she too use with from this that they them then than there these those what when where which while
		will would been being have into over under more most also only such each both other some very just about after
		before between through during without within upon here your their were does done per via is it of on in at to by
		as an or be so no if we`) {
		stopWords[w] = true
	}
}

// searchIndex returns the search script: one entry per material in library
// order, [slug, title, maker or lab, words], the words being the lab (when
// a maker is named), product code, category, tags and, up to maxNoteBytes,
// the distinct words of the notes, in lower case. site.js loads it when
// the search box is first used.
func (b *builder) searchIndex() ([]byte, error) {
	out, err := b.appendParts([]byte("window.skysheetSearchIndex = ["), b.sums, "search entries", ",", b.searchEntries)
	if err != nil {
		return nil, err
	}
	return append(out, "]\n"...), nil
}

// searchEntries returns the search index entries of ms as JSON, separated
// by commas (json.Marshal escapes <, > and &: safe in a script).
func (b *builder) searchEntries(ms []*evaluate.Summary) ([]byte, error) {
	entries := make([][4]string, 0, len(ms))
	for _, m := range ms {
		e, err := b.searchEntryOf(m)
		if err != nil {
			return nil, err
		}
		entries = append(entries, e)
	}
	return jsonElements(entries)
}

// searchEntryOf returns m's entry of the search index: the one made when
// its datasheet was, or kept in the cache with it (see setSearchEntry);
// else made from its Markdown file read now.
func (b *builder) searchEntryOf(m *evaluate.Summary) ([4]string, error) {
	b.mu.Lock()
	e, ok := b.search[m.Slug]
	b.mu.Unlock()
	if ok {
		return e, nil
	}
	_, body, err := m.Text()
	if err != nil {
		return [4]string{}, err
	}
	return searchEntry(m, body), nil
}

// keptSearchEntry returns the search index entry kept for material slug.
func (b *builder) keptSearchEntry(slug string) [4]string {
	b.mu.Lock()
	defer b.mu.Unlock()
	return b.search[slug]
}

// setSearchEntry keeps e as the search index entry of material slug.
func (b *builder) setSearchEntry(slug string, e [4]string) {
	b.mu.Lock()
	defer b.mu.Unlock()
	if b.search == nil {
		b.search = map[string][4]string{}
	}
	b.search[slug] = e
}

// jsonElements returns the JSON of the slice v without its brackets: its
// elements separated by commas, a part of a longer array.
func jsonElements[T any](v []T) ([]byte, error) {
	data, err := json.Marshal(v)
	if err != nil {
		return nil, err
	}
	return data[1 : len(data)-1], nil
}

// searchEntry is the entry of the search index of material m, whose
// Markdown body is body.
func searchEntry(m *evaluate.Summary, body []byte) [4]string {
	fm := m.Front
	who := firstOf(fm.Maker, fm.Lab)
	seen := map[string]bool{}
	for w := range wordsOf(fm.Title + " " + who) {
		seen[w] = true // found in the title or maker already
	}
	var words []string
	add := func(text string, limit int) {
		n := 0
		for w := range wordsOf(text) {
			if seen[w] {
				continue
			}
			if limit > 0 && n+len(w)+1 > limit {
				return
			}
			seen[w] = true
			words = append(words, w)
			n += len(w) + 1
		}
	}
	if fm.Maker != "" {
		add(fm.Lab, 0)
	}
	add(fm.ProductCode+" "+fm.Category+" "+strings.Join(fm.Tags, " "), 0)
	add(string(body), maxNoteBytes)
	return [4]string{m.Slug, fm.Title, who, strings.Join(words, " ")}
}

// searchWords splits text into lower-case words of letters and digits
// (joined by inner hyphens, points or commas, as in "bw-93" or "0.95"),
// leaving out words shorter than three characters, numbers without a
// letter, stop words and Markdown.
func searchWords(text string) []string { return slices.Collect(wordsOf(text)) }

// wordsOf yields the words of searchWords(text) one by one, as it finds
// them: a caller that stops early does not split the rest of the text.
// Each rune is lowered as strings.ToLower lowers it (invalid UTF-8 gives
// U+FFFD, which separates words).
func wordsOf(text string) iter.Seq[string] {
	return func(yield func(string) bool) {
		var w []byte // the lowered field being read
		emit := func() bool {
			f := bytes.Trim(w, "-.,")
			w = w[:0]
			if utf8.RuneCount(f) < 3 || stopWords[string(f)] || !bytes.ContainsFunc(f, unicode.IsLetter) {
				return true
			}
			return yield(string(f))
		}
		for _, r := range text {
			r = unicode.ToLower(r)
			if unicode.IsLetter(r) || unicode.IsNumber(r) || r == '-' || r == '.' || r == ',' {
				w = utf8.AppendRune(w, r)
				continue
			}
			if len(w) > 0 && !emit() {
				return
			}
		}
		if len(w) > 0 {
			emit()
		}
	}
}
