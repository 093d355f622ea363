/**
 * Sweep: S picking and site classes on SH records the tests' generator makes (test/picking/
 * shearRecord.ts: P first, a ringing surface wave behind the S, unit Gaussian noise; onsets from
 * the independent forward model of test/reference), one record per shot, one polarity each, over
 * seeded random lines. Not part of npm test.
 *
 * Two line sets:
 * - wide (default): three-layer Vs profiles 130-1300 m/s, Vp/Vs 1.6-2.6, sampling 0.125, 0.25,
 *   0.5 or 1 ms, S signal-to-noise 5-50 near the source (log-uniform), P 0.1-0.5 of the S, surface
 *   wave 1-4 × the S at 0.85-0.95 of the top Vs, geophones 1-3 m apart, 24/48/72/96 channels, five
 *   to seven shots (ends, inside, and off the ends by 1-10 spacings), each struck on a side drawn
 *   at random (S polarity ±1);
 * - classic (--classic): the 24-line set this sweep first measured (P/S 0.15-0.4, SNR 12/20/35,
 *   0.25 or 0.5 ms, 48 channels at 1.5 or 2 m, six shots).
 *
 * For each line: median and 90th percentile S-pick error; picks on the P (nearer the P onset than
 * the S onset; and, counted apart, within max(1 ms, 3 samples) of the P onset); picks on the
 * surface wave (later than the S by over 2 ms and nearer the surface-wave onset than the S
 * onset); late picks (over 5 ms after the S); unpicked traces. Vs30 from the interpretation
 * against the true Vs30 (EN 1998-1 Eq. 3.1 over 30 m; ASCE 7 Eq. 20.4-1 over 30.48 m; the deepest
 * layer extended) and the classes against those of the true Vs30 (bounds of
 * ../shared/SITE-CLASSES.md, written out here); beside it the Vs30 the interpretation gives from
 * the exact S onsets, which tells a picking failure from a layout the interpretation cannot
 * resolve. With --cli the Vs30 and classes come from `hammerline interpret --wave S --json` on the
 * SEG-2 records written by the test SEG-2 writer (the picks are then made twice: once here for
 * the errors, once by the command) and the site's record list is checked.
 *
 * Run: nice npx tsx bench/shearSweep.ts [lines] [first seed] [--classic] [--cli]
 * The seed ranges reported in DEVELOPERS.md: 1-60 (tuning) and 1001-1060 (validation).
 */
import { WarningLog } from '../src/core/warnings.js';
import { readFirstBreaks } from '../src/io/firstBreaksCsv.js';
import { pickTableCsv } from '../src/io/pickTable.js';
import { readSeg2 } from '../src/io/seg2/read.js';
import { interpret } from '../src/interpret.js';
import { main } from '../src/cli/main.js';
import type { CliIo } from '../src/cli/io.js';
import { pickRecords } from '../src/picking/pickRecords.js';
import type { PickRow } from '../src/picking/recordPicks.js';
import { shearShotSeg2 } from '../test/picking/shearRecord.js';
import { classicSetup, wideSetup } from './shearLines.js';

const flags = process.argv.slice(2).filter((a) => a.startsWith('--'));
const numbers = process.argv.slice(2).filter((a) => !a.startsWith('--'));
const count = Number(numbers[0] ?? 24);
const firstSeed = Number(numbers[1] ?? 1);
const classic = flags.includes('--classic');
const viaCli = flags.includes('--cli');

// Class bounds, m/s, "above lower, up to and including upper" (SITE-CLASSES.md).
const ASCE716: [string, number][] = [['E', 182.88], ['D', 365.76], ['C', 762], ['B', 1524], ['A', Infinity]];
const ASCE722: [string, number][] = [['E', 152.4], ['DE', 213.36], ['D', 304.8], ['CD', 441.96], ['C', 640.08], ['BC', 914.4], ['B', 1524], ['A', Infinity]];
const EC8: [string, number][] = [['D', 180], ['C', 360], ['B', 800], ['A', Infinity]];
const classOf = (table: [string, number][], v: number) => table.find(([, upper]) => v <= upper)![0];

