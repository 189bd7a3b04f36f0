package main

import (
	"context"
	"io"
	"net/http"
	"net/http/httptest"
	"os"
	"path/filepath"
	"strings"
	"testing"
	"time"

	"skysheet/datasheet/library"
)

func get(t *testing.T, c *http.Client, url string) (int, string) {
	t.Helper()
	resp, err := c.Get(url)
	if err != nil {
		t.Fatal(err)
	}
	defer resp.Body.Close()
	b, _ := io.ReadAll(resp.Body)
	return resp.StatusCode, string(b)
}

func TestPreviewRendersOnChange(t *testing.T) {
	lib := copyLibrary(t)
	s := &preview{dir: lib, version: "test", log: io.Discard}
	s.rerender()
	ts := httptest.NewServer(s)
	defer ts.Close()
	c := ts.Client()
	c.CheckRedirect = func(*http.Request, []*http.Request) error { return http.ErrUseLastResponse }

	code, body := get(t, c, ts.URL+"/")
	if code != 200 || !strings.Contains(body, "Northfield Test Bench") || !strings.Contains(body, renderIDPath) {
		t.Fatalf("index: %d", code)
	}
	if code, _ := get(t, c, ts.URL+"/m/basalt/"); code != 200 {
		t.Errorf("datasheet: %d", code)
	}
	if code, _ := get(t, c, ts.URL+"/m/basalt"); code != http.StatusMovedPermanently {
		t.Errorf("folder without slash: %d", code)
	}
	if code, _ := get(t, c, ts.URL+"/nothere.html"); code != 404 {
		t.Errorf("missing page: %d", code)
	}
	for name, data := range s.files {
		if strings.Contains(string(data), renderIDPath) {
			t.Errorf("%s: the reload script belongs to preview responses, not to rendered files", name)
		}
	}
	_, id := get(t, c, ts.URL+renderIDPath)
	if id == "" || id != s.renderID() {
		t.Fatalf("render id %q", id)
	}

	ctx, cancel := context.WithCancel(context.Background())
	defer cancel()
	go s.watch(ctx, 50*time.Millisecond)

	md := filepath.Join(lib, "content", "roof", "basalt.md")
	src, _ := os.ReadFile(md)
	edited := strings.Replace(string(src), "Basalt roof coating (invented)", "Basalt roof coating, revised (invented)", 1)
	// waitPage polls the datasheet until it satisfies ok. The render it
	// waits for is the one of the file's final content: files are replaced
	// by a rename (replaceFile), so no render ever sees half a file, and
	// the test waits for what the page shows, not merely for some new
	// render, which may still be one of an earlier state.
	waitPage := func(what string, ok func(body string) bool) {
		t.Helper()
		deadline := time.Now().Add(20 * time.Second)
		for {
			_, body := get(t, c, ts.URL+"/m/basalt/index.html")
			if ok(body) {
				return
			}
			if time.Now().After(deadline) {
				t.Fatalf("the page never showed %s", what)
			}
			time.Sleep(50 * time.Millisecond)
		}
	}
	// Write until the watcher, which starts in the background, sees it.
	stopWriting, stopped := make(chan struct{}), make(chan struct{})
	go func() {
		defer close(stopped)
		for {
			replaceFile(t, md, edited)
			select {
			case <-stopWriting:
				return
			case <-time.After(300 * time.Millisecond):
			}
		}
	}()
	waitPage("the edit", func(body string) bool {
		return strings.Contains(body, "revised") && !strings.Contains(body, "The last render failed")
	})
	close(stopWriting)
	<-stopped // no late write of the good version may follow the broken one below
	if now := s.renderID(); now == id {
		t.Error("the render id did not change after an edit")
	}

	// A broken file: pages carry the problems over the last good render.
	replaceFile(t, md, strings.Replace(edited, "category:", "categroy:", 1))
	waitPage("the problem banner", func(body string) bool {
		return strings.Contains(body, "The last render failed") && strings.Contains(body, "basalt.md:5:1: unknown key")
	})
	if _, body := get(t, c, ts.URL+"/m/basalt/index.html"); !strings.Contains(body, "revised") {
		t.Error("the banner does not stand over the last good render")
	}
}

// replaceFile replaces the file p by a new one with data, through a hidden
// temporary file and a rename, as editors do: a watcher never sees half of
// it.
func replaceFile(t *testing.T, p, data string) {
	t.Helper()
	tmp := filepath.Join(filepath.Dir(p), "."+filepath.Base(p)+".tmp")
	if err := os.WriteFile(tmp, []byte(data), 0o644); err != nil {
		t.Error(err)
		return
	}
	if err := os.Rename(tmp, p); err != nil {
		t.Error(err)
	}
}

// TestPreviewIgnoresSiteFolder checks that rendering the library into its
// default site folder while a preview watches it leads to no new render.
// The watcher sees changes in the order they happen, so every change made
// before a last edit of skysheet.yaml has been seen once that edit is.
func TestPreviewIgnoresSiteFolder(t *testing.T) {
	lib := copyLibrary(t)
	changes := make(chan string, 4096)
	s := &preview{dir: lib, version: "test", log: io.Discard, changed: func(name string) {
		select {
		case changes <- name:
		default:
		}
	}}
	s.rerender()
	ctx, cancel := context.WithCancel(context.Background())
	defer cancel()
	go s.watch(ctx, 50*time.Millisecond)

	// touch rewrites a file until the watcher, which starts in the
	// background, reports it; it returns the changes seen up to then.
	touch := func(p string) []string {
		t.Helper()
		data, _ := os.ReadFile(p)
		var seen []string
		deadline := time.Now().Add(10 * time.Second)
		for {
			writeAt(t, p, string(data))
			again := time.After(300 * time.Millisecond)
		wait:
			for {
				select {
				case name := <-changes:
					seen = append(seen, name)
					if filepath.Clean(name) == p {
						return seen
					}
				case <-again:
					break wait
				}
			}
			if time.Now().After(deadline) {
				t.Fatalf("the watcher did not report %s", p)
			}
		}
	}
	touch(filepath.Join(lib, "content", "roof", "basalt.md"))
	for range 2 { // creates lib/site, then replaces it
		if code, _, errs := runCLI("render", lib); code != 0 {
			t.Fatalf("render: exit %d: %s", code, errs)
		}
	}
	writeAt(t, filepath.Join(lib, "site", "extra.txt"), "written into the site folder")
	for _, name := range touch(filepath.Join(lib, library.ConfigFile)) {
		if rel, _ := filepath.Rel(lib, name); rel == siteDir || strings.HasPrefix(rel, siteDir+string(filepath.Separator)) {
			t.Errorf("a change of %s led to a new render", rel)
		}
	}
}
