package site

import (
	"bytes"
	"crypto/sha256"
	"encoding/hex"
	"errors"
	"fmt"
	"html/template"
	"io/fs"
	"maps"
	"os"
	"path"
	"runtime"
	"sort"
	"strings"
	"sync"

	"skysheet/datasheet"
	"skysheet/datasheet/evaluate"
	"skysheet/datasheet/library"
	"skysheet/spectra"
	"skysheet/templates"
)

// Options control how a site is rendered.
type Options struct {
	// Templates is the library's templates/ folder; nil means the embedded
	// defaults only. Its *.html files are parsed after the defaults, and
	// its style.css and site.js replace the default assets.
	Templates fs.FS
	// Version is the software version printed on every page.
	Version string
	// Workers is the number of materials evaluated and rendered at once;
	// 0 means one per CPU.
	Workers int
	// Progress, if set, is called after each material page with the number
	// done and the total. It is called from one goroutine at a time.
	Progress func(done, total int)
	// Cache, if set, keeps what is rendered of each material for the next
	// render and gives back what it kept from the last (see [Cache]).
	Cache *Cache
}

// Writer receives the files of the site. Names are slash-separated paths
// relative to the site root; each is written once. Render calls WriteFile
// from one goroutine at a time, but not in name order: a material's files
// are written as soon as it is rendered.
//
// With a [Cache], a Writer that also has the method
//
//	LinkFile(name, src string, srcInfo fs.FileInfo) error
//
// is given the files the cache holds by the path of the cache's copy
// (to link, or copy), rather than read into memory and written again;
// srcInfo is that copy's, when the cache has just looked at it, else nil.
// A Writer that keeps in place the files of the last render that it is
// given again may also have the method
//
//	KeptFile(name string) fs.FileInfo
//
// returning what is at name now (not following a link), or nil when it
// keeps no such file. When that is the very file of the cache (the same
// device and inode, size and modification time as recorded), the cache
// does not look at its own copy, and passes what KeptFile returned to
// LinkFile as srcInfo.
type Writer interface {
	WriteFile(name string, data []byte) error
}

// linker is a Writer that can take a file from the cache's folder.
type linker interface {
	LinkFile(name, src string, srcInfo fs.FileInfo) error
}

// keeper is a Writer that tells the files of the last render it keeps.
type keeper interface {
	KeptFile(name string) fs.FileInfo
}

// Render evaluates every material of lib with [evaluate.Library] and writes
// the site to out: each material's page and downloads as soon as the
// material is evaluated (its spectra are then dropped), then the index,
// listings, comparison pages, review page, catalog.json and assets, built
// from the materials' summaries. Problems are collected: the error, if
// any, is a [library.Errors] naming each material or page that failed, in
// file order, and out may then hold only part of the site (write to a
// temporary place and keep it only on success).
func Render(lib *library.Library, opt Options, out Writer) error {
	b, err := newBuilder(lib, opt)
	if err != nil {
		return err
	}
	w := &serialWriter{out: out}
	if k, ok := out.(keeper); ok {
		b.kept = k.KeptFile
	}
	cmpOf := b.comparisonsOf()
	eo := evaluate.Options{Workers: opt.Workers, Progress: opt.Progress}
	if opt.Cache != nil {
		eo.Reuse = func(m *library.Material) (*evaluate.Summary, error) {
			return b.reuse(m, cmpOf[m.Slug], w)
		}
	}
	sums, err := evaluate.Library(lib, eo, func(m *evaluate.Material) error {
		cmps := cmpOf[m.Slug]
		files, err := b.materialFiles(m, cmps)
		if err != nil {
			return err
		}
		if len(cmps) > 0 {
			b.setOverlay(m.Slug, overlay{r: m.Optics.R, a: m.Optics.A})
		}
		// What stays of the material is what the later pages show.
		m.Figures = keptFigures(m.Figures, len(cmps) > 0)
		if opt.Cache != nil {
			if key, ok := b.keyOf(m.Material, cmps); ok {
				s := m.Kept()
				b.setKey(m.Slug, key, s.Inputs)
				e := &entry{Kept: kept{Inputs: s.Inputs, Figures: s.Figures, Verdicts: s.Verdicts, Warnings: s.Warnings,
					Search: b.keptSearchEntry(m.Slug)}}
				if paths, ok := opt.Cache.put(key, e, lib, files); ok {
					return w.takeAll(e.Files, paths, nil, files)
				}
			}
		}
		return w.writeAll(files)
	})
	if err != nil {
		return err
	}
	b.sums = sums
	files, err := b.render()
	if err != nil {
		return err
	}
	for _, t := range b.taken {
		if err := w.takeAll(t.list, t.paths, t.infos, nil); err != nil {
			return err
		}
	}
	return w.writeAll(files)
}

