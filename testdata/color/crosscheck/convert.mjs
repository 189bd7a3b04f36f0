// Converts CIE XYZ to CIELAB, chromaticity and sRGB, and computes colour
// differences, with the general-purpose colour library "colorjs.io", so that
// the Go colorimetry package can be compared with it (see TestCrossCheck in
// spectra/colorimetry).
//
// Usage: node convert.mjs < input.json
//
// Input: {"colors": [{"name", "xyz": [X, Y, Z], "white": [Xn, Yn, Zn]}],
//         "pairs": [[[L, a, b], [L, a, b]], ...]}
// X, Y, Z are on the scale Y = 100 for the white [Xn, Yn, Zn] of the CIE
// tables the Go package sums with. The library's D65 white is the sRGB one
// (x = 0.3127, y = 0.3290); the colour is handed to it as
// X/Xn·Xw, Y/Yn, Z/Zn·Zw, [Xw, 1, Zw] being that white, so that its "lab-d65"
// (which divides by [Xw, 1, Zw]) gives L*a*b* relative to [Xn, Yn, Zn]
// exactly, and its "srgb" gets the same white-scaled XYZ as the Go package.
//
// Output: {"colors": [{"name", "lab", "xy", "linear", "srgb", "hex",
//          "inGamut"}], "pairs": [{"de76", "de2000"}]}
// "linear" is linear sRGB before clipping, "srgb" the encoded values after
// clipping each channel to [0, 1], "hex" their 8-bit form, "inGamut" whether
// linear sRGB lies within [0, 1] to 1e-9.
import { readFileSync } from 'node:fs';
import Color from 'colorjs.io';
import { xy } from 'colorjs.io/fn';

const input = JSON.parse(readFileSync(0, 'utf8'));
const w = Color.Space.get('xyz-d65').white;

const colors = input.colors.map(({ name, xyz, white }) => {
  const c = new Color('xyz-d65', xyz.map((v, i) => (v / white[i]) * w[i]));
  return {
    name,
    lab: c.to('lab-d65').coords,
    xy: xy(c),
    linear: c.to('srgb-linear').coords,
    srgb: c.to('srgb').toGamut({ method: 'clip' }).coords,
    hex: c.to('srgb').toGamut({ method: 'clip' }).toString({ format: 'hex', collapse: false }),
    inGamut: c.inGamut('srgb-linear', { epsilon: 1e-9 }),
  };
});

const pairs = input.pairs.map(([a, b]) => {
  const ca = new Color('lab', a);
  const cb = new Color('lab', b);
  return { de76: Color.deltaE76(ca, cb), de2000: Color.deltaE2000(ca, cb) };
});

process.stdout.write(JSON.stringify({ colors, pairs }));
