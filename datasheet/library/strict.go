package library

import (
	"errors"
	"fmt"
	"io/fs"
	"reflect"
	"regexp"
	"sort"
	"strconv"
	"strings"
	"sync"
	"time"

	"gopkg.in/yaml.v3"

	"skysheet/spectra/msg"
)

// doc is one YAML document of a library file: the file name and the number
// of lines before the YAML text, so that node lines map to file lines.
type doc struct {
	file   string
	offset int
	fsys   fs.FS                  // for files named in the document (a sky file)
	seen   *sync.Map              // what was learnt of the spectrum files (see Library.seen)
	listed map[string]fs.DirEntry // the regular files under content/, as listed (see contentFiles)
	loaded time.Time              // when Load began (see StampOf)
}

// parse reads the YAML text src into a node. An empty text gives an empty
// mapping.
func (d doc) parse(src []byte) (*yaml.Node, error) {
	var n yaml.Node
	if err := yaml.Unmarshal(src, &n); err != nil {
		return nil, d.yamlError(err, ErrSyntax)
	}
	if n.Kind == 0 {
		return &yaml.Node{Kind: yaml.MappingNode, Tag: "!!map", Line: 1, Column: 1}, nil
	}
	root := &n
	if root.Kind == yaml.DocumentNode && len(root.Content) == 1 {
		root = root.Content[0]
	}
	if root.Kind != yaml.MappingNode {
		return nil, d.at(root, ErrType, "want a mapping of keys to values, found %s", kindName(root))
	}
	return root, nil
}

// at returns an error at node n.
func (d doc) at(n *yaml.Node, sentinel error, format string, a ...any) *Error {
	return errorf(d.file, n.Line+d.offset, n.Column, sentinel, format, a...)
}

var yamlLineRE = regexp.MustCompile(`line (\d+)`)

// parserProblems start the messages of the yaml package's parser (as
// opposed to its scanner). The parser reports 0-based lines; the scanner
// and the decoder report 1-based lines; both report none for the first line.
var parserProblems = []string{
	"did not find expected ',' or ']'", "did not find expected ',' or '}'",
	"did not find expected '-' indicator", "did not find expected <document start>",
	"did not find expected <stream-start>", "did not find expected key",
	"did not find expected node content", "found duplicate %TAG directive",
	"found duplicate %YAML directive", "found incompatible YAML document",
	"found undefined tag handle",
}

// yamlError turns an error from the yaml package into *Error lines, with
// line numbers moved to the file's.
func (d doc) yamlError(err error, sentinel error) error {
	fix := func(msg string, parser bool) (int, string) {
		msg = strings.TrimPrefix(msg, "yaml: ")
		line := 0
		if m := yamlLineRE.FindStringSubmatchIndex(msg); m != nil && m[0] == 0 {
			line, _ = strconv.Atoi(msg[m[2]:m[3]])
			msg = strings.TrimPrefix(msg[m[1]:], ": ")
		}
		switch {
		case !parser:
		case line == 0 && !strings.HasPrefix(msg, "unknown anchor") && !strings.HasPrefix(msg, "anchor") && !strings.HasPrefix(msg, "document contains"):
			// Syntax errors on the first line carry no line number.
			line = 1
		default:
			for _, p := range parserProblems {
				if strings.HasPrefix(msg, p) {
					line++
					break
				}
			}
		}
		if line == 0 {
			return 0, msg
		}
		return line + d.offset, msg
	}
	var te *yaml.TypeError
	if errors.As(err, &te) {
		var es Errors
		for _, m := range te.Errors {
			line, msg := fix(m, false)
			es = append(es, errorf(d.file, line, 0, sentinel, "%s", msg))
		}
		return es
	}
	line, msg := fix(err.Error(), true)
	return errorf(d.file, line, 0, sentinel, "%s", msg)
}

