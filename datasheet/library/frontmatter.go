package library

import (
	"bytes"
	"fmt"
	"math"
	"slices"
	"strings"
	"unicode/utf8"

	"gopkg.in/yaml.v3"

	"skysheet/datasheet"
	"skysheet/spectra"
	"skysheet/spectra/msg"
)

// FrontMatter is the YAML block at the top of a content file. A material
// needs title, maker or lab, and either at least one spectra entry or a
// stack of layers; a comparison page has title and compare, and may have
// slug, summary and reference.
type FrontMatter struct {
	Title       string            `yaml:"title"`
	Slug        string            `yaml:"slug"` // default: from the file name
	Maker       string            `yaml:"maker"`
	Lab         string            `yaml:"lab"`
	ProductCode string            `yaml:"product_code"`
	Category    string            `yaml:"category"` // free text, e.g. paint, film, fabric, membrane
	Tags        []string          `yaml:"tags"`
	Summary     string            `yaml:"summary"`
	License     string            `yaml:"license"` // licence of the data
	Spectra     []SpectrumRef     `yaml:"spectra"`
	Measured    Measured          `yaml:"measured"`
	Conditions  Overrides         `yaml:"conditions"`
	Claims      []datasheet.Claim `yaml:"claims"`
	Compare     []string          `yaml:"compare"` // slugs of materials: makes the file a comparison page
	// Stack makes the material a stack of layers, top first, computed
	// from the layers' spectra instead of measured.
	Stack []LayerRef `yaml:"stack"`
	// Reference, on a comparison page, is the slug of the material the
	// others are compared with (one of compare).
	Reference string `yaml:"reference"`
	// Skin, on a comparison page with a reference, is the slug of a
	// skin-like surface: each material is then also worn over it as a
	// textile (heat reaching the skin).
	Skin string `yaml:"skin"`
}

// LayerRef is one layer of a stack: another material of the library, or
// spectra files of its own, with the layer's thickness and thermal
// conductivity when heat crosses it by conduction (a cover).
type LayerRef struct {
	Material        string        `yaml:"material"` // slug of a measured material of the library
	Name            string        `yaml:"name"`     // for a layer with its own spectra
	Spectra         []SpectrumRef `yaml:"spectra"`
	ThicknessMM     *float64      `yaml:"thickness_mm"`
	ConductivityWmK *float64      `yaml:"conductivity_w_mk"`
}

// SpectrumRef names one spectra file of a material.
type SpectrumRef struct {
	File       string `yaml:"file" json:"file,omitempty"` // relative to the Markdown file, slash-separated
	Role       string `yaml:"role" json:"role,omitempty"` // free text: solar, thermal, ...
	Instrument string `yaml:"instrument" json:"instrument,omitempty"`
	Notes      string `yaml:"notes" json:"notes,omitempty"`
}

// Measured describes how a material was measured. All fields but
// Emittance are free text.
type Measured struct {
	Date       string `yaml:"date" json:"date,omitempty"`
	Instrument string `yaml:"instrument" json:"instrument,omitempty"`
	Angle      string `yaml:"angle" json:"angle,omitempty"`
	Reference  string `yaml:"reference" json:"reference,omitempty"` // reference standard
	Operator   string `yaml:"operator" json:"operator,omitempty"`
	Notes      string `yaml:"notes" json:"notes,omitempty"`
	// Emittance is the basis of the infrared data, near-normal or
	// hemispherical, for the files that do not state their own.
	Emittance spectra.EmittanceBasis `yaml:"emittance" json:"emittance,omitempty"`
}

// figureKeys are the figures a claim may name.
var figureKeys = datasheet.FigureKeys()

// checkClaims reports the claims that name no figure the tool computes, or
// that are malformed, at the node that is wrong.
func (d doc) checkClaims(cs []datasheet.Claim, nodes []*yaml.Node) []error {
	var errs []error
	for i, c := range cs {
		n := nodes[i]
		at := func(key string) *yaml.Node {
			if n.Kind != yaml.MappingNode {
				return n
			}
			return valueNode(n, key)
		}
		if f := strings.TrimSpace(c.Figure); f != "" && !slices.Contains(figureKeys, f) {
			best, close := msg.Nearest(f, figureKeys)
			hint := fmt.Sprintf("nearest figure %q; known figures: %s", best, strings.Join(figureKeys, ", "))
			if close {
				hint = fmt.Sprintf("did you mean %q?", best)
			}
			errs = append(errs, d.at(at("figure"), ErrUnknownFigure, "claim %d names %q (%s)", i+1, f, hint))
			continue
		}
		if err := c.Validate(); err != nil {
			node := n
			switch {
			case strings.TrimSpace(c.Figure) == "":
				node = at("figure")
			case !finite(c.Value):
				node = at("value")
			case !finite(c.Tolerance) || c.Tolerance < 0:
				node = at("tolerance")
			case strings.Contains(err.Error(), ": delta_e "):
				node = at("delta_e")
			case strings.Contains(err.Error(), ": values "):
				node = at("values")
			case strings.Contains(err.Error(), ": value "):
				node = at("value")
			default:
				node = at("basis")
			}
			errs = append(errs, d.at(node, ErrClaim, "claim %d: %v", i+1, err))
		}
	}
	return errs
}