// keptFigures returns what the pages built after the datasheets need of
// f: the headline numbers, the notes and colours, and the figures of the
// material tables and colour charts (every figure when a comparison lists
// the material), and the weather series' figures that catalog.json and the
// comparisons give. The cooling curve, the sensitivities, the sky, the
// assumptions, the provenance and the rest stay in the material's
// figures.json.
func keptFigures(f *datasheet.Figures, all bool) *datasheet.Figures {
	if f == nil {
		return nil
	}
	k := *f
	k.Assumptions, k.Splices, k.CoolingCurve, k.Sensitivity, k.Cautions = nil, nil, nil, nil, nil
	k.Sky, k.Provenance, k.Stack = datasheet.Sky{}, datasheet.Provenance{}, nil
	if !all {
		k.Figures = nil
		for _, x := range f.Figures {
			if isTableFigure(x.Key) || x.IsColor() {
				k.Figures = append(k.Figures, x)
			}
		}
	}
	return &k
}

// isTableFigure reports whether the material tables show figure key.
func isTableFigure(key string) bool {
	for _, c := range tableFigures {
		if c.Key == key {
			return true
		}
	}
	return false
}

// serialWriter lets one goroutine at a time write.
type serialWriter struct {
	mu  sync.Mutex
	out Writer
}

// takeAll writes the files a cache entry lists, in name order: by the
// path of the cache's copy (and its file information when infos has it)
// when the Writer can link, else from data or, when data lacks a file,
// from the cache's copy.
func (w *serialWriter) takeAll(list []cachedFile, paths []string, infos []fs.FileInfo, data files) error {
	l, canLink := w.out.(linker)
	w.mu.Lock()
	defer w.mu.Unlock()
	for i, f := range list {
		if canLink {
			var info fs.FileInfo
			if i < len(infos) {
				info = infos[i]
			}
			if err := l.LinkFile(f.Name, paths[i], info); err != nil {
				return err
			}
			continue
		}
		b, ok := data[f.Name]
		if !ok {
			var err error
			if b, err = os.ReadFile(paths[i]); err != nil {
				return err
			}
		}
		if err := w.out.WriteFile(f.Name, b); err != nil {
			return err
		}
	}
	return nil
}

// writeAll writes files in name order.
func (w *serialWriter) writeAll(fs files) error {
	names := make([]string, 0, len(fs))
	for n := range fs {
		names = append(names, n)
	}
	sort.Strings(names)
	w.mu.Lock()
	defer w.mu.Unlock()
	for _, n := range names {
		if err := w.out.WriteFile(n, fs[n]); err != nil {
			return err
		}
	}
	return nil
}

type builder struct {
	lib  *library.Library
	opt  Options
	tmpl *template.Template
	md   markdown
	site siteInfo
	// sums are the materials' summaries, in library order, for the pages
	// rendered after the datasheets: the index, listings, review page and
	// catalog.json.
	sums []*evaluate.Summary
	// cacheBase is the part of every cache key that all materials share.
	cacheBase string
	// kept is the Writer's KeptFile, if it has one (see Cache.get).
	kept func(name string) fs.FileInfo
	// Guarded by mu: overlays keeps, for each material a comparison
	// lists, what its overlay charts draw; keys, what identifies each
	// cached material's summary, by slug (see setKey and pageKey; read-only
	// once the materials are evaluated); taken, the site files that the
	// pages made after the datasheets take from the cache (see memo).
	mu       sync.Mutex
	overlays map[string]overlay
	search   map[string][4]string // each material's search index entry (see searchEntryOf)
	keys     map[string]string
	taken    []takenFiles
	// Made by prepare before the pages that rest on every material, and
	// read-only after: the materials in index order and their numbers in
	// it, the categories and tags, the figure cells of each material's
	// table row by slug.
	order      []*evaluate.Summary
	numbers    map[string]int
	categories groupSet
	tags       groupSet
	rowFigs    map[string]*rowFigures
}

