import { SimpleLinearRegression } from 'ml-regression';
import type { DelayProfile } from './delayProfile.js';
import { timeAt } from './headWaves.js';
import type { ReversedPair } from './reversedPair.js';

/**
 * Plus-minus method (Hagedoorn 1959, Geophys. Prospect. 7, 158-182). For a receiver G between
 * reversed sources A and B, both recording the head wave: the plus time T⁺ = t_AG + t_BG − t_AB
 * is twice the delay time at G; the minus time T⁻ = t_AG − t_BG grows along the line at 2/V, so
 * the slope of its least-squares line gives the refractor velocity V and its standard error. The
 * pick noise is measured from the scatter of the minus times (each the difference of two picks).
 *
 * @returns delays at every receiver covered by both curves, or undefined where fewer than three are
 */
export function plusMinus(pair: ReversedPair, refractor: number): DelayProfile | undefined {
  const stations: { x: number; plus: number; minus: number; phantom: boolean }[] = [];
  for (const x of pair.forward.xs) {
    if (!(x > pair.forward.sourceX && x < pair.reverse.sourceX)) continue;
    const tf = timeAt(pair.forward, x);
    const tr = timeAt(pair.reverse, x);
    if (tf === undefined || tr === undefined || !pair.reverse.xs.includes(x)) continue;
    stations.push({ x, plus: tf + tr - pair.reciprocal, minus: tf - tr, phantom: pair.forward.phantomXs.includes(x) || pair.reverse.phantomXs.includes(x) });
  }
  if (stations.length < 3) return undefined;
  const xs = stations.map((s) => s.x);
  const line = new SimpleLinearRegression(xs, stations.map((s) => s.minus));
  const residuals = stations.map((s) => s.minus - line.predict(s.x));
  const dof = Math.max(1, stations.length - 2);
  const minusSd = Math.sqrt(residuals.reduce((a, r) => a + r * r, 0) / dof);
  const mean = xs.reduce((a, b) => a + b, 0) / xs.length;
  const sxx = xs.reduce((a, b) => a + (b - mean) ** 2, 0);
  const slopeSe = minusSd / Math.sqrt(sxx);
  const pickSd = minusSd / Math.SQRT2;
  // var(T⁺) = 2σ² + var(t_AB), with t_AB the mean of its readings; a phantomed time adds the
  // variance of its shift, about 2σ²/n for n common receivers (taken as 2σ²/3 at worst).
  const reciprocalVariance = (pickSd * pickSd) / pair.reciprocalReadings;
  const delaySe = (phantom: boolean) => Math.sqrt(2 * pickSd * pickSd + reciprocalVariance + (phantom ? (2 * pickSd * pickSd) / 3 : 0)) / 2;
  const velocity = 2 / line.slope;
  return {
    method: 'plus-minus',
    refractor,
    stations: stations.map((s) => ({ x: s.x, delay: s.plus / 2, delaySe: delaySe(s.phantom) })),
    velocity: { velocity, se: (2 * slopeSe) / line.slope ** 2 },
    info: {
      source_forward: pair.forward.sourceId,
      source_reverse: pair.reverse.sourceId,
      reciprocal_time_ms: Number((pair.reciprocal * 1e3).toFixed(3)),
      pick_noise_ms: Number((pickSd * 1e3).toFixed(3)),
      phantomed_stations: stations.filter((s) => s.phantom).length,
    },
  };
}