// maxLayerMM is the thickest layer a stack accepts: a cover, a film or a
// fabric, not a wall.
const maxLayerMM = 1000

// checkStack reports the layers of a stack that are malformed, at the node
// that is wrong: each layer names a material or has spectra of its own (not
// both), a name only with its own spectra, thickness and conductivity
// together, each finite and positive.
func (d doc) checkStack(layers []LayerRef, key *yaml.Node, nodes []*yaml.Node) []error {
	if len(layers) < 2 {
		return []error{d.at(key, ErrMissing, "stack: want a list of at least two layers, top first, each with material: or spectra:")}
	}
	if len(nodes) != len(layers) {
		return nil // the decoder reported the type error
	}
	var errs []error
	for i, l := range layers {
		n := nodes[i]
		at := func(key string) *yaml.Node {
			if v := valueNode(n, key); v != n {
				return v
			}
			return n
		}
		own, named := len(l.Spectra) > 0, strings.TrimSpace(l.Material) != ""
		switch {
		case own && named:
			errs = append(errs, d.at(at("spectra"), ErrNotAllowed, "stack layer %d has both material: and spectra:; keep one", i+1))
		case !own && !named:
			errs = append(errs, d.at(n, ErrMissing, "stack layer %d: material: (a slug of this library) or spectra: (files of its own)", i+1))
		case named && strings.TrimSpace(l.Name) != "":
			errs = append(errs, d.at(at("name"), ErrNotAllowed, "stack layer %d: name: is for a layer with its own spectra; a material layer takes its material's title", i+1))
		case own && strings.TrimSpace(l.Name) == "":
			errs = append(errs, d.at(n, ErrMissing, "stack layer %d: name: (a layer with its own spectra needs a name to show)", i+1))
		}
		for j, s := range l.Spectra {
			if strings.TrimSpace(s.File) == "" {
				sp := at("spectra")
				if sp.Kind == yaml.SequenceNode && j < len(sp.Content) {
					sp = sp.Content[j]
				}
				errs = append(errs, d.at(sp, ErrMissing, "file (stack layer %d, spectra entry %d)", i+1, j+1))
			}
		}
		if (l.ThicknessMM == nil) != (l.ConductivityWmK == nil) {
			errs = append(errs, d.at(n, ErrMissing, "stack layer %d: thickness_mm and conductivity_w_mk go together (heat crossing the layer by conduction needs both)", i+1))
		}
		if x := l.ThicknessMM; x != nil && !(*x > 0 && *x <= maxLayerMM) {
			errs = append(errs, d.at(at("thickness_mm"), ErrConditions, "stack layer %d: thickness_mm %g: want 0 < d ≤ %d mm", i+1, *x, maxLayerMM))
		}
		if x := l.ConductivityWmK; x != nil && !(*x > 0 && *x <= 1000) {
			errs = append(errs, d.at(at("conductivity_w_mk"), ErrConditions, "stack layer %d: conductivity_w_mk %g: want 0 < k ≤ 1000 W m⁻¹ K⁻¹", i+1, *x))
		}
	}
	return errs
}

func finite(x float64) bool { return !math.IsNaN(x) && !math.IsInf(x, 0) }

// comparisonKeys are the only keys a comparison page may set.
var comparisonKeys = map[string]bool{"title": true, "slug": true, "summary": true, "compare": true, "reference": true, "skin": true}

// splitFront splits a content file into its YAML text and Markdown body.
// The YAML text starts on file line 2; the body starts on line bodyLine.
func splitFront(file string, src []byte) (yamlText, body []byte, bodyLine int, err error) {
	src = bytes.TrimPrefix(src, []byte("\uFEFF"))
	fence := func(l []byte, marks ...string) bool {
		t := strings.TrimRight(string(l), " \t\r")
		for _, m := range marks {
			if t == m {
				return true
			}
		}
		return false
	}
	nl := bytes.IndexByte(src, '\n')
	if nl < 0 || !fence(src[:nl], "---") {
		if fence(src, "---") {
			return nil, nil, 0, errorf(file, 1, 0, ErrUnclosed, "")
		}
		return nil, nil, 0, errorf(file, 1, 0, ErrNoFrontMatter, "")
	}
	start, pos, line := nl+1, nl+1, 1
	for pos < len(src) {
		end, next := len(src), len(src)
		if i := bytes.IndexByte(src[pos:], '\n'); i >= 0 {
			end, next = pos+i, pos+i+1
		}
		line++
		if fence(src[pos:end], "---", "...") {
			return src[start:pos], src[next:], line + 1, nil
		}
		pos = next
	}
	return nil, nil, 0, errorf(file, 1, 0, ErrUnclosed, "")
}

