/**
 * Sweep: S picking and site classes on SH records the tests' generator makes (test/picking/
 * shearRecord.ts: P first at 0.15-0.4 of the S, a ringing surface wave behind the S, unit Gaussian
 * noise; onsets from the independent forward model of test/reference), one polarity per shot,
 * over seeded random Vs profiles, Vp/Vs ratios, amplitudes, frequencies, noise and sampling.
 * For each line: median and 90th percentile S-pick error, picks on the P (nearer the P onset than
 * the S onset), unpicked traces; Vs30 from `interpret` against the true Vs30 (EN 1998-1 Eq. 3.1,
 * the deepest layer extended) and the classes against those of the true Vs30 (bounds of
 * ../shared/SITE-CLASSES.md, written out here). Not part of npm test.
 * Run: nice npx tsx bench/shearSweep.ts [lines] [first seed]
 */
import { WarningLog } from '../src/core/warnings.js';
import { readFirstBreaks } from '../src/io/firstBreaksCsv.js';
import { pickTableCsv } from '../src/io/pickTable.js';
import { interpret } from '../src/interpret.js';
import { pickShearRecord } from '../src/picking/pickShearRecord.js';
import type { PickRow } from '../src/picking/recordPicks.js';
import { seededNormal } from '../test/reference/layeredTravelTimes.js';
import { shearShot, type ShearLine } from '../test/picking/shearRecord.js';

const count = Number(process.argv[2] ?? 24);
const firstSeed = Number(process.argv[3] ?? 1);

// Class bounds, m/s, "above lower, up to and including upper" (SITE-CLASSES.md).
const ASCE716: [string, number][] = [['E', 182.88], ['D', 365.76], ['C', 762], ['B', 1524], ['A', Infinity]];
const ASCE722: [string, number][] = [['E', 152.4], ['DE', 213.36], ['D', 304.8], ['CD', 441.96], ['C', 640.08], ['BC', 914.4], ['B', 1524], ['A', Infinity]];
const EC8: [string, number][] = [['D', 180], ['C', 360], ['B', 800], ['A', Infinity]];
const classOf = (table: [string, number][], v: number) => table.find(([, upper]) => v <= upper)![0];

function uniform(random: () => number, low: number, high: number) {
  return low + (high - low) * random();
}

