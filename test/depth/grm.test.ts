import { describe, expect, it } from 'vitest';
import { flatFirstArrival } from '../reference/flatLayerTimes.js';
import { csvFrom, interpretCsv, range } from '../helpers.js';

// The geometric XY of the generalized reciprocal method over flat layers: XY = 2 Σⱼ zⱼ tan θⱼ with
// sin θⱼ = Vⱼ / V′ (Palmer 1980, The Generalized Reciprocal Method of Seismic Refraction
// Interpretation, SEG; from memory). Over flat layers the XY = 0 time-depths are exact, so on
// exact first breaks (Telford et al. 1990 §4.2, test/reference/flatLayerTimes.ts) the geometric
// XY is the formula's value to rounding.
function grmInfo(thicknesses: number[], velocities: number[], count: number) {
  const end = count - 1;
  const { result } = interpretCsv(csvFrom([-20, 0, end / 2, end, end + 20], range(count, 1), (s, r) => flatFirstArrival(thicknesses, velocities, r - s)));
  return result.refractors.map((r) => r.methodInfo['GRM']);
}

describe('GRM geometric XY (Palmer 1980)', () => {
  it('grm over 6 m of 600 m/s on 1500 m/s gives the geometric XY 2·6·tan(asin 0.4) = 5.237 m within 1 cm', () => {
    // tan(asin 0.4) = 0.4 / √(1 − 0.16) = 0.436436; 12 · 0.436436 = 5.2372 m, by hand
    // (sin instead of tan would give 4.80 m).
    const [info] = grmInfo([6], [600, 1500], 72);
    expect(Math.abs(Number(info.geometric_xy_m) - 5.2372)).toBeLessThan(0.01);
  });

  it('grm under two flat layers (4 m at 400, 8 m at 1200 over 3000 m/s) sums both layers: XY = 8.059 m within 1 cm', () => {
    // 2 (4 tan(asin(400/3000)) + 8 tan(asin(1200/3000))) = 2 (4 · 0.134535 + 8 · 0.436436)
    // = 2 (0.538138 + 3.491487) = 8.0592 m, by hand (sin: 7.467 m; the deeper layer alone: 6.983 m).
    const info = grmInfo([4, 8], [400, 1200, 3000], 96)[1];
    expect(Math.abs(Number(info.geometric_xy_m) - 8.0592)).toBeLessThan(0.01);
  });
});