// frontLines records where things are in the front matter, for errors.
type frontLines struct {
	root    *yaml.Node
	spectra []*yaml.Node // one per spectra entry
	compare []*yaml.Node // one per compare entry
	stack   []*yaml.Node // one per stack layer
}

// place is a file line and column.
type place struct{ Line, Column int }

// frontPlaces records where the checks made after parsing (see readFile)
// point in a front matter that parsed: the file lines and columns of its
// values. A key that is missing has the place of the front matter itself.
type frontPlaces struct {
	Slug, Skin, Spectra place
	Compare             []place // one per compare entry
	Files               []place // one per spectra entry: its file value, or the entry
	Stack               []layerPlaces
}

// layerPlaces are the places of one stack layer.
type layerPlaces struct {
	At, Material place
	Files        []place // one per spectra entry of the layer's own
}

// places returns where the values of the front matter are, in file lines.
func (fl frontLines) places(d doc) frontPlaces {
	at := func(n *yaml.Node) place { return place{n.Line + d.offset, n.Column} }
	files := func(nodes []*yaml.Node) []place {
		var ps []place
		for _, n := range nodes {
			if v := valueNode(n, "file"); v != n {
				n = v
			}
			ps = append(ps, at(n))
		}
		return ps
	}
	p := frontPlaces{
		Slug:    at(valueNode(fl.root, "slug")),
		Skin:    at(valueNode(fl.root, "skin")),
		Spectra: at(valueNode(fl.root, "spectra")),
		Files:   files(fl.spectra),
	}
	for _, n := range fl.compare {
		p.Compare = append(p.Compare, at(n))
	}
	for _, n := range fl.stack {
		var nodes []*yaml.Node
		if v := valueNode(n, "spectra"); v != n && v.Kind == yaml.SequenceNode {
			nodes = v.Content
		}
		p.Stack = append(p.Stack, layerPlaces{At: at(n), Material: at(valueNode(n, "material")), Files: files(nodes)})
	}
	return p
}

// parseFront reads and checks the front matter of file and returns where
// its values are (see frontPlaces) when it parsed.
func parseFront(file string, yamlText []byte) (FrontMatter, frontPlaces, error) {
	fm, fl, d, err := parseFrontNodes(file, yamlText)
	if fl.root == nil {
		return fm, frontPlaces{}, err
	}
	return fm, fl.places(d), err
}