const totals = { errors: [] as number[], onP: 0, unpicked: 0, traces: 0, vs30: [] as number[], match: 0, classes: 0 };
console.log('line | Vs profile (m/s over m) | P/S | snr | dt ms | median ms | p90 ms | on P | unpicked | Vs30 true | Vs30 got | error % | classes true | got');
for (let n = 0; n < count; n++) {
  const seed = firstSeed + n;
  const normal = seededNormal(9000 + seed);
  const random = () => Math.min(0.999999, Math.max(0, 0.5 + normal() / 6));
  const vs1 = uniform(random, 130, 260);
  const vs2 = Math.min(650, vs1 * uniform(random, 1.5, 2.3));
  const vs3 = Math.min(1300, vs2 * uniform(random, 1.7, 3));
  const h1 = uniform(random, 2, 6);
  const h2 = h1 + uniform(random, 5, 12);
  const vs = [vs1, vs2, vs3];
  const ratios = [uniform(random, 1.8, 2.6), uniform(random, 1.7, 2.4), uniform(random, 1.6, 2.1)];
  const vp = vs.map((v, k) => v * ratios[k]);
  for (let k = 1; k < 3; k++) vp[k] = Math.max(vp[k], 1.15 * vp[k - 1]);
  const line: ShearLine = { surface: () => 50, interfaces: [() => 50 - h1, () => 50 - h2], vp, vs };
  const pRatio = uniform(random, 0.15, 0.4);
  // Cycled by seed, so that a line can be run again alone.
  const k = seed - 1;
  const snr = [12, 20, 35][k % 3];
  const dt = k % 2 === 0 ? 0.00025 : 0.0005;
  const spacing = [1.5, 1.5, 2][k % 3];
  const receivers = Array.from({ length: 48 }, (_, i) => i * spacing);
  const end = 47 * spacing;
  const sources = [-4 * spacing, 0, end / 3 - spacing / 2, (2 * end) / 3 + spacing / 2, end, end + 4 * spacing];
  const rows: PickRow[] = [];
  const errors: number[] = [];
  let onP = 0;
  let unpicked = 0;
  let traces = 0;
  sources.forEach((sx, s) => {
    const shot = shearShot(line, sx, receivers, {
      pRatio, snr, seed: seed * 100 + s, sampleInterval: dt, samples: Math.round(0.5 / dt), step: 0.25,
      surfaceAmplitude: uniform(random, 1.5, 3), surfaceVelocity: uniform(random, 0.8, 0.92),
      frequencies: [uniform(random, 70, 110), uniform(random, 35, 60), uniform(random, 15, 25)],
    });
    const { picks } = pickShearRecord(shot.traces);
    picks.forEach((p, r) => {
      rows.push({ sourceId: `R${s + 1}`, sourceX: sx, receiverX: receivers[r], time: p.time, confidence: p.confidence, status: p.status, file: `R${s + 1}.seg2`, trace: r + 1, wave: 'S' });
      if (receivers[r] === sx) return;
      traces++;
      if (p.time === undefined) { unpicked++; return; }
      errors.push(Math.abs(p.time - shot.sTimes[r]));
      if (Math.abs(p.time - shot.pTimes[r]) < Math.abs(p.time - shot.sTimes[r])) onP++;
    });
  });
  const average = (depth: number) => depth / (h1 / vs1 + (h2 - h1) / vs2 + (depth - h2) / vs3);
  // vs,30 over 30 m (EN 1998-1 Eq. 3.1); ASCE 7 averages the top 100 ft = 30.48 m (Eq. 20.4-1).
  const truth = average(30);
  const truthAsce = average(30.48);
  let got: number | undefined;
  let gotClasses: string[] = [];
  try {
    const log = new WarningLog();
    const result = interpret(readFirstBreaks(pickTableCsv(rows, 'm', false), `line${seed}`, log, { wave: 'S' }), { wave: 'S' }, log);
    got = result.site?.vs30;
    gotClasses = result.site?.classes.map((c) => c.velocityClass ?? c.class) ?? [];
  } catch (error) {
    gotClasses = [`error: ${(error as Error).message.slice(0, 50)}`];
  }
  const trueClasses = [classOf(ASCE716, truthAsce), classOf(ASCE722, truthAsce), classOf(EC8, truth)];
  errors.sort((a, b) => a - b);
  const median = errors[errors.length >> 1];
  const p90 = errors[Math.floor(0.9 * (errors.length - 1))];
  totals.errors.push(...errors);
  totals.onP += onP;
  totals.unpicked += unpicked;
  totals.traces += traces;
  if (got !== undefined) totals.vs30.push(Math.abs(got - truth) / truth);
  totals.classes += 3;
  totals.match += trueClasses.filter((c, k) => gotClasses[k] === c).length;
  console.log([seed, `${vs.map((v) => v.toFixed(0)).join('/')} over ${h1.toFixed(1)}/${h2.toFixed(1)}`, pRatio.toFixed(2), snr, dt * 1e3, (median * 1e3).toFixed(2), (p90 * 1e3).toFixed(2), onP, unpicked, truth.toFixed(1), got?.toFixed(1) ?? '-', got === undefined ? '-' : ((100 * (got - truth)) / truth).toFixed(1), trueClasses.join(','), gotClasses.join(',')].join(' | '));
}
totals.errors.sort((a, b) => a - b);
const vsErr = [...totals.vs30].sort((a, b) => a - b);
console.log(`\nall: ${totals.errors.length} picks of ${totals.traces} traces, median error ${(totals.errors[totals.errors.length >> 1] * 1e3).toFixed(3)} ms, 90th percentile ${(totals.errors[Math.floor(0.9 * (totals.errors.length - 1))] * 1e3).toFixed(2)} ms, on P ${totals.onP}, unpicked ${totals.unpicked}; Vs30 error median ${(100 * vsErr[vsErr.length >> 1]).toFixed(1)} %, worst ${(100 * vsErr[vsErr.length - 1]).toFixed(1)} %, within 5 % on ${vsErr.filter((e) => e <= 0.05).length} of ${count} lines (${count - vsErr.length} without Vs30); classes matching ${totals.match} of ${totals.classes}`);
