import { propagate } from '../core/propagate.js';
import type { Layer } from '../core/types.js';
import { layerThickness } from './interceptTime.js';

/**
 * Depth to refractor n at a station from its one-way delay time (time-depth) there: the delay is
 * half an intercept time, so the layer thickness follows from the same flat-layer relation
 * (Telford, Geldart & Sheriff 1990, §4.2; Hagedoorn 1959; Palmer 1980), given the depths to the
 * refractors above at the same station. Standard error by the delta method over the delay, the
 * velocities and the depths above.
 *
 * @param delay - one-way delay time at the station, in seconds, and its standard error
 * @param upperDepths - depths to refractors 1 … n−1 at the station, in metres, with standard errors
 * @param layers - layer velocities; layer n+1 carries the refractor velocity used
 * @returns depth and its standard error, or undefined where no positive thickness fits
 */
export function depthFromDelay(
  delay: number, delaySe: number, upperDepths: number[], upperSes: number[], velocities: number[], velocitySes: number[],
): { depth: number; se: number } | undefined {
  const n = upperDepths.length + 1;
  const thicknessesOf = (depths: number[]) => depths.map((d, i) => d - (i === 0 ? 0 : depths[i - 1]));
  const depthOf = (p: number[]) => {
    const depths = p.slice(n + 2);
    const h = layerThickness(2 * p[0], thicknessesOf(depths), p.slice(1, n + 2));
    return h === undefined ? NaN : (depths[depths.length - 1] ?? 0) + h;
  };
  const params = [delay, ...velocities.slice(0, n + 1), ...upperDepths];
  const depth = depthOf(params);
  if (!Number.isFinite(depth)) return undefined;
  return { depth, se: propagate(depthOf, params, [delaySe, ...velocitySes.slice(0, n + 1), ...upperSes]) };
}

/** Velocities and their standard errors with the refractor's velocity replaced by a method's own estimate. */
export function velocitiesFor(layers: Layer[], refractor: number, refractorVelocity?: { velocity: number; se: number }) {
  const velocities = layers.map((l) => l.velocity);
  const ses = layers.map((l) => l.velocitySe);
  if (refractorVelocity !== undefined) {
    velocities[refractor] = refractorVelocity.velocity;
    ses[refractor] = refractorVelocity.se;
  }
  return { velocities, ses };
}