// parseFrontNodes is parseFront with the YAML nodes of the front matter.
func parseFrontNodes(file string, yamlText []byte) (FrontMatter, frontLines, doc, error) {
	d := doc{file: file, offset: 1}
	var fm FrontMatter
	var fl frontLines
	root, err := d.parse(yamlText)
	if err != nil {
		return fm, fl, d, err
	}
	fl.root = root
	var errs Errors
	usable, err := d.decode(root, &fm)
	if err != nil {
		errs = append(errs, err.(Errors)...)
	}
	if !usable {
		return fm, fl, d, errs
	}
	if v := valueNode(root, "spectra"); v != root && v.Kind == yaml.SequenceNode {
		fl.spectra = v.Content
	}
	if v := valueNode(root, "compare"); v != root && v.Kind == yaml.SequenceNode {
		fl.compare = v.Content
	}
	if v := valueNode(root, "stack"); v != root && v.Kind == yaml.SequenceNode && len(v.Content) == len(fm.Stack) {
		fl.stack = v.Content
	}
	trim := func(s *string) { *s = strings.TrimSpace(*s) }
	for _, s := range []*string{&fm.Title, &fm.Slug, &fm.Maker, &fm.Lab, &fm.ProductCode, &fm.Category, &fm.Summary, &fm.License} {
		trim(s)
	}
	missing := func(key, what string) {
		errs = append(errs, errorf(file, 1, 0, ErrMissing, "%s (%s)", key, what))
	}
	if fm.Title == "" {
		missing("title", "the name shown on the page")
	}
	if valueNode(root, "compare") != root {
		for i := 0; i+1 < len(root.Content); i += 2 {
			if k := root.Content[i]; !comparisonKeys[k.Value] {
				errs = append(errs, d.at(k, ErrNotAllowed, "%s in a comparison page (it has compare:); allowed: title, slug, summary, compare, reference, skin", msg.Quote(k.Value)))
			}
		}
		if len(fm.Compare) == 0 {
			errs = append(errs, d.at(valueNode(root, "compare"), ErrMissing, "compare: want a list of material slugs"))
		}
		if r := strings.TrimSpace(fm.Reference); r != "" && !slices.ContainsFunc(fm.Compare, func(s string) bool { return strings.TrimSpace(s) == r }) {
			best, _ := msg.Nearest(r, fm.Compare)
			errs = append(errs, d.at(valueNode(root, "reference"), ErrUnknownMaterial, "reference %s is not one of compare (did you mean %q?)", msg.Quote(r), best))
		}
		if strings.TrimSpace(fm.Skin) != "" && strings.TrimSpace(fm.Reference) == "" {
			errs = append(errs, d.at(valueNode(root, "skin"), ErrMissing, "reference: skin: compares textiles worn over a skin-like surface against a reference; name the reference material"))
		}
	} else {
		if fm.Maker == "" && fm.Lab == "" {
			missing("maker", "or lab: who made or measured the material")
		}
		switch stack := valueNode(root, "stack"); {
		case stack != root && valueNode(root, "spectra") != root:
			errs = append(errs, d.at(stack, ErrNotAllowed, "stack together with spectra: a stack takes its spectra from its layers; keep one of the two"))
		case stack != root && stack.Kind == yaml.SequenceNode:
			errs = append(errs, d.checkStack(fm.Stack, stack, fl.stack)...)
		case stack == root && len(fm.Spectra) == 0:
			missing("spectra", "a list of spectra files, each with file:, or a stack of layers")
		}
		for i, s := range fm.Spectra {
			if strings.TrimSpace(s.File) == "" {
				errs = append(errs, d.at(fl.spectra[i], ErrMissing, "file (spectra entry %d)", i+1))
			}
		}
	}
	for i, t := range fm.Tags {
		fm.Tags[i] = strings.TrimSpace(t)
	}
	errs = append(errs, d.blanks(root, "")...)
	if v := valueNode(root, "claims"); v != root && v.Kind == yaml.SequenceNode && len(v.Content) == len(fm.Claims) {
		errs = append(errs, d.checkClaims(fm.Claims, v.Content)...)
	}
	if len(errs) > 0 {
		return fm, fl, d, errs
	}
	return fm, fl, d, nil
}

// Blank starts a value that is still to be filled in, as "skysheet import
// --material" writes them: "FILL IN: who made the material". A front
// matter value or a body line holding it is an [ErrBlank].
const Blank = "FILL IN"

// blanks reports every scalar under n whose value starts with [Blank], at
// its line and column, naming its key.
func (d doc) blanks(n *yaml.Node, key string) []error {
	var errs []error
	switch n.Kind {
	case yaml.ScalarNode:
		if strings.HasPrefix(strings.TrimSpace(n.Value), Blank) {
			what := strings.TrimSpace(strings.TrimPrefix(strings.TrimSpace(n.Value), Blank))
			what = strings.TrimSpace(strings.TrimPrefix(what, ":"))
			errs = append(errs, d.at(n, ErrBlank, "%s: %s", key, cutBlank(what)))
		}
	case yaml.MappingNode:
		for i := 0; i+1 < len(n.Content); i += 2 {
			k := n.Content[i].Value
			if key != "" {
				k = key + "." + k
			}
			errs = append(errs, d.blanks(n.Content[i+1], k)...)
		}
	case yaml.SequenceNode:
		for i, c := range n.Content {
			errs = append(errs, d.blanks(c, fmt.Sprintf("%s[%d]", key, i+1))...)
		}
	}
	return errs
}

// bodyBlanks reports every line of a Markdown body holding [Blank];
// the body starts on file line first.
func bodyBlanks(file string, body []byte, first int) []error {
	var errs []error
	for i, l := range bytes.Split(body, []byte("\n")) {
		if c := bytes.Index(l, []byte(Blank)); c >= 0 {
			errs = append(errs, errorf(file, first+i, utf8.RuneCount(l[:c])+1, ErrBlank, "in the text: %s", cutBlank(strings.TrimSpace(string(l[c:])))))
		}
	}
	return errs
}

// cutBlank cuts what a blank asks for to 160 characters: long enough for
// the hints import writes, short enough for one message.
func cutBlank(s string) string {
	if r := []rune(s); len(r) > 160 {
		return string(r[:159]) + "…"
	}
	return s
}
