import { describe, expect, it } from 'vitest';
import { residualPattern } from '../../src/forward/residualPattern.js';
import { seededNormal } from '../reference/layeredTravelTimes.js';

// The lag-1 autocorrelation r1 = Σ e_i e_{i+1} / Σ e_i² and its test statistic z = r1 √n, about
// standard normal for independent residuals (Box & Pierce 1970, J. Am. Stat. Assoc. 65,
// 1509-1526). For a first-order autoregressive series e_i = φ e_{i-1} + a_i the lag-1
// autocorrelation is φ (Box & Jenkins 1976, Time Series Analysis, §3.2.4).
const rows = (sourceId: string, values: number[]) => values.map((difference, i) => ({ sourceId, receiverX: i * 2, row: i + 2, difference }));

describe('residualPattern', () => {
  it('residualPattern(independent Gaussian residuals, 20 draws of 4 sources × 96) keeps |z| below 3.5 on every draw', () => {
    for (let seed = 1; seed <= 20; seed++) {
      const normal = seededNormal(seed);
      const residuals = ['S1', 'S2', 'S3', 'S4'].flatMap((id) => rows(id, Array.from({ length: 96 }, () => 3e-4 * normal())));
      const p = residualPattern(residuals)!;
      expect(p.n).toBe(384);
      expect(Math.abs(p.z), `draw ${seed}`).toBeLessThan(3.5);
    }
  });

  it('residualPattern(AR(1) with φ = 0.6, 4 sources × 500) gives r1 within 0.05 of 0.6 and z = r1 √2000', () => {
    const normal = seededNormal(7);
    const ar = () => { let e = 0; return Array.from({ length: 500 }, () => (e = 0.6 * e + normal())); };
    const p = residualPattern(['A', 'B', 'C', 'D'].flatMap((id) => rows(id, ar())))!;
    expect(Math.abs(p.r1 - 0.6)).toBeLessThan(0.05);
    expect(p.z).toBeCloseTo(p.r1 * Math.sqrt(2000), 9);
  });

  it('residualPattern orders each source\'s residuals along x and does not run across sources', () => {
    // Alternating signs along x (r1 near −1 per source) given out of order, two sources end to end
    // with the same sign at the join: a lag across the join or in row order would change r1.
    const shuffled = [3, 0, 2, 1, 5, 4].map((i) => ({ sourceId: 'S1', receiverX: i, row: i, difference: i % 2 === 0 ? 1 : -1 }));
    const second = [0, 1, 2, 3, 4, 5].map((i) => ({ sourceId: 'S2', receiverX: i, row: 10 + i, difference: i % 2 === 0 ? -1 : 1 }));
    const filler = Array.from({ length: 10 }, (_, i) => ({ sourceId: `F${i}`, receiverX: 0, row: 100 + i, difference: 0 }));
    const p = residualPattern([...shuffled, ...second, ...filler])!;
    // 5 products of −1 per source, over 12 squares of 1: r1 = −10/12, by hand.
    expect(p.r1).toBeCloseTo(-10 / 12, 12);
  });

  it('residualPattern of fewer than 20 residuals is undefined', () => {
    expect(residualPattern(rows('S1', Array.from({ length: 19 }, (_, i) => i)))).toBeUndefined();
  });
});
