package spectra

import (
	"errors"
	"math"
	"math/rand/v2"
	"strings"
	"testing"
)

// layerOf builds a layer's optics from R and T given at the points nm, one
// piece, with A = 1 − R − T.
func layerOf(nm, r, t []float64) Optics {
	a := make([]float64, len(nm))
	for i := range a {
		a[i] = 1 - r[i] - t[i]
	}
	return Optics{R: Series{Pieces: []Piece{{NM: nm, V: r}}}, T: Series{Pieces: []Piece{{NM: nm, V: t}}},
		A: Series{Pieces: []Piece{{NM: nm, V: a}}}}
}

// flat is a layer with constant R and T over [lo, hi] nm.
func flat(r, t, lo, hi float64) Optics {
	return layerOf([]float64{lo, hi}, []float64{r, r}, []float64{t, t})
}

// at returns s at nm, failing the test where s has no value.
func at(t *testing.T, s Series, nm float64) float64 {
	t.Helper()
	v, ok := s.At(nm)
	if !ok {
		t.Fatalf("no value at %g nm", nm)
	}
	return v
}

func TestStackHandWorked(t *testing.T) {
	// Layer 1: R₁ = 0.1, T₁ = 0.8 (A₁ = 0.1); layer 2: R₂ = 0.5, T₂ = 0.3
	// (A₂ = 0.2). By hand, with D = 1 − R₁R₂ = 0.95:
	//   R = 0.1 + 0.8²·0.5/0.95 = 0.1 + 0.32/0.95 = 83/190
	//   T = 0.8·0.3/0.95 = 0.24/0.95 = 48/190
	//   A = 1 − R − T = 59/190
	//   R seen from below = 0.5 + 0.3²·0.1/0.95 = 0.484/0.95 = 96.8/190
	// Light in the gap: d₁ = T₁/D = 0.8/0.95 going down, u₁ = R₂ d₁ = 0.4/0.95
	// coming back up. Layer 1 absorbs A₁ (1 + u₁) = 0.1·1.35/0.95 = 27/190,
	// layer 2 absorbs A₂ d₁ = 0.2·0.8/0.95 = 32/190; 27 + 32 = 59.
	s, err := Stack([]Optics{flat(0.1, 0.8, 300, 2500), flat(0.5, 0.3, 300, 2500)})
	if err != nil {
		t.Fatal(err)
	}
	for _, tt := range []struct {
		name string
		s    Series
		want float64
	}{
		{"R", s.R, 83.0 / 190},
		{"T", s.T, 48.0 / 190},
		{"A", s.A, 59.0 / 190},
		{"R from below", s.RBelow, 96.8 / 190},
		{"absorbed in layer 1", s.Absorbed[0], 27.0 / 190},
		{"absorbed in layer 2", s.Absorbed[1], 32.0 / 190},
	} {
		for _, nm := range []float64{300, 1000, 2500} {
			if got := at(t, tt.s, nm); math.Abs(got-tt.want) > 1e-15 {
				t.Errorf("%s at %g nm: %.17g, want %.17g", tt.name, nm, got, tt.want)
			}
		}
	}
}

func TestStackTransparentLayer(t *testing.T) {
	// A layer with T = 1, R = 0 changes nothing: R = 0 + 1²·R₂/(1 − 0) = R₂
	// and T = 1·T₂/1 = T₂ exactly, above or below the other layer.
	nm := []float64{300, 410.5, 777, 1500, 2500}
	other := layerOf(nm, []float64{0.05, 0.6, 0.93, 0.2, 0.41}, []float64{0.9, 0.3, 0, 0.55, 0.12})
	glass := flat(0, 1, 300, 2500)
	for _, tt := range []struct {
		name   string
		layers []Optics
		other  int
	}{
		{"on top", []Optics{glass, other}, 1},
		{"below", []Optics{other, glass}, 0},
	} {
		s, err := Stack(tt.layers)
		if err != nil {
			t.Fatal(err)
		}
		for i, x := range nm {
			if s.R.Pieces[0].NM[i] != x {
				t.Fatalf("%s: grid %v, want %v", tt.name, s.R.Pieces[0].NM, nm)
			}
			r, tr := other.R.Pieces[0].V[i], other.T.Pieces[0].V[i]
			if s.R.Pieces[0].V[i] != r || s.T.Pieces[0].V[i] != tr || s.RBelow.Pieces[0].V[i] != r {
				t.Errorf("%s at %g nm: R %g, T %g, R below %g; want %g, %g, %g exactly", tt.name, x,
					s.R.Pieces[0].V[i], s.T.Pieces[0].V[i], s.RBelow.Pieces[0].V[i], r, tr, r)
			}
			if a := s.A.Pieces[0].V[i]; a != 1-r-tr {
				t.Errorf("%s at %g nm: A %g, want %g", tt.name, x, a, 1-r-tr)
			}
			if g := s.Absorbed[1-tt.other].Pieces[0].V[i]; math.Abs(g) > 1e-15 {
				t.Errorf("%s at %g nm: the clear layer absorbs %g", tt.name, x, g)
			}
		}
	}
}

