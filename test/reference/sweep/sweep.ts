/**
 * Sweep over random realistic lines (test/reference/realisticLines.ts, the independent forward
 * model with seeded pick noise): how often the interpretation is fully right. Not a test; run with
 *   nice npx tsx test/reference/sweep/sweep.ts [lines=40] [firstSeed=1] [--verbose]
 * Fully right: the layer count, every velocity within 5 %, and the mean absolute depth error of
 * each refractor's recommended profile within 10 % of its mean true depth.
 */
import { WarningLog } from '../../../src/core/warnings.js';
import { readFirstBreaks } from '../../../src/io/firstBreaksCsv.js';
import { interpret } from '../../../src/interpret.js';
import { realisticCsv, realisticLine } from '../realisticLines.js';

const args = process.argv.slice(2).filter((a) => !a.startsWith('--'));
const verbose = process.argv.includes('--verbose');
const lines = Number(args[0] ?? 40);
const first = Number(args[1] ?? 1);

interface Row { name: string; right: boolean; countRight: boolean; invented: boolean; velocitiesRight: boolean; depthsRight: boolean; water?: boolean; stepped: boolean; misfit: boolean; detail: string; ms: number }
const rows: Row[] = [];
for (let seed = first; seed < first + lines; seed++) {
  const line = realisticLine(seed);
  const csv = realisticCsv(line, seed);
  const log = new WarningLog();
  const table = readFirstBreaks(csv, `line-${seed}.csv`, log);
  const start = performance.now();
  let result;
  try {
    result = interpret(table, {}, log);
  } catch (error) {
    rows.push({ name: line.name, right: false, countRight: false, invented: false, velocitiesRight: false, depthsRight: false, stepped: line.kind.shape === 'stepped' || line.kind.shape === 'channel', misfit: false, detail: `threw ${(error as Error).message}`, ms: 0 });
    if (verbose) process.stdout.write(`${seed}\tTHREW\t${line.name}\t${(error as Error).message}\n`);
    continue;
  }
  const ms = performance.now() - start;
  const truth = line.section.velocities;
  const got = result.layers.map((l) => l.velocity);
  const countRight = got.length === truth.length;
  const invented = got.length > truth.length;
  const velocitiesRight = countRight && truth.every((v, i) => Math.abs(got[i] / v - 1) <= 0.05);
  const depthErrors = line.depth.map((depthAt, k) => {
    const points = result.refractors[k]?.points ?? [];
    if (points.length === 0) return Infinity;
    const error = points.reduce((a, p) => a + Math.abs(p.depth - depthAt(p.x)), 0) / points.length;
    const mean = points.reduce((a, p) => a + depthAt(p.x), 0) / points.length;
    return error / mean;
  });
  const depthsRight = countRight && depthErrors.every((e) => e <= 0.1);
  const codes = new Set(result.warnings.map((w) => w.code));
  const row: Row = {
    name: line.name,
    right: countRight && velocitiesRight && depthsRight,
    countRight, invented, velocitiesRight, depthsRight,
    water: line.kind.layers === 'water-table' ? codes.has('water-table') : undefined,
    stepped: line.kind.shape === 'stepped' || line.kind.shape === 'channel',
    misfit: codes.has('forward-misfit'),
    detail: `forward/noise ${result.forward ? (result.forward.rms / result.pickNoise.sigma).toFixed(2) : '-'} (${result.forward ? (result.forward.rms * 1e3).toFixed(2) : '-'}/${(result.pickNoise.sigma * 1e3).toFixed(2)} ms, true ${line.noiseMs.toFixed(2)}), got ${got.map(Math.round).join('/')} m/s, depth error ${depthErrors.map((e) => (Number.isFinite(e) ? `${(e * 100).toFixed(1)} %` : 'none')).join(', ')}`,
    ms,
  };
  rows.push(row);
  if (verbose) process.stdout.write(`${seed}\t${row.right ? 'RIGHT' : 'wrong'}\t${row.name}\t${row.detail}${row.misfit ? ' [forward-misfit]' : ''}${row.water === false ? ' [water-table missed]' : ''}\n`);
}
const count = (f: (r: Row) => boolean) => rows.filter(f).length;
const water = rows.filter((r) => r.water !== undefined);
const stepped = rows.filter((r) => r.stepped);
process.stdout.write([
  `lines ${rows.length}`,
  `fully right ${count((r) => r.right)} (${((100 * count((r) => r.right)) / rows.length).toFixed(0)} %)`,
  `layer count right ${count((r) => r.countRight)}`,
  `invented layer ${count((r) => r.invented)}`,
  `velocities within 5 % ${count((r) => r.velocitiesRight)}`,
  `depths within 10 % ${count((r) => r.depthsRight)}`,
  `water table flagged ${water.filter((r) => r.water).length} of ${water.length}`,
  `stepped or channelled rock fully right ${stepped.filter((r) => r.right).length} of ${stepped.length}`,
  `forward-misfit on fully right lines ${count((r) => r.right && r.misfit)}, on wrong lines ${count((r) => !r.right && r.misfit)} of ${count((r) => !r.right)}`,
  `threw ${count((r) => r.detail.startsWith('threw'))}`,
  `median interpret time ${[...rows.map((r) => r.ms)].sort((a, b) => a - b)[rows.length >> 1].toFixed(0)} ms`,
].join('\n') + '\n');
