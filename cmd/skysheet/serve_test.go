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

func TestServeRebuildsOnChange(t *testing.T) {
	lib := copyLibrary(t)
	s := &server{dir: lib, version: "test", log: io.Discard}
	s.rebuild()
	ts := httptest.NewServer(s)
	defer ts.Close()
	c := ts.Client()
	c.CheckRedirect = func(*http.Request, []*http.Request) error { return http.ErrUseLastResponse }

	code, body := get(t, c, ts.URL+"/")
	if code != 200 || !strings.Contains(body, "Northfield Test Bench") || !strings.Contains(body, buildIDPath) {
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
		if strings.Contains(string(data), buildIDPath) {
			t.Errorf("%s: the reload script belongs to serve responses, not to built files", name)
		}
	}
	_, id := get(t, c, ts.URL+buildIDPath)
	if id == "" || id != s.buildID() {
		t.Fatalf("build id %q", id)
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
			if _, now := get(t, c, ts.URL+buildIDPath); now != old {
				return now
			}
			time.Sleep(100 * time.Millisecond)
		}
		t.Fatal("the build id did not change after an edit")
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
		t.Error("page not rebuilt")
	}

	// A broken file: the id changes again and pages carry the problems.
	writeAt(t, md, strings.Replace(edited, "category:", "categroy:", 1))
	waitID(id2)
	_, body = get(t, c, ts.URL+"/m/basalt/index.html")
	if !strings.Contains(body, "The last build failed") || !strings.Contains(body, "basalt.md:5:1: unknown key") {
		t.Errorf("no problem banner")
	}
}
