import type { Layer, RefractorPoint } from '../core/types.js';
import { depthFromDelay, velocitiesFor } from './convert.js';

/** One-way delay times (time-depths) of one refractor at stations, from one method. */
export interface DelayProfile {
  method: string;
  /** Refractor index (1 = top of layer 2). */
  refractor: number;
  stations: { x: number; delay: number; delaySe: number }[];
  /** The method's own estimate of the refractor velocity, in m/s, when it makes one. */
  velocity?: { velocity: number; se: number };
  /** What the method chose (for example the optimum XY), for the record. */
  info: Record<string, unknown>;
}

/** Depth to the refractors above at a station, from whichever profile covers it. */
export type UpperDepths = (x: number) => { depths: number[]; ses: number[] } | undefined;

/**
 * Converts a delay profile into refractor points: depth below the ground at each station and
 * refractor elevation, with standard errors.
 */
export function pointsFromDelays(profile: DelayProfile, layers: Layer[], upper: UpperDepths, groundElev: (x: number) => number): RefractorPoint[] {
  const { velocities, ses } = velocitiesFor(layers, profile.refractor, profile.velocity);
  const points: RefractorPoint[] = [];
  for (const station of profile.stations) {
    const above = profile.refractor === 1 ? { depths: [], ses: [] } : upper(station.x);
    if (above === undefined) continue;
    const result = depthFromDelay(station.delay, station.delaySe, above.depths, above.ses, velocities, ses);
    if (result === undefined) continue;
    const elev = groundElev(station.x);
    points.push({ x: station.x, depth: result.depth, elev: elev - result.depth, depthSe: result.se });
  }
  return points;
}

/** Depth of a profile at x by linear interpolation between its points (undefined outside them). */
export function depthAt(points: RefractorPoint[], x: number): { depth: number; se: number } | undefined {
  if (points.length === 0 || x < points[0].x - 1e-9 || x > points[points.length - 1].x + 1e-9) return undefined;
  let i = 0;
  while (i < points.length - 1 && points[i + 1].x < x) i++;
  const a = points[i];
  const b = points[Math.min(points.length - 1, i + 1)];
  if (Math.abs(a.x - x) < 1e-9 || a.x === b.x) return { depth: a.depth, se: a.depthSe };
  const t = (x - a.x) / (b.x - a.x);
  return { depth: a.depth * (1 - t) + b.depth * t, se: a.depthSe * (1 - t) + b.depthSe * t };
}
