package datasheet

import (
	"fmt"
	"math"

	"skysheet/spectra"
)

// SkinSetting is the scene of the fabric-over-skin balance: a horizontal
// fabric under the sun and the sky, over skin held at a fixed temperature,
// with a thin gap of still air between them. Start from
// [DefaultSkinSetting].
type SkinSetting struct {
	SkinK         float64 `json:"skin_k"`         // skin temperature, held
	SkinEmittance float64 `json:"skin_emittance"` // long-wave emittance of skin, grey
	AirK          float64 `json:"air_k"`          // outside air
	// SkyDownWm2 is L↓, the sky's downward long-wave flux on a horizontal
	// surface, W/m² (for a clear sky ε_sky σT_a⁴ with the hemispherical
	// ε_sky of the sky model).
	SkyDownWm2    float64 `json:"sky_down_w_m2"`
	IrradianceWm2 float64 `json:"irradiance_w_m2"` // sunlight on the fabric; 0 at night
	HWm2K         float64 `json:"h_w_m2k"`         // convection from the fabric to the outside air
	// GapM is the still-air gap between fabric and skin, crossed by
	// conduction (and radiation); 0 means the fabric touches the skin and
	// takes its temperature.
	GapM               float64 `json:"gap_m"`
	GapConductivityWmK float64 `json:"gap_conductivity_w_mk"` // air in the gap

	// How the fabric's grey figures are taken from spectra by
	// [FabricOnSkin]: the solar band and spectrum ("global" or "direct")
	// of the absorbed sunlight, and the band and blackbody temperature of
	// the long-wave means.
	SolarBandNM    [2]float64 `json:"solar_band_nm"`
	SolarSpectrum  string     `json:"solar_spectrum"`
	LongWaveBandUM [2]float64 `json:"long_wave_band_um"`
	LongWaveK      float64    `json:"long_wave_k"`
}

// DefaultSkinSetting returns skin at 34 °C with emittance 0.98 (common
// practice, no source), air at 300 K under the clear sky of a 10 °C dew
// point (L↓ = ε_sky σT_a⁴ with the Berdahl–Martin emissivity, 355.6 W/m²),
// 1000 W/m² of sun, h = 6 W m⁻² K⁻¹ outside, a 5 mm air gap (common
// practice, no source) of conductivity 0.026 W m⁻¹ K⁻¹ (dry air near 300 K,
// from memory), absorbed sunlight over 280–4000 nm under the ASTM G173-03
// global tilt spectrum and long-wave means over 2.5–25 µm at the skin's
// temperature.
func DefaultSkinSetting() SkinSetting {
	const airK = 300.0
	return SkinSetting{
		SkinK: 307.15, SkinEmittance: 0.98, AirK: airK,
		SkyDownWm2:    BerdahlMartin(10) * spectra.StefanBoltzmann * math.Pow(airK, 4),
		IrradianceWm2: 1000, HWm2K: 6, GapM: 0.005, GapConductivityWmK: 0.026,
		SolarBandNM: [2]float64{280, 4000}, SolarSpectrum: "global",
		LongWaveBandUM: [2]float64{2.5, 25}, LongWaveK: 307.15,
	}
}

// SkinSettingFor returns [DefaultSkinSetting] in the scene of conditions
// c under sky: the air temperature, sunlight (irradiance and spectrum) and
// h of c, and L↓ = ε_hemi σT_a⁴ with the hemispherical emissivity of sky
// (the default L↓ when sky has none).
func SkinSettingFor(c Conditions, sky Sky) SkinSetting {
	s := DefaultSkinSetting()
	s.AirK, s.IrradianceWm2, s.HWm2K, s.SolarSpectrum = c.AmbientK, c.IrradianceWm2, c.HWm2K, c.SolarSpectrum.String()
	if e := float64(sky.HemisphericalEmissivity); e > 0 && e <= 1 {
		s.SkyDownWm2 = e * spectra.StefanBoltzmann * math.Pow(c.AmbientK, 4)
	}
	return s
}

// Validate reports the first value of the balance outside its range, as an
// error wrapping [ErrSystemInput].
func (s SkinSetting) Validate() error {
	for _, c := range []struct {
		name, unit string
		v, lo, hi  float64
		openLo     bool
	}{
		{"skin temperature", "K", s.SkinK, 250, 350, false},
		{"skin emittance", "", s.SkinEmittance, 0, 1, true},
		{"air temperature", "K", s.AirK, 150, 400, false},
		{"sky's downward long-wave flux", "W/m²", s.SkyDownWm2, 0, 2000, false},
		{"irradiance", "W/m²", s.IrradianceWm2, 0, 2000, false},
		{"heat-transfer coefficient h", "W m⁻² K⁻¹", s.HWm2K, 0, 1000, false},
		{"air gap", "m (a thin still-air gap)", s.GapM, 0, 0.05, false},
		{"gap conductivity", "W m⁻¹ K⁻¹", s.GapConductivityWmK, 0, 10, true},
	} {
		ok := c.v >= c.lo && c.v <= c.hi && !(c.openLo && c.v == c.lo)
		if !ok {
			lo := "≤"
			if c.openLo {
				lo = "<"
			}
			return fmt.Errorf("%s %g is %w: want %g %s value ≤ %g %s", c.name, c.v, ErrSystemInput, c.lo, lo, c.hi, c.unit)
		}
	}
	return nil
}

