package main

import (
	"context"
	"crypto/sha256"
	"encoding/hex"
	"errors"
	"fmt"
	"html"
	"io"
	"io/fs"
	"mime"
	"net"
	"net/http"
	"os"
	"os/signal"
	"path"
	"path/filepath"
	"sort"
	"strings"
	"sync"
	"time"

	"github.com/fsnotify/fsnotify"

	"skysheet/datasheet/library"
	"skysheet/datasheet/site"
)

func init() {
	register(&command{
		name:    "preview",
		args:    "[DIR]",
		summary: "preview the library in DIR (default .) on 127.0.0.1 while editing: render it in memory, again on every change",
		run:     runPreview,
	})
}

func runPreview(e *env, args []string) error {
	fl := newFlags(e, commands["preview"])
	port := fl.Int("port", 8080, "port on 127.0.0.1 (0 picks a free one)")
	noCache := fl.Bool("no-cache", false, "neither read nor write the render cache ("+cacheDir+"/ in the library folder)")
	maxSize := maxFileSizeFlag(fl)
	pos, err := parseFlags(fl, args)
	if err != nil {
		return err
	}
	if len(pos) > 1 {
		return usagef("one library folder at most, got %d", len(pos))
	}
	if *port < 0 || *port > 65535 {
		return usagef("port %d: want 0..65535", *port)
	}
	dir := "."
	if len(pos) == 1 {
		dir = pos[0]
	}
	if st, err := os.Stat(dir); err != nil || !st.IsDir() {
		return usagef("library folder %s: not a folder", dir)
	}
	s := &preview{dir: dir, version: version(), log: e.stderr, maxSize: *maxSize, cache: !*noCache}
	s.rerender()
	ln, err := net.Listen("tcp", fmt.Sprintf("127.0.0.1:%d", *port))
	if err != nil {
		return err
	}
	ctx, stop := signal.NotifyContext(context.Background(), os.Interrupt)
	defer stop()
	go func() {
		if err := s.watch(ctx, 200*time.Millisecond); err != nil {
			fmt.Fprintf(e.stderr, "skysheet preview: watching %s: %v\n", dir, err)
		}
	}()
	srv := &http.Server{Handler: s, ReadHeaderTimeout: 10 * time.Second}
	go func() {
		<-ctx.Done()
		shut, cancel := context.WithTimeout(context.Background(), 2*time.Second)
		defer cancel()
		srv.Shutdown(shut)
	}()
	fmt.Fprintf(e.stdout, "previewing %s at http://%s/ (Ctrl-C to stop); pages reload when a file changes\n", dir, ln.Addr())
	if err := srv.Serve(ln); err != nil && !errors.Is(err, http.ErrServerClosed) {
		return err
	}
	return nil
}

// preview holds the latest render of a library in memory and serves it.
type preview struct {
	dir, version string
	log          io.Writer
	maxSize      int64 // largest file read; 0 means defaultMaxFileSize
	cache        bool  // use the render cache, as render does

	// changed, if set, is called from the watcher with the name of every
	// change that leads to a new render (tests follow the watcher with it).
	changed func(name string)

	mu     sync.RWMutex
	files  map[string][]byte // last good render
	failed []string          // problems of the last render, if it failed
	id     string            // changes with every new render result
}

// memSite collects a render in memory.
type memSite map[string][]byte

func (m memSite) WriteFile(name string, data []byte) error {
	m[name] = data
	return nil
}

// rerender renders the library and records the result. A failed render
// keeps the previous pages and shows its problems on them.
func (s *preview) rerender() {
	files, problems := s.render()
	h := sha256.New()
	if problems != nil {
		for _, p := range problems {
			fmt.Fprintln(h, p)
		}
	} else {
		names := make([]string, 0, len(files))
		for n := range files {
			names = append(names, n)
		}
		sort.Strings(names)
		for _, n := range names {
			fmt.Fprintf(h, "%s %d\n", n, len(files[n]))
			h.Write(files[n])
		}
	}
	id := hex.EncodeToString(h.Sum(nil))[:16]
	s.mu.Lock()
	defer s.mu.Unlock()
	if problems == nil {
		s.files = files
	}
	s.failed = problems
	if id != s.id {
		s.id = id
		if problems != nil {
			fmt.Fprintf(s.log, "render failed:\n  %s\n", strings.Join(problems, "\n  "))
		} else {
			fmt.Fprintf(s.log, "rendered %d files (render %s)\n", len(files), id)
		}
	}
}

