// Thins series with the largest-triangle-three-buckets implementation of the
// general-purpose "downsample" library, so that the chart thinning of
// datasheet/site can be compared with it (see TestThinCrossCheck there).
//
// Usage: node thin.mjs < input.json
//
// Input:  {"series": [{"name", "x": [...], "y": [...], "n": threshold}]}
// Output: {"series": [{"name", "kept": [indices of the points kept]}]}
//
// Each point is handed to the library as [x, y, index]; the library returns
// the same arrays, so their third element is the index it chose.
import { readFileSync } from 'node:fs';
import { LTTB } from 'downsample';

const input = JSON.parse(readFileSync(0, 'utf8'));
const series = input.series.map(({ name, x, y, n }) => {
  const points = x.map((xi, i) => [xi, y[i], i]);
  return { name, kept: LTTB(points, n).map((p) => p[2]) };
});
process.stdout.write(JSON.stringify({ series }));
