import { maxOf } from '../core/extent.js';
import { median } from '../core/stats.js';
import type { BranchFit } from '../core/types.js';
import { WarningLog } from '../core/warnings.js';
import { layerVelocities } from '../fit/layers.js';
import { MIN_VELOCITY_CONTRAST } from '../fit/partitionSearch.js';
import { fillTimeTerms, reassignBranch } from './arrivalTimes.js';
import { MIN_TRIPLES, pickNoise } from './pickNoise.js';
import { SMOOTHING_WEIGHT, solveTimeTerms, type ModelGeometry, type ModelPick, type TimeTermModel } from './timeTerms.js';

/** Most reassign-and-refit rounds of one candidate model at each smoothing. */
export const MAX_ITERATIONS = 12;

/**
 * Smoothing weights of the receiver time terms, stage by stage (coarse to fine): with stiff time
 * terms first, no receiver's own time term can bend to take in picks of another arrival, so the
 * assignment settles on the whole line's evidence; the final stage has the model's weight.
 */
export const SMOOTHING_STAGES = [30, SMOOTHING_WEIGHT];

/**
 * A deeper refractor gets depths only with at least this many picks, from at least two sources,
 * seen from both directions, and with ΔBIC of at least BIC_STRONG against the model without it.
 */
export const MIN_REFRACTOR_PICKS = 8;
/** ΔBIC above 10 is "very strong" evidence (Kass & Raftery 1995, J. Am. Stat. Assoc. 90, 773-795, §3.2). */
export const BIC_STRONG = 10;
/** Least pick noise the deepest-refractor test assumes, in seconds (the floor of the reassignment's σ). */
export const MIN_TEST_NOISE = 0.05e-3;

/** One candidate of the layer-count choice. */
export interface CountCandidate {
  refractors: number;
  /** The criterion n ln(rss / n) + 2 p ln ln n, p the slownesses and time terms; undefined when rejected. */
  value?: number;
  rss: number;
  parameters: number;
  iterations: number;
  /** Why the candidate was rejected, when it was. */
  rejected?: string;
}

/** A refractor the joint model sees but whose evidence is too thin for depths. */
export interface PossibleRefractor {
  /** Index it would have (1 = top of layer 2). */
  index: number;
  velocity: number;
  velocitySe: number;
  picks: number;
  sources: string[];
  reversed: boolean;
  /** BIC of the model without it minus the model with it. */
  deltaBic: number;
  /** The tests it failed. */
  failed: string[];
}

export interface JointModel {
  geometry: ModelGeometry;
  /** Source id of each source index of the geometry. */
  sourceIds: string[];
  picks: ModelPick[];
  /** Arrival of each pick (0 = direct wave, k = refractor k). */
  arrival: Int8Array;
  model: TimeTermModel;
  /**
   * Branch fits of the best model with one refractor fewer (its deepest two merged), when the
   * chosen model has two or more refractors with depths: interpret checks the deepest refractor
   * against it through the layered inversion.
   */
  alternative?: BranchFit[];
  /** Refractors that get depths (the model may hold one more, a possible refractor). */
  refractors: number;
  possible: PossibleRefractor[];
  candidates: CountCandidate[];
  /** Reassign-and-refit rounds of the chosen model, and how many picks its last round moved. */
  iterations: number;
  converged: boolean;
  /** Picks whose arrival differs from the per-branch segments' first guess. */
  reassigned: number;
  /** The branches' fits rebuilt on the joint assignment (segments = runs of one arrival). */
  fits: BranchFit[];
  /** For each pick, the fits and pick indices it stands for (a zero-offset pick joins two branches). */
  refs: { fit: number; index: number }[][];
}

interface Candidate {
  model: TimeTermModel;
  arrival: Int8Array;
  iterations: number;
  converged: boolean;
  value: number;
  rejected?: string;
}