// Fabric is a fabric's part in the skin balance as grey (band-weighted)
// fractions; [FabricOnSkin] derives it from spectra.
type Fabric struct {
	// SolarFabric and SolarSkin are the shares of the sunlight falling on
	// the fabric that the fabric absorbs and that the skin beneath absorbs,
	// counting every reflection between them.
	SolarFabric   Num `json:"solar_fabric"`
	SolarSkin     Num `json:"solar_skin"`
	SolarCoverage Num `json:"solar_coverage"`
	// Emittance (= absorptance), Transmittance and Reflectance of the fabric
	// in the long-wave infrared, each Planck-weighted; they sum to 1.
	Emittance        Num `json:"emittance"`
	Transmittance    Num `json:"transmittance"`
	Reflectance      Num `json:"reflectance"`
	LongWaveCoverage Num `json:"long_wave_coverage"`
	// Assumptions of the stack behind the solar shares.
	Assumptions []string `json:"assumptions"`
}

// FabricOnSkin derives a fabric's grey figures from its optics and those of
// the skin: the solar shares from the stack fabric over skin
// ([spectra.Stack], per-layer absorbed fractions) weighted by the solar
// spectrum over s.SolarBandNM; the long-wave reflectance ρ and
// transmittance τ of the fabric alone, weighted by a blackbody at
// s.LongWaveK over s.LongWaveBandUM, where it has both R and T, and
// ε = 1 − ρ − τ. The skin's long-wave emittance is s.SkinEmittance, not its
// spectrum. It returns an error when the spectra share no range or leave a
// band without data.
func FabricOnSkin(fabric, skin spectra.Optics, s SkinSetting) (Fabric, error) {
	var spec SolarSpectrum
	if err := spec.UnmarshalText([]byte(s.SolarSpectrum)); err != nil {
		return Fabric{}, err
	}
	sun := spec.Weighting()
	if b := s.SolarBandNM; !(b[0] >= spectra.SolarRangeNM.Lo && b[1] > b[0] && b[1] <= spectra.SolarRangeNM.Hi) {
		return Fabric{}, fmt.Errorf("solar band %g–%g nm is %w: want a band within the G173 tables' %g–%g nm",
			b[0], b[1], ErrSystemInput, spectra.SolarRangeNM.Lo, spectra.SolarRangeNM.Hi)
	}
	if b := s.LongWaveBandUM; !(b[0] > 0 && b[1] > b[0] && b[1] <= maxBandUM) || !(s.LongWaveK > 0 && s.LongWaveK < 1e4) {
		return Fabric{}, fmt.Errorf("long-wave band %g–%g µm at %g K is %w: want 0 < low < high ≤ %g µm and a temperature in kelvin",
			b[0], b[1], s.LongWaveK, ErrSystemInput, float64(maxBandUM))
	}
	pair, err := spectra.Stack([]spectra.Optics{fabric, skin})
	if err != nil {
		return Fabric{}, fmt.Errorf("fabric over skin: %w", err)
	}
	mf := spectra.BandMean(pair.Absorbed[0], sun, s.SolarBandNM[0], s.SolarBandNM[1])
	ms := spectra.BandMean(pair.Absorbed[1], sun, s.SolarBandNM[0], s.SolarBandNM[1])
	if math.IsNaN(mf.Value) {
		return Fabric{}, fmt.Errorf("fabric over skin: no data in the solar band %g–%g nm: %w", s.SolarBandNM[0], s.SolarBandNM[1], spectra.ErrNoData)
	}
	alone, err := spectra.Stack([]spectra.Optics{fabric})
	if err != nil {
		return Fabric{}, fmt.Errorf("fabric: %w", err)
	}
	bb := spectra.Blackbody{K: s.LongWaveK}
	lo, hi := s.LongWaveBandUM[0]*1000, s.LongWaveBandUM[1]*1000
	mr, mt := spectra.BandMean(alone.R, bb, lo, hi), spectra.BandMean(alone.T, bb, lo, hi)
	if math.IsNaN(mr.Value) {
		return Fabric{}, fmt.Errorf("fabric: no R and T in the long-wave band %g–%g µm: %w", s.LongWaveBandUM[0], s.LongWaveBandUM[1], spectra.ErrNoData)
	}
	clip := func(x float64) float64 { return math.Max(0, math.Min(1, x)) }
	f := Fabric{
		SolarFabric: Num(clip(mf.Value)), SolarSkin: Num(clip(ms.Value)), SolarCoverage: Num(mf.Coverage),
		Reflectance: Num(clip(mr.Value)), Transmittance: Num(clip(mt.Value)), LongWaveCoverage: Num(mr.Coverage),
		Assumptions: pair.Assumptions,
	}
	f.Emittance = Num(math.Max(0, 1-float64(f.Reflectance)-float64(f.Transmittance)))
	return f, nil
}

