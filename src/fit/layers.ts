import { SimpleLinearRegression } from 'ml-regression';
import { propagate } from '../core/propagate.js';
import { median, weightedMean } from '../core/stats.js';
import { startsAtSource } from './branches.js';
import { solveInterface, type PlaneInterface } from './dippingLayers.js';
import type { BranchFit, Layer, Segment } from '../core/types.js';
import type { WarningLog } from '../core/warnings.js';
import { maxOf, minOf, pushAll } from '../core/extent.js';
import { len, si } from '../core/siText.js';

/**
 * A segment whose apparent velocity differs from the median of its layer by more than this factor
 * is reported: dips of 10 to 15 degrees give up- and down-dip apparent velocities within about this
 * ratio of the true one for usual velocity contrasts (common practice).
 */
const CONSISTENCY_RATIO = 1.4;

/**
 * Intercept time above which a first segment is not the direct wave: a direct wave passes through
 * the origin, give or take a trigger delay of a millisecond or so (common practice), while a head
 * wave's intercept is twice the delay time to the refractor, several milliseconds for any
 * refractor a metre or more down.
 */
const DIRECT_INTERCEPT_LIMIT = 3e-3;

/** A segment faster than the deepest layer seen near the sources by this factor starts a new layer. */
const NEW_LAYER_RATIO = 1.25;

/**
 * Assigns each branch segment to a layer. Branches whose first pick is near their source see the
 * direct wave, so their segment k is layer k. Branches from sources off the ends start on a deeper
 * layer: their segments are matched, in order, to the layer whose median slowness they are
 * closest to (in ratio) among branches on the same side (up-dip and down-dip apparent velocities
 * differ). Segments far from their layer's median on their side are warned about.
 *
 * @param spacing - receiver spacing, in metres, to judge "near the source"
 * @returns the number of layers
 */
export function assignLayers(fits: BranchFit[], spacing: number, warnings: WarningLog): number {
  const near = (fit: BranchFit) => startsAtSource(fit.branch, spacing);
  // A near-source branch whose first segment does not start near time zero has no direct-wave
  // segment (too few picks before the crossover): its segments are refracted from the first.
  const headFirst = (fit: BranchFit) => {
    const first = fit.segments[0];
    return first.intercept > Math.max(DIRECT_INTERCEPT_LIMIT, 5 * first.interceptSe);
  };
  const reference = fits.filter((f) => near(f) && !headFirst(f));
  const lacking = fits.filter((f) => near(f) && headFirst(f));
  if (reference.length === 0 && lacking.length > 0) {
    for (const f of fits) for (const segment of f.segments) segment.layer += 1;
    warnings.add('no-direct-wave',
      `no branch starting at its source has a direct-wave segment: every first segment starts well after time zero (intercepts ${lacking.map((f) => (f.segments[0].intercept * 1e3).toFixed(1)).join(', ')} ms), so the top-layer velocity is unknown and no depth can be computed. Pick geophones closer to the sources (at least three before the crossover distance)`,
      { layer: 1 });
    return maxOf(fits.map((f) => f.segments.length)) + 1;
  }
  for (const f of lacking) {
    for (const segment of f.segments) segment.layer += 1;
    warnings.add('direct-wave-unsampled',
      `${f.branch.sourceId}:${f.branch.side} branch starts with a segment of intercept ${(f.segments[0].intercept * 1e3).toFixed(1)} ms, not a direct wave (too few picks before the crossover); its segments are taken as refracted from the first`);
  }
  const base = reference.length > 0 ? reference : fits;
  let layerCount = maxOf(base.map((f) => f.segments.length));
  // Up-dip and down-dip apparent velocities differ, so each side is matched against its own side.
  const medianSlowness = (members: BranchFit[], k: number) =>
    median(members.flatMap((f) => f.segments.filter((s) => s.layer === k).map((s) => s.slowness)));
  for (const fit of fits) {
    if (base.includes(fit) || lacking.includes(fit)) continue;
    const sameSide = base.filter((f) => f.branch.side === fit.branch.side);
    const references = sameSide.length > 0 ? sameSide : base;
    const layerSlowness: number[] = [];
    let known = 0;
    for (let k = 1; k <= layerCount; k++) {
      const m = medianSlowness(references, k) ?? medianSlowness(base, k);
      if (m === undefined) break;
      layerSlowness[k] = m;
      known = k;
    }
    const layers = matchInOrder(fit.segments.map((s) => s.slowness), layerSlowness, known);
    fit.segments.forEach((s, i) => { s.layer = layers[i]; });
    layerCount = Math.max(layerCount, maxOf(layers));
  }
  for (let k = 1; k <= layerCount; k++) {
    for (const side of ['forward', 'reverse'] as const) {
      const members = fits.filter((f) => f.branch.side === side).flatMap((f) => f.segments.filter((s) => s.layer === k).map((s) => ({ f, s })));
      const mid = median(members.map((m) => m.s.slowness));
      if (mid === undefined) continue;
      for (const { f, s } of members) {
        const ratio = s.slowness / mid;
        // Only a significant departure: a short segment's slope is too uncertain to accuse.
        const significant = Math.abs(s.slowness - mid) > 3 * s.slownessSe;
        if (significant && (ratio > CONSISTENCY_RATIO || ratio < 1 / CONSISTENCY_RATIO)) {
          warnings.add('layer-consistency',
            `${f.branch.sourceId}:${f.branch.side} segment ${s.order} (apparent velocity ${Math.round(s.apparentVelocity)} m/s) is assigned to layer ${k}, whose median apparent velocity on ${side} branches is ${Math.round(1 / mid)} m/s; check the picks or fix the branch's segments`,
            { layer: k });
        }
      }
    }
  }
  return layerCount;
}