/**
 * One model for all shots: every pick on the direct wave or on one refractor, one velocity per
 * layer shared by all shots, and a time term per source and per receiver on each refractor
 * (solveTimeTerms). It starts from the per-branch segments (their layer assignment), then
 * reassigns each pick to the arrival the model predicts first (reassignBranch) and refits, until
 * no pick moves (at most MAX_ITERATIONS rounds).
 *
 * The number of refractors is chosen on this joint model by the information criterion
 * n ln(rss/n) + 2 p ln ln n (Hannan & Quinn 1979; see penalty), p counting every slowness and
 * every time term: a refractor costs its time terms, so a bend of the branches that per-geophone
 * time terms explain (relief) costs more as an extra layer than it saves. Candidates are the
 * segments' count and every count below it, each made by merging the adjacent pair of refractors
 * whose merge fits best (greedily, from the deepest count down). A candidate whose velocities do
 * not increase by MIN_VELOCITY_CONTRAST layer to layer, or that leaves a refractor fewer than 3
 * picks, is rejected.
 *
 * A deepest refractor below the first gets depths only when it has MIN_REFRACTOR_PICKS picks, from
 * two or more sources, seen from both directions, and ΔBIC ≥ BIC_STRONG (BIC = n ln(rss/n) + p ln n,
 * Schwarz 1978, Ann. Stat. 6, 461-464; rss / σ² + p ln n with σ the pick noise from second differences, see bicOf) against the best model without it; otherwise it is a possible refractor (reported with its evidence, no depths).
 *
 * @param fits - per-branch fits whose segments carry layers (assignLayers)
 * @param spacing - receiver spacing, in metres
 * @returns undefined when the segments have no direct wave or no refractor
 */
