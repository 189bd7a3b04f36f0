package datasheet

import (
	"errors"
	"math"
	"math/rand/v2"
	"strings"
	"testing"

	"skysheet/spectra"
)

// opticsOf reads a neutral-format file and resolves it.
func opticsOf(t *testing.T, text, name string) spectra.Optics {
	t.Helper()
	return spectra.Resolve(mustParse(t, text, name), spectra.DefaultClosureTol)
}

// gapFluxes returns the long-wave fluxes in the gap, q↓ leaving the fabric
// downward and q↑ leaving the skin upward, by following the radiation as it
// bounces (fixed-point iteration), independently of the package's closed
// form: q↓ = ε_f B_f + τ_f L↓ + ρ_f q↑ and q↑ = ε_s B_s + (1 − ε_s) q↓.
func gapFluxes(eps, tau, rho, epsSkin, tf, ts, sky float64) (down, up float64) {
	sigma := 5.670374419e-8 // CODATA 2018
	bf, bs := sigma*math.Pow(tf, 4), sigma*math.Pow(ts, 4)
	for range 10000 {
		d := eps*bf + tau*sky + rho*up
		u := epsSkin*bs + (1-epsSkin)*d
		if math.Abs(d-down) < 1e-13 && math.Abs(u-up) < 1e-13 {
			return d, u
		}
		down, up = d, u
	}
	panic("gap fluxes did not converge")
}

// residuals substitutes a solution back into both balances, written out
// here from the energy each node receives and gives: it returns the
// fabric's net gain (zero at balance) and the skin's net gain.
func residuals(f Fabric, s SkinSetting, tf float64) (fabric, skin float64) {
	sigma := 5.670374419e-8 // CODATA 2018
	eps, tau, rho := float64(f.Emittance), float64(f.Transmittance), float64(f.Reflectance)
	down, up := gapFluxes(eps, tau, rho, s.SkinEmittance, tf, s.SkinK, s.SkyDownWm2)
	// The fabric absorbs ε_f of the long-wave falling on either face (L↓
	// from above, q↑ from below) and emits ε_f σT_f⁴ from each face.
	fabric = s.IrradianceWm2*float64(f.SolarFabric) + eps*(s.SkyDownWm2+up) - 2*eps*sigma*math.Pow(tf, 4) +
		s.HWm2K*(s.AirK-tf)
	// The skin absorbs ε_s of q↓ and emits ε_s σT_s⁴.
	skin = s.IrradianceWm2*float64(f.SolarSkin) + s.SkinEmittance*down - s.SkinEmittance*sigma*math.Pow(s.SkinK, 4)
	if s.GapM > 0 {
		k := s.GapConductivityWmK / s.GapM
		fabric += k * (s.SkinK - tf)
		skin += k * (tf - s.SkinK)
	} else { // touching: the skin takes whatever the fabric gains
		skin += fabric
		fabric = 0
	}
	return fabric, skin
}

// randomFabric draws grey fractions that are physically possible.
func randomFabric(rng *rand.Rand) Fabric {
	a, b := rng.Float64(), rng.Float64()
	if a > b {
		a, b = b, a
	}
	af := rng.Float64()
	as := rng.Float64() * (1 - af)
	return Fabric{SolarFabric: Num(af), SolarSkin: Num(as), Emittance: Num(a), Transmittance: Num(b - a), Reflectance: Num(1 - b)}
}

func TestSkinHeatSubstituted(t *testing.T) {
	rng := rand.New(rand.NewPCG(12, 4))
	for trial := range 500 {
		f := randomFabric(rng)
		s := DefaultSkinSetting()
		s.AirK = 270 + 50*rng.Float64()
		s.SkyDownWm2 = 200 + 250*rng.Float64()
		s.IrradianceWm2 = 1100 * rng.Float64()
		s.HWm2K = 30 * rng.Float64()
		s.GapM = []float64{0, 0.0005, 0.005, 0.02}[rng.IntN(4)]
		b, err := SkinHeat(f, s)
		if err != nil {
			t.Fatalf("trial %d: %v", trial, err)
		}
		fab, skin := residuals(f, s, b.FabricK)
		if math.Abs(fab) > 1e-6 {
			t.Errorf("trial %d (%+v, gap %g m): the fabric's balance is off by %.3g W/m² at T_f = %.6f K", trial, f, s.GapM, fab, b.FabricK)
		}
		if math.Abs(skin-b.SkinGainWm2) > 1e-6 {
			t.Errorf("trial %d: heat into skin %.9f W/m², substituted %.9f", trial, b.SkinGainWm2, skin)
		}
		// Bookkeeping: the terms add up, and what enters the system from
		// above (sun, sky, convection) leaves upward or goes into the skin.
		if d := b.FabricSolarWm2 + b.FabricLongWaveWm2 + b.FabricConvectionWm2 + b.FabricConductionWm2; math.Abs(d) > 1e-6 {
			t.Errorf("trial %d: the fabric's terms sum to %.3g W/m²", trial, d)
		}
		if d := b.SkinSolarWm2 + b.SkinLongWaveWm2 + b.SkinConductionWm2 - b.SkinGainWm2; math.Abs(d) > 1e-9 {
			t.Errorf("trial %d: the skin's terms miss its gain by %.3g W/m²", trial, d)
		}
		in := s.IrradianceWm2 + s.SkyDownWm2 + b.FabricConvectionWm2
		out := b.SolarReflectedWm2 + b.UpLongWaveWm2 + b.SkinGainWm2
		if math.Abs(in-out) > 1e-6 {
			t.Errorf("trial %d: %.9f W/m² in, %.9f out", trial, in, out)
		}
		if math.Abs(b.FabricConductionWm2+b.SkinConductionWm2) > 1e-9 {
			t.Errorf("trial %d: conduction %g into the fabric but %g into the skin", trial, b.FabricConductionWm2, b.SkinConductionWm2)
		}
	}
}

