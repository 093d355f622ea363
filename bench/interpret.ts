/**
 * Benchmark: interpret() on a generated 96-channel line with 25 sources, against the floor of a
 * plain single least-squares line pass over the same picks, measured in the same run.
 * Target (issue 2): a full interpretation under 50 ms on one core. Run: npm run bench
 */
import { medianTime } from './timing.js';
import { SimpleLinearRegression } from 'ml-regression';
import { WarningLog } from '../src/core/warnings.js';
import { readFirstBreaks } from '../src/io/firstBreaksCsv.js';
import { interpret } from '../src/interpret.js';
import { syntheticCsv } from '../test/reference/layeredTravelTimes.js';

const receivers = Array.from({ length: 96 }, (_, i) => i * 2);
const sources = Array.from({ length: 25 }, (_, i) => -10 + i * (210 / 24));
const csv = syntheticCsv({ surface: () => 100, interfaces: [() => 96, () => 86], velocities: [400, 1300, 3200] }, sources, receivers, 0.25, 1);
const table = readFirstBreaks(csv, 'bench.csv', new WarningLog());

function floor(): number {
  // One least-squares line per source over all its picks: the least any interpretation must do.
  let sum = 0;
  const bySource = new Map<string, { x: number[]; t: number[] }>();
  for (const p of table.picks) {
    if (!bySource.has(p.sourceId)) bySource.set(p.sourceId, { x: [], t: [] });
    const s = bySource.get(p.sourceId)!;
    s.x.push(Math.abs(p.receiverX - p.sourceX));
    s.t.push(p.time);
  }
  for (const { x, t } of bySource.values()) sum += new SimpleLinearRegression(x, t).slope;
  return sum;
}

const picks = table.picks.length;
const full = medianTime(`interpret() on ${picks} picks (96 channels, 25 sources)`, () => interpret(table, {}, new WarningLog()), 30);
const base = medianTime('floor: one least-squares line per source', floor, 200);
process.stdout.write(`ratio interpret / floor: ${(full / base).toFixed(1)}\n`);
process.stdout.write(`target: interpret under 50 ms: ${full < 50 ? 'met' : 'NOT met'} (${full.toFixed(1)} ms)\n`);