export function jointModel(fits: BranchFit[], spacing: number, options: { maxRefractors?: number } = {}): JointModel | undefined {
  const { geometry, sourceIds, picks, refs, orders, initial, fixed } = observations(fits, spacing);
  if (!initial.some((a) => a === 0)) return undefined;
  const compacted = compact(initial);
  const top = maxOf(compacted);
  if (top < 1) return undefined;
  const isFixed = (i: number) => fixed[i] === 1;

  const criterion = (model: TimeTermModel) => {
    const n = model.used;
    return n * Math.log(model.rss / n) + model.parameters * penalty(n);
  };
  const solve = (arrival: Int8Array, refractors: number, errors: boolean, smoothing = SMOOTHING_WEIGHT) => {
    const model = solveTimeTerms(geometry, picks, arrival, refractors, { errors: false, smoothing });
    if (model === undefined) return undefined;
    const held = heldSlownesses(arrival, refractors, picks, refs, fits, model);
    if (held.every((h) => h === undefined)) return errors ? solveTimeTerms(geometry, picks, arrival, refractors, { smoothing }) : model;
    return solveTimeTerms(geometry, picks, arrival, refractors, { errors, held, smoothing });
  };

  const run = (start: Int8Array, refractors: number): Candidate => {
    let arrival: Int8Array<ArrayBufferLike> = Int8Array.from(start);
    let iterations = 0;
    let converged = false;
    let bestState: { arrival: Int8Array<ArrayBufferLike>; model: TimeTermModel; value: number } | undefined;
    for (const smoothing of SMOOTHING_STAGES) {
      // The state of least criterion seen at this smoothing: a round that fits worse is not taken.
      bestState = undefined;
      converged = false;
      for (let round = 0; round < MAX_ITERATIONS; round++) {
        iterations++;
        const model = solve(arrival, refractors, false, smoothing);
        if (model === undefined) break;
        const value = criterion(model);
        if (bestState !== undefined && !(value < bestState.value)) break;
        bestState = { arrival, model, value };
        const filled = fillTimeTerms(model, geometry);
        const sigma = Math.max(model.sigma, 0.05e-3);
        const next = Int8Array.from(arrival);
        for (const order of orders) {
          const labels = reassignBranch(model, filled, picks, order, arrival, sigma, isFixed);
          order.forEach((i, p) => { next[i] = labels[p]; });
        }
        let moved = 0;
        for (let i = 0; i < next.length; i++) if (next[i] !== arrival[i]) moved++;
        if (moved === 0) { converged = true; break; }
        arrival = next;
      }
      arrival = bestState!.arrival;
    }
    const final = bestState!.model;
    arrival = bestState!.arrival;
    const counts = new Array(refractors + 1).fill(0);
    for (const a of arrival) if (a >= 0) counts[a]++;
    let rejected: string | undefined;
    const velocities = final.slowness.map((u) => 1 / u);
    const medians = medianOffsets(arrival, refractors, picks);
    for (let k = 1; k <= refractors; k++) {
      if (counts[k] < 3) { rejected = `refractor ${k} keeps ${counts[k]} picks`; break; }
      if (!(velocities[k] >= MIN_VELOCITY_CONTRAST * velocities[k - 1])) { rejected = `layer ${k + 1} (${Math.round(velocities[k])} m/s) is not ${Math.round((MIN_VELOCITY_CONTRAST - 1) * 100)} % faster than layer ${k} (${Math.round(velocities[k - 1])} m/s)`; break; }
    }
    for (let k = 1; k < refractors && rejected === undefined; k++) {
      if (!(medians[k] < medians[k + 1])) rejected = `refractor ${k} arrives first at larger offsets than refractor ${k + 1} (median ${medians[k].toFixed(1)} m against ${medians[k + 1].toFixed(1)} m)`;
    }
    return { model: final, arrival, iterations, converged, value: bestState!.value, rejected };
  };

  // From the segments' count down, merging the adjacent pair whose merge fits best.
  const best = new Map<number, Candidate>();
  best.set(top, run(compacted, top));
  for (let count = top - 1; count >= 1; count--) {
    const from = best.get(count + 1)!;
    let chosen: Candidate | undefined;
    for (let k = 1; k <= count; k++) {
      const merged = Int8Array.from(from.arrival, (a) => (a > k ? a - 1 : a));
      const trial = run(merged, count);
      const better = chosen === undefined
        || (trial.rejected === undefined && (chosen.rejected !== undefined || trial.value < chosen.value))
        || (trial.rejected !== undefined && chosen.rejected !== undefined && trial.value < chosen.value);
      if (better) chosen = trial;
    }
    best.set(count, chosen!);
  }
  // The pick noise measured from the picks themselves (second differences along the branches),
  // when there are enough of them: the count is then chosen with the variance known (countValue).
  const noise = pickNoise(fits, spacing, [], NaN);
  const sigma = noise.secondDifferences !== undefined && noise.secondDifferences.count >= MIN_TRIPLES ? Math.max(noise.sigma, MIN_TEST_NOISE) : undefined;
  const countOf = (c: Candidate) => countValue(c.model, sigma);
  const candidates: CountCandidate[] = [...best.entries()].sort((a, b) => a[0] - b[0]).map(([refractors, c]) => ({
    refractors, value: c.rejected ? undefined : countOf(c), rss: c.model.rss, parameters: c.model.parameters, iterations: c.iterations, ...(c.rejected ? { rejected: c.rejected } : {}),
  }));
  const most = options.maxRefractors ?? Infinity;
  const valid = [...best.entries()].filter(([r, c]) => c.rejected === undefined && r <= most);
  // With every candidate rejected, the one-refractor model stands (its velocities are reported and warned about).
  const [count, chosen] = valid.length > 0 ? valid.reduce((a, b) => (countOf(b[1]) < countOf(a[1]) ? b : a)) : [1, best.get(1)!];

  const final = { ...chosen, model: solve(chosen.arrival, count, true)! };
  const possible: PossibleRefractor[] = [];
  let refractors = count;
  if (count >= 2) {
    const below = best.get(count - 1)!;
    const test = deepestTest(final.model, final.arrival, count, picks, refs, fits, sourceIds, below.rejected === undefined ? bicOf(below.model, sigma) - bicOf(chosen.model, sigma) : Infinity);
    if (test.failed.length > 0) {
      possible.push(test);
      refractors = count - 1;
    }
  }
  let reassigned = 0;
  for (let i = 0; i < initial.length; i++) if (initial[i] !== final.arrival[i]) reassigned++;
  // The best model with one refractor fewer, for the check through the layered inversion (interpret).
  const fewer = refractors === count && count >= 2 ? best.get(count - 1) : undefined;
  const alternative = fewer !== undefined && fewer.rejected === undefined ? rebuildFits(fits, fewer.arrival, refs, fewer.model) : undefined;
  return {
    geometry, sourceIds, picks, arrival: final.arrival, model: final.model, refractors, possible, candidates, alternative,
    iterations: final.iterations, converged: final.converged, reassigned,
    fits: rebuildFits(fits, final.arrival, refs, final.model), refs,
  };
}