// check walks node n against the YAML fields of type t and returns an error
// for each unknown or repeated key and for arrays of the wrong length.
// The conditions (type Overrides) are checked by checkConditions.
func (d doc) check(n *yaml.Node, t reflect.Type) []error {
	for t.Kind() == reflect.Pointer {
		t = t.Elem()
	}
	if t == reflect.TypeFor[Overrides]() {
		return d.checkConditions(n)
	}
	if n.Kind == yaml.AliasNode {
		return []error{d.at(n, ErrNotAllowed, "YAML aliases are not used in library files")}
	}
	switch t.Kind() {
	case reflect.Struct:
		if n.Kind != yaml.MappingNode {
			return nil // the decoder reports the type error
		}
		fields := yamlFields(t)
		var errs []error
		seen := map[string]*yaml.Node{}
		for i := 0; i+1 < len(n.Content); i += 2 {
			k, v := n.Content[i], n.Content[i+1]
			if k.Kind == yaml.AliasNode || v.Kind == yaml.AliasNode {
				errs = append(errs, d.at(k, ErrNotAllowed, "YAML aliases are not used in library files"))
				continue
			}
			if k.Value == "<<" {
				errs = append(errs, d.at(k, ErrNotAllowed, "YAML merge keys are not used in library files"))
				continue
			}
			if prev, dup := seen[k.Value]; dup {
				errs = append(errs, d.at(k, ErrDuplicateKey, "%s (first at line %d)", msg.Quote(k.Value), prev.Line+d.offset))
				continue
			}
			seen[k.Value] = k
			f, ok := fields[k.Value]
			if !ok {
				errs = append(errs, d.at(k, ErrUnknownKey, "%s", unknownKey(k.Value, sortedKeys(fields))))
				continue
			}
			errs = append(errs, d.check(v, f.Type)...)
		}
		return errs
	case reflect.Slice:
		if n.Kind != yaml.SequenceNode {
			return nil
		}
		var errs []error
		for _, c := range n.Content {
			errs = append(errs, d.check(c, t.Elem())...)
		}
		return errs
	case reflect.Array:
		if n.Kind != yaml.SequenceNode {
			return nil
		}
		if len(n.Content) != t.Len() {
			return []error{d.at(n, ErrType, "want a list of %d numbers, found %d items", t.Len(), len(n.Content))}
		}
		var errs []error
		for _, c := range n.Content {
			errs = append(errs, d.check(c, t.Elem())...)
		}
		return errs
	}
	return nil
}

// decode checks n strictly against out's type and decodes it into out. The
// error, if any, is an Errors. When usable is true, out is filled as far as
// the types allow and the caller may go on checking it; a repeated key
// stops decoding.
func (d doc) decode(n *yaml.Node, out any) (usable bool, err error) {
	errs := Errors(d.check(n, reflect.TypeOf(out)))
	for _, e := range errs {
		if errors.Is(e, ErrDuplicateKey) {
			return false, errs
		}
	}
	usable = true
	if err := n.Decode(out); err != nil {
		var te *yaml.TypeError
		usable = errors.As(err, &te)
		switch e := d.yamlError(err, ErrType).(type) {
		case Errors:
			errs = append(errs, e...)
		default:
			errs = append(errs, e)
		}
	}
	if len(errs) > 0 {
		return usable, errs
	}
	return true, nil
}

// yamlFields returns the fields of struct type t by YAML key. The map is
// made once per type (the front matter has a few struct types) and shared:
// not to be changed.
func yamlFields(t reflect.Type) map[string]reflect.StructField {
	if m, ok := fieldsByType.Load(t); ok {
		return m.(map[string]reflect.StructField)
	}
	m, _ := fieldsByType.LoadOrStore(t, fieldsOf(t))
	return m.(map[string]reflect.StructField)
}

// fieldsByType holds what yamlFields returned, by type.
var fieldsByType sync.Map

// fieldsOf returns the fields of struct type t by YAML key.
func fieldsOf(t reflect.Type) map[string]reflect.StructField {
	out := map[string]reflect.StructField{}
	for i := range t.NumField() {
		f := t.Field(i)
		if !f.IsExported() {
			continue
		}
		name, _, _ := strings.Cut(f.Tag.Get("yaml"), ",")
		if name == "-" {
			continue
		}
		if name == "" {
			name = strings.ToLower(f.Name)
		}
		out[name] = f
	}
	return out
}

// sortedKeys returns the keys of m, sorted.
func sortedKeys[V any](m map[string]V) []string {
	keys := make([]string, 0, len(m))
	for k := range m {
		keys = append(keys, k)
	}
	sort.Strings(keys)
	return keys
}

// unknownKey describes an unknown key with the nearest of the known names
// (sorted).
func unknownKey(key string, names []string) string {
	best, close := msg.Nearest(key, names)
	if close {
		return fmt.Sprintf("%s (did you mean %q?)", msg.Quote(key), best)
	}
	return fmt.Sprintf("%s (nearest known key %q; known keys: %s)", msg.Quote(key), best, strings.Join(names, ", "))
}

func kindName(n *yaml.Node) string {
	switch n.Kind {
	case yaml.SequenceNode:
		return "a list"
	case yaml.ScalarNode:
		return msg.Quote(n.Value)
	case yaml.MappingNode:
		return "a mapping"
	}
	return "something else"
}
