import { minOf } from '../core/extent.js';
import type { ModelGeometry, ModelPick, TimeTermModel } from './timeTerms.js';
import { interpolationWeights } from './timeTerms.js';


/** The time terms every pick can use: each receiver's and source's on each refractor (NaN where none can be given). */
export interface FilledTimeTerms {
  receivers: Float64Array[];
  sources: Float64Array[];
}

/**
 * Time terms for prediction: a receiver without its own time term on a refractor takes the one
 * interpolated between its neighbours (the end value beyond them); a source without one takes the
 * receiver time term at its position when it lies within 1.5 spacings of the receivers that have
 * one (Willmore & Bancroft 1960: a shot at a station has the station's time term); otherwise none.
 */
export function fillTimeTerms(model: TimeTermModel, geometry: ModelGeometry): FilledTimeTerms {
  const receivers = model.receiverDelays.map((delays) => Float64Array.from(geometry.receiverXs, (x, r) => (Number.isNaN(delays[r]) ? delayAt(delays, geometry.receiverXs, x, Infinity) ?? NaN : delays[r])));
  const sources = model.sourceDelays.map((delays, k) => Float64Array.from(geometry.sourceXs, (x, s) => (Number.isNaN(delays[s]) ? delayAt(model.receiverDelays[k], geometry.receiverXs, x, 1.5 * geometry.spacing) ?? NaN : delays[s])));
  return { receivers, sources };
}

/**
 * The model time of a pick on one arrival: the direct wave d / V₁, or on refractor k
 * aₛₖ + bᵣₖ + |xᵣ − xₛ| / Vₖ₊₁ (Willmore & Bancroft 1960), with the time terms of fillTimeTerms.
 *
 * @param arrival - 0 for the direct wave, k for refractor k
 * @returns seconds, or undefined where the arrival cannot be predicted
 */
export function arrivalTime(model: TimeTermModel, filled: FilledTimeTerms, pick: ModelPick, arrival: number): number | undefined {
  if (arrival === 0) return pick.distance * model.slowness[0];
  const time = filled.sources[arrival - 1][pick.source] + filled.receivers[arrival - 1][pick.receiver] + pick.offset * model.slowness[arrival];
  return Number.isNaN(time) ? undefined : time;
}

/**
 * A receiver time term at x: linear between the receivers that have one, their end value up to
 * `reach` metres beyond them.
 */
function delayAt(delays: Float64Array, xs: number[], x: number, reach: number): number | undefined {
  const at: number[] = [];
  const values: number[] = [];
  for (let i = 0; i < delays.length; i++) {
    if (Number.isNaN(delays[i])) continue;
    at.push(xs[i]);
    values.push(delays[i]);
  }
  if (at.length === 0) return undefined;
  if (x < at[0]) return at[0] - x <= reach ? values[0] : undefined;
  if (x > at[at.length - 1]) return x - at[at.length - 1] <= reach ? values[values.length - 1] : undefined;
  const weights = interpolationWeights(at, x, Infinity)!;
  return weights.reduce((sum, [j, w]) => sum + w * values[j], 0);
}

/**
 * Reassigns the picks of one branch (a source and a side, in order of offset) to arrivals: each
 * pick is the first arrival, so it belongs to the arrival the model predicts earliest. Along a
 * branch the arrivals must follow the order of the layers (a deeper refractor, once first, stays
 * first on a section of layers faster with depth), so the labels are chosen non-decreasing with
 * offset by dynamic programming, at least cost Σ ((tⱼ − t_min) / σ)² over the picks, tⱼ the model
 * time of the chosen arrival and t_min the earliest one, less 1 for the pick's current arrival.
 * (A residual term, ((t − tⱼ) / σ)², was tried and made no line of the sweep better.)
 *
 * @param order - indices of the branch's picks in order of offset
 * @param fixed - picks whose arrival may not change (the zero-offset pick: the direct wave)
 * @returns the arrival of each of the branch's picks, in the order given
 */
export function reassignBranch(
  model: TimeTermModel, filled: FilledTimeTerms, picks: ModelPick[], order: number[], current: Int8Array, sigma: number, fixed: (i: number) => boolean,
): number[] {
  const arrivals = model.refractors + 1;
  const cost = order.map((i) => {
    const times = Array.from({ length: arrivals }, (_, j) => arrivalTime(model, filled, picks[i], j) ?? Infinity);
    if (fixed(i)) return times.map((_, j) => (j === current[i] ? 0 : Infinity));
    const least = minOf(times);
    // A pick leaves its arrival only when another is predicted earlier by more than σ: within the
    // noise both explain it, and moving it would only chase the noise.
    return times.map((t, j) => (Number.isFinite(t) ? Math.max(0, ((t - least) / sigma) ** 2 - (j === current[i] ? 1 : 0)) : Infinity));
  });
  const n = order.length;
  const best: Float64Array[] = cost.map(() => new Float64Array(arrivals).fill(Infinity));
  const from: Int8Array[] = cost.map(() => new Int8Array(arrivals).fill(-1));
  for (let j = 0; j < arrivals; j++) best[0][j] = cost[0][j];
  for (let p = 1; p < n; p++) {
    let runningBest = Infinity;
    let runningFrom = -1;
    for (let j = 0; j < arrivals; j++) {
      if (best[p - 1][j] < runningBest) { runningBest = best[p - 1][j]; runningFrom = j; }
      best[p][j] = runningBest + cost[p][j];
      from[p][j] = runningFrom;
    }
  }
  let label = 0;
  for (let j = 1; j < arrivals; j++) if (best[n - 1][j] < best[n - 1][label]) label = j;
  const labels = new Array<number>(n);
  for (let p = n - 1; p >= 0; p--) {
    labels[p] = label;
    if (p > 0) label = from[p][label];
  }
  // A branch with no finite labelling (an arrival nobody predicts) keeps its labels.
  if (!Number.isFinite(best[n - 1][labels[n - 1]])) return order.map((i) => current[i]);
  return labels;
}
