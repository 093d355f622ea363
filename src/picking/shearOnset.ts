import { aicOnset } from './aic.js';
import { described, isDead, refineOnset, windows, type PickOptions, type PickTrace, type TracePick } from './autoPick.js';

/**
 * Least ratio of the S time to the P time at one receiver. Every path's S time is Vp/Vs times its
 * P time, and Vp/Vs = √((2 − 2ν)/(1 − 2ν)) ≥ √2 for Poisson's ratio ν ≥ 0 (elasticity; soils and
 * rocks have ν from about 0.1 to 0.5), so the first S arrival comes at least √2 times as late as
 * the first P arrival. 1.3 leaves room for picking error in the P time.
 */
export const SHEAR_AFTER_P = 1.3;

/**
 * Amplitude jump that marks the S onset: the short-window RMS must exceed this multiple of the
 * largest short-window RMS since the P arrival. On horizontal geophones facing an SH source the P
 * arrives at about 0.1 to 0.5 of the S amplitude (common practice), so the S is twice the P or
 * more; 1.65 leaves room for the P coda and noise adding to the S.
 */
export const SHEAR_JUMP = 1.65;

/**
 * The S-wave onset on one trace of an SH record, after its P arrival:
 * 1. the search starts at SHEAR_AFTER_P × the P time (the P arrival and what precedes it are passed
 *    over: the picker never stops at the first energy above the noise);
 * 2. an amplitude-jump trigger, the energy-ratio idea of STA/LTA (Allen 1978) and of the modified
 *    energy ratio (Wong et al. 2009, CREWES Research Report 21) with the "long" window replaced by
 *    the largest short-window RMS since the P arrival: the first window whose RMS exceeds
 *    SHEAR_JUMP times that and three times the noise RMS before the P;
 * 3. the AIC picker (Maeda 1985; Sleeman & van Eck 1999) in a window that begins after the P
 *    arrival and reaches two AIC windows past the trigger, so its noise part is the P coda;
 * 4. the ramp fit of `refineOnset` to the first rise of the S.
 * The later, stronger surface wave is not reached: the trigger stops at the first jump.
 *
 * @param t - the trace
 * @param pTime - the P arrival at this trace, in seconds after the shot (undefined: not seen; the
 *   search then starts at the shot)
 * @returns the pick (time in seconds after the shot), or status 'no clear onset'
 */
export function shearOnset(t: PickTrace, pTime: number | undefined, options: PickOptions = {}): TracePick {
  if (isDead(t)) return { confidence: 0, status: 'dead' };
  const dt = t.sampleInterval;
  const { short, aic } = windows(t, options);
  const n = t.data.length;
  const shot = Math.max(0, Math.ceil(-t.delay / dt));
  const index = (time: number) => Math.round((time - t.delay) / dt);
  const pIndex = pTime === undefined ? shot : Math.max(shot, Math.min(n - 1, index(pTime)));
  const start = pTime === undefined ? shot : Math.max(pIndex + 1, Math.min(n - 1, index(SHEAR_AFTER_P * pTime)));
  if (start + 2 * short >= n) return { confidence: 0, status: 'no clear onset' };
  // Noise RMS before the P arrival (or before the shot when the P was not seen).
  let noiseSum = 0;
  const noiseFrom = Math.max(0, pIndex - 4 * Math.max(short, 1) * 4);
  for (let k = noiseFrom; k < pIndex; k++) noiseSum += t.data[k] * t.data[k];
  const noise = pIndex > noiseFrom ? Math.sqrt(noiseSum / (pIndex - noiseFrom)) : 0;
  // Short-window RMS as a running sum: rms(k) over [k, k + short).
  let windowSum = 0;
  const from = Math.max(0, pIndex - short);
  for (let k = from; k < from + short; k++) windowSum += t.data[k] * t.data[k];
  const rms = new Float64Array(n);
  for (let k = from; k + short <= n; k++) {
    rms[k] = Math.sqrt(windowSum / short);
    windowSum -= t.data[k] * t.data[k];
    if (k + short < n) windowSum += t.data[k + short] * t.data[k + short];
  }
  let largest = 0;
  let trigger = -1;
  for (let k = from; k + short <= n; k++) {
    // The reference is the largest window that ends before window k starts.
    const behind = k - short;
    if (behind >= from) largest = Math.max(largest, rms[behind]);
    if (k >= start && rms[k] > SHEAR_JUMP * largest && rms[k] > 3 * noise && rms[k] > 0) { trigger = k; break; }
  }
  if (trigger < 0) return { confidence: 0, status: 'no clear onset' };
  const aicStart = Math.max(start - short, pIndex + 1, trigger - Math.max(4 * short, Math.round(0.02 / dt)));
  const found = aicOnset(t.data, aicStart, Math.min(n, trigger + short + 2 * aic));
  if (found === undefined) return { confidence: 0, status: 'no clear onset' };
  const onset = refineOnset(t.data, Math.max(found.onset, start), short, start);
  return described(t, onset, short, 'picked');
}

/** Largest absolute sample between two times (seconds after the shot), 0 for an empty span. */
export function peakBetween(t: PickTrace, from: number, to: number): number {
  const first = Math.max(0, Math.round((from - t.delay) / t.sampleInterval));
  const last = Math.min(t.data.length, Math.round((to - t.delay) / t.sampleInterval));
  let peak = 0;
  for (let k = first; k < last; k++) peak = Math.max(peak, Math.abs(t.data[k]));
  return peak;
}

/**
 * Whether a first break is the weaker P ahead of the S: an S onset is found after it
 * (`shearOnset`) and the S peak over three STA windows is at least SHEAR_OVER_P times the first
 * break's peak over the same span (or up to the S, if sooner); a first break not followed by an
 * arrival that much stronger is taken to be the S itself, its P lost in the noise.
 */
export function precedesShear(t: PickTrace, firstBreak: number, options: PickOptions = {}): boolean {
  return shearAfter(t, firstBreak, options) !== undefined;
}

/**
 * Least ratio of the S peak to the first break's peak for the first break to be taken as a P: on
 * SH records the P comes at 0.1 to 0.5 of the S (common practice), so the S is twice the P or
 * more; 1.5 leaves room for noise on both peaks.
 */
export const SHEAR_OVER_P = 1.5;

/** The S onset by which `precedesShear` shows a first break to be a P (seconds after the shot), or undefined. */
export function shearAfter(t: PickTrace, firstBreak: number, options: PickOptions = {}): number | undefined {
  const s = shearOnset(t, firstBreak, options);
  if (s.time === undefined) return undefined;
  const span = 3 * windows(t, options).short * t.sampleInterval;
  return peakBetween(t, s.time, s.time + span) >= SHEAR_OVER_P * peakBetween(t, firstBreak, Math.min(s.time, firstBreak + span)) ? s.time : undefined;
}
