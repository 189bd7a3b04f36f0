package main

import (
	"math"
	"net/url"
	"os"
	"path/filepath"
	"testing"
)

func TestMedian(t *testing.T) {
	for _, tc := range []struct {
		in   []float64
		want float64
	}{
		{[]float64{3}, 3},
		{[]float64{5, 1, 3}, 3},      // middle of the sorted three
		{[]float64{4, 1, 3, 2}, 2.5}, // mean of the middle two
		{[]float64{1, math.NaN()}, math.NaN()},
	} {
		got := median(tc.in)
		if got != tc.want && !(math.IsNaN(got) && math.IsNaN(tc.want)) {
			t.Errorf("median(%v) = %v, want %v", tc.in, got, tc.want)
		}
	}
}

func TestFileBytes(t *testing.T) {
	dir := t.TempDir()
	for name, n := range map[string]int{"index.html": 1000, "style.css": 234} {
		if err := os.WriteFile(filepath.Join(dir, name), make([]byte, n), 0o644); err != nil {
			t.Fatal(err)
		}
	}
	fileURL := func(name string) string {
		return (&url.URL{Scheme: "file", Path: filepath.ToSlash(filepath.Join(dir, name))}).String()
	}
	if got, err := fileBytes([]string{fileURL("index.html"), fileURL("style.css")}); err != nil || got != 1234 {
		t.Errorf("fileBytes = %d, %v; want 1234", got, err)
	}
	for _, bad := range []string{"http://127.0.0.1/x.js", fileURL("missing.js")} {
		if _, err := fileBytes([]string{bad}); err == nil {
			t.Errorf("fileBytes(%s): no error", bad)
		}
	}
}
