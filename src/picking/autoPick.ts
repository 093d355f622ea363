import { median, theilSenSlope } from '../core/stats.js';
import { segmentedRegression } from '../fit/segmentedRegression.js';
import { aicOnset } from './aic.js';
import { staLtaTriggerOn } from './staLta.js';
import { minOf } from '../core/extent.js';

/** A trace to pick: samples, time axis, and its offset from the source. */
export interface PickTrace {
  data: Float32Array;
  /** Sample interval and time of the first sample (DELAY), in seconds. */
  sampleInterval: number;
  delay: number;
  /** Receiver position minus source position, in metres (sign gives the side). */
  offset: number;
  dead?: boolean;
}

export type PickStatus = 'picked' | 'repicked' | 'dead' | 'no clear onset' | 'inconsistent' | 'on the P arrival';

export interface TracePick {
  /** First-break time after the shot, in seconds; undefined when not picked. */
  time?: number;
  /** 0 (a guess) to 1 (a clear onset), from the signal-to-noise ratio at the pick. */
  confidence: number;
  status: PickStatus;
  /** Ratio of RMS amplitude just after the pick to just before it. */
  snr?: number;
}

export interface PickOptions {
  /** STA window, in seconds; default 2 ms. */
  shortWindow?: number;
  /** LTA window, in seconds; default 20 ms. */
  longWindow?: number;
  /** STA/LTA energy ratio that triggers; default 4. */
  threshold?: number;
  /** Half-width of the AIC window after the trigger, in seconds; default 6 ms. */
  aicWindow?: number;
}

/**
 * Automatic first-break picking of one shot record, from published methods:
 * 1. per trace, an STA/LTA trigger on the energy (Allen 1978), then the AIC picker (Maeda 1985)
 *    between the start of the record and a window past the trigger, for the onset;
 * 2. across the record, the picks of each side against offset are fitted by the segmented
 *    regression of the interpretation (velocities increasing with depth only, outliers by modified
 *    z-score); a pick far off that travel-time curve (a late noise burst, the ground roll, a
 *    pre-trigger spike) is picked again by AIC in a window around the predicted time, and left
 *    unpicked when that does not agree either.
 * Confidence is 1 − exp(−(snr − 1)/3), snr the RMS ratio after/before the pick over one STA window;
 * halved for a re-pick. Dead traces (marked DEAD, or constant) are not picked.
 */
export function pickRecord(traces: PickTrace[], options: PickOptions = {}): TracePick[] {
  const picks = traces.map((t) => pickTrace(t, options));
  return checkRecord(traces, picks, (i, predicted, halfWidth) => pickNear(traces[i], predicted, halfWidth, options));
}

/**
 * A second look at one trace near a predicted time: trace index, predicted onset (s after the
 * shot) and half-width of the window (s); undefined when nothing is found there.
 */
export type Repick = (trace: number, predicted: number, halfWidth: number) => TracePick | undefined;

/**
 * The record-consistency step of `pickRecord` on picks made by any per-trace picker (first breaks,
 * or S onsets): spikes against neighbour lines, the segmented regression per side, near-source
 * picks by the concave shape of a first-arrival curve (`nearSourceArrivals`), a re-pick near the
 * curve for the rest (`repick`), else `inconsistent`. Returns a new array.
 */