/**
 * Matches segment slownesses, in order, to strictly increasing layer numbers so that the sum of
 * |ln(segment / layer)| is least; a layer below the deepest known one costs ln(NEW_LAYER_RATIO).
 */
function matchInOrder(slowness: number[], layerSlowness: number[], layerCount: number): number[] {
  const layers = layerCount + slowness.length;
  const cost = (i: number, k: number) => (k <= layerCount
    ? Math.abs(Math.log(slowness[i] / layerSlowness[k]))
    // A new layer costs less than the deepest known one only beyond NEW_LAYER_RATIO faster than it.
    : Math.max(0, 2 * Math.log(NEW_LAYER_RATIO) - Math.log(layerSlowness[layerCount] / slowness[i])) + 10 * (k - layerCount - 1));
  // best[i][k]: least cost of the first i+1 segments with segment i on layer k.
  const best: number[][] = slowness.map(() => new Array(layers + 1).fill(Infinity));
  const from: number[][] = slowness.map(() => new Array(layers + 1).fill(-1));
  for (let k = 1; k <= layers; k++) best[0][k] = cost(0, k);
  for (let i = 1; i < slowness.length; i++) {
    for (let k = 1; k <= layers; k++) {
      for (let j = 1; j < k; j++) {
        const c = best[i - 1][j] + cost(i, k);
        if (c < best[i][k]) { best[i][k] = c; from[i][k] = j; }
      }
    }
  }
  const last = slowness.length - 1;
  let k = 1;
  for (let j = 1; j <= layers; j++) if (best[last][j] < best[last][k]) k = j;
  const result: number[] = [];
  for (let i = last; i >= 0; i--) {
    result.unshift(k);
    k = from[i][k];
  }
  return result;
}

/**
 * Layer velocities from the assigned segments.
 *
 * Layer 1 (the direct wave): the travel-time slope against straight-line source-receiver distance
 * over all direct-wave picks, branch by branch, combined by inverse-variance weighting.
 *
 * Deeper layers: the true velocity and dip of each refractor from the mean forward and reverse
 * apparent slownesses sf and sr of its head waves, by the recursion of Johnson (1976) for plane
 * dipping layers that need not be parallel (see dippingLayers.ts): the rays are traced down from
 * the ground through the refractors above, already solved, to the critical angle at this one.
 * For the first refractor this is Telford, Geldart & Sheriff (1990), §4.3:
 * θ = ½[asin(V1·sf) + asin(V1·sr)], δ = ½[asin(V1·sf) − asin(V1·sr)], V = V1 / sin θ.
 * δ is positive when the refractor deepens towards +x. Standard errors by the delta method over
 * V1 and every apparent slowness the recursion uses. A layer seen from one side only keeps its
 * apparent velocity, with a warning, and is taken as flat-topped by the layers below it.
 */