func TestStackMirrorSubstrate(t *testing.T) {
	// A perfect mirror below (R₂ = 1, T₂ = 0): the formula gives
	// R = R₁ + T₁²·1/(1 − R₁·1) = R₁ + T₁²/(1 − R₁) and T = 0; the mirror
	// absorbs nothing, so the top layer absorbs 1 − R.
	mirror := flat(1, 0, 200, 3000)
	for _, l := range [][2]float64{{0, 1}, {0.04, 0.9}, {0.3, 0.3}, {0.9, 0.05}, {0.5, 0}, {0, 0}} {
		r1, t1 := l[0], l[1]
		s, err := Stack([]Optics{flat(r1, t1, 200, 3000), mirror})
		if err != nil {
			t.Fatal(err)
		}
		want := r1 + t1*t1/(1-r1)
		if got := at(t, s.R, 1000); math.Abs(got-want) > 1e-15 {
			t.Errorf("R₁ %g, T₁ %g: R = %.17g, want %.17g", r1, t1, got, want)
		}
		if got := at(t, s.T, 1000); got != 0 {
			t.Errorf("R₁ %g, T₁ %g: T = %g, want 0", r1, t1, got)
		}
		if a1, a2 := at(t, s.Absorbed[0], 1000), at(t, s.Absorbed[1], 1000); math.Abs(a1-(1-want)) > 1e-15 || math.Abs(a2) > 1e-15 {
			t.Errorf("R₁ %g, T₁ %g: absorbed %g, %g; want %g, 0", r1, t1, a1, a2, 1-want)
		}
	}
}

// fluxes solves the light in the gaps of a stack of symmetric layers
// (r[i], t[i]), top first, directly as a linear system — independently of
// the pairwise combination. Gap k lies below layer k (gap 0 above the
// stack); per unit light falling on the top, d₀ = 1 and uₙ = 0, and each
// layer i (1-based) reflects and transmits what falls on it:
//
//	uᵢ₋₁ = rᵢ dᵢ₋₁ + tᵢ uᵢ,   dᵢ = tᵢ dᵢ₋₁ + rᵢ uᵢ.
//
// It returns R = u₀, T = dₙ and the absorbed fractions
// (1 − rᵢ − tᵢ)(dᵢ₋₁ + uᵢ).
func fluxes(r, t []float64) (R, T float64, abs []float64) {
	n := len(r)
	// Unknowns laid out as d₁..dₙ, then u₀..uₙ₋₁.
	d := func(k int) int { return k - 1 } // d_k, k = 1..n
	u := func(k int) int { return n + k } // u_k, k = 0..n−1
	m := make([][]float64, 2*n)           // augmented rows
	for i := range m {
		m[i] = make([]float64, 2*n+1)
	}
	for i := 1; i <= n; i++ {
		ri, ti := r[i-1], t[i-1]
		// u_{i−1} − rᵢ d_{i−1} − tᵢ uᵢ = 0
		row := m[2*(i-1)]
		row[u(i-1)] = 1
		if i-1 == 0 {
			row[2*n] += ri // d₀ = 1 moves to the right side
		} else {
			row[d(i-1)] -= ri
		}
		if i < n {
			row[u(i)] -= ti
		}
		// dᵢ − tᵢ d_{i−1} − rᵢ uᵢ = 0
		row = m[2*(i-1)+1]
		row[d(i)] = 1
		if i-1 == 0 {
			row[2*n] += ti
		} else {
			row[d(i-1)] -= ti
		}
		if i < n {
			row[u(i)] -= ri
		}
	}
	x := solveLinear(m)
	dk := func(k int) float64 {
		if k == 0 {
			return 1
		}
		return x[d(k)]
	}
	uk := func(k int) float64 {
		if k == n {
			return 0
		}
		return x[u(k)]
	}
	abs = make([]float64, n)
	for i := 1; i <= n; i++ {
		abs[i-1] = (1 - r[i-1] - t[i-1]) * (dk(i-1) + uk(i))
	}
	return uk(0), dk(n), abs
}