export function checkRecord(traces: PickTrace[], initial: TracePick[], repick: Repick): TracePick[] {
  const picks = [...initial];
  for (const side of [-1, 1]) {
    const members = traces.map((t, i) => ({ t, i })).filter(({ t, i }) => Math.sign(t.offset) === side && picks[i].time !== undefined)
      .sort((a, b) => Math.abs(a.t.offset) - Math.abs(b.t.offset));
    if (members.length < 6) continue;
    // Spikes first: a pick far from the line through its neighbours (two each side) cannot be
    // trusted to shape the travel-time curve that judges the others.
    const dt = members[0].t.sampleInterval;
    const spikes = new Set(localSpikes(members.map(({ t }) => Math.abs(t.offset)), members.map(({ i }) => picks[i].time!), dt));
    const clean = members.filter((_, k) => !spikes.has(k));
    if (clean.length < 6) continue;
    const x = clean.map(({ t }) => Math.abs(t.offset));
    const y = clean.map(({ i }) => picks[i].time!);
    const fit = travelTimeFit(x, y);
    if (fit === undefined) continue;
    // First arrivals follow the lower envelope of the segment lines (each line wins beyond its crossover).
    const predict = (offset: number) => minOf(fit.segments.map((segment) => segment.intercept + segment.slope * offset));
    const tolerance = Math.max(4 * fit.residualSd, 3 * dt, 1e-3);
    // Traces with no onset of their own are tried at the predicted time too.
    const candidates = [
      ...members.filter(({ i, t }, k) => spikes.has(k) || fit.outliers.includes(clean.findIndex((m) => m.i === i)) || Math.abs(picks[i].time! - predict(Math.abs(t.offset))) > tolerance).map(({ i }) => i),
      ...traces.map((t, i) => ({ t, i })).filter(({ t, i }) => Math.sign(t.offset) === side && picks[i].status === 'no clear onset').map(({ i }) => i),
    ];
    const nearSource = nearSourceArrivals(members.map(({ t, i }) => ({ i, x: Math.abs(t.offset), time: picks[i].time! })), new Set(candidates), predict, tolerance);
    for (const i of candidates) {
      if (nearSource.has(i)) continue;
      const t = traces[i];
      const predicted = predict(Math.abs(t.offset));
      const again = repick(i, predicted, Math.max(3 * tolerance, 4e-3));
      if (again !== undefined && Math.abs(again.time! - predicted) <= tolerance && (again.snr ?? 0) >= 1.5) {
        picks[i] = { ...again, status: 'repicked', confidence: again.confidence / 2 };
      } else if (picks[i].time !== undefined) {
        picks[i] = { confidence: 0, status: 'inconsistent', snr: picks[i].snr };
      }
    }
  }
  return picks;
}

/**
 * The segmented regression of one side's picks against offset, as a first-arrival curve: slopes
 * decreasing with offset (faster layers deeper) and every slope positive (a first arrival comes
 * later at a farther geophone). A fit with a slope at or below zero has bent through early
 * spikes; it is tried again with one segment fewer, down to a single line.
 *
 * @param x - absolute offsets in metres, increasing; y - times in seconds
 */
export function travelTimeFit(x: number[], y: number[]): ReturnType<typeof segmentedRegression> {
  for (let segments = 3; segments >= 1; segments--) {
    const fit = segmentedRegression(x, y, { forbidSlopeIncrease: true, maxSegments: segments, continuous: false });
    if (fit === undefined || fit.segments.every((segment) => segment.slope > 0)) return fit;
  }
  return undefined;
}

/**
 * Near-source picks judged against the shape every first-arrival curve has, not against the lines
 * of the picks beyond them. A first-arrival curve is the lower envelope of straight lines (direct
 * and head waves), so it is concave in offset and starts at the shot (t = 0 at offset 0); a concave
 * curve lies above its chords and below the extension of its secants (Telford et al. 1990, ch. 4:
 * a refracted line crosses the direct line at the crossover distance, where the slope drops). The
 * few picks between the source and the first consistent pick (the direct wave of an off-end shot,
 * before an early crossover) fall below the backward extension of the refracted lines, which is
 * why the record fit alone calls them inconsistent. Such a pick is kept when it lies, within the
 * tolerance, above the chord from the shot (0, 0) to the next kept pick (earlier than that is a
 * pre-trigger spike or noise) and below both the secant through the next two kept picks extended
 * back and the record's fitted curve (later than that is a late phase or a missed onset).
 * Judged from the far end inwards, each kept pick becoming the next one's neighbour.
 *
 * @param members - picks of one side sorted by offset (x = absolute offset, in metres; time in s)
 * @param candidates - trace indices found inconsistent with the record fit
 * @returns trace indices of near-source candidates that are consistent after all
 */
export function nearSourceArrivals(members: { i: number; x: number; time: number }[], candidates: Set<number>, predict: (offset: number) => number, tolerance: number): Set<number> {
  const kept = new Set<number>();
  let run = 0;
  while (run < members.length && candidates.has(members[run].i)) run++;
  if (run === 0 || run + 2 > members.length) return kept;
  // The two nearest kept picks beyond the current one, nearest first.
  const next = [members[run], members[run + 1]];
  for (let k = run - 1; k >= 0; k--) {
    const m = members[k];
    const [a, b] = next;
    if (m.x <= 0 || a.x <= m.x || b.x <= a.x) continue;
    const chord = (a.time * m.x) / a.x;
    const secant = a.time + ((b.time - a.time) * (m.x - a.x)) / (b.x - a.x);
    const upper = Math.min(secant, predict(m.x));
    if (m.time >= chord - tolerance && m.time <= upper + tolerance && m.time > 0) {
      kept.add(m.i);
      next[1] = a;
      next[0] = m;
    }
  }
  return kept;
}

