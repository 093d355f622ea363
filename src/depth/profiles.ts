import { linearAt } from '../core/interpolate.js';
import { median } from '../core/stats.js';
import type { BranchFit, Layer, Refractor, RefractorPoint } from '../core/types.js';
import type { WarningLog } from '../core/warnings.js';
import { delayTime } from './delayTime.js';
import { depthAt, pointsFromDelays, type DelayProfile, type UpperDepths } from './delayProfile.js';
import { grm } from './grm.js';
import { headCurves } from './headWaves.js';
import { hiddenLayerLimit, type HiddenLayerLimit } from './hiddenLayer.js';
import { plusMinus } from './plusMinus.js';
import { reversedPair } from './reversedPair.js';
import { maxOf } from '../core/extent.js';

/**
 * The depth of an overburden refractor just beyond the ends of its profile (within `reach`
 * metres): its end value held, with the standard error doubled. A deeper refractor seen at the
 * line's ends needs the one above it there, and a refractor's depth changes little over a few
 * geophones.
 */
function nearEnd(points: RefractorPoint[], x: number, reach: number): { depth: number; se: number } | undefined {
  if (points.length === 0) return undefined;
  const end = x < points[0].x ? points[0] : x > points[points.length - 1].x ? points[points.length - 1] : undefined;
  if (end === undefined || Math.abs(end.x - x) > reach) return undefined;
  return { depth: end.depth, se: 2 * end.depthSe };
}

/** Geophones in the running mean of an overburden refractor's depths used to convert deeper ones. */
export const OVERBURDEN_WINDOW = 5;

/** Methods disagree where their depths differ by more than this fraction of the depth, or… */
export const DISAGREE_FRACTION = 0.1;
/** …by more than this many metres, whichever is larger. */
export const DISAGREE_METRES = 0.5;

export interface ProfileInput {
  fits: BranchFit[];
  /** Layers down to the deepest usable refractor. */
  layers: Layer[];
  /** Intercept-time points per refractor (already computed). */
  interceptPoints: RefractorPoint[][];
  receivers: { x: number; elev: number }[];
  spacing: number;
  /** Pick noise, in seconds (the line-fit RMS). */
  pickNoise: number;
}

export interface RefractorMethods extends Refractor {
  /** Method of each recommended point, in the same order as points. */
  pointMethods: string[];
  /** Refractor velocity and choices of each method. */
  methodInfo: Record<string, { velocity_mps?: number; velocity_se_mps?: number } & Record<string, unknown>>;
  hiddenLayer?: HiddenLayerLimit;
}

/**
 * Depths to every refractor under every geophone it covers: plus-minus and GRM between the
 * reversed pair of sources (phantomed from off-end shots), the delay-time method over all sources,
 * and the intercept-time depths under the sources. The recommended profile (see recommend) is GRM
 * at its optimum XY where the refractor proves irregular, the delay-time method (every source,
 * so the ends of the line too, and the least noise) elsewhere; plus-minus and intercept-time are
 * kept in byMethod as checks. A warning is given wherever two methods differ by more than
 * max(0.5 m, 10 % of the depth).
 */