export function layerVelocities(fits: BranchFit[], layerCount: number, warnings: WarningLog): Layer[] {
  const layers: Layer[] = [];
  const directSegments = fits.flatMap((f) => f.segments.filter((s) => s.layer === 1).map((s) => ({ f, s })));
  // Where the direct-wave lines pass through the origin within their errors, the origin is data
  // too (the shot is at time zero): their slopes are refitted through it, which steadies V1 from
  // the few picks a thin top layer leaves (common practice).
  const meanIntercept = weightedMean(directSegments.map(({ s }) => s.intercept), directSegments.map(({ s }) => s.interceptSe));
  const throughOrigin = meanIntercept !== undefined && Math.abs(meanIntercept.mean) < Math.max(2 * meanIntercept.se, 0.2e-3);
  const direct = directSegments.map(({ f, s }) => (throughOrigin ? originSlowness(f, s) : directSlowness(f, s)));
  const directPicks = median(directSegments.map(({ s }) => s.used));
  if (directPicks !== undefined && directPicks <= 4) {
    warnings.add('few-direct-picks',
      `the direct wave rests on ${directPicks} picks per branch (median): the top-layer velocity, on which every depth depends, is poorly sampled and a head-wave pick near the crossover can bias it; place geophones closer together near the sources`,
      { layer: 1 });
  }
  const v1Fit = weightedMean(direct.map((d) => d.slowness), direct.map((d) => d.se));
  let v1: number | undefined;
  let v1Se = 0;
  if (v1Fit !== undefined) {
    v1 = 1 / v1Fit.mean;
    v1Se = v1Fit.se / v1Fit.mean ** 2;
    layers.push({ index: 1, velocity: v1, velocitySe: v1Se, segmentCount: direct.length, reversed: hasBothSides(fits, 1), throughOrigin });
  }
  // The refractors above the current one, for the recursion: solved from their apparent
  // slownesses (whose errors propagate), or fixed (apparent velocity, taken as flat).
  const above: Above[] = [];
  for (let k = v1 === undefined ? 1 : 2; k <= layerCount; k++) {
    const side = (name: 'forward' | 'reverse') => {
      const segs = fits.filter((f) => f.branch.side === name).flatMap((f) => f.segments.filter((s) => s.layer === k));
      return weightedMean(segs.map((s) => s.slowness), segs.map((s) => s.slownessSe));
    };
    const fwd = side('forward');
    const rev = side('reverse');
    const count = fits.reduce((n, f) => n + f.segments.filter((s) => s.layer === k).length, 0);
    if (count === 0) continue;
    const solved = fwd !== undefined && rev !== undefined && v1 !== undefined
      ? recursion([...above, { slowness: [fwd.mean, rev.mean], slownessSe: [fwd.se, rev.se] }], v1, v1Se)
      : undefined;
    // Without a ray solution, a side whose picks on this layer do not come later with offset
    // (slowness zero or negative) defines no velocity: the up-dip apparent slowness sin(θc − δ)/V1
    // is negative only where the dip δ exceeds the critical angle θc (Telford et al. 1990, §4.3),
    // which only the ray solution above can take; the harmonic mean and a one-sided apparent
    // velocity assume a small dip. The layer and those below it are left out, and said so.
    const backwards = solved !== undefined ? [] : ([['forward', fwd], ['reverse', rev]] as const).filter(([, m]) => m !== undefined && !(m.mean > 0));
    if (backwards.length > 0) {
      const offsets = fits.flatMap((f) => f.segments.filter((s) => s.layer === k).flatMap((s) => [s.firstOffset, s.lastOffset]));
      const [side, m] = backwards[0];
      warnings.add('unresolved-layer',
        si`the picks given to layer ${k} on the ${side} branches (offsets ${len(minOf(offsets), 0)} to ${len(maxOf(offsets), 0)}) do not arrive later as the offset grows (their apparent velocity is ${m!.mean === 0 ? 'infinite' : 'negative'}): they define no layer velocity, so layer ${k}${k < layerCount ? ' and those below it are' : ' is'} not reported and no depth is computed to ${k < layerCount ? 'them' : 'it'}. Such picks come from a refractor whose relief is large against the spread, or from mispicks: check them, and lengthen the spread or shoot off both ends to record the refractor over more geophones`,
        { layer: k });
      break;
    }
    if (fwd !== undefined && rev !== undefined && solved !== undefined) {
      layers.push({
        index: k,
        velocity: solved.interface.velocity,
        velocitySe: propagate((p) => solved.at(p)?.velocity ?? NaN, solved.params, solved.ses),
        dipDeg: solved.interface.dip * (180 / Math.PI),
        dipSeDeg: propagate((p) => (solved.at(p)?.dip ?? NaN) * (180 / Math.PI), solved.params, solved.ses),
        forwardApparent: 1 / fwd.mean,
        reverseApparent: 1 / rev.mean,
        segmentCount: count,
        reversed: true,
      });
      above.push({ slowness: [fwd.mean, rev.mean], slownessSe: [fwd.se, rev.se] });
    } else if (fwd !== undefined && rev !== undefined) {
      // Slower than a layer above on a side, or no top-layer velocity: no ray fits; use the harmonic mean.
      const harmonic = ([sf, sr]: number[]) => 2 / (sf + sr);
      const params = [fwd.mean, rev.mean];
      layers.push({
        index: k, velocity: harmonic(params), velocitySe: propagate(harmonic, params, [fwd.se, rev.se]),
        forwardApparent: 1 / fwd.mean, reverseApparent: 1 / rev.mean, segmentCount: count, reversed: true,
      });
      above.push({ fixed: { velocity: harmonic(params), dip: 0 } });
    } else {
      const one = (fwd ?? rev)!;
      layers.push({
        index: k, velocity: 1 / one.mean, velocitySe: one.se / one.mean ** 2,
        forwardApparent: fwd ? 1 / fwd.mean : undefined, reverseApparent: rev ? 1 / rev.mean : undefined,
        segmentCount: count, reversed: false,
      });
      above.push({ fixed: { velocity: 1 / one.mean, dip: 0 } });
      warnings.add('unreversed-layer',
        `layer ${k} is seen only by ${fwd ? 'forward (+x)' : 'reverse (-x)'} branches; its velocity ${Math.round(1 / one.mean)} m/s is apparent, not true, and its dip is unknown. Shoot the other end to reverse it`,
        { layer: k });
    }
  }
  return layers;
}

