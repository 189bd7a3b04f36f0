package site

import (
	"os"
	"testing"

	"skysheet/datasheet/library"
)

// BenchmarkRenderDemo renders the demo library at the repository root
// (evaluation, charts, pages, listings, catalog) into memory; it reports
// the time per material beside the time per render.
func BenchmarkRenderDemo(b *testing.B) {
	lib, err := library.Load(os.DirFS("../.."))
	if err != nil {
		b.Fatal(err)
	}
	n := len(lib.Materials)
	b.ReportAllocs()
	for b.Loop() {
		if err := Render(lib, Options{Version: "bench"}, memWriter{}); err != nil {
			b.Fatal(err)
		}
	}
	b.ReportMetric(float64(b.Elapsed().Nanoseconds())/float64(b.N*n), "ns/material")
}