// bareSkin is the balance of skin with nothing over it but a still-air
// layer, computed here on its own: absorbed sunlight I α, long-wave
// ε_s (L↓ − σT_s⁴) and the air at T_a through h and the gap in series,
// h_eff = 1/(1/h + d/k).
func bareSkin(alpha float64, s SkinSetting) float64 {
	sigma := 5.670374419e-8 // CODATA 2018
	heff := 1 / (1/s.HWm2K + s.GapM/s.GapConductivityWmK)
	return s.IrradianceWm2*alpha + s.SkinEmittance*(s.SkyDownWm2-sigma*math.Pow(s.SkinK, 4)) + heff*(s.AirK-s.SkinK)
}

func TestSkinHeatClearFabric(t *testing.T) {
	// A fabric with T = 1 and R = 0 in the sun and in the infrared leaves the
	// skin as it would be bare (with the still air it holds).
	clear := opticsOf(t, "wavelength_nm,R,T\n250,0,1\n30000,0,1\n", "clear.csv")
	for _, tt := range []struct {
		name, skin string
		alpha      float64 // NaN: take the skin's own solar mean
	}{
		{"flat skin", "wavelength_nm,R\n250,0.35\n4000,0.35\n", 0.65}, // α = 1 − R
		{"shaped skin", "wavelength_nm,R\n250,0.08\n400,0.15\n600,0.45\n1100,0.6\n1450,0.2\n1900,0.1\n2500,0.05\n4000,0.03\n", math.NaN()},
	} {
		skin := opticsOf(t, tt.skin, "skin.csv")
		alpha := tt.alpha
		if math.IsNaN(alpha) {
			alpha = spectra.BandMean(skin.A, spectra.SolarGlobal(), 280, 4000).Value
		}
		for _, gap := range []float64{0, 0.003, 0.01} {
			for _, sun := range []float64{0, 1000} {
				s := DefaultSkinSetting()
				s.GapM, s.IrradianceWm2 = gap, sun
				f, err := FabricOnSkin(clear, skin, s)
				if err != nil {
					t.Fatal(err)
				}
				b, err := SkinHeat(f, s)
				if err != nil {
					t.Fatal(err)
				}
				if want := bareSkin(alpha, s); math.Abs(b.SkinGainWm2-want) > 1e-6 {
					t.Errorf("%s, gap %g m, sun %g: heat into skin %.9f W/m², bare skin %.9f", tt.name, gap, sun, b.SkinGainWm2, want)
				}
			}
		}
	}
}

func TestSkinHeatBlackFabricTouching(t *testing.T) {
	// An opaque black fabric (ε = 1) touching the skin, absorbing 90 % of
	// the sun: it takes the skin's 307.15 K, the skin sees only it, and the
	// skin receives everything the fabric gains:
	//   Q = 0.9 I + L↓ − σT_s⁴ + h (T_a − T_s)
	//     = 900 + 355.636 − 504.677 + 6·(300 − 307.15) = 708.059 W/m²
	// (σ from CODATA 2018; L↓ = ε_sky σT_a⁴ with the Berdahl–Martin
	// ε_sky = 0.711 + 0.56·0.1 + 0.73·0.01 at a 10 °C dew point).
	s := DefaultSkinSetting()
	s.GapM = 0
	f := Fabric{SolarFabric: 0.9, Emittance: 1}
	b, err := SkinHeat(f, s)
	if err != nil {
		t.Fatal(err)
	}
	sigma := 5.670374419e-8
	sky := (0.711 + 0.56*0.1 + 0.73*0.01) * sigma * math.Pow(300, 4)
	want := 900 + sky - sigma*math.Pow(307.15, 4) + 6*(300-307.15)
	if math.Abs(b.SkinGainWm2-want) > 1e-6 || math.Abs(want-708.059) > 1e-3 {
		t.Errorf("heat into skin %.6f W/m², want %.6f (by hand 708.059)", b.SkinGainWm2, want)
	}
	if b.FabricK != 307.15 || b.SkinLongWaveWm2 > 1e-9 || b.SkinLongWaveWm2 < -1e-9 {
		t.Errorf("T_f %g K, skin long-wave %g W/m²: want 307.15 K and 0", b.FabricK, b.SkinLongWaveWm2)
	}
}

