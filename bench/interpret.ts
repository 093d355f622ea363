/**
 * Benchmark: interpret() on a generated 96-channel line with 25 sources, with the layered
 * inversion on, against the floor of a plain single least-squares line pass over the same picks,
 * measured in the same run; and the time of each stage of interpret(), each run on its own from
 * the inputs interpret() gives it, so that what the stages leave unexplained is small. Target:
 * with the inversion at most 500 ms per line on one core. Run: npm run bench
 */
import { SimpleLinearRegression } from 'ml-regression';
import { WarningLog } from '../src/core/warnings.js';
import { checkLayerCautions, checkShearTopLayer } from '../src/core/cautions.js';
import { interceptTimeDepths } from '../src/depth/interceptTime.js';
import { refractorProfiles } from '../src/depth/profiles.js';
import { reciprocalChecks } from '../src/depth/reciprocal.js';
import { splitBranches } from '../src/fit/branches.js';
import { fitLine } from '../src/fit/fitLine.js';
import { assignLayers, layerVelocities } from '../src/fit/layers.js';
import { forwardCheck } from '../src/forward/forwardCheck.js';
import { readFirstBreaks } from '../src/io/firstBreaksCsv.js';
import { interpret, lineFitRms, receiverGround, receiverSpacing, usableLayers } from '../src/interpret.js';
import { jointModel } from '../src/model/jointModel.js';
import { pickNoise } from '../src/model/pickNoise.js';
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

interface Timing { wall: number; cpu: number }

/**
 * Median wall and processor time of `run`, in ms, over `repeats` runs after three warm-up runs;
 * `setup` (not timed) makes fresh inputs for each run, for stages that change what they are given.
 * Processor time counts every thread of the process (the collector's too): on a shared machine it
 * is closer to one core's time than the wall clock.
 */
function measure<T>(label: string, setup: () => T, run: (input: T) => unknown, repeats: number): Timing {
  for (let i = 0; i < 3; i++) run(setup());
  const walls: number[] = [];
  const cpus: number[] = [];
  for (let i = 0; i < repeats; i++) {
    const input = setup();
    const cpu = process.cpuUsage();
    const start = performance.now();
    run(input);
    walls.push(performance.now() - start);
    const used = process.cpuUsage(cpu);
    cpus.push((used.user + used.system) / 1000);
  }
  const median = (a: number[]) => a.sort((x, y) => x - y)[a.length >> 1];
  const timing = { wall: median(walls), cpu: median(cpus) };
  process.stdout.write(`${label.padEnd(58)} wall ${timing.wall.toFixed(1).padStart(7)} ms, processor ${timing.cpu.toFixed(1).padStart(7)} ms (median of ${repeats})\n`);
  return timing;
}
const none = () => undefined;

const picks = table.picks.length;
process.stdout.write(`interpret() on ${picks} picks (96 channels, 25 sources); load average ${(await import('node:os')).loadavg().map((l) => l.toFixed(2)).join(' ')}\n`);
// Warm-up: the first dozen runs are up to half again slower (compilation, heap growth).
for (let i = 0; i < 12; i++) interpret(table, {}, new WarningLog());
const full = measure('interpret() with the inversion', none, () => interpret(table, {}, new WarningLog()), 15);
const off = measure('interpret() without the inversion', none, () => interpret(table, { inversion: false }, new WarningLog()), 15);
const base = measure('floor: one least-squares line per source', none, floor, 200);

