package library

import (
	"os"
	"testing"
)

// BenchmarkLoadDemo reads the demo library at the repository root.
func BenchmarkLoadDemo(b *testing.B) {
	fsys := os.DirFS("../..")
	for b.Loop() {
		if _, err := Load(fsys); err != nil {
			b.Fatal(err)
		}
	}
}