/** The evidence for the deepest refractor of a model, and the tests it fails. */
function deepestTest(
  model: TimeTermModel, arrival: Int8Array, k: number, picks: ModelPick[], refs: { fit: number; index: number }[][], fits: BranchFit[], sourceIds: string[], deltaBic: number,
): PossibleRefractor {
  const on = [...arrival.keys()].filter((i) => arrival[i] === k);
  const sources = new Set(on.map((i) => picks[i].source));
  const sides = new Set(on.flatMap((i) => refs[i].map((r) => fits[r.fit].branch.side)));
  const failed: string[] = [];
  if (on.length < MIN_REFRACTOR_PICKS) failed.push(`${on.length} picks, fewer than ${MIN_REFRACTOR_PICKS}`);
  if (sources.size < 2) failed.push('seen from one source only');
  if (sides.size < 2) failed.push('seen from one direction only (unreversed)');
  if (!(deltaBic >= BIC_STRONG)) failed.push(`ΔBIC ${deltaBic.toFixed(1)} against the model without it, below ${BIC_STRONG}`);
  const ids = [...sources].map((s) => sourceIds[s]);
  const se = model.slownessSe[k];
  return { index: k, velocity: 1 / model.slowness[k], velocitySe: se / model.slowness[k] ** 2, picks: on.length, sources: ids, reversed: sides.size === 2, deltaBic, failed };
}

/**
 * Median offset of the picks on each refractor (index 0 unused). Beyond its crossover a deeper
 * refractor's head wave overtakes a shallower one's, so on layers faster with depth the picks of a
 * shallower refractor lie at shorter offsets (Telford et al. 1990, §4.3, crossover distance). The
 * reassignment keeps that order along each branch; across shots it is checked on the medians: a
 * shallower refractor whose picks lie farther out than the deeper one's is the branch of a shot off
 * the end taken apart from the same refractor seen by the shots inside the spread.
 */
function medianOffsets(arrival: Int8Array, refractors: number, picks: ModelPick[]): number[] {
  const offsets: number[][] = Array.from({ length: refractors + 1 }, () => []);
  arrival.forEach((a, i) => { if (a > 0) offsets[a].push(Math.abs(picks[i].offset)); });
  return offsets.map((list) => median(list) ?? NaN);
}

/** Name of the layer-count criterion, as the JSON reports it. */
export const COUNT_CRITERION = 'Hannan-Quinn: rss/σ² + 2 p ln ln n with σ the pick noise from second differences (n ln(rss/n) + 2 p ln ln n where too few), p = slownesses + time terms';

/**
 * The layer-count criterion of a candidate: rss / σ² + 2 p ln ln n with σ the pick noise measured
 * from the picks (second differences along the branches, model/pickNoise.ts), the form of an
 * information criterion with the variance known (Hannan & Quinn 1979; Burnham & Anderson 2002,
 * Model Selection and Multimodel Inference, §2.2 for the known-variance form); without enough
 * triples to measure σ, n ln(rss / n) + 2 p ln ln n. The estimated form takes each candidate's own
 * misfit for the noise: a candidate with one refractor too few on a water-table line (the
 * saturated layer's picks given to the rock) left residuals well above the pick noise, yet its
 * n ln(rss/n) fell by less than the cost of the saturated layer's time terms (seed 37 of
 * test/reference/sweep: three layers found with the known variance, two before).
 */
