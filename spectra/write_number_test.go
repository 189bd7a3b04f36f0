package spectra

import (
	"math"
	"math/rand/v2"
	"strconv"
	"testing"
)

// TestAppendShortest checks appendShortest against the standard library's
// strconv.AppendFloat(…, 'g', -1, 64), the shortest form that reads back
// (the Go standard library is the reference here): measured-looking
// decimals of every length, numbers at the edges of the fast path, and
// random doubles that are no short decimal at all.
func TestAppendShortest(t *testing.T) {
	check := func(x float64) {
		t.Helper()
		want := strconv.FormatFloat(x, 'g', -1, 64)
		if got := string(appendShortest(nil, x)); got != want {
			t.Errorf("%v: %q, want %q", x, got, want)
		}
	}
	for _, x := range []float64{0, math.Copysign(0, -1), 1, -1, 0.1, 0.0783, 2500, 250.5, 1e-4, 9.9999e-5, 1e-5, 0.00012,
		999999, 999999.5, 1e6, 1e6 - 1e-9, 123456.78901234, 0.30000000000000004, 1.0 / 3, 2501.2506253126563,
		1e15, 12345678.9, 0.12345678, 0.123456789, 4.35e-3, 99.99999999, math.Inf(1), math.Inf(-1), math.NaN(),
		math.MaxFloat64, math.SmallestNonzeroFloat64, 1e7 / 3998} {
		check(x)
		check(-x)
	}
	rng := rand.New(rand.NewPCG(7, 7))
	for range 200000 {
		k := rng.IntN(10)
		n := rng.Int64N(int64(math.Pow(10, float64(1+rng.IntN(12)))))
		check(float64(n) / math.Pow(10, float64(k)))
		check(-float64(n) / math.Pow(10, float64(k)))
		check(math.Float64frombits(rng.Uint64()))
		check(rng.Float64() * math.Pow(10, float64(rng.IntN(14)-6)))
	}
}

func FuzzAppendShortest(f *testing.F) {
	for _, x := range []float64{0.0783, 2500, 1e-4, 999999.5, 2501.2506253126563} {
		f.Add(x)
	}
	f.Fuzz(func(t *testing.T, x float64) {
		want := strconv.FormatFloat(x, 'g', -1, 64)
		if got := string(appendShortest(nil, x)); got != want {
			t.Errorf("%v: %q, want %q", x, got, want)
		}
	})
}

func BenchmarkAppendShortest(b *testing.B) {
	xs := []float64{0.0783, 2500, 0.005, 0.9115, 251, 2501.2506253126563, 0.0017}
	var buf []byte
	b.Run("fast", func(b *testing.B) {
		for i := range b.N {
			buf = appendShortest(buf[:0], xs[i%len(xs)])
		}
	})
	b.Run("strconv", func(b *testing.B) {
		for i := range b.N {
			buf = strconv.AppendFloat(buf[:0], xs[i%len(xs)], 'g', -1, 64)
		}
	})
}