// SkinBalance is the steady state of the fabric-over-skin balance. Fluxes
// are W/m² per unit area of skin, positive into the node named.
type SkinBalance struct {
	FabricK float64 `json:"fabric_k"` // the fabric's temperature
	// SkinGainWm2 is the net heat flux into the skin (positive: the skin
	// gains heat), the sum of the three Skin terms.
	SkinGainWm2       float64 `json:"skin_gain_w_m2"`
	SkinSolarWm2      float64 `json:"skin_solar_w_m2"`
	SkinLongWaveWm2   float64 `json:"skin_long_wave_w_m2"`
	SkinConductionWm2 float64 `json:"skin_conduction_w_m2"` // across the gap, from the fabric
	// The fabric's terms; they sum to zero.
	FabricSolarWm2      float64 `json:"fabric_solar_w_m2"`
	FabricLongWaveWm2   float64 `json:"fabric_long_wave_w_m2"`
	FabricConvectionWm2 float64 `json:"fabric_convection_w_m2"` // from the outside air
	FabricConductionWm2 float64 `json:"fabric_conduction_w_m2"` // across the gap, from the skin
	// Leaving the system upward: sunlight reflected and long-wave
	// radiation (emitted, reflected and passed through).
	SolarReflectedWm2 float64 `json:"solar_reflected_w_m2"`
	UpLongWaveWm2     float64 `json:"up_long_wave_w_m2"`
}

// SkinHeat solves the steady two-node balance of fabric f over skin in
// setting s: the skin is held at s.SkinK, the fabric's temperature T_f is
// found from its own balance
//
//	I a_f + LW_f(T_f) + h (T_a − T_f) + (k/d) (T_s − T_f) = 0
//
// (absorbed sunlight, net long-wave, convection to the outside air,
// conduction across the gap), and the net heat into the skin is
//
//	Q = I a_s + LW_s(T_f) + (k/d) (T_f − T_s).
//
// The long-wave exchange is between infinite grey diffuse planes, the
// fabric the same from both sides: with B = σT⁴, the flux leaving the
// fabric downward q↓ and the skin upward q↑ solve
//
//	q↓ = ε_f B_f + τ_f L↓ + ρ_f q↑,   q↑ = ε_s B_s + (1 − ε_s) q↓,
//
// so LW_s = ε_s (q↓ − B_s), LW_f = ε_f (L↓ + q↑) − 2 ε_f B_f, and the flux
// leaving upward is ε_f B_f + ρ_f L↓ + τ_f q↑. With GapM = 0 the fabric
// takes the skin's temperature and passes to it all it gains. T_f is found
// by Brent's method, bracketed (the balance falls strictly with T_f), to
// 1e-9 K. The night balance is the same with IrradianceWm2 = 0.
func SkinHeat(f Fabric, s SkinSetting) (SkinBalance, error) {
	if err := s.Validate(); err != nil {
		return SkinBalance{}, err
	}
	g, err := greyOf(f)
	if err != nil {
		return SkinBalance{}, err
	}
	i := s.IrradianceWm2
	fabric := func(tf float64) float64 { // the fabric's gains except conduction
		lwf, _, _ := s.longWave(g, tf)
		return i*g.solarF + lwf + s.HWm2K*(s.AirK-tf)
	}
	var tf, cond float64 // cond: conduction from skin into fabric
	if s.GapM == 0 {
		tf = s.SkinK
		cond = -fabric(tf)
	} else {
		k := s.GapConductivityWmK / s.GapM
		bal := func(t float64) float64 { return -(fabric(t) + k*(s.SkinK-t)) } // increasing in t
		if tf, err = increasingRoot(bal, s.SkinK, 1, 1e4); err != nil {
			return SkinBalance{}, fmt.Errorf("fabric over skin: no fabric temperature balances it between 1 K and 10⁴ K")
		}
		cond = k * (s.SkinK - tf)
	}
	lwf, lws, up := s.longWave(g, tf)
	b := SkinBalance{
		FabricK:         tf,
		SkinSolarWm2:    i * g.solarS,
		SkinLongWaveWm2: lws, SkinConductionWm2: -cond,
		FabricSolarWm2: i * g.solarF, FabricLongWaveWm2: lwf,
		FabricConvectionWm2: s.HWm2K * (s.AirK - tf), FabricConductionWm2: cond,
		SolarReflectedWm2: i * (1 - g.solarF - g.solarS), UpLongWaveWm2: up,
	}
	b.SkinGainWm2 = b.SkinSolarWm2 + b.SkinLongWaveWm2 + b.SkinConductionWm2
	return b, nil
}