func newBuilder(lib *library.Library, opt Options) (*builder, error) {
	t, err := parseTemplates(opt.Templates)
	if err != nil {
		return nil, err
	}
	cfg := lib.Config
	b := &builder{lib: lib, opt: opt, tmpl: t, md: newMarkdown(cfg.AllowHTML),
		site: siteInfo{Title: cfg.Title, Description: cfg.Description, Lab: cfg.Lab, Publisher: cfg.Publisher,
			Version: opt.Version, SiteAddress: cfg.SiteAddress}}
	if opt.Cache != nil {
		if b.cacheBase, err = cacheBaseOf(opt.Cache, opt, cfg); err != nil {
			return nil, err
		}
	}
	return b, nil
}

// reuse writes what the cache kept of m, listed by comparisons cmps,
// through w and returns its summary; nil when the cache holds no valid
// entry for m.
func (b *builder) reuse(m *library.Material, cmps []*library.Comparison, w *serialWriter) (*evaluate.Summary, error) {
	key, ok := b.keyOf(m, cmps)
	if !ok {
		return nil, nil
	}
	e, paths, infos := b.opt.Cache.get(key, b.lib, b.kept)
	if e == nil {
		return nil, nil
	}
	if err := w.takeAll(e.Files, paths, infos, nil); err != nil {
		return nil, err
	}
	b.opt.Cache.hit()
	b.setKey(m.Slug, key, e.Kept.Inputs)
	b.setSearchEntry(m.Slug, e.Kept.Search)
	return cachedSummary(m, e), nil
}

// setKey records what identifies the summary of the material with the
// given slug: its cache key, which names the Markdown file, and the files
// it rests on with their SHA-256 (a spectrum changed keeps the key).
func (b *builder) setKey(slug, key string, inputs []library.Input) {
	h := sha256.New()
	fmt.Fprintf(h, "%d:%s\n", len(key), key)
	for _, in := range inputs {
		fmt.Fprintf(h, "%d:%s\n%d:%s\n", len(in.Path), in.Path, len(in.SHA256), in.SHA256)
	}
	b.mu.Lock()
	defer b.mu.Unlock()
	if b.keys == nil {
		b.keys = map[string]string{}
	}
	b.keys[slug] = hex.EncodeToString(h.Sum(nil))
}

// parseTemplates parses the default templates, then the overrides.
func parseTemplates(over fs.FS) (*template.Template, error) {
	t, err := template.New("").ParseFS(templates.FS, "*.html")
	if err != nil {
		return nil, fmt.Errorf("default templates: %w", err)
	}
	if over == nil {
		return t, nil
	}
	names, err := fs.Glob(over, "*.html")
	if err != nil || len(names) == 0 {
		return t, nil
	}
	t, err = t.ParseFS(over, "*.html")
	if err != nil {
		return nil, fmt.Errorf("templates/: %w", err)
	}
	for _, n := range []string{"index", "datasheet", "listing", "compare", "review"} {
		if t.Lookup(n) == nil {
			return nil, fmt.Errorf("templates/: the page template %q is missing", n)
		}
	}
	return t, nil
}

// asset returns a file of the overrides, else the default.
func (b *builder) asset(name string) ([]byte, error) {
	if b.opt.Templates != nil {
		data, err := fs.ReadFile(b.opt.Templates, name)
		if err == nil {
			return data, nil
		}
		if !errors.Is(err, fs.ErrNotExist) {
			return nil, fmt.Errorf("templates/%s: %w", name, err)
		}
	}
	return fs.ReadFile(templates.FS, name)
}

// files maps output names to contents.
type files map[string][]byte

// render renders the pages that rest on every material: index,
// listings, comparisons, review and assets.
func (b *builder) render() (files, error) {
	b.prepare()
	// The parts are independent: they are built at the same time, each
	// into files of its own, and merged in this order.
	// The index and catalog.json take the longest: first, so that the
	// workers share the rest (each listing is a part).
	parts := []func(files) error{b.indexFiles, b.catalogFiles}
	for _, kind := range []string{"tag", "category"} {
		g := b.groups(kind == "tag")
		for _, s := range g.slugs {
			parts = append(parts, func(out files) error {
				ms := g.members[s]
				return b.memo(b.pageKey(ms, "listing", kind, s, g.names[s]), out, func(out files) error {
					return b.listingFiles(kind, s, g.names[s], ms, out)
				})
			})
		}
	}
	for _, c := range b.lib.Comparisons {
		parts = append(parts, func(out files) error { return b.comparisonFiles(c, out) })
	}
	parts = append(parts, b.reviewFiles,
		func(out files) error {
			data, err := b.searchIndex()
			out[searchIndexName] = data
			return err
		},
		func(out files) error {
			var errs library.Errors
			for _, a := range []string{"style.css", "site.js"} {
				data, err := b.asset(a)
				if err != nil {
					errs = append(errs, err)
					continue
				}
				out["assets/"+a] = data
			}
			if len(errs) > 0 {
				return errs
			}
			return nil
		})
	outs := make([]files, len(parts))
	errs := make([]error, len(parts))
	b.each(len(parts), func(i int) {
		outs[i] = files{}
		errs[i] = parts[i](outs[i])
	})
	out := files{}
	var all library.Errors
	for i := range parts {
		maps.Copy(out, outs[i])
		var es library.Errors
		switch {
		case errs[i] == nil:
		case errors.As(errs[i], &es):
			all = append(all, es...)
		default:
			all = append(all, errs[i])
		}
	}
	if len(all) > 0 {
		return nil, all
	}
	return out, nil
}