// solveLinear solves the augmented system m by elimination with partial pivoting.
func solveLinear(m [][]float64) []float64 {
	n := len(m)
	for c := 0; c < n; c++ {
		p := c
		for i := c + 1; i < n; i++ {
			if math.Abs(m[i][c]) > math.Abs(m[p][c]) {
				p = i
			}
		}
		m[c], m[p] = m[p], m[c]
		for i := c + 1; i < n; i++ {
			f := m[i][c] / m[c][c]
			for j := c; j <= n; j++ {
				m[i][j] -= f * m[c][j]
			}
		}
	}
	x := make([]float64, n)
	for i := n - 1; i >= 0; i-- {
		s := m[i][n]
		for j := i + 1; j < n; j++ {
			s -= m[i][j] * x[j]
		}
		x[i] = s / m[i][i]
	}
	return x
}

// randomLayer draws R and T with R + T ≤ 1, now and then on an edge.
func randomLayer(rng *rand.Rand) (r, t float64) {
	switch rng.IntN(10) {
	case 0:
		return 0, rng.Float64()
	case 1:
		r = rng.Float64()
		return r, 1 - r
	case 2:
		return rng.Float64(), 0
	}
	r, t = rng.Float64(), rng.Float64()
	if r+t > 1 {
		r, t = 1-r, 1-t
	}
	return r, t
}

func TestStackEnergyProperty(t *testing.T) {
	rng := rand.New(rand.NewPCG(1, 12))
	const tol = 1e-12
	for trial := range 2000 {
		n := 1 + rng.IntN(6)
		r, tr := make([]float64, n), make([]float64, n)
		for i := range r {
			r[i], tr[i] = randomLayer(rng)
		}
		abs := make([]float64, n)
		var w stackWork
		R, _, T := w.solve(r, tr, abs)
		sum := R + T
		for _, a := range abs {
			sum += a
			if a < -tol || a > 1+tol {
				t.Fatalf("trial %d, R %v, T %v: absorbed %v outside 0..1", trial, r, tr, abs)
			}
		}
		if math.Abs(sum-1) > tol || R < -tol || R > 1+tol || T < -tol || T > 1+tol {
			t.Fatalf("trial %d, R %v, T %v: R %g + T %g + ΣA = %.17g", trial, r, tr, R, T, sum)
		}
		// The same light, solved directly as a linear system (skip the
		// nearly singular draws where two mirrors face each other).
		ill := false
		for i := range r {
			ill = ill || r[i] > 0.999
		}
		if ill {
			continue
		}
		fr, ft, fa := fluxes(r, tr)
		if math.Abs(fr-R) > 1e-10 || math.Abs(ft-T) > 1e-10 {
			t.Fatalf("trial %d: R, T = %g, %g; linear system %g, %g", trial, R, T, fr, ft)
		}
		for i := range abs {
			if math.Abs(fa[i]-abs[i]) > 1e-10 {
				t.Fatalf("trial %d, R %v, T %v: layer %d absorbs %.15g, linear system %.15g", trial, r, tr, i+1, abs[i], fa[i])
			}
		}
	}
}