/**
 * Picks (sorted by offset) that lie far from the travel-time curve their neighbours draw: the
 * departure is the smaller of the misfits to the line through the three neighbours before and the
 * line through the three after (at a crossover a good pick lies on one of them; a spike on neither).
 * A spike departs by more than six robust deviations (1.4826 × the median departure) and more than
 * max(5 samples, 2 ms). Removed worst first and the rest judged again, up to a fifth of the picks.
 */
export function localSpikes(x: number[], y: number[], dt: number): number[] {
  const out: number[] = [];
  const excluded = new Set<number>();
  // The line through up to three neighbours on one side, by Theil-Sen (the median of the pairwise
  // slopes and of the intercepts; Sen 1968), so that one spike among them does not bend it.
  const side = (k: number, step: -1 | 1) => {
    const near: number[] = [];
    for (let j = k + step; j >= 0 && j < x.length && near.length < 3; j += step) if (!excluded.has(j)) near.push(j);
    if (near.length < 2) return Infinity;
    const slope = theilSenSlope(near.map((j) => x[j]), near.map((j) => y[j]));
    if (slope === undefined) return Infinity;
    const intercept = median(near.map((j) => y[j] - slope * x[j]))!;
    return Math.abs(y[k] - (intercept + slope * x[k]));
  };
  while (out.length < Math.floor(x.length / 5)) {
    const d = x.map((_, k) => (excluded.has(k) ? 0 : Math.min(side(k, -1), side(k, 1))));
    const finite = d.filter((v, k) => !excluded.has(k) && Number.isFinite(v)).sort((a, b) => a - b);
    if (finite.length === 0) break;
    const scale = 1.4826 * finite[finite.length >> 1];
    let worst = -1;
    for (let k = 0; k < x.length; k++) if (!excluded.has(k) && Number.isFinite(d[k]) && (worst < 0 || d[k] > d[worst])) worst = k;
    if (worst < 0 || d[worst] <= Math.max(6 * scale, 5 * dt, 2e-3)) break;
    excluded.add(worst);
    out.push(worst);
  }
  return out;
}

export function windows(t: PickTrace, options: PickOptions) {
  const dt = t.sampleInterval;
  // At least 8 samples in the STA: the mean of fewer squared noise samples exceeds four times the
  // noise level too often (a chi-square with 4 degrees of freedom passes 16 three times in a thousand).
  const short = Math.max(8, Math.round((options.shortWindow ?? 2e-3) / dt));
  const long = Math.max(short * 4, Math.round((options.longWindow ?? 20e-3) / dt));
  const aic = Math.max(16, Math.round((options.aicWindow ?? 6e-3) / dt));
  return { short, long, aic };
}

export function isDead(t: PickTrace): boolean {
  if (t.dead) return true;
  const first = t.data[0];
  for (let k = 1; k < t.data.length; k++) if (t.data[k] !== first) return false;
  return true;
}

/** Picks one trace on its own: STA/LTA trigger, then AIC. */
export function pickTrace(t: PickTrace, options: PickOptions = {}): TracePick {
  if (isDead(t)) return { confidence: 0, status: 'dead' };
  const { short, long, aic } = windows(t, options);
  // Only samples at or after the shot can hold a first break.
  const shot = Math.max(0, Math.ceil(-t.delay / t.sampleInterval));
  const trigger = staLtaTriggerOn(t.data, short, long, options.threshold ?? 4, Math.min(short, Math.max(2, shot)), shot);
  if (trigger === undefined) return { confidence: 0, status: 'no clear onset' };
  // The AIC window reaches well past the trigger so that the signal part is not just the rise.
  const end = Math.min(t.data.length, trigger + 2 * aic);
  const start = Math.max(0, Math.min(shot, trigger) - long);
  const found = aicOnset(t.data, start, end);
  if (found === undefined) return { confidence: 0, status: 'no clear onset' };
  const onset = refineOnset(t.data, Math.max(found.onset, shot), short, shot);
  return described(t, onset, short, 'picked');
}

