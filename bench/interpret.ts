/**
 * Benchmark: interpret() on a generated 96-channel line with 25 sources, with the layered
 * inversion on, against the floor of a plain single least-squares line pass over the same picks,
 * measured in the same run; and the time of each stage (fitting, depths, inversion, forward check,
 * site). Targets: the interpretation without the inversion under 50 ms (issue 2); with the
 * inversion at most 500 ms per line on one core (issue 8). Run: npm run bench
 */
import { medianTime } from './timing.js';
import { SimpleLinearRegression } from 'ml-regression';
import { WarningLog } from '../src/core/warnings.js';
import { linearAt } from '../src/core/interpolate.js';
import { splitBranches } from '../src/fit/branches.js';
import { fitLine } from '../src/fit/fitLine.js';
import { forwardCheck } from '../src/forward/forwardCheck.js';
import { readFirstBreaks } from '../src/io/firstBreaksCsv.js';
import { interpret, receiverGround, receiverSpacing } from '../src/interpret.js';
import { refineByInversion } from '../src/model/refineByInversion.js';
import { siteInputFromInterpretation } from '../src/site/fromInterpretation.js';
import { assessSite } from '../src/site/siteAssessment.js';
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

/** Median processor time of a function, in ms, over `repeats` runs after three warm-up runs: on a shared machine it is closer to one core's time than the wall clock. */
function medianCpu(run: () => unknown, repeats: number): number {
  for (let i = 0; i < 3; i++) run();
  const samples: number[] = [];
  for (let i = 0; i < repeats; i++) {
    const start = process.cpuUsage();
    run();
    const used = process.cpuUsage(start);
    samples.push((used.user + used.system) / 1000);
  }
  samples.sort((a, b) => a - b);
  return samples[samples.length >> 1];
}

const picks = table.picks.length;
const full = medianTime(`interpret() with the inversion on ${picks} picks (96 channels, 25 sources)`, () => interpret(table, {}, new WarningLog()), 15);
const off = medianTime('interpret() without the inversion', () => interpret(table, { inversion: false }, new WarningLog()), 15);
const base = medianTime('floor: one least-squares line per source', floor, 200);

// Stages, each timed on its own over the same line.
const spacing = receiverSpacing(table);
const fitting = medianTime('  stage: branches and fitting (fitLine)', () => fitLine(splitBranches(table.picks, new WarningLog(), { file: 'bench.csv' }), {}, 'bench.csv', spacing, 'P'), 15);
const start = interpret(table, { inversion: false }, new WarningLog());
const usable = start.layers.slice(0, start.refractors.length + 1);
const inversionRuns: number[] = [];
for (let i = 0; i < 12; i++) {
  // Fresh copies each run: the inversion replaces the profiles and velocities it is given.
  const refractors = structuredClone(start.refractors);
  const layers = structuredClone(usable);
  const t0 = performance.now();
  refineByInversion({ fits: start.fits, layers, refractors, receivers: receiverGround(table), spacing, wave: 'P' }, {}, new WarningLog());
  if (i >= 2) inversionRuns.push(performance.now() - t0);
}
inversionRuns.sort((a, b) => a - b);
const inversion = inversionRuns[inversionRuns.length >> 1];
process.stdout.write(`  stage: layered inversion: median ${inversion.toFixed(3)} ms, over ${inversionRuns.length} runs\n`);
const result = interpret(table, {}, new WarningLog());
const ground = (x: number) => linearAt(receivers, receivers.map(() => 100), x);
const forward = medianTime('  stage: forward check', () => forwardCheck(result.fits, result.layers.slice(0, result.refractors.length + 1), result.refractors, ground, spacing), 30);
const siteInput = siteInputFromInterpretation(result, receivers, { poisson: [0.3] })!;
const site = medianTime('  stage: site (Vs30 and classes, 4000 draws; P line given a Poisson ratio)', () => assessSite(siteInput), 15);
const depths = off - fitting - forward;
process.stdout.write(`  stage: layers, depth methods and checks (by difference): ${depths.toFixed(1)} ms\n`);
process.stdout.write(`inversion on: ${result.inversion?.iterations} iterations, RMS ${(result.inversion!.rmsBefore! * 1e3).toFixed(3)} -> ${(result.inversion!.rmsAfter! * 1e3).toFixed(3)} ms, kept ${result.inversion?.kept}\n`);
process.stdout.write(`total with the inversion ${full.toFixed(1)} ms (${(inversion / full * 100).toFixed(0)} % in the inversion); without ${off.toFixed(1)} ms\n`);
const fullCpu = medianCpu(() => interpret(table, {}, new WarningLog()), 9);
const offCpu = medianCpu(() => interpret(table, { inversion: false }, new WarningLog()), 9);
process.stdout.write(`processor time (all threads of this process, including the collector's): ${fullCpu.toFixed(1)} ms with the inversion, ${offCpu.toFixed(1)} ms without\n`);
process.stdout.write(`ratio interpret / floor: ${(full / base).toFixed(1)} with the inversion, ${(off / base).toFixed(1)} without; with / without the inversion: ${(full / off).toFixed(2)}\n`);
process.stdout.write(`target: interpret without the inversion under 50 ms: ${off < 50 ? 'met' : 'NOT met'} (${off.toFixed(1)} ms)\n`);
process.stdout.write(`target: interpret with the inversion at most 500 ms on one core: ${full <= 500 ? 'met' : 'NOT met'} by the wall clock (${full.toFixed(1)} ms), ${fullCpu <= 500 ? 'met' : 'NOT met'} by processor time (${fullCpu.toFixed(1)} ms); the site stage, ${site.toFixed(1)} ms, runs only when a site class is asked for\n`);