function countValue(model: { rss: number; used: number; parameters: number }, sigma?: number): number {
  const n = model.used;
  const misfit = sigma === undefined ? n * Math.log(model.rss / n) : model.rss / (sigma * sigma);
  return misfit + model.parameters * penalty(n);
}

/**
 * Penalty per parameter of the layer-count criterion for n picks: 2 ln ln n (Hannan & Quinn 1979,
 * J. R. Stat. Soc. B 41, 190-195), the least penalty that still picks the true order as n grows.
 * BIC's ln n was tried first: a line of three shots has about as many time terms as picks on a
 * refractor, and ln n (5.2 for 186 picks) then refused a real third layer whose model left
 * residuals at the pick noise (measured on forward-model lines, test/reference/sweep).
 */
function penalty(n: number): number {
  return 2 * Math.log(Math.log(n));
}

/**
 * BIC (Schwarz 1978) for the stricter test of a deepest refractor: rss / σ² + p ln n with σ the
 * pick noise measured from the picks themselves (second differences along the branches,
 * model/pickNoise.ts), else n ln(rss/n) + p ln n with the variance estimated from the model.
 * The estimated form takes a model's own misfit for noise: on a stepped or channelled rock head
 * the model without the refractor left residuals twice the pick noise, and its ΔBIC then refused
 * real refractors of 40 to 117 picks from four sources (seeds 28, 36, 60 of the sweep,
 * test/reference/sweep). The one refractor of seeds 1-120 and the 24 lines of
 * test/interpret.realistic.test.ts that the estimated form refused rightly (line 201, a shot off the
 * end on a refractor of its own) the offset order of medianOffsets refuses.
 */
function bicOf(model: { rss: number; used: number; parameters: number }, sigma?: number): number {
  const misfit = sigma === undefined ? model.used * Math.log(model.rss / model.used) : model.rss / (sigma * sigma);
  return misfit + model.parameters * Math.log(model.used);
}

/** Receivers with picks on a refractor from both directions, below which its slowness is held. */
export const MIN_REVERSED_RECEIVERS = 3;

/**
 * Slownesses to hold, by layer: a refractor with fewer than MIN_REVERSED_RECEIVERS receivers
 * recorded from both directions has its slowness from the up-dip and down-dip apparent
 * velocities of its segments (Telford et al. 1990, §4.3; layerVelocities), as cos δ / V.
 */
function heldSlownesses(arrival: Int8Array, refractors: number, picks: ModelPick[], refs: { fit: number; index: number }[][], fits: BranchFit[], model: TimeTermModel): ({ slowness: number; se: number } | undefined)[] {
  const held: ({ slowness: number; se: number } | undefined)[] = new Array(refractors + 1).fill(undefined);
  let weak = false;
  const sides: Map<number, Set<string>>[] = Array.from({ length: refractors + 1 }, () => new Map());
  arrival.forEach((a, i) => {
    if (a <= 0) return;
    const r = picks[i].receiver;
    if (!sides[a].has(r)) sides[a].set(r, new Set());
    for (const ref of refs[i]) sides[a].get(r)!.add(fits[ref.fit].branch.side);
  });
  const weakLayers: number[] = [];
  for (let k = 1; k <= refractors; k++) {
    const reversed = [...sides[k].values()].filter((s) => s.size === 2).length;
    if (reversed < MIN_REVERSED_RECEIVERS) { weak = true; weakLayers.push(k); }
  }
  if (!weak) return held;
  const segmentLayers = layerVelocities(rebuildFits(fits, arrival, refs, model), refractors + 1, new WarningLog());
  for (const k of weakLayers) {
    const layer = segmentLayers.find((l) => l.index === k + 1);
    if (layer === undefined || !layer.reversed || !Number.isFinite(layer.velocity)) continue;
    const cosine = Math.cos(((layer.dipDeg ?? 0) * Math.PI) / 180);
    held[k] = { slowness: cosine / layer.velocity, se: (cosine * layer.velocitySe) / layer.velocity ** 2 };
  }
  return held;
}

