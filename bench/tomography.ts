/**
 * Benchmark: tomography of a 48-channel, 7-shot line (geophones at 2 m; undulating rock under dry
 * and saturated soil; 0.25 ms noise) to convergence, against one forward solve of all shots on the
 * same grid, in the same run. Target (issue 13): at most 5 s on one core. Run: npm run bench:tomography
 */
import { WarningLog } from '../src/core/warnings.js';
import { eikonalTimes } from '../src/forward/eikonal.js';
import { readFirstBreaks } from '../src/io/firstBreaksCsv.js';
import { tomography } from '../src/tomography/tomography.js';
import { syntheticCsv } from '../test/reference/layeredTravelTimes.js';
import { medianTime } from './timing.js';

const receivers = Array.from({ length: 48 }, (_, i) => i * 2);
const sources = [-24, -1, 23, 47, 71, 95, 118];
const csv = syntheticCsv({ surface: () => 100, interfaces: [() => 97, (x) => 90 - 2.5 * Math.sin((2 * Math.PI * x) / 60)], velocities: [450, 1500, 3500] }, sources, receivers, 0.25, 11);
const table = readFirstBreaks(csv, 'bench.csv', new WarningLog());
let grid = tomography(table, { maxIterations: 0 }, new WarningLog()).grid;
// One full run (it takes seconds; a median over repeats would take minutes).
const started = performance.now();
const t = tomography(table, { contours: [2500] }, new WarningLog());
const full = performance.now() - started;
grid = t.grid;
const r = t.results[0];
process.stdout.write(`tomography to convergence (gradient start): ${full.toFixed(0)} ms, ${r.iterations.length - 1} iterations, RMS ${(r.iterations[0].rms * 1e3).toFixed(2)} -> ${(r.iterations[r.iterations.length - 1].rms * 1e3).toFixed(2)} ms\n`);
const one = medianTime('one forward solve of the 7 shots', () => {
  for (const x of sources) eikonalTimes(grid, { x, elev: 100 });
}, 20);
process.stdout.write(`ratio tomography / forward solve: ${(full / one).toFixed(0)}\n`);
process.stdout.write(`target: at most 5 s: ${full <= 5000 ? 'met' : 'NOT met'} (${(full / 1000).toFixed(2)} s)\n`);