export function refractorProfiles(input: ProfileInput, warnings: WarningLog): RefractorMethods[] {
  const { layers, receivers, spacing } = input;
  const elevation = groundElevation(receivers);
  const range: [number, number] = [receivers[0].x, receivers[receivers.length - 1].x];
  const result: RefractorMethods[] = [];
  for (let n = 1; n < layers.length; n++) {
    const curves = headCurves(input.fits, n + 1);
    // The refractors above enter a deeper depth amplified (by (cos θ₁/V₁)(V₂/cos θ₂), about 4 for a
    // thin slow top layer), so their per-geophone noise is smoothed first: a running mean over
    // OVERBURDEN_WINDOW geophones.
    const smoothed = new Map<RefractorPoint[], RefractorPoint[]>();
    const smooth = (points: RefractorPoint[]) => {
      if (!smoothed.has(points)) smoothed.set(points, runningMean(points, OVERBURDEN_WINDOW));
      return smoothed.get(points)!;
    };
    const upperOf = (method: string): UpperDepths => (x) => {
      const depths: number[] = [];
      const ses: number[] = [];
      for (const above of result) {
        const own = above.byMethod[method];
        const value = (own && own.length > 0 && depthAt(smooth(own), x)) || depthAt(smooth(above.points), x) || nearEnd(smooth(above.points), x, 5 * spacing);
        if (value === undefined) return undefined;
        depths.push(value.depth);
        ses.push(value.se);
      }
      return { depths, ses };
    };
    const byMethod: Record<string, RefractorPoint[]> = {};
    const methodInfo: RefractorMethods['methodInfo'] = {};
    const record = (profile: DelayProfile | undefined) => {
      if (profile === undefined) return;
      byMethod[profile.method] = pointsFromDelays(profile, layers, upperOf(profile.method), elevation);
      methodInfo[profile.method] = {
        ...(profile.velocity ? { velocity_mps: round(profile.velocity.velocity, 1), velocity_se_mps: round(profile.velocity.se, 1) } : {}),
        ...profile.info,
      };
    };
    const pair = reversedPair(curves, range, spacing);
    if (typeof pair === 'string') {
      warnings.add('no-reversed-pair', `refractor ${n}: plus-minus and GRM cannot run, ${pair}; the delay-time and intercept-time methods still give depths`, { layer: n + 1 });
    } else {
      const pm = plusMinus(pair, n);
      record(pm);
      const xyFromGeometry = (velocity: number, delays: { x: number; delay: number }[]) => {
        const profile: DelayProfile = { method: 'GRM', refractor: n, stations: delays.map((d) => ({ ...d, delaySe: 0 })), velocity: { velocity, se: 0 }, info: {} };
        const points = pointsFromDelays(profile, layers, upperOf('GRM'), elevation);
        const depths = points.map((p) => p.depth);
        const thicknesses = result.map((r) => median(points.map((p) => depthAt(r.points, p.x)?.depth ?? NaN).filter(Number.isFinite)) ?? 0);
        const total = median(depths) ?? 0;
        const bounds = [...thicknesses, total];
        let xy = 0;
        bounds.forEach((depth, j) => {
          const thickness = depth - (j === 0 ? 0 : bounds[j - 1]);
          const sine = layers[j].velocity / velocity;
          if (sine < 1) xy += 2 * thickness * (sine / Math.sqrt(1 - sine * sine));
        });
        return xy;
      };
      record(grm(pair, n, spacing, input.pickNoise, xyFromGeometry));
    }
    // The velocity is held at the layer's true velocity from the segments (forward and reverse
    // branches together): a free velocity trades with trends in the delays wherever a receiver is
    // recorded from one direction only.
    const held = delayTime(curves, n, { velocity: layers[n].velocity, se: layers[n].velocitySe });
    if (held !== undefined) held.info = { ...held.info, velocity_held_at: 'the layer velocity from the segments' };
    record(held);
    byMethod['intercept-time'] = input.interceptPoints[n - 1] ?? [];

    const irregular = methodInfo['GRM']?.optimum_xy_basis === 'velocity analysis';
    const recommended = recommend(withoutUnconfirmed(n, byMethod, warnings), irregular);
    const { points, pointMethods } = fillGaps(recommended.points, recommended.pointMethods, receivers, elevation, n, warnings);
    const method = pointMethods.length === 0 ? 'none' : [...new Set(pointMethods)].join(' + ');
    result.push({ index: n, method, points, pointMethods, byMethod, methodInfo, hiddenLayer: hiddenLayerOf(input.fits, layers, n) });
    disagreements(n, byMethod, warnings);
    coverageGaps(n, points, receivers, warnings);
  }
  return result;
}

/** A profile this far from the intercept-time depths under most of the sources it covers is not recommended. */
export const CONFIRM_METRES = 1;
export const CONFIRM_FRACTION = 0.2;

/**
 * The methods fit to be recommended: a delay-time, GRM or plus-minus profile is checked against
 * the intercept-time depths under the sources (Telford et al. 1990 §4.3: the same picks, a
 * different reduction). Where it differs from them by more than max(CONFIRM_METRES,
 * CONFIRM_FRACTION of the depth) under most of the sources it covers, it is kept in
 * byMethod as a check but not recommended, and a warning says so. This catches a time-term
 * solution that one-sided coverage has left free to shift by a constant.
 */