/** Renumbers arrivals so that the refractors present are 1, 2, … in order. */
function compact(arrival: Int8Array): Int8Array {
  const present = [...new Set(arrival)].filter((a) => a > 0).sort((a, b) => a - b);
  const map = new Map(present.map((a, i) => [a, i + 1]));
  return Int8Array.from(arrival, (a) => (a > 0 ? map.get(a)! : a));
}

/**
 * The picks of the fits as the joint model's observations (outliers left out; a zero-offset pick
 * that joins both branches of its source counted once), with the segments' arrivals as the first
 * guess and each branch's picks in order of offset.
 */
function observations(fits: BranchFit[], spacing: number) {
  const sourceKey = (f: BranchFit) => f.branch.sourceId;
  const sourceIds = [...new Set(fits.map(sourceKey))];
  const sourceXs = sourceIds.map((id) => fits.find((f) => f.branch.sourceId === id)!.branch.sourceX);
  const receiverXs = [...new Set(fits.flatMap((f) => f.branch.picks.map((p) => p.receiverX)))].sort((a, b) => a - b);
  const receiverIndex = new Map(receiverXs.map((x, i) => [x, i]));
  const picks: ModelPick[] = [];
  const refs: { fit: number; index: number }[][] = [];
  const initialList: number[] = [];
  const fixedList: number[] = [];
  const orders: number[][] = [];
  const byRow = new Map<number, number>();
  fits.forEach((f, fi) => {
    const outliers = new Set(f.outlierRows);
    const order: number[] = [];
    const source = sourceIds.indexOf(f.branch.sourceId);
    f.branch.picks.forEach((p, index) => {
      if (outliers.has(p.row)) return;
      const segment = f.segments.find((s) => index >= s.start && index < s.end);
      if (segment === undefined) return;
      let i = byRow.get(p.row);
      if (i === undefined) {
        i = picks.length;
        byRow.set(p.row, i);
        picks.push({ source, receiver: receiverIndex.get(p.receiverX)!, offset: f.branch.offsets[index], distance: f.branch.distances[index], time: p.time });
        refs.push([]);
        const zero = f.branch.offsets[index] === 0;
        initialList.push(zero ? 0 : segment.layer - 1);
        fixedList.push(zero ? 1 : 0);
      }
      refs[i].push({ fit: fi, index });
      order.push(i);
    });
    if (order.length > 0) orders.push(order);
  });
  return {
    geometry: { sourceXs, receiverXs, spacing } as ModelGeometry,
    sourceIds,
    picks, refs, orders,
    initial: Int8Array.from(initialList),
    fixed: Int8Array.from(fixedList),
  };
}

/**
 * The fits rebuilt on the joint assignment (a branch whose picks all keep their arrival keeps its
 * fit): each changed branch's segments are its runs of one arrival
 * (layer = arrival + 1), each with its own least-squares line (slope and intercept with standard
 * errors from the branch's joint-model residual deviation), so the depth methods and the
 * travel-time plot read the joint model's assignment.
 */