/** A refractor above the one being solved: from its apparent slownesses, or fixed. */
type Above = { slowness: [number, number]; slownessSe: [number, number] } | { fixed: PlaneInterface };

/**
 * The Johnson (1976) recursion down to the last entry of `chain`, as a function of the parameter
 * vector [V1, sf, sr of each entry solved from slownesses] (for the delta method), with its value
 * at the measured parameters.
 */
function recursion(chain: Above[], v1: number, v1Se: number) {
  const params = [v1];
  const ses = [v1Se];
  for (const entry of chain) {
    if ('slowness' in entry) { pushAll(params, entry.slowness); pushAll(ses, entry.slownessSe); }
  }
  const at = (p: number[]): PlaneInterface | undefined => {
    const interfaces: PlaneInterface[] = [];
    let next = 1;
    for (const entry of chain) {
      let solved: PlaneInterface | undefined;
      if ('fixed' in entry) solved = entry.fixed;
      else {
        solved = solveInterface(p[0], interfaces, p[next], p[next + 1]);
        next += 2;
      }
      if (solved === undefined) return undefined;
      interfaces.push(solved);
    }
    return interfaces[interfaces.length - 1];
  };
  const value = at(params);
  return value === undefined ? undefined : { interface: value, at, params, ses };
}

function hasBothSides(fits: BranchFit[], layer: number): boolean {
  const sides = new Set(fits.filter((f) => f.segments.some((s) => s.layer === layer)).map((f) => f.branch.side));
  return sides.size === 2;
}

/** Direct-wave slowness of one segment, fitted against straight-line distance (sloping ground). */
function directSlowness(fit: BranchFit, segment: Segment): { slowness: number; se: number } {
  const indices: number[] = [];
  for (let i = segment.start; i < segment.end; i++) if (!fit.outlierRows.includes(fit.branch.picks[i].row)) indices.push(i);
  const d = indices.map((i) => fit.branch.distances[i]);
  const t = indices.map((i) => fit.branch.times[i]);
  const flat = d.every((di, j) => Math.abs(di - fit.branch.offsets[indices[j]]) < 1e-9);
  if (flat) return { slowness: segment.slowness, se: segment.slownessSe };
  const line = new SimpleLinearRegression(d, t);
  const mean = d.reduce((a, b) => a + b, 0) / d.length;
  const sxx = d.reduce((a, b) => a + (b - mean) ** 2, 0);
  return { slowness: line.slope, se: sxx > 0 ? fit.residualSd / Math.sqrt(sxx) : Infinity };
}

/** Direct-wave slowness of one segment fitted through the origin against straight-line distance: s = Σ d t / Σ d². */
function originSlowness(fit: BranchFit, segment: Segment): { slowness: number; se: number } {
  let sdt = 0;
  let sdd = 0;
  for (let i = segment.start; i < segment.end; i++) {
    if (fit.outlierRows.includes(fit.branch.picks[i].row)) continue;
    const d = fit.branch.distances[i];
    sdt += d * fit.branch.times[i];
    sdd += d * d;
  }
  return { slowness: sdt / sdd, se: sdd > 0 ? fit.residualSd / Math.sqrt(sdd) : Infinity };
}
