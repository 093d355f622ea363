import type { FirstBreak } from '../core/types.js';

/** A velocity increasing linearly with depth below the ground: v = v0 + gradient · depth. */
export interface GradientStart {
  /** Velocity at the ground, in m/s. */
  v0: number;
  /** Increase of velocity with depth, in m/s per metre (1/s). */
  gradient: number;
  /** RMS of the first breaks about the fitted curve, in seconds. */
  rms: number;
}

/**
 * The first-arrival time over a velocity v0 + g·z at source-receiver distance x:
 * t = (2/g) asinh(g x / (2 v0)) (circular rays, constant ray parameter; a standard result, e.g.
 * Telford, Geldart & Sheriff 1990, ch. 4), x / v0 when g = 0.
 */
export function gradientTime(x: number, v0: number, gradient: number): number {
  if (gradient < 1e-9) return x / v0;
  return (2 / gradient) * Math.asinh((gradient * x) / (2 * v0));
}

/**
 * A 1-D starting model for tomography that assumes no layers: v0 and the gradient fitted to every
 * first break by least squares over a logarithmic grid of both, refined around the best node.
 *
 * @param picks - first breaks (slope distance source to receiver is used)
 * @param range - lowest and highest velocity allowed, in m/s
 */
export function gradientStart(picks: FirstBreak[], range: [number, number]): GradientStart {
  const distance = Float64Array.from(picks, (p) => Math.hypot(p.receiverX - p.sourceX, p.receiverElev - p.sourceElev));
  const time = Float64Array.from(picks, (p) => p.time);
  const cost = (v0: number, g: number): number => {
    let sum = 0;
    for (let i = 0; i < distance.length; i++) {
      const r = gradientTime(distance[i], v0, g) - time[i];
      sum += r * r;
    }
    return sum;
  };
  let best = { v0: range[0], gradient: 0, cost: Infinity };
  const logV = [Math.log(range[0]), Math.log(range[1])];
  for (let a = 0; a <= 40; a++) {
    const v0 = Math.exp(logV[0] + ((logV[1] - logV[0]) * a) / 40);
    for (let b = 0; b <= 40; b++) {
      const g = b === 0 ? 0 : Math.exp(Math.log(0.5) + ((Math.log(500) - Math.log(0.5)) * (b - 1)) / 39);
      const c = cost(v0, g);
      if (c < best.cost) best = { v0, gradient: g, cost: c };
    }
  }
  // Refine by shrinking steps around the best node (a pattern search in log space).
  let stepV = (logV[1] - logV[0]) / 40;
  let stepG = (Math.log(500) - Math.log(0.5)) / 39;
  for (let round = 0; round < 40; round++) {
    let improved = false;
    for (const [dv, dg] of [[1, 0], [-1, 0], [0, 1], [0, -1]]) {
      const v0 = best.v0 * Math.exp(dv * stepV);
      const g = Math.max(0, best.gradient === 0 ? (dg > 0 ? 0.5 : 0) : best.gradient * Math.exp(dg * stepG));
      if (v0 < range[0] || v0 > range[1]) continue;
      const c = cost(v0, g);
      if (c < best.cost) {
        best = { v0, gradient: g, cost: c };
        improved = true;
      }
    }
    if (!improved) {
      stepV /= 2;
      stepG /= 2;
    }
  }
  return { v0: best.v0, gradient: best.gradient, rms: Math.sqrt(best.cost / Math.max(1, distance.length)) };
}