/**
 * Moves an AIC onset to where the first arrival leaves zero. AIC marks where the signal becomes
 * distinguishable from the noise, a few samples into an emergent arrival. A ramp, zero before an
 * onset k₀ and a·(k − k₀) after it, is fitted by least squares to the samples from two STA
 * windows before the AIC onset up to where the first arrival first reaches 60 % of its largest
 * amplitude in the next three STA windows; k₀ is searched on whole samples, then in quarter
 * samples around the best. For a sine-like onset the ramp errs by under a sample.
 *
 * @returns the onset as a fractional sample index, never before `earliest`
 */
export function refineOnset(data: Float32Array, onset: number, short: number, earliest: number): number {
  const limit = Math.min(data.length, onset + 3 * short);
  let largest = 0;
  let sign = 1;
  for (let k = onset; k < limit; k++) {
    if (Math.abs(data[k]) > largest) { largest = Math.abs(data[k]); sign = Math.sign(data[k]) || 1; }
  }
  if (largest === 0) return onset;
  let reach = onset;
  while (reach < limit - 1 && sign * data[reach] < 0.6 * largest) reach++;
  const first = Math.max(earliest, onset - 2 * short);
  if (reach - first < 6) return onset;
  const rampRss = (k0: number) => {
    let su = 0, sux = 0, sxx = 0;
    for (let k = first; k <= reach; k++) {
      const v = sign * data[k];
      sxx += v * v;
      const u = k > k0 ? k - k0 : 0;
      su += u * u;
      sux += u * v;
    }
    return su > 0 ? sxx - (sux * sux) / su : sxx;
  };
  let best = onset;
  let bestRss = Infinity;
  for (let k0 = first; k0 < reach - 2; k0++) {
    const r = rampRss(k0);
    if (r < bestRss) { bestRss = r; best = k0; }
  }
  // Quarter samples around the best whole sample, within the searched range.
  const centre = best;
  for (let step = -0.75; step <= 0.75; step += 0.25) {
    const k0 = centre + step;
    if (k0 < first || k0 > reach - 2) continue;
    const r = rampRss(k0);
    if (r < bestRss) { bestRss = r; best = k0; }
  }
  return Math.max(earliest, best);
}

/**
 * AIC in a window around a predicted time, for a second look; the window starts no earlier than
 * `earliest` (seconds after the shot) when given.
 */
export function pickNear(t: PickTrace, predicted: number, halfWidth: number, options: PickOptions, earliest = -Infinity): TracePick | undefined {
  if (isDead(t)) return undefined;
  const { short } = windows(t, options);
  const centre = Math.round((predicted - t.delay) / t.sampleInterval);
  const half = Math.round(halfWidth / t.sampleInterval);
  const start = Math.max(0, centre - half, Number.isFinite(earliest) ? Math.ceil((earliest - t.delay) / t.sampleInterval) : 0);
  const end = Math.min(t.data.length, centre + half);
  const found = aicOnset(t.data, start, end);
  if (found === undefined) return undefined;
  const shot = Math.max(0, Math.ceil(-t.delay / t.sampleInterval));
  return described(t, refineOnset(t.data, found.onset, short, Math.max(start, shot)), short, 'picked');
}

export function described(t: PickTrace, fractionalOnset: number, short: number, status: PickStatus): TracePick {
  const n = t.data.length;
  const onset = Math.min(n - 1, Math.max(0, Math.round(fractionalOnset)));
  const meanSquare = (from: number, to: number) => {
    let sum = 0;
    for (let k = from; k < to; k++) sum += t.data[k] * t.data[k];
    return sum / Math.max(1, to - from);
  };
  const noise = Math.sqrt(meanSquare(Math.max(0, onset - short), onset));
  const signal = Math.sqrt(meanSquare(onset, Math.min(n, onset + short)));
  const snr = noise > 0 ? signal / noise : signal > 0 ? 100 : 0;
  return { time: t.delay + fractionalOnset * t.sampleInterval, confidence: Math.max(0, Math.min(1, 1 - Math.exp(-(snr - 1) / 3))), status, snr };
}