function withoutUnconfirmed(n: number, byMethod: Record<string, RefractorPoint[]>, warnings: WarningLog): Record<string, RefractorPoint[]> {
  const sources = byMethod['intercept-time'] ?? [];
  const kept: Record<string, RefractorPoint[]> = { ...byMethod };
  for (const method of ['delay-time', 'GRM', 'plus-minus']) {
    const points = byMethod[method];
    if (points === undefined || points.length === 0) continue;
    let compared = 0;
    const apart: { x: number; depth: number; intercept: number }[] = [];
    for (const source of sources) {
      const at = depthAt(points, source.x);
      if (at === undefined || !Number.isFinite(source.depth)) continue;
      compared++;
      if (Math.abs(at.depth - source.depth) > Math.max(CONFIRM_METRES, CONFIRM_FRACTION * source.depth)) apart.push({ x: source.x, depth: at.depth, intercept: source.depth });
    }
    if (compared >= 1 && apart.length * 2 > compared) {
      delete kept[method];
      warnings.add('method-unconfirmed',
        `refractor ${n}: the ${method} depths differ from the intercept-time depths under ${apart.length} of the ${compared} sources they reach (${apart.slice(0, 4).map((a) => `x = ${a.x} m: ${a.depth.toFixed(1)} against ${a.intercept.toFixed(1)} m`).join('; ')}), by more than ${CONFIRM_METRES} m or ${CONFIRM_FRACTION * 100} %: the ${method} profile is not recommended; it is kept with the other methods for comparison. Check the coverage of this refractor and the picks`,
        { layer: n + 1 });
    }
  }
  return kept;
}

/**
 * The recommended profile. Where GRM's velocity analysis found a decisive optimum XY the refractor
 * is irregular, and GRM follows it best: GRM where it covers, delay-time elsewhere. Otherwise the
 * delay-time method, which averages every source's picks at each geophone, is the less noisy, with
 * GRM only where the delay-time method leaves a geophone uncovered.
 */
function recommend(byMethod: Record<string, RefractorPoint[]>, irregular: boolean): { points: RefractorPoint[]; pointMethods: string[] } {
  const chosen = new Map<number, { point: RefractorPoint; method: string }>();
  for (const method of irregular ? ['delay-time', 'GRM'] : ['GRM', 'delay-time']) {
    for (const point of byMethod[method] ?? []) chosen.set(point.x, { point, method });
  }
  if (chosen.size === 0) {
    for (const point of byMethod['plus-minus'] ?? byMethod['intercept-time'] ?? []) chosen.set(point.x, { point, method: byMethod['plus-minus'] ? 'plus-minus' : 'intercept-time' });
  }
  const sorted = [...chosen.entries()].sort((a, b) => a[0] - b[0]);
  return { points: sorted.map(([, c]) => c.point), pointMethods: sorted.map(([, c]) => c.method) };
}

function disagreements(n: number, byMethod: Record<string, RefractorPoint[]>, warnings: WarningLog): void {
  const methods = Object.keys(byMethod).filter((m) => m !== 'intercept-time');
  for (let i = 0; i < methods.length; i++) {
    for (let j = i + 1; j < methods.length; j++) {
      const a = byMethod[methods[i]];
      const bySecond = new Map(byMethod[methods[j]].map((p) => [p.x, p]));
      const apart = a.filter((p) => {
        const q = bySecond.get(p.x);
        return q !== undefined && Math.abs(p.depth - q.depth) > Math.max(DISAGREE_METRES, DISAGREE_FRACTION * Math.max(p.depth, q.depth));
      });
      if (apart.length === 0) continue;
      const worst = maxOf(apart.map((p) => Math.abs(p.depth - bySecond.get(p.x)!.depth)));
      warnings.add('methods-disagree',
        `refractor ${n}: ${methods[i]} and ${methods[j]} depths differ by more than ${DISAGREE_METRES} m or ${DISAGREE_FRACTION * 100} % at ${apart.length} geophone${apart.length > 1 ? 's' : ''} (x = ${apart.slice(0, 6).map((p) => p.x).join(', ')}${apart.length > 6 ? ', ...' : ''} m), by up to ${worst.toFixed(2)} m: the refractor may be irregular there, or the picks inconsistent; treat those depths with care`,
        { layer: n + 1 });
    }
  }
}

/** Gaps of at most this many geophones inside a profile are filled by linear interpolation. */
export const FILL_GAP_GEOPHONES = 10;

/**
 * Fills geophones inside the recommended profile that no method covers (a thin refractor seen
 * over short stretches, a receiver recorded from too few sources) by linear interpolation between
 * the covered neighbours, for gaps of up to FILL_GAP_GEOPHONES. The standard error of a filled
 * depth is the larger neighbour's plus half their difference; its method is "interpolated".
 */
