import { median } from '../core/stats.js';
import type { FirstBreak } from '../core/types.js';

/**
 * Pick noise from second differences of neighbouring picks: along each source's picks on one side,
 * at three equally spaced geophones, t₀ − 2t₁ + t₂ removes any straight or gently curving arrival
 * and leaves noise of variance 6σ² (independent picks); σ = 1.4826 · MAD / √6 is robust to the few
 * triples that straddle a crossover. Relief of a refractor cannot inflate it the way it inflates a
 * line fit.
 *
 * @returns the noise in seconds, and where it came from; 0.5 ms (common practice for hammer
 *   records) when fewer than 10 triples are available
 */
export function secondDifferenceNoise(picks: FirstBreak[]): { noise: number; source: string } {
  const bySide = new Map<string, FirstBreak[]>();
  for (const p of picks) {
    const key = `${p.sourceId}\u0000${p.receiverX >= p.sourceX ? '+' : '-'}`;
    if (!bySide.has(key)) bySide.set(key, []);
    bySide.get(key)!.push(p);
  }
  const seconds: number[] = [];
  for (const side of bySide.values()) {
    side.sort((a, b) => a.receiverX - b.receiverX);
    for (let i = 1; i + 1 < side.length; i++) {
      const left = side[i].receiverX - side[i - 1].receiverX;
      const right = side[i + 1].receiverX - side[i].receiverX;
      if (!(left > 0) || Math.abs(left - right) > 0.01 * left) continue;
      seconds.push(side[i - 1].time - 2 * side[i].time + side[i + 1].time);
    }
  }
  if (seconds.length < 10) return { noise: 0.5e-3, source: 'assumed 0.5 ms (too few neighbouring picks to estimate it)' };
  // The triples that straddle a crossover carry the change of slope, not noise: they are set aside
  // (beyond 3.5 standard deviations, which leaves a Gaussian all but untouched) and the MAD taken again.
  let kept = seconds;
  let sigma = Infinity;
  for (let round = 0; round < 4; round++) {
    const centre = median(kept)!;
    const mad = median(kept.map((d) => Math.abs(d - centre)))!;
    sigma = 1.4826 * mad;
    const next = kept.filter((d) => Math.abs(d - centre) <= 3.5 * sigma);
    if (next.length === kept.length || next.length < 10) break;
    kept = next;
  }
  const noise = Math.max(0.02e-3, sigma / Math.sqrt(6));
  return { noise, source: `second differences of ${seconds.length} neighbouring-pick triples` };
}
