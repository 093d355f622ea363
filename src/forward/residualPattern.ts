import type { ForwardCheck } from './forwardCheck.js';

/**
 * Above this, the lag-1 autocorrelation of the forward-check residuals along the branches is
 * taken as a pattern noise would not leave: z = r₁ √n is about standard normal for independent
 * residuals (Box & Pierce 1970, J. Am. Stat. Assoc. 65, 1509-1526), so z > 5 has a chance of about
 * 3 × 10⁻⁷ under pure noise. Measured on the sweep (test/reference/sweep, seeds 1-108): above 5 on
 * 3 of 90 fully right lines (relief the smoothed section rounds off) and on 4 of 17 wrong ones,
 * each of those 4 without a forward-misfit warning (a missed middle layer on 67 and 79, rock
 * velocity 9-11 % low on 99 and 106).
 */
export const PATTERN_Z = 5;

/** The lag-1 autocorrelation of the residuals along each source's line of geophones, pooled. */
export interface ResidualPattern {
  /** Σ e_i e_{i+1} / Σ e_i² over consecutive geophones of each source, pooled over sources. */
  r1: number;
  /** r1 √n, n the residuals: about standard normal when the residuals are independent. */
  z: number;
  n: number;
}

/**
 * Lag-1 autocorrelation of the forward check's residuals (pick minus computed), taken along the
 * line source by source (geophones in order of x) and pooled: independent pick errors leave it
 * near zero, a section that misses a layer, a bend of a refractor or a change of velocity leaves
 * runs of residuals of one sign (Box & Pierce 1970). Undefined for fewer than 20 residuals.
 */
export function residualPattern(residuals: ForwardCheck['residuals']): ResidualPattern | undefined {
  const bySource = new Map<string, { x: number; e: number }[]>();
  for (const r of residuals) {
    const list = bySource.get(r.sourceId) ?? [];
    list.push({ x: r.receiverX, e: r.difference });
    bySource.set(r.sourceId, list);
  }
  let lagged = 0;
  let squares = 0;
  let n = 0;
  for (const list of bySource.values()) {
    list.sort((a, b) => a.x - b.x);
    list.forEach((p, i) => {
      squares += p.e * p.e;
      n++;
      if (i > 0) lagged += p.e * list[i - 1].e;
    });
  }
  if (n < 20 || !(squares > 0)) return undefined;
  const r1 = lagged / squares;
  return { r1, z: r1 * Math.sqrt(n), n };
}