// Each stage of interpret() in its order, from the inputs interpret() gives it.
const log = () => new WarningLog();
const spacing = receiverSpacing(table);
const stages: [string, Timing][] = [];
const stage = <T>(label: string, setup: () => T, run: (input: T) => unknown, repeats = 15) => stages.push([label, measure(`  stage: ${label}`, setup, run, repeats)]);
const branches = splitBranches(table.picks, log(), { file: table.file });
stage('branches (splitBranches)', none, () => splitBranches(table.picks, log(), { file: table.file }));
const { fits: segmentFits } = fitLine(branches, {}, table.file, spacing, 'P');
stage('segmented regression (fitLine)', none, () => fitLine(branches, {}, table.file, spacing, 'P'));
// assignLayers renumbers the segments' layers in place: a fresh copy each run.
stage('layer assignment (assignLayers)', () => structuredClone(segmentFits), (fits) => assignLayers(fits, spacing, log()));
assignLayers(segmentFits, spacing, log());
const joint = jointModel(segmentFits, spacing)!;
stage('joint time-term model (jointModel)', none, () => jointModel(segmentFits, spacing));
const fits = joint.fits;
const layers = layerVelocities(fits, joint.refractors + 1, log());
stage('layer velocities and cautions', none, () => {
  const w = log();
  const l = layerVelocities(fits, joint.refractors + 1, w);
  checkLayerCautions(l, 'P', w);
  checkShearTopLayer(l, 'P', w);
});
const usable = usableLayers(layers);
const intercept = interceptTimeDepths(fits, usable, log());
const lineRms = lineFitRms(segmentFits);
const ground = receiverGround(table);
stage('intercept times, reciprocal times', none, () => {
  interceptTimeDepths(fits, usable, log());
  reciprocalChecks(fits, lineFitRms(segmentFits), log());
  receiverGround(table);
});
const profileInput = { fits, layers: usable, interceptPoints: intercept, receivers: ground, spacing, pickNoise: lineRms };
const reciprocal = reciprocalChecks(fits, lineRms, log());
const noiseSigma = pickNoise(fits, spacing, reciprocal.map((c) => c.timeAB - c.timeBA), lineRms, []).sigma;
const refractors = refractorProfiles(profileInput, log());
stage('depth methods (plus-minus, GRM, delay-time)', none, () => refractorProfiles(profileInput, log()));
// The inversion replaces the profiles and velocities it is given: fresh copies each run.
stage('layered inversion (refineByInversion)', () => ({ refractors: structuredClone(refractors), layers: structuredClone(usable) }),
  (input) => refineByInversion({ fits, layers: input.layers, refractors: input.refractors, receivers: ground, spacing, wave: 'P', pickNoise: noiseSigma }, {}, log()), 11);
const result = interpret(table, {}, log());
const checked = result.layers.slice(0, result.refractors.length + 1);
stage('forward check', none, () => forwardCheck({ fits: result.fits, layers: checked, refractors: result.refractors, receivers: ground, spacing, timeShift: result.inversion?.kept ? result.inversion.timeShift ?? 0 : 0 }), 30);
stage('pick noise', none, () => pickNoise(fits, spacing, reciprocal.map((c) => c.timeAB - c.timeBA), lineRms, []), 30);

const sum = { wall: 0, cpu: 0 };
for (const [, t] of stages) { sum.wall += t.wall; sum.cpu += t.cpu; }
process.stdout.write(`  the stages together: wall ${sum.wall.toFixed(1)} ms, processor ${sum.cpu.toFixed(1)} ms; the rest (by difference, with the inversion): wall ${(full.wall - sum.wall).toFixed(1)} ms, processor ${(full.cpu - sum.cpu).toFixed(1)} ms\n`);
for (const [label, t] of [...stages].sort((a, b) => b[1].cpu - a[1].cpu).slice(0, 3)) {
  process.stdout.write(`  share of the processor time: ${label} ${(t.cpu / full.cpu * 100).toFixed(0)} %\n`);
}
const siteInput = siteInputFromInterpretation(result, receivers, { poisson: [0.3] })!;
measure('site (Vs30 and classes, 4000 draws; only when asked for)', none, () => assessSite(siteInput), 15);
process.stdout.write(`inversion: ${result.inversion?.iterations} iterations, RMS ${(result.inversion!.rmsBefore! * 1e3).toFixed(3)} -> ${(result.inversion!.rmsAfter! * 1e3).toFixed(3)} ms, kept ${result.inversion?.kept}; joint model: ${joint.iterations} rounds, ${joint.candidates.length} layer counts tried\n`);
process.stdout.write(`ratio interpret / floor (wall): ${(full.wall / base.wall).toFixed(0)} with the inversion, ${(off.wall / base.wall).toFixed(0)} without; with / without the inversion: ${(full.cpu / off.cpu).toFixed(2)} (processor)\n`);
process.stdout.write(`target: interpret with the inversion at most 500 ms on one core: ${full.cpu <= 500 ? 'met' : 'NOT met'} by processor time (${full.cpu.toFixed(1)} ms), ${full.wall <= 500 ? 'met' : 'NOT met'} by the wall clock (${full.wall.toFixed(1)} ms)\n`);