func TestSkinLongWaveThroughFabric(t *testing.T) {
	// At a fixed fabric temperature, the skin's long-wave gain depends on the
	// sky only through the fabric's transmittance: by ε_s τ_f ΔL /
	// (1 − ρ_f (1 − ε_s)) (one pass, then the skin–fabric bounces).
	s := DefaultSkinSetting()
	for _, g := range []grey{{eps: 0.9, tau: 0, rho: 0.1}, {eps: 0.5, tau: 0, rho: 0.5}, {eps: 0.6, tau: 0.3, rho: 0.1}, {eps: 0, tau: 1}} {
		dark, bright := s, s
		dark.SkyDownWm2, bright.SkyDownWm2 = 250, 400
		_, skinDark, _ := dark.longWave(g, 310)
		_, skinBright, _ := bright.longWave(g, 310)
		want := s.SkinEmittance * g.tau * 150 / (1 - g.rho*(1-s.SkinEmittance))
		if d := skinBright - skinDark; math.Abs(d-want) > 1e-9 {
			t.Errorf("ε %g τ %g ρ %g: the sky changes the skin's long-wave gain by %.12g W/m², want %.12g", g.eps, g.tau, g.rho, d, want)
		}
		if g.tau == 0 && skinBright != skinDark {
			t.Errorf("opaque fabric (ε %g): the skin sees the sky (%g vs %g W/m²)", g.eps, skinDark, skinBright)
		}
	}
}

func TestSkinHeatDayAndNight(t *testing.T) {
	s := DefaultSkinSetting()
	f := Fabric{SolarFabric: 0.3, SolarSkin: 0.2, Emittance: 0.85, Transmittance: 0.05, Reflectance: 0.1}
	day, err := SkinHeat(f, s)
	if err != nil {
		t.Fatal(err)
	}
	s.IrradianceWm2 = 0
	night, err := SkinHeat(f, s)
	if err != nil {
		t.Fatal(err)
	}
	if !(day.SkinGainWm2 > night.SkinGainWm2 && day.FabricK > night.FabricK) {
		t.Errorf("day: %g W/m² at %g K; night: %g W/m² at %g K", day.SkinGainWm2, day.FabricK, night.SkinGainWm2, night.FabricK)
	}
	if night.SkinGainWm2 >= 0 {
		t.Errorf("skin at 34 °C under a clear night sky in 27 °C air gains %g W/m²: want a loss", night.SkinGainWm2)
	}
}

func TestFabricOnSkin(t *testing.T) {
	// Flat fabric R_f = 0.3, T_f = 0.5 (A_f = 0.2) over flat skin R_s = 0.4.
	// By hand, D = 1 − R_f R_s = 0.88: the fabric absorbs
	// A_f (1 + T_f R_s / D) = 0.2 (1 + 0.2/0.88) = 0.2454545…, the skin
	// T_f (1 − R_s)/D = 0.3/0.88 = 0.3409090…; in the infrared ρ = 0.3,
	// τ = 0.5, ε = 0.2.
	fabric := opticsOf(t, "wavelength_nm,R,T\n250,0.3,0.5\n30000,0.3,0.5\n", "fabric.csv")
	skin := opticsOf(t, "wavelength_nm,R\n250,0.4\n4000,0.4\n", "skin.csv")
	f, err := FabricOnSkin(fabric, skin, DefaultSkinSetting())
	if err != nil {
		t.Fatal(err)
	}
	for _, tt := range []struct {
		name      string
		got, want Num
	}{
		{"solar, fabric", f.SolarFabric, 0.2 * (1 + 0.2/0.88)},
		{"solar, skin", f.SolarSkin, 0.3 / 0.88},
		{"solar coverage", f.SolarCoverage, 1},
		{"ρ", f.Reflectance, 0.3},
		{"τ", f.Transmittance, 0.5},
		{"ε", f.Emittance, 0.2},
		{"long-wave coverage", f.LongWaveCoverage, 1},
	} {
		if math.Abs(float64(tt.got-tt.want)) > 1e-12 {
			t.Errorf("%s: %.15g, want %.15g", tt.name, float64(tt.got), float64(tt.want))
		}
	}
	if !strings.Contains(strings.Join(f.Assumptions, " "), "same from both sides") {
		t.Errorf("assumptions %q do not carry the stack's", f.Assumptions)
	}
	// Skin data stopping at 2500 nm leave part of the 280–4000 nm band
	// uncovered: the coverage says so.
	short := opticsOf(t, "wavelength_nm,R\n250,0.4\n2500,0.4\n", "skin.csv")
	if f, err := FabricOnSkin(fabric, short, DefaultSkinSetting()); err != nil || !(f.SolarCoverage < 1 && f.SolarCoverage > 0.95) {
		t.Errorf("skin to 2500 nm: solar coverage %g, %v; want a little below 1", float64(f.SolarCoverage), err)
	}
	// No infrared data: an error, not a number.
	visible := opticsOf(t, "wavelength_nm,R,T\n250,0.3,0.5\n2400,0.3,0.5\n", "fabric.csv")
	if _, err := FabricOnSkin(visible, skin, DefaultSkinSetting()); !errors.Is(err, spectra.ErrNoData) {
		t.Errorf("fabric without infrared data: %v, want ErrNoData", err)
	}
}