function fillGaps(
  points: RefractorPoint[], methods: string[], receivers: { x: number }[], elevation: (x: number) => number,
  n: number, warnings: WarningLog,
): { points: RefractorPoint[]; pointMethods: string[] } {
  if (points.length < 2) return { points, pointMethods: methods };
  const covered = new Map(points.map((p, i) => [p.x, i]));
  const filled: { point: RefractorPoint; method: string }[] = points.map((point, i) => ({ point, method: methods[i] }));
  const inside = receivers.filter((r) => r.x > points[0].x && r.x < points[points.length - 1].x && !covered.has(r.x));
  let count = 0;
  for (const r of inside) {
    let a = 0;
    while (a + 1 < points.length && points[a + 1].x < r.x) a++;
    const left = points[a];
    const right = points[a + 1];
    const gap = receivers.filter((q) => q.x > left.x && q.x < right.x).length;
    if (gap > FILL_GAP_GEOPHONES) continue;
    const t = (r.x - left.x) / (right.x - left.x);
    const depth = left.depth * (1 - t) + right.depth * t;
    filled.push({ point: { x: r.x, depth, elev: elevation(r.x) - depth, depthSe: Math.max(left.depthSe, right.depthSe) + Math.abs(left.depth - right.depth) / 2 }, method: 'interpolated' });
    count++;
  }
  if (count > 0) {
    warnings.add('interpolated-depths',
      `refractor ${n}: ${count} geophone${count > 1 ? 's' : ''} inside the profile that no method covers ${count > 1 ? 'have' : 'has'} depths interpolated between the covered neighbours (method "interpolated", with a larger standard error)`,
      { layer: n + 1 });
  }
  filled.sort((p, q) => p.point.x - q.point.x);
  return { points: filled.map((f) => f.point), pointMethods: filled.map((f) => f.method) };
}

function coverageGaps(n: number, points: RefractorPoint[], receivers: { x: number }[], warnings: WarningLog): void {
  const covered = new Set(points.map((p) => p.x));
  const missing = receivers.filter((r) => !covered.has(r.x)).map((r) => r.x);
  if (missing.length > 0) {
    warnings.add('not-covered',
      `refractor ${n}: no depth at ${missing.length} of ${receivers.length} geophones (x = ${missing.slice(0, 8).join(', ')}${missing.length > 8 ? ', ...' : ''} m), where no source records its head wave; shoot farther off the ends, or add sources, to cover them`,
      { layer: n + 1 });
  }
}

/** Soske's largest hidden layer above refractor n, for a hidden velocity at the geometric mean. */
export function hiddenLayerOf(fits: BranchFit[], layers: Layer[], n: number): HiddenLayerLimit | undefined {
  const near = fits.filter((f) => f.segments.some((s) => s.layer === 1));
  const intercepts = (layer: number) => median(near.flatMap((f) => f.segments.filter((s) => s.layer === layer).map((s) => s.intercept)));
  const upper = n === 1 ? 0 : intercepts(n);
  const lower = intercepts(n + 1);
  if (upper === undefined || lower === undefined) return undefined;
  const v1 = layers[n - 1].velocity;
  const v3 = layers[n].velocity;
  return hiddenLayerLimit(n, v1, v3, upper, lower, Math.sqrt(v1 * v3));
}

/** Ground elevation along the line from the receivers (linear interpolation, end values beyond). */
function groundElevation(receivers: { x: number; elev: number }[]): (x: number) => number {
  const xs = receivers.map((r) => r.x);
  const elevations = receivers.map((r) => r.elev);
  return (x) => linearAt(xs, elevations, x);
}

const round = (v: number, d: number) => Number(v.toFixed(d));

/**
 * Running mean of depths over `window` neighbouring points (fewer at the ends); the standard error
 * of a mean of n points is taken as the mean standard error over √n (neighbours' errors are
 * nearly independent for per-geophone delays).
 */
function runningMean(points: RefractorPoint[], window: number): RefractorPoint[] {
  const half = Math.floor(window / 2);
  return points.map((p, i) => {
    const slice = points.slice(Math.max(0, i - half), Math.min(points.length, i + half + 1));
    const depth = slice.reduce((a, q) => a + q.depth, 0) / slice.length;
    const se = slice.reduce((a, q) => a + q.depthSe, 0) / slice.length / Math.sqrt(slice.length);
    return { ...p, depth, elev: p.elev + p.depth - depth, depthSe: se };
  });
}
