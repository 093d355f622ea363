import { compositeCurve, timeAt, type CompositeCurve, type HeadCurve } from './headWaves.js';

/** A pair of reversed sources for one refractor, with their (phantomed) head-wave curves. */
export interface ReversedPair {
  forward: CompositeCurve;
  reverse: CompositeCurve;
  /** Reciprocal time between the two sources along the refractor's head wave, in seconds. */
  reciprocal: number;
  /** How many of the two reciprocal readings were available (1 or 2). */
  reciprocalReadings: number;
}

/**
 * The reversed pair for plus-minus and GRM: the source inside the spread with the smallest x and a forward
 * head-wave branch, and the one with the largest x and a reverse one, each filled in by phantoming from the
 * other sources on its side (so the ends of the line are covered where off-end shots allow).
 *
 * @returns the pair, or a sentence saying why there is none
 */
export function reversedPair(curves: HeadCurve[], receiverRange: [number, number], spacing: number): ReversedPair | string {
  const [lo, hi] = receiverRange;
  const inside = (c: HeadCurve) => c.sourceX >= lo - spacing / 2 && c.sourceX <= hi + spacing / 2;
  const forward = curves.filter((c) => c.side === 'forward' && inside(c)).sort((a, b) => a.sourceX - b.sourceX)[0];
  const reverse = curves.filter((c) => c.side === 'reverse' && inside(c)).sort((a, b) => b.sourceX - a.sourceX)[0];
  if (forward === undefined || reverse === undefined) {
    return `no reversed pair: the refractor's head wave is seen ${forward ? 'only from sources shooting towards +x' : reverse ? 'only from sources shooting towards -x' : 'from no source inside the spread'}`;
  }
  if (!(reverse.sourceX > forward.sourceX)) return `no reversed pair: the source shooting towards -x (${reverse.sourceId}) is not beyond the one shooting towards +x (${forward.sourceId})`;
  const f = compositeCurve(forward, curves);
  const r = compositeCurve(reverse, curves);
  const readings = [timeAt(f, r.sourceX), timeAt(r, f.sourceX)].filter((t): t is number => t !== undefined);
  if (readings.length === 0) {
    return `no reciprocal time between ${forward.sourceId} and ${reverse.sourceId}: neither head-wave curve reaches the other source`;
  }
  return { forward: f, reverse: r, reciprocal: readings.reduce((a, b) => a + b, 0) / readings.length, reciprocalReadings: readings.length };
}