function rebuildFits(fits: BranchFit[], arrival: Int8Array, refs: { fit: number; index: number }[][], model: TimeTermModel): BranchFit[] {
  const labelOf = fits.map((f) => new Int16Array(f.branch.picks.length).fill(-1));
  const residualSquares = fits.map(() => ({ sum: 0, n: 0 }));
  refs.forEach((list, i) => {
    for (const { fit, index } of list) {
      labelOf[fit][index] = arrival[i];
      if (Number.isFinite(model.residuals[i])) {
        residualSquares[fit].sum += model.residuals[i] ** 2;
        residualSquares[fit].n++;
      }
    }
  });
  return fits.map((f, fi) => {
    const labels = labelOf[fi];
    // A branch whose picks keep the segments' arrivals keeps its segments (and their hinge fits).
    const unchanged = f.branch.picks.every((_, i) => labels[i] < 0 || f.segments.some((s) => i >= s.start && i < s.end && s.layer === labels[i] + 1));
    if (unchanged) return f;
    // Outliers (no label) take the label of the pick before them, or after them at the start.
    for (let i = 0; i < labels.length; i++) if (labels[i] < 0 && i > 0) labels[i] = labels[i - 1];
    for (let i = labels.length - 1; i >= 0; i--) if (labels[i] < 0 && i + 1 < labels.length) labels[i] = labels[i + 1];
    const { sum, n } = residualSquares[fi];
    const residualSd = n > 2 ? Math.sqrt(sum / (n - 2)) : model.sigma;
    const outliers = new Set(f.outlierRows);
    const segments: BranchFit['segments'] = [];
    let start = 0;
    for (let i = 1; i <= labels.length; i++) {
      if (i < labels.length && labels[i] === labels[start]) continue;
      if (labels[start] >= 0) segments.push(segmentOf(f, start, i, labels[start], outliers, residualSd, model, segments.length + 1));
      start = i;
    }
    for (let s = 1; s < segments.length; s++) {
      const a = segments[s - 1];
      const b = segments[s];
      if (a.slowness !== b.slowness) b.crossoverOffset = (b.intercept - a.intercept) / (a.slowness - b.slowness);
    }
    return { ...f, segments, residualSd };
  });
}

function segmentOf(f: BranchFit, start: number, end: number, arrival: number, outliers: Set<number>, sd: number, model: TimeTermModel, order: number): BranchFit['segments'][number] {
  const xs: number[] = [];
  const ts: number[] = [];
  for (let i = start; i < end; i++) {
    if (outliers.has(f.branch.picks[i].row)) continue;
    xs.push(f.branch.offsets[i]);
    ts.push(f.branch.times[i]);
  }
  const n = xs.length;
  const meanX = xs.reduce((a, b) => a + b, 0) / Math.max(1, n);
  const meanT = ts.reduce((a, b) => a + b, 0) / Math.max(1, n);
  const sxx = xs.reduce((a, x) => a + (x - meanX) ** 2, 0);
  let slowness: number;
  let slownessSe: number;
  let intercept: number;
  let interceptSe: number;
  if (arrival === 0) {
    // The direct wave passes through the origin (the joint model's direct wave, d / V₁).
    const sxt = xs.reduce((a, x, i) => a + x * ts[i], 0);
    const sx2 = xs.reduce((a, x) => a + x * x, 0);
    slowness = sx2 > 0 ? sxt / sx2 : model.slowness[0];
    slownessSe = sx2 > 0 ? sd / Math.sqrt(sx2) : model.slownessSe[0];
    intercept = 0;
    interceptSe = 0;
  } else if (n >= 3 && sxx > 0) {
    slowness = xs.reduce((a, x, i) => a + (x - meanX) * (ts[i] - meanT), 0) / sxx;
    slownessSe = sd / Math.sqrt(sxx);
    intercept = meanT - slowness * meanX;
    interceptSe = sd * Math.sqrt(1 / n + (meanX * meanX) / sxx);
  } else {
    // Too few picks for a line of their own: the layer's slowness, the intercept through their mean.
    slowness = model.slowness[arrival];
    slownessSe = model.slownessSe[arrival];
    intercept = meanT - slowness * meanX;
    interceptSe = sd / Math.sqrt(Math.max(1, n));
  }
  return {
    order, layer: arrival + 1, start, end,
    firstOffset: f.branch.offsets[start], lastOffset: f.branch.offsets[end - 1],
    slowness, slownessSe, intercept, interceptSe, apparentVelocity: 1 / slowness, used: n, throughOrigin: arrival === 0,
  };
}