function cliVs30(files: Record<string, Uint8Array>): { vs30?: number; classes: string[]; records?: string[]; error?: string } {
  let stdout = '';
  let stderr = '';
  const io: CliIo = {
    stdout: (t) => { stdout += t; },
    stderr: (t) => { stderr += t; },
    readText: (path) => new TextDecoder('latin1').decode(files[path]),
    readBytes: (path) => {
      if (!(path in files)) throw Object.assign(new Error('not found'), { code: 'ENOENT' });
      return files[path];
    },
    writeText: () => undefined,
  };
  const code = main(['interpret', ...Object.keys(files), '--wave', 'S', '--json', '--quiet'], io);
  if (code !== 0 && stdout === '') return { classes: [], error: `exit ${code}: ${stderr.slice(0, 60)}` };
  const doc = JSON.parse(stdout);
  if (doc.site === undefined) return { classes: [], error: 'no site' };
  return { vs30: doc.site.vs30_mps, classes: doc.site.classes.map((c: { class_by_velocity?: string; class: string }) => c.class_by_velocity ?? c.class), records: doc.site.records };
}

function libraryVs30(rows: PickRow[], name: string): { vs30?: number; classes: string[]; error?: string } {
  try {
    const log = new WarningLog();
    const result = interpret(readFirstBreaks(pickTableCsv(rows, 'm', false), name, log, { wave: 'S' }), { wave: 'S' }, log);
    return { vs30: result.site?.vs30, classes: result.site?.classes.map((c) => c.velocityClass ?? c.class) ?? [] };
  } catch (error) {
    return { classes: [], error: (error as Error).message.slice(0, 50) };
  }
}