// grey is a Fabric checked and in plain numbers.
type grey struct{ solarF, solarS, eps, tau, rho float64 }

// greyOf checks f: every fraction in 0..1, a_f + a_s ≤ 1 and ε + τ + ρ = 1
// (to 1e-9).
func greyOf(f Fabric) (grey, error) {
	g := grey{float64(f.SolarFabric), float64(f.SolarSkin), float64(f.Emittance), float64(f.Transmittance), float64(f.Reflectance)}
	for _, v := range []struct {
		name string
		x    float64
	}{{"solar share of the fabric", g.solarF}, {"solar share of the skin", g.solarS},
		{"long-wave emittance", g.eps}, {"long-wave transmittance", g.tau}, {"long-wave reflectance", g.rho}} {
		if !(v.x >= 0 && v.x <= 1) {
			return g, fmt.Errorf("fabric: %s %g is %w: want 0..1", v.name, v.x, ErrSystemInput)
		}
	}
	if g.solarF+g.solarS > 1+1e-9 {
		return g, fmt.Errorf("fabric: solar shares %g + %g exceed 1: %w", g.solarF, g.solarS, ErrSystemInput)
	}
	if d := g.eps + g.tau + g.rho - 1; math.Abs(d) > 1e-9 {
		return g, fmt.Errorf("fabric: long-wave ε + τ + ρ = %g, not 1: %w", 1+d, ErrSystemInput)
	}
	return g, nil
}

// longWave returns the net long-wave gain of the fabric and of the skin and
// the long-wave flux leaving upward, at fabric temperature tf (see
// [SkinHeat]).
func (s SkinSetting) longWave(g grey, tf float64) (fabric, skin, up float64) {
	sigma := spectra.StefanBoltzmann
	bf, bs := sigma*tf*tf*tf*tf, sigma*s.SkinK*s.SkinK*s.SkinK*s.SkinK
	es, l := s.SkinEmittance, s.SkyDownWm2
	down := (g.eps*bf + g.tau*l + g.rho*es*bs) / (1 - g.rho*(1-es)) // q↓; ε_s > 0 keeps it finite
	upGap := es*bs + (1-es)*down                                    // q↑
	fabric = g.eps*(l+upGap) - 2*g.eps*bf
	skin = es * (down - bs)
	up = g.eps*bf + g.rho*l + g.tau*upGap
	return fabric, skin, up
}

// Assumptions states the skin balance of s in sentences.
func (s SkinSetting) Assumptions() []string {
	out := []string{
		fmt.Sprintf("Skin held at %s K (%s °C) with long-wave emittance %s (common practice, no source); a steady balance, "+
			"no sweat, no blood flow, nothing but the fabric over the skin.", fmtG(s.SkinK), fmtG(s.SkinK-273.15), fmtG(s.SkinEmittance)),
		fmt.Sprintf("The fabric, horizontal under %s W/m² of sun and a sky sending L↓ = %s W/m² of long-wave radiation, loses "+
			"heat to air at %s K with h = %s W m⁻² K⁻¹; the fabric's temperature is found from its own balance.",
			fmtG(s.IrradianceWm2), fmtG(s.SkyDownWm2), fmtG(s.AirK), fmtG(s.HWm2K)),
		"Sunlight absorbed in the fabric and in the skin: the fabric as a stack over the skin, with every reflection between them.",
		fmt.Sprintf("Long-wave exchange between grey, diffuse, infinite planes: the fabric's emittance, transmittance and "+
			"reflectance are Planck-weighted means at %s K over %g–%g µm, the same for its own emission, the skin's and the "+
			"sky's (whose spectrum is not a blackbody's): a grey approximation.", fmtG(s.LongWaveK), s.LongWaveBandUM[0], s.LongWaveBandUM[1]),
	}
	if s.GapM == 0 {
		out = append(out, "The fabric touches the skin and takes its temperature.")
	} else {
		out = append(out, fmt.Sprintf("Between fabric and skin a %s mm gap of still air conducts heat with k = %s W m⁻¹ K⁻¹ "+
			"(common practice, no source), and radiation crosses it; no convection in the gap.", fmtG(s.GapM*1000), fmtG(s.GapConductivityWmK)))
	}
	return out
}