func TestStackThreeLayersTwoWays(t *testing.T) {
	// Top pair first needs the pair's reflectance seen from below (rb),
	// which differs from rf; bottom pair first needs only rf of the bottom
	// pair. Both must give the same stack.
	rng := rand.New(rand.NewPCG(3, 3))
	sym := func(r, t float64) side { return side{r, r, t} }
	for trial := range 1000 {
		var l [3]side
		for i := range l {
			l[i] = sym(randomLayer(rng))
		}
		topFirst := over(over(l[0], l[1]), l[2])
		bottomFirst := over(l[0], over(l[1], l[2]))
		if d := math.Max(math.Abs(topFirst.rf-bottomFirst.rf), math.Max(math.Abs(topFirst.rb-bottomFirst.rb), math.Abs(topFirst.t-bottomFirst.t))); d > 1e-12 {
			t.Fatalf("trial %d, layers %v: top pair first %+v, bottom pair first %+v", trial, l, topFirst, bottomFirst)
		}
	}
	// Wrongly taking the top pair as the same from both sides (rb = rf)
	// gives another answer: the check above can fail.
	l := [3]side{sym(0.1, 0.8), sym(0.5, 0.3), sym(0.2, 0.5)}
	p := over(l[0], l[1])
	wrong := over(side{p.rf, p.rf, p.t}, l[2])
	right := over(l[0], over(l[1], l[2]))
	if math.Abs(wrong.rf-right.rf) < 1e-5 { // 2.3e-4 apart
		t.Errorf("a pair taken as symmetric gives R %g, the right %g: the two-way check would not notice", wrong.rf, right.rf)
	}
	// Through Stack: the reflectance from below equals that of the reversed
	// stack from above.
	layers := []Optics{flat(0.1, 0.8, 300, 2500), flat(0.5, 0.3, 300, 2500), flat(0.02, 0.6, 300, 2500)}
	s, err := Stack(layers)
	if err != nil {
		t.Fatal(err)
	}
	rev, err := Stack([]Optics{layers[2], layers[1], layers[0]})
	if err != nil {
		t.Fatal(err)
	}
	if a, b := at(t, s.RBelow, 500), at(t, rev.R, 500); math.Abs(a-b) > 1e-15 {
		t.Errorf("R from below %.17g, reversed stack's R %.17g", a, b)
	}
	if a, b := at(t, s.T, 500), at(t, rev.T, 500); math.Abs(a-b) > 1e-15 {
		t.Errorf("T %.17g, reversed stack's T %.17g", a, b)
	}
}

func TestStackGrid(t *testing.T) {
	// Layer 1: 300–1000 and 1200–2500 nm (a gap); layer 2: 400–2000 nm, its
	// T only to 1800 nm. Common: 400–1000 and 1200–1800 nm.
	l1 := Optics{
		R: Series{Pieces: []Piece{{NM: []float64{300, 500, 1000}, V: []float64{0.1, 0.2, 0.3}},
			{NM: []float64{1200, 2500}, V: []float64{0.4, 0.4}}}},
		T: Series{Pieces: []Piece{{NM: []float64{300, 500, 1000}, V: []float64{0.8, 0.7, 0.6}},
			{NM: []float64{1200, 2500}, V: []float64{0.5, 0.5}}}},
	}
	l2 := Optics{
		R: Series{Pieces: []Piece{{NM: []float64{400, 700, 1500, 2000}, V: []float64{0.5, 0.6, 0.7, 0.8}}}},
		T: Series{Pieces: []Piece{{NM: []float64{400, 1800}, V: []float64{0.2, 0.1}}}},
	}
	s, err := Stack([]Optics{l1, l2})
	if err != nil {
		t.Fatal(err)
	}
	want := [][]float64{{400, 500, 700, 1000}, {1200, 1500, 1800}}
	if len(s.R.Pieces) != len(want) {
		t.Fatalf("pieces %v, want grids %v", s.R.Pieces, want)
	}
	for i, p := range s.R.Pieces {
		if len(p.NM) != len(want[i]) {
			t.Fatalf("piece %d: grid %v, want %v", i, p.NM, want[i])
		}
		for j, nm := range p.NM {
			if nm != want[i][j] {
				t.Fatalf("piece %d: grid %v, want %v", i, p.NM, want[i])
			}
			// Each point: the two-layer formula on the layers' own
			// (interpolated) values.
			r1, t1 := at(t, l1.R, nm), at(t, l1.T, nm)
			r2, t2 := at(t, l2.R, nm), at(t, l2.T, nm)
			d := 1 - r1*r2
			if got, w := p.V[j], r1+t1*t1*r2/d; math.Abs(got-w) > 1e-15 {
				t.Errorf("R at %g nm: %g, want %g", nm, got, w)
			}
			if got, w := s.T.Pieces[i].V[j], t1*t2/d; math.Abs(got-w) > 1e-15 {
				t.Errorf("T at %g nm: %g, want %g", nm, got, w)
			}
		}
	}
	for i, p := range s.A.Pieces {
		for j, a := range p.V {
			if sum := s.Absorbed[0].Pieces[i].V[j] + s.Absorbed[1].Pieces[i].V[j]; math.Abs(sum-a) > 1e-15 {
				t.Errorf("at %g nm: layers absorb %g in all, the stack's A is %g", p.NM[j], sum, a)
			}
		}
	}
	if _, ok := s.A.At(1100); ok {
		t.Error("the stack bridges the gap of layer 1 at 1100 nm")
	}
	if !strings.Contains(strings.Join(s.Assumptions, " "), "same from both sides") {
		t.Errorf("assumptions do not say the layers are taken as the same from both sides: %q", s.Assumptions)
	}
}