const percentile = (sorted: number[], q: number) => sorted[Math.floor(q * (sorted.length - 1))];
const totals = { errors: [] as number[], onP: 0, nearP: 0, surface: 0, late: 0, unpicked: 0, traces: 0, vs30: [] as number[], oracle: [] as number[], lines: 0, within: 0, oracleWithin: 0, match: [0, 0, 0], cliRecords: 0 };
console.log(`${classic ? 'classic' : 'wide'} set, seeds ${firstSeed}-${firstSeed + count - 1}${viaCli ? ', Vs30 through interpret --wave S' : ''}`);
console.log('line | Vs profile (m/s over m) | layout | median ms | p90 ms | on P (near P) | surface | late | unpicked/traces | Vs30 true | exact onsets | got | error % | classes true | got');
for (let n = 0; n < count; n++) {
  const seed = firstSeed + n;
  const setup = classic ? classicSetup(seed) : wideSetup(seed);
  const { line, receivers, sources } = setup;
  const [h1, h2] = setup.h;
  const files: Record<string, Uint8Array> = {};
  const truths: { p: number[]; s: number[]; surface: number[] }[] = [];
  sources.forEach((sx, s) => {
    const options = setup.shot(s);
    const shot = shearShotSeg2(line, sx, receivers, options);
    files[`sh${s + 1}.seg2`] = shot.bytes;
    truths.push({ p: shot.pTimes, s: shot.sTimes, surface: receivers.map((rx) => Math.abs(rx - sx) / ((options.surfaceVelocity ?? 0.85) * line.vs[0])) });
  });
  const names = Object.keys(files);
  // The picking of the command line: SEG-2 read, S records grouped by shot position, each picked.
  const { rows } = pickRecords(names.map((f) => readSeg2(files[f], f)), { wave: 'S' });
  const exactRows: PickRow[] = [];
  const errors: number[] = [];
  let onP = 0, nearP = 0, surface = 0, late = 0, unpicked = 0, traces = 0;
  let row = 0;
  sources.forEach((sx, s) => {
    const truth = truths[s];
    const dt = setup.shot(s).sampleInterval!;
    receivers.forEach((rx, r) => {
      const p = rows[row++];
      exactRows.push({ ...p, time: truth.s[r], status: 'picked', confidence: 1 });
      if (rx === sx) return;
      traces++;
      if (p.time === undefined) { unpicked++; return; }
      const error = p.time - truth.s[r];
      errors.push(Math.abs(error));
      if (Math.abs(p.time - truth.p[r]) < Math.abs(error)) onP++;
      if (Math.abs(p.time - truth.p[r]) <= Math.max(1e-3, 3 * dt)) nearP++;
      if (error > 2e-3 && Math.abs(p.time - truth.surface[r]) < error) surface++;
      if (error > 5e-3) late++;
    });
  });
  const average = (depth: number) => depth / (h1 / line.vs[0] + (h2 - h1) / line.vs[1] + (depth - h2) / line.vs[2]);
  // vs,30 over 30 m (EN 1998-1 Eq. 3.1); ASCE 7 averages the top 100 ft = 30.48 m (Eq. 20.4-1).
  const truth = average(30);
  const truthAsce = average(30.48);
  const got = viaCli ? cliVs30(files) : libraryVs30(rows, `line${seed}`);
  const oracle = libraryVs30(exactRows, `line${seed}`);
  const trueClasses = [classOf(ASCE716, truthAsce), classOf(ASCE722, truthAsce), classOf(EC8, truth)];
  errors.sort((a, b) => a - b);
  pushAll(totals.errors, errors);
  totals.onP += onP; totals.nearP += nearP; totals.surface += surface; totals.late += late;
  totals.unpicked += unpicked; totals.traces += traces; totals.lines++;
  const relative = (v: number | undefined) => (v === undefined ? undefined : (v - truth) / truth);
  const e = relative(got.vs30);
  const eo = relative(oracle.vs30);
  if (e !== undefined) totals.vs30.push(Math.abs(e));
  if (eo !== undefined) totals.oracle.push(Math.abs(eo));
  if (e !== undefined && Math.abs(e) <= 0.05) totals.within++;
  if (eo !== undefined && Math.abs(eo) <= 0.05) totals.oracleWithin++;
  trueClasses.forEach((c, k) => { if (got.classes[k] === c) totals.match[k]++; });
  if ('records' in got && JSON.stringify(got.records) === JSON.stringify(names)) totals.cliRecords++;
  console.log([seed, `${line.vs.map((v) => v.toFixed(0)).join('/')} over ${h1.toFixed(1)}/${h2.toFixed(1)}`, setup.summary,
    (percentile(errors, 0.5) * 1e3).toFixed(2), (percentile(errors, 0.9) * 1e3).toFixed(2), `${onP} (${nearP})`, surface, late, `${unpicked}/${traces}`,
    truth.toFixed(1), oracle.vs30?.toFixed(1) ?? oracle.error ?? '-', got.vs30?.toFixed(1) ?? got.error ?? '-', e === undefined ? '-' : (100 * e).toFixed(1),
    trueClasses.join(','), got.classes.join(',')].join(' | '));
}
function pushAll(into: number[], from: number[]) { for (const v of from) into.push(v); }
totals.errors.sort((a, b) => a - b);
const vsErr = [...totals.vs30].sort((a, b) => a - b);
console.log(`\nall: ${totals.errors.length} picks of ${totals.traces} traces, median error ${(percentile(totals.errors, 0.5) * 1e3).toFixed(3)} ms, 90th percentile ${(percentile(totals.errors, 0.9) * 1e3).toFixed(2)} ms, `
  + `on P ${totals.onP} (within max(1 ms, 3 samples) of the P onset ${totals.nearP}), on the surface wave ${totals.surface}, later than 5 ms ${totals.late}, unpicked ${totals.unpicked}`);
console.log(`Vs30 within 5 % on ${totals.within} of ${totals.lines} lines (from the exact onsets ${totals.oracleWithin}); error median ${(100 * vsErr[vsErr.length >> 1]).toFixed(1)} %, worst ${(100 * vsErr[vsErr.length - 1]).toFixed(1)} %, ${totals.lines - vsErr.length} without Vs30; `
  + `classes right: ASCE 7-16 ${totals.match[0]}, ASCE 7-22 ${totals.match[1]}, EN 1998-1 ${totals.match[2]} of ${totals.lines}${viaCli ? `; site records named on ${totals.cliRecords}` : ''}`);
