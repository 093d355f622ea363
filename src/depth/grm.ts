import { SimpleLinearRegression } from 'ml-regression';
import type { DelayProfile } from './delayProfile.js';
import { intervalIndex, timeAt } from './headWaves.js';
import type { ReversedPair } from './reversedPair.js';
import type { Layer } from '../core/types.js';
import type { WarningLog } from '../core/warnings.js';
import { si, vel } from '../core/siText.js';
import type { RefractorMethods } from './profiles.js';

/** One XY value tried by the GRM velocity analysis. */
export interface XyTrial {
  xy: number;
  /** Residual RMS of the velocity-analysis function about its line, scaled to node-pick noise, in seconds. */
  rms: number;
  velocity: number;
  stations: number;
}

/**
 * The velocity-analysis criterion is taken as decisive only when the XY the geometry gives fits
 * this much worse (ratio of RMS) than the best XY. On a planar refractor every XY fits alike and
 * the RMS values differ only by noise (about ±15 % for 40 stations, and the least of 20 correlated
 * values is lower still); an irregular refractor raises the RMS away from the optimum by several
 * times the pick noise. A ratio of 1.4 (variance ratio 2) separates the two.
 */
const DECISIVE_RATIO = 1.4;

/**
 * Generalized reciprocal method (Palmer 1980, The Generalized Reciprocal Method of Seismic
 * Refraction Interpretation, SEG; Palmer 1981, Geophysics 46, 1508-1518). For each XY, with
 * X = G − XY/2 and Y = G + XY/2, the velocity-analysis function t_V = (t_AY − t_BX + t_AB) / 2
 * has slope 1/V′, and the time-depth is t_G = [t_AY + t_BX − (t_AB + XY/V′)] / 2. The optimum XY is
 * the one whose velocity-analysis function is most nearly a straight line (Palmer's criterion:
 * forward and reverse rays then leave the refractor at one point), when it fits decisively better
 * than the XY the geometry gives, XY = 2 Σ zⱼ tan θⱼ with sin θⱼ = Vⱼ/V′ (Palmer 1980; from
 * memory), computed from the XY = 0 depths; otherwise (a planar refractor, where every XY fits
 * alike) the geometric XY is used.
 *
 * @param spacing - receiver spacing, in metres (XY is tried in steps of half of it)
 * @param geometricXy - the geometric XY, in metres, from the XY = 0 delays and V′
 */
export function grm(pair: ReversedPair, refractor: number, spacing: number, pickNoise: number, geometricXy: (velocity: number, delays: { x: number; delay: number }[]) => number): DelayProfile | undefined {
  const span = pair.reverse.sourceX - pair.forward.sourceX;
  const step = spacing / 2;
  const maxXy = Math.min(12 * spacing, span / 4);
  const trials: (XyTrial & { tv: { x: number; tv: number; tf: number; tr: number; weight: number }[] })[] = [];
  for (let xy = 0; xy <= maxXy + 1e-9; xy += step) {
    const rows: { x: number; tv: number; tf: number; tr: number; weight: number }[] = [];
    for (const g of pair.forward.xs) {
      const y = g + xy / 2;
      const x = g - xy / 2;
      if (!(x >= pair.forward.sourceX && y <= pair.reverse.sourceX)) continue;
      const tf = timeAt(pair.forward, y);
      const tr = timeAt(pair.reverse, x);
      if (tf === undefined || tr === undefined) continue;
      rows.push({ x: g, tv: (tf - tr + pair.reciprocal) / 2, tf, tr, weight: (noiseFactor(pair.forward.xs, y) + noiseFactor(pair.reverse.xs, x)) / 2 });
    }
    if (rows.length < 4) continue;
    const line = new SimpleLinearRegression(rows.map((r) => r.x), rows.map((r) => r.tv));
    // Interpolated times are averages of two picks and less noisy; scale each residual back to node noise.
    const scaled = rows.map((r) => (r.tv - line.predict(r.x)) ** 2 / r.weight);
    const rms = Math.sqrt(scaled.reduce((a, b) => a + b, 0) / (rows.length - 2));
    trials.push({ xy, rms, velocity: 1 / line.slope, stations: rows.length, tv: rows });
  }
  if (trials.length === 0) return undefined;
  const best = trials.reduce((a, b) => (b.rms < a.rms ? b : a));
  const zero = trials[0];
  const geometric = geometricXy(zero.velocity, zero.tv.map((r) => ({ x: r.x, delay: (r.tf + r.tr - pair.reciprocal) / 2 })));
  const atGeometry = trials.reduce((a, b) => (Math.abs(b.xy - geometric) < Math.abs(a.xy - geometric) ? b : a));
  const decisive = atGeometry.rms / best.rms > DECISIVE_RATIO;
  const basis: 'velocity analysis' | 'geometry' = decisive ? 'velocity analysis' : 'geometry';
  const chosen = decisive ? best : atGeometry;
  const velocity = chosen.velocity;
  const xs = chosen.tv.map((r) => r.x);
  const mean = xs.reduce((a, b) => a + b, 0) / xs.length;
  const sxx = xs.reduce((a, b) => a + (b - mean) ** 2, 0);
  const slopeSe = chosen.rms / Math.sqrt(sxx);
  const delaySe = Math.sqrt(2 * pickNoise * pickNoise + (pickNoise * pickNoise) / pair.reciprocalReadings) / 2;
  return {
    method: 'GRM',
    refractor,
    stations: chosen.tv.map((r) => ({ x: r.x, delay: (r.tf + r.tr - (pair.reciprocal + chosen.xy / velocity)) / 2, delaySe })),
    velocity: { velocity, se: slopeSe * velocity * velocity },
    info: {
      optimum_xy_m: chosen.xy,
      optimum_xy_basis: basis,
      geometric_xy_m: Number(geometric.toFixed(3)),
      xy_trials: trials.map((t) => ({ xy_m: t.xy, rms_ms: Number((t.rms * 1e3).toFixed(4)), velocity_mps: Number(t.velocity.toFixed(1)) })),
      source_forward: pair.forward.sourceId,
      source_reverse: pair.reverse.sourceId,
      velocity_analysis_stations: chosen.tv.length,
    },
  };
}