func TestStackErrors(t *testing.T) {
	if _, err := Stack(nil); !errors.Is(err, ErrNoData) {
		t.Errorf("no layers: %v, want ErrNoData", err)
	}
	_, err := Stack([]Optics{flat(0.1, 0.2, 300, 500), flat(0.1, 0.2, 500, 900)})
	if !errors.Is(err, errNoCommonRange) {
		t.Errorf("touching ranges: %v, want ErrNoCommonRange", err)
	}
	onlyR := Optics{R: flat(0.1, 0, 300, 900).R}
	if _, err := Stack([]Optics{onlyR}); !errors.Is(err, errNoCommonRange) {
		t.Errorf("layer without T: %v, want ErrNoCommonRange", err)
	}
}

func TestStackClipAndClosure(t *testing.T) {
	noisy := layerOf([]float64{300, 400, 500}, []float64{1.02, 0.5, 0.5}, []float64{-0.01, 0.6, 0.3})
	noisy.Closure = Closure{Tolerance: 0.02, Problems: []string{"R+T exceeds 1 by 0.1000 at 400 nm (tolerance 0.02)."}}
	s, err := Stack([]Optics{flat(0, 0.9, 300, 500), noisy})
	if err != nil {
		t.Fatal(err)
	}
	// At 300 nm layer 2 becomes R = 1, T = 0; at 400 nm R, T = 0.5, 0.6
	// scaled to 5/11, 6/11.
	if got, want := at(t, s.R, 300), 0.81; math.Abs(got-want) > 1e-15 { // 0 + 0.9²·1/1
		t.Errorf("R at 300 nm: %g, want %g", got, want)
	}
	if got, want := at(t, s.T, 400), 0.9*6.0/11; math.Abs(got-want) > 1e-15 {
		t.Errorf("T at 400 nm: %g, want %g", got, want)
	}
	all := strings.Join(s.Assumptions, " ")
	if !strings.Contains(all, "clipped") || !strings.Contains(all, "300–400 nm") {
		t.Errorf("assumptions do not name the clipped range 300–400 nm: %q", s.Assumptions)
	}
	if len(s.Closure.Problems) != 1 || !strings.HasPrefix(s.Closure.Problems[0], "Layer 2: ") {
		t.Errorf("closure problems %q: want layer 2's, prefixed", s.Closure.Problems)
	}
}

// FuzzStack stacks layers built from arbitrary bytes (values a little
// outside 0..1 included, as measurements give) and checks that energy is
// conserved and every fraction stays in 0..1 wherever the stack has data.
func FuzzStack(f *testing.F) {
	f.Add([]byte{3, 10, 200, 40, 90, 250, 0, 255, 128, 64, 32, 16})
	f.Add([]byte{1, 255, 0, 255, 0})
	f.Fuzz(func(t *testing.T, in []byte) {
		if len(in) < 5 {
			return
		}
		n := 1 + int(in[0])%4
		in = in[1:]
		var layers []Optics
		for i := 0; i < n && len(in) >= 4; i++ {
			lo := 300 + float64(in[0])
			hi := lo + 1 + float64(in[1])*10
			v := func(b byte) float64 { return -0.1 + 1.2*float64(b)/255 }
			layers = append(layers, layerOf([]float64{lo, (lo + hi) / 2, hi},
				[]float64{v(in[2]), v(in[3]), v(in[2] ^ in[3])}, []float64{v(in[3]), v(in[2]), v(in[2] + in[3])}))
			in = in[4:]
		}
		s, err := Stack(layers)
		if err != nil {
			if !errors.Is(err, errNoCommonRange) && !errors.Is(err, ErrNoData) {
				t.Fatalf("unexpected error %v", err)
			}
			return
		}
		for i, p := range s.R.Pieces {
			for j, r := range p.V {
				tr, a := s.T.Pieces[i].V[j], s.A.Pieces[i].V[j]
				sum := r + tr
				for _, ab := range s.Absorbed {
					x := ab.Pieces[i].V[j]
					if x < -1e-12 || x > 1+1e-12 {
						t.Fatalf("at %g nm a layer absorbs %g", p.NM[j], x)
					}
					sum += x
				}
				if math.Abs(sum-1) > 1e-12 || r < -1e-12 || r > 1+1e-12 || tr < -1e-12 || tr > 1+1e-12 || a < -1e-12 {
					t.Fatalf("at %g nm: R %g, T %g, A %g, R+T+ΣA %.17g", p.NM[j], r, tr, a, sum)
				}
			}
		}
	})
}