func TestSkinHeatErrors(t *testing.T) {
	good := Fabric{SolarFabric: 0.3, SolarSkin: 0.2, Emittance: 0.85, Transmittance: 0.05, Reflectance: 0.1}
	for _, tt := range []struct {
		name string
		set  func(*SkinSetting)
		f    Fabric
	}{
		{"skin in °C", func(s *SkinSetting) { s.SkinK = 34 }, good},
		{"skin emittance 0", func(s *SkinSetting) { s.SkinEmittance = 0 }, good},
		{"negative sky", func(s *SkinSetting) { s.SkyDownWm2 = -1 }, good},
		{"NaN sky", func(s *SkinSetting) { s.SkyDownWm2 = math.NaN() }, good},
		{"negative gap", func(s *SkinSetting) { s.GapM = -0.001 }, good},
		{"gap in mm", func(s *SkinSetting) { s.GapM = 5 }, good},
		{"no conductivity", func(s *SkinSetting) { s.GapConductivityWmK = 0 }, good},
		{"negative h", func(s *SkinSetting) { s.HWm2K = -2 }, good},
		{"ε + τ + ρ ≠ 1", func(*SkinSetting) {}, Fabric{Emittance: 0.8, Transmittance: 0.1, Reflectance: 0.2}},
		{"solar shares above 1", func(*SkinSetting) {}, Fabric{SolarFabric: 0.7, SolarSkin: 0.4, Emittance: 1}},
		{"NaN share", func(*SkinSetting) {}, Fabric{SolarFabric: Num(math.NaN()), Emittance: 1}},
	} {
		s := DefaultSkinSetting()
		tt.set(&s)
		if _, err := SkinHeat(tt.f, s); !errors.Is(err, ErrSystemInput) {
			t.Errorf("%s: %v, want ErrSystemInput", tt.name, err)
		}
	}
}

func TestSkinAssumptions(t *testing.T) {
	s := DefaultSkinSetting()
	all := strings.Join(s.Assumptions(), " ")
	for _, want := range []string{"307.15 K (34 °C)", "0.98", "grey approximation", "5 mm gap of still air", "L↓ = 355.636"} {
		if !strings.Contains(all, want) {
			t.Errorf("assumptions do not say %q: %s", want, all)
		}
	}
	s.GapM = 0
	if all := strings.Join(s.Assumptions(), " "); !strings.Contains(all, "touches the skin") {
		t.Errorf("touching fabric not stated: %s", all)
	}
}

func TestSkinSettingFor(t *testing.T) {
	c := DefaultConditions()
	c.AmbientK, c.IrradianceWm2, c.HWm2K = 305, 800, 4
	sky := ClearSky(c)
	s := SkinSettingFor(c, sky)
	// L↓ = ε_hemi σT_a⁴ (Stefan–Boltzmann law), σ from CODATA 2018 (rounded:
	// agrees to 1e-10 relative with the package's σ from h, c and k).
	want := float64(sky.HemisphericalEmissivity) * 5.670374419e-8 * math.Pow(305, 4)
	if math.Abs(s.SkyDownWm2-want) > 1e-6 || s.AirK != 305 || s.IrradianceWm2 != 800 || s.HWm2K != 4 || s.SkinK != 307.15 {
		t.Errorf("setting %+v, L↓ want %g", s, want)
	}
	if s := SkinSettingFor(c, Sky{}); s.SkyDownWm2 != DefaultSkinSetting().SkyDownWm2 {
		t.Errorf("no sky: L↓ %g", s.SkyDownWm2)
	}
}