func (s *preview) render() (memSite, []string) {
	problems := func(err error) []string {
		var es library.Errors
		if errors.As(err, &es) {
			var out []string
			for _, e := range es {
				out = append(out, e.Error())
			}
			return out
		}
		return []string{err.Error()}
	}
	root, err := os.OpenRoot(s.dir)
	if err != nil {
		return nil, problems(err)
	}
	defer root.Close()
	fsys := newInputFS(root, s.maxSize)
	defer fsys.Close()
	var fc *library.FrontCache
	if s.cache {
		fc = frontCacheOf(s.dir)
	}
	lib, err := loadLibrary(fsys, fc)
	if err != nil {
		return nil, problems(err)
	}
	opt := site.Options{Version: s.version}
	if st, err := fs.Stat(fsys, templatesDir); err == nil && st.IsDir() {
		opt.Templates, _ = fs.Sub(fsys, templatesDir)
	}
	if s.cache {
		// The same cache as render's: a rebuild after an edit evaluates
		// only the materials whose files changed.
		c, release := openRenderCache(s.dir, s.log)
		defer release()
		opt.Cache = c
	}
	out := memSite{}
	if err := site.Render(lib, opt, out); err != nil {
		return nil, problems(err)
	}
	if opt.Cache != nil {
		closeRenderCache(opt.Cache, fc, s.dir, s.log)
	}
	return out, nil
}

// renderIDPath answers the current render id; open pages poll it.
const renderIDPath = "/_skysheet/render-id"

func (s *preview) ServeHTTP(w http.ResponseWriter, r *http.Request) {
	if !loopbackHost(r.Host) {
		// A page elsewhere may point a name of its own at 127.0.0.1 (DNS
		// rebinding) to read the preview; such requests carry that name.
		http.Error(w, "skysheet preview answers only requests for localhost, 127.0.0.1 or [::1]", http.StatusMisdirectedRequest)
		return
	}
	s.mu.RLock()
	files, failed, id := s.files, s.failed, s.id
	s.mu.RUnlock()
	if r.URL.Path == renderIDPath {
		w.Header().Set("Content-Type", "text/plain; charset=utf-8")
		w.Header().Set("Cache-Control", "no-store")
		io.WriteString(w, id)
		return
	}
	name := strings.TrimPrefix(path.Clean("/"+r.URL.Path), "/")
	if name == "" || strings.HasSuffix(r.URL.Path, "/") {
		name = path.Join(name, "index.html")
	}
	data, ok := files[name]
	if !ok && files != nil {
		if _, dir := files[path.Join(name, "index.html")]; dir {
			http.Redirect(w, r, r.URL.Path+"/", http.StatusMovedPermanently)
			return
		}
	}
	w.Header().Set("Cache-Control", "no-store")
	if !ok {
		if files == nil && failed != nil {
			w.Header().Set("Content-Type", "text/html; charset=utf-8")
			w.WriteHeader(http.StatusInternalServerError)
			io.WriteString(w, liveExtras(id, failed, []byte("<!DOCTYPE html><html><head><meta charset=\"utf-8\"><title>Render failed</title></head><body></body></html>")))
			return
		}
		http.NotFound(w, r)
		return
	}
	ct := mime.TypeByExtension(path.Ext(name))
	if ct == "" {
		ct = http.DetectContentType(data)
	}
	w.Header().Set("Content-Type", ct)
	if strings.HasSuffix(name, ".html") {
		io.WriteString(w, liveExtras(id, failed, data))
		return
	}
	w.Write(data)
}

