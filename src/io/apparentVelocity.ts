import type { Wave } from '../core/types.js';
import type { Seg2Record } from './seg2/types.js';

/** Lowest and highest apparent velocity, in m/s, that first breaks can show. */
export interface VelocityBounds {
  low: number;
  high: number;
}

/**
 * Apparent velocities (offset / first-break time) any ground gives: P waves from about 50 m/s
 * (loose dry soil, with a trigger delay) to 8000 m/s (the fastest fresh crystalline rock), S waves
 * from 30 to 5000 m/s (common practice; from memory of the usual tables of near-surface
 * velocities, with margin). For records whose wave is not known, the union of the two.
 */
export const APPARENT_VELOCITY_BOUNDS: Record<Wave | 'any', VelocityBounds> = {
  P: { low: 50, high: 8000 },
  S: { low: 30, high: 5000 },
  any: { low: 30, high: 8000 },
};

/** A likely unit mistake: if `advice` holds, the true apparent velocity is the computed one times `factor`. */
export interface UnitSuspect {
  factor: number;
  advice: string;
}

/**
 * Median of offset / time over picks away from the source, in m/s; a zero time at a non-zero
 * offset counts as infinitely fast. Undefined when no pick is away from the source.
 */
export function medianApparentVelocity(offsets: ArrayLike<number>, times: ArrayLike<number>): number | undefined {
  const velocities: number[] = [];
  for (let i = 0; i < offsets.length; i++) {
    const offset = Math.abs(offsets[i]);
    if (offset > 0) velocities.push(times[i] > 0 ? offset / times[i] : Infinity);
  }
  if (velocities.length === 0) return undefined;
  velocities.sort((a, b) => a - b);
  return velocities[velocities.length >> 1];
}

/**
 * Judges the units from the data: a median apparent velocity outside the bounds means a wrong time
 * or length unit (or a wrong source position). Returns the sentence for the user, naming the unit
 * that would bring the velocity inside the bounds, or undefined when the velocity is plausible.
 */
export function apparentVelocityProblem(velocity: number, wave: Wave | 'any', suspects: UnitSuspect[]): string | undefined {
  const bounds = APPARENT_VELOCITY_BOUNDS[wave];
  if (velocity >= bounds.low && velocity <= bounds.high) return undefined;
  const shown = Number.isFinite(velocity) ? `${formatVelocity(velocity)} m/s` : 'infinite (zero times away from the source)';
  const likely = suspects.filter((s) => Number.isFinite(velocity) && velocity * s.factor >= bounds.low && velocity * s.factor <= bounds.high);
  const waveWords = wave === 'any' ? 'first breaks have' : `${wave} waves have`;
  const advice = likely.length > 0
    ? likely.map((s) => `${s.advice} (that would make it ${formatVelocity(velocity * s.factor)} m/s)`).join('; or ')
    : 'check the time unit, the length unit and the source positions';
  return `the median apparent velocity (offset / time) is ${shown}, outside the ${bounds.low} to ${bounds.high} m/s that ${waveWords} in any ground; ${advice}. If the values are right, give --accept-velocities`;
}

function formatVelocity(v: number): string {
  return v >= 100 ? String(Math.round(v)) : v >= 1 ? v.toFixed(1) : v.toPrecision(2);
}

/**
 * The unit problem of a SEG-2 record judged from its picks, in words, or undefined: a median
 * apparent velocity no ground has names the likely header fault (SAMPLE_INTERVAL in milliseconds
 * or microseconds, coordinates in feet or metres against UNITS). Shared by the command line and the
 * field app.
 */
export function recordVelocityProblem(record: Seg2Record, picked: { receiverX: number; sourceX: number; time?: number }[], wave: Wave | 'any'): string | undefined {
  const good = picked.filter((r) => r.time !== undefined);
  const velocity = medianApparentVelocity(good.map((r) => r.receiverX - r.sourceX), good.map((r) => r.time!));
  if (velocity === undefined) return undefined;
  const interval = record.traces[0]?.keywords.SAMPLE_INTERVAL ?? '';
  return apparentVelocityProblem(velocity, wave, [
    { factor: 1e3, advice: `SAMPLE_INTERVAL ${interval} looks like milliseconds, but SEG-2 gives seconds (ask for the record to be written again, or correct the header)` },
    { factor: 1e6, advice: `SAMPLE_INTERVAL ${interval} looks like microseconds, but SEG-2 gives seconds` },
    record.metresPerUnit === 1
      ? { factor: 0.3048, advice: `the coordinates look like feet while UNITS says ${record.units}` }
      : { factor: 1 / record.metresPerUnit, advice: `the coordinates look like metres while UNITS says ${record.units}` },
  ]);
}