// each calls do(i) for every i in [0, n), taken in order by at most
// workers goroutines at once, and returns when all have returned.
func (b *builder) each(n int, do func(i int)) {
	next := make(chan int)
	var wg sync.WaitGroup
	for range min(b.workers(), n) {
		wg.Go(func() {
			for i := range next {
				do(i)
			}
		})
	}
	for i := range n {
		next <- i
	}
	close(next)
	wg.Wait()
}

// workers is the number of goroutines rendering at once.
func (b *builder) workers() int {
	if b.opt.Workers > 0 {
		return b.opt.Workers
	}
	return runtime.GOMAXPROCS(0)
}

// execute runs a page template.
func (b *builder) execute(name string, p *page) ([]byte, error) {
	var buf bytes.Buffer
	if err := b.tmpl.ExecuteTemplate(&buf, name, p); err != nil {
		return nil, err
	}
	return buf.Bytes(), nil
}

// rootOf is the relative path from the page at outPath to the site root.
func rootOf(outPath string) string {
	return strings.Repeat("../", len(splitPath(path.Dir(outPath))))
}

func (b *builder) newPage(kind, title, outPath string) *page {
	p := &page{Site: b.site, Root: rootOf(outPath), Title: title, Kind: kind}
	if b.site.SiteAddress != "" {
		p.Canonical = b.site.SiteAddress + outPath
	}
	return p
}

func splitPath(p string) []string {
	if p == "." || p == "" {
		return nil
	}
	var parts []string
	for p != "." && p != "/" && p != "" {
		parts = append(parts, path.Base(p))
		p = path.Dir(p)
	}
	return parts
}

// materialDir is the output folder of a material.
func materialDir(slug string) string { return "m/" + slug + "/" }

// comparisonsOf maps each material slug to the comparisons listing it.
func (b *builder) comparisonsOf() map[string][]*library.Comparison {
	m := map[string][]*library.Comparison{}
	for _, c := range b.lib.Comparisons {
		for _, x := range c.Materials {
			m[x.Slug] = append(m[x.Slug], c)
		}
	}
	return m
}

// materialFiles renders one material: its page and downloads.
func (b *builder) materialFiles(m *evaluate.Material, cmps []*library.Comparison) (files, error) {
	dir := materialDir(m.Slug)
	fail := func(err error) (files, error) {
		return nil, &library.Error{File: m.Path, Err: fmt.Errorf("page %sindex.html: %w", dir, err)}
	}
	p := b.newPage("datasheet", m.Front.Title, dir+"index.html")
	source, body, err := m.Text()
	if err != nil {
		return nil, err
	}
	b.setSearchEntry(m.Slug, searchEntry(&m.Summary, body))
	v, err := b.materialView(m, body, p.Root, cmps)
	if err != nil {
		return fail(err)
	}
	p.M = v
	html, err := b.execute("datasheet", p)
	if err != nil {
		return fail(err)
	}
	var csv bytes.Buffer
	if err := spectra.Write(&csv, m.Sample); err != nil {
		return fail(err)
	}
	js, err := marshalIndent(m.Figures)
	if err != nil {
		return fail(err)
	}
	claims, err := b.claimsJSON(&m.Summary)
	if err != nil {
		return fail(err)
	}
	var figCSV bytes.Buffer
	if err := m.Figures.WriteCSV(&figCSV); err != nil {
		return fail(err)
	}
	out, err := b.weatherFiles(m)
	if err != nil {
		return nil, err
	}
	out[dir+"index.html"] = html
	out[dir+"spectrum.csv"] = csv.Bytes()
	out[dir+"figures.json"] = append(js, '\n')
	out[dir+"figures.csv"] = figCSV.Bytes()
	out[dir+"claims.json"] = claims
	out[dir+"source.md"] = source
	return out, nil
}
