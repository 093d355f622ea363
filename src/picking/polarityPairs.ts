import { pickRecord, windows, type PickOptions, type PickTrace } from './autoPick.js';
import { pickShearRecord, type ShearPickResult } from './pickShearRecord.js';

/** What became of the records of one SH shot position. */
export interface PairCheck {
  /** 'pair': opposite S polarities, subtracted; 'stack': same polarity, summed. */
  combined: 'pair' | 'stack';
  /** Energy of the difference over energy of the sum, after the shot (above 1: S reversed). */
  differenceToSum: number;
  /**
   * For a pair: the P left in the difference as a fraction of the P in the sum, RMS over the P
   * windows less the noise (0: cancelled); undefined where no P was seen to judge by.
   */
  pResidual?: number;
}

export interface PairResult extends ShearPickResult {
  check: PairCheck;
}

/** Sample-by-sample a + sign·b of matched traces (same length, interval and delay). */
function combine(a: PickTrace[], b: PickTrace[], sign: 1 | -1): PickTrace[] {
  return a.map((t, i) => {
    const data = new Float32Array(t.data.length);
    for (let k = 0; k < data.length; k++) data[k] = t.data[k] + sign * b[i].data[k];
    return { ...t, data, dead: t.dead || b[i].dead };
  });
}

function energy(traces: PickTrace[]): number {
  let sum = 0;
  for (const t of traces) {
    const shot = Math.max(0, Math.ceil(-t.delay / t.sampleInterval));
    for (let k = shot; k < t.data.length; k++) sum += t.data[k] * t.data[k];
  }
  return sum;
}

/**
 * The S picks of a shot recorded twice with the beam struck from opposite sides (a polarity
 * pair): striking the other end reverses the S (and the SH surface wave) and leaves the P as it
 * was, so the difference of the two records doubles the S and cancels the P, and their sum keeps
 * the P and cancels the S (common practice for SH refraction). The P first breaks are picked on
 * the sum, the S on the difference (`pickShearRecord`). When the difference is weaker than the sum
 * the S was not reversed: the records are stacked (summed) and picked as one record instead.
 * The P left in the difference is measured over the P windows (from the P time to halfway to the
 * S, at most three STA windows), against the P of the sum, both less their noise before the P.
 *
 * @param a - traces of one record; b - the other record's traces at the same receivers, in order
 * @throws RangeError when the records do not match trace for trace
 */
export function pickPolarityPair(a: PickTrace[], b: PickTrace[], options: PickOptions = {}): PairResult {
  if (a.length !== b.length || a.some((t, i) => t.data.length !== b[i].data.length || t.sampleInterval !== b[i].sampleInterval || t.delay !== b[i].delay || t.offset !== b[i].offset)) {
    throw new RangeError('the two records of a polarity pair must have the same receivers, sample count, sample interval and delay, trace for trace');
  }
  const difference = combine(a, b, -1);
  const sum = combine(a, b, 1);
  const differenceToSum = energy(difference) / Math.max(energy(sum), 1e-30);
  if (differenceToSum < 1) {
    return { ...pickShearRecord(sum, options), check: { combined: 'stack', differenceToSum } };
  }
  // The sum holds the P alone; where it shows too little of it, the records' own first breaks.
  const sumBreaks = pickRecord(sum, options);
  // Clear onsets (signal-to-noise about 3 or more) on a third of the traces: noise alone does not do that.
  const enough = sumBreaks.filter((p) => (p.status === 'picked' || p.status === 'repicked') && (p.snr ?? 0) >= 3).length >= Math.max(6, sum.length / 3);
  const result = enough ? pickShearRecord(difference, options, sumBreaks) : pickShearRecord(difference, options, pickShearRecord(a, options).pTimes.map((time) => (time === undefined ? { confidence: 0, status: 'no clear onset' as const } : { time, confidence: 1, status: 'picked' as const })));
  return { ...result, check: { combined: 'pair', differenceToSum, pResidual: pResidual(difference, sum, result, options) } };
}

function pResidual(difference: PickTrace[], sum: PickTrace[], result: ShearPickResult, options: PickOptions): number | undefined {
  let dSignal = 0, sSignal = 0, dNoise = 0, sNoise = 0, nSignal = 0, nNoise = 0;
  difference.forEach((t, i) => {
    const p = result.pTimes[i];
    const s = result.picks[i].time;
    if (p === undefined || s === undefined || p <= 0) return;
    const dt = t.sampleInterval;
    const { short } = windows(t, options);
    const from = Math.round((p - t.delay) / dt);
    const to = Math.min(from + 3 * short, Math.round(((p + s) / 2 - t.delay) / dt));
    const noiseFrom = Math.max(0, from - 4 * short);
    if (to - from < 4 || from - noiseFrom < 4) return;
    for (let k = from; k < to; k++) { dSignal += t.data[k] ** 2; sSignal += sum[i].data[k] ** 2; nSignal++; }
    for (let k = noiseFrom; k < from; k++) { dNoise += t.data[k] ** 2; sNoise += sum[i].data[k] ** 2; nNoise++; }
  });
  if (nSignal === 0 || nNoise === 0) return undefined;
  const pSum = Math.sqrt(Math.max(0, sSignal / nSignal - sNoise / nNoise));
  const pDifference = Math.sqrt(Math.max(0, dSignal / nSignal - dNoise / nNoise));
  // No P above the noise in the sum: nothing to judge the cancellation by.
  const sumNoise = Math.sqrt(sNoise / nNoise);
  if (pSum < sumNoise) return pDifference >= Math.sqrt(dNoise / nNoise) ? pDifference / sumNoise : undefined;
  return pDifference / pSum;
}
