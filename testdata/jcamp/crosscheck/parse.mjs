// Parses JCAMP-DX files with the general-purpose "jcampconverter" library
// and prints, as one JSON array, each file's abscissa and ordinate values
// (XFACTOR and YFACTOR applied) and units, so that the Go reader can be
// compared with it point by point (see TestJCAMPCrossCheck in spectra).
//
// Usage: node parse.mjs FILE...
//
// This version of the library reads (XY..XY) tables under ##PEAK TABLE= and
// ##XYDATA= but not under ##XYPOINTS=, so that label is renamed before
// parsing; nothing else is changed.
import { readFileSync } from 'node:fs';
import { convert } from 'jcampconverter';

const out = [];
for (const file of process.argv.slice(2)) {
  const text = readFileSync(file, 'latin1').replace(/^##XYPOINTS=/m, '##PEAK TABLE=');
  const result = convert(text, { keepRecordsRegExp: /.*/ });
  if (result.flatten.length !== 1 || result.flatten[0].spectra.length !== 1) {
    throw new Error(`${file}: expected one block with one spectrum`);
  }
  const entry = result.flatten[0];
  const spectrum = entry.spectra[0];
  out.push({
    file,
    title: entry.title,
    xUnits: spectrum.xUnits,
    yUnits: spectrum.yUnits,
    x: Array.from(spectrum.data.x),
    y: Array.from(spectrum.data.y),
  });
}
process.stdout.write(JSON.stringify(out));