// liveExtras adds to a page, in a preview only, a script that reloads it
// when the render id changes and, after a failed render, a banner with the
// problems.
func liveExtras(id string, failed []string, page []byte) string {
	script := `<script>(function(){var id="` + id + `";function poll(){fetch("` + renderIDPath + `",{cache:"no-store"}).then(function(r){return r.text()}).then(function(t){if(t!==id){location.reload()}else{setTimeout(poll,800)}}).catch(function(){setTimeout(poll,2000)})}setTimeout(poll,800)})();</script>`
	s := string(page)
	if len(failed) > 0 {
		banner := `<div style="position:sticky;top:0;z-index:9;background:#7a1d1d;color:#fff;padding:10px 16px;font:14px/1.4 monospace;white-space:pre-wrap">The last render failed; showing the previous pages.` + "\n" + html.EscapeString(strings.Join(failed, "\n")) + `</div>`
		if i := bodyOpenEnd(s); i >= 0 {
			s = s[:i] + banner + s[i:]
		} else {
			s = banner + s
		}
	}
	if i := strings.LastIndex(s, "</body>"); i >= 0 {
		return s[:i] + script + s[i:]
	}
	return s + script
}

// bodyOpenEnd returns the index just after the <body ...> tag, or -1.
func bodyOpenEnd(s string) int {
	i := strings.Index(s, "<body")
	if i < 0 {
		return -1
	}
	j := strings.IndexByte(s[i:], '>')
	if j < 0 {
		return -1
	}
	return i + j + 1
}

// watch renders again after changes below the library folder, once no
// change has come for quiet. It watches every folder (new ones too), except
// hidden ones and the site folder that render writes.
func (s *preview) watch(ctx context.Context, quiet time.Duration) error {
	w, err := fsnotify.NewWatcher()
	if err != nil {
		return err
	}
	defer w.Close()
	addTree := func(root string) {
		filepath.WalkDir(root, func(p string, d fs.DirEntry, err error) error {
			if err != nil || !d.IsDir() {
				return nil
			}
			if p != root && strings.HasPrefix(d.Name(), ".") || s.ignored(p) {
				return filepath.SkipDir
			}
			w.Add(p)
			return nil
		})
	}
	addTree(s.dir)
	var timer *time.Timer
	fire := make(chan struct{}, 1)
	for {
		select {
		case <-ctx.Done():
			return nil
		case ev, ok := <-w.Events:
			if !ok {
				return nil
			}
			if strings.HasPrefix(filepath.Base(ev.Name), ".") || s.ignored(ev.Name) {
				continue // editor swap files, hidden folders, the site folder
			}
			if ev.Has(fsnotify.Create) {
				if st, err := os.Stat(ev.Name); err == nil && st.IsDir() {
					addTree(ev.Name)
				}
			}
			if s.changed != nil {
				s.changed(ev.Name)
			}
			if timer != nil {
				timer.Stop()
			}
			timer = time.AfterFunc(quiet, func() {
				select {
				case fire <- struct{}{}:
				default:
				}
			})
		case err, ok := <-w.Errors:
			if !ok {
				return nil
			}
			fmt.Fprintf(s.log, "watch: %v\n", err)
		case <-fire:
			s.rerender()
		}
	}
}

// ignored reports whether p, a path below the library folder, is the site
// folder that render writes by default: its changes are no edits of the
// library.
func (s *preview) ignored(p string) bool {
	return filepath.Clean(p) == filepath.Join(s.dir, siteDir)
}

// renderID returns the current render id.
func (s *preview) renderID() string {
	s.mu.RLock()
	defer s.mu.RUnlock()
	return s.id
}

// loopbackHost reports whether the Host header h (a name, with or without a
// port) names this machine's loopback interface: localhost, 127.0.0.1 or
// [::1].
func loopbackHost(h string) bool {
	host, _, err := net.SplitHostPort(h)
	if err != nil {
		host = strings.TrimSuffix(strings.TrimPrefix(h, "["), "]")
	}
	switch strings.ToLower(strings.TrimSuffix(host, ".")) {
	case "localhost", "127.0.0.1", "::1":
		return true
	}
	return false
}
