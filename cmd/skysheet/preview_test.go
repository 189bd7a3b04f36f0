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
	waitID := func(old string) string {
		t.Helper()
		deadline := time.Now().Add(10 * time.Second)
		for time.Now().Before(deadline) {
			if _, now := get(t, c, ts.URL+renderIDPath); now != old {
				return now
			}
			time.Sleep(100 * time.Millisecond)
		}
		t.Fatal("the render id did not change after an edit")
		return ""
	}
	// Write until the watcher, which starts in the background, sees it.
	stopWriting, stopped := make(chan struct{}), make(chan struct{})
	go func() {
		defer close(stopped)
		for {
			os.WriteFile(md, []byte(edited), 0o644)
			select {
			case <-stopWriting:
				return
			case <-time.After(300 * time.Millisecond):
			}
		}
	}()
	id2 := waitID(id)
	close(stopWriting)
	<-stopped // no late write of the good version may follow the broken one below
	if _, body := get(t, c, ts.URL+"/m/basalt/index.html"); !strings.Contains(body, "revised") {
		t.Error("page not rendered again")
	}

	// A broken file: the id changes again and pages carry the problems.
	writeAt(t, md, strings.Replace(edited, "category:", "categroy:", 1))
	waitID(id2)
	_, body = get(t, c, ts.URL+"/m/basalt/index.html")
	if !strings.Contains(body, "The last render failed") || !strings.Contains(body, "basalt.md:5:1: unknown key") {
		t.Errorf("no problem banner")
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