/** Variance of a time interpolated at x relative to a pick's: 1 at a receiver, (1−t)² + t² between. */
function noiseFactor(xs: number[], x: number): number {
  const i = intervalIndex(xs, x);
  if (i >= xs.length - 1 || Math.abs(xs[i] - x) < 1e-9) return 1;
  const t = (x - xs[i]) / (xs[i + 1] - xs[i]);
  return (1 - t) ** 2 + t * t;
}

/**
 * The refractor velocity of Palmer's velocity analysis against the layer velocity of the
 * interpretation: each differs from the other by more than their combined standard error and by
 * more than this fraction of the layer velocity before a warning is given.
 */
export const VELOCITY_ANALYSIS_TOLERANCE = 0.05;

/** The velocity-analysis cross-check of one refractor's velocity. */
export interface VelocityAnalysisCheck {
  /** Refractor index (1 = top of layer 2). */
  refractor: number;
  /** V′ from the slope of t_V = (t_forward − t_reverse + t_reciprocal) / 2 against x at the GRM's XY, and its standard error, in m/s. */
  velocity: number;
  se: number;
  /** XY the velocity analysis was read at, in metres, and the sources of the reversed pair. */
  xy: number;
  stations: number;
  sourceForward: string;
  sourceReverse: string;
  /** The layer velocity of the interpretation beneath the refractor and its standard error, in m/s. */
  layerVelocity: number;
  layerSe: number;
  /** (V′ − layer velocity) / layer velocity. */
  difference: number;
  /** True unless the two differ by more than their combined standard error and VELOCITY_ANALYSIS_TOLERANCE. */
  agrees: boolean;
}

/**
 * Cross-checks each refractor's layer velocity against Palmer's (1980) velocity-analysis function
 * over its reversed pair (the GRM's own, at the XY the GRM chose): t_V has slope 1/V′ and, over a
 * plane refractor, is a straight line for every XY (V′ = V / cos δ for a dip δ, within 0.4 % of V
 * up to 5°). A `velocity-analysis-differs` warning names both values where they differ by more
 * than √(SE₁² + SE₂²) and VELOCITY_ANALYSIS_TOLERANCE. Refractors without a reversed pair (no
 * GRM) have no check.
 */
export function velocityAnalysisCheck(refractors: RefractorMethods[], layers: Layer[], log: WarningLog): VelocityAnalysisCheck[] {
  const checks: VelocityAnalysisCheck[] = [];
  for (const r of refractors) {
    const info = r.methodInfo['GRM'];
    const layer = layers[r.index];
    if (info?.velocity_mps === undefined || layer === undefined) continue;
    const velocity = Number(info.velocity_mps);
    const se = Number(info.velocity_se_mps);
    if (!(velocity > 0) || !Number.isFinite(se)) continue;
    const layerSe = Number.isFinite(layer.velocitySe) ? layer.velocitySe : 0;
    const gap = Math.abs(velocity - layer.velocity);
    const agrees = !(gap > Math.hypot(se, layerSe) && gap > VELOCITY_ANALYSIS_TOLERANCE * layer.velocity);
    const check: VelocityAnalysisCheck = {
      refractor: r.index, velocity, se, xy: Number(info.optimum_xy_m), stations: Number(info.velocity_analysis_stations),
      sourceForward: String(info.source_forward), sourceReverse: String(info.source_reverse),
      layerVelocity: layer.velocity, layerSe, difference: (velocity - layer.velocity) / layer.velocity, agrees,
    };
    checks.push(check);
    if (!agrees) {
      log.add('velocity-analysis-differs',
        si`refractor ${r.index}: the velocity analysis of the generalized reciprocal method (Palmer 1980; sources ${check.sourceForward} and ${check.sourceReverse}, ${check.stations} geophones) gives ${vel(velocity)} ± ${vel(se)} for layer ${r.index + 1}, against the layer velocity of ${vel(layer.velocity)} ± ${vel(layerSe)} used for the depths (${(check.difference * 100).toFixed(1)} %, more than their combined standard error and ${VELOCITY_ANALYSIS_TOLERANCE * 100} %). The refractor velocity, and with it every depth to this refractor, is less certain than its standard error says: check the head-wave picks assigned to this layer, and look for a lateral change of velocity or a refractor that is not plane`,
        { layer: r.index + 1 });
    }
  }
  return checks;
}
