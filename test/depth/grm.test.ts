import { describe, expect, it } from 'vitest';
import type { Layer } from '../../src/core/types.js';
import { WarningLog } from '../../src/core/warnings.js';
import { grm, velocityAnalysisCheck } from '../../src/depth/grm.js';
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

// Palmer's (1980) velocity-analysis function over a plane dipping refractor. Head-wave time over a
// plane refractor dipping δ under flat ground (Telford, Geldart & Sheriff 1990, §4.2.3, eq. 4.37
// rearranged): t = x cos δ / V2 + (h_s + h_r) cos θc / V1, h the perpendicular depths. With
// forward source A, reverse source B, X = G − XY/2, Y = G + XY/2 and h_Y − h_X = XY sin δ:
//   t_V = (t_AY − t_BX + t_AB) / 2 = G cos δ / V2 + h_A cos θc / V1 + XY sin δ cos θc / (2 V1),
// a straight line in G of slope cos δ / V2 for every XY: V′ = V2 / cos δ exactly (by hand).
describe('velocity analysis over a plane dipping refractor (Palmer 1980)', () => {
  const v1 = 600;
  const v2 = 2400;
  const dip = (4 * Math.PI) / 180;
  const perpendicular = (x: number) => (10 + Math.tan(dip) * x) * Math.cos(dip);
  const k = Math.cos(Math.asin(v1 / v2)) / v1;
  const head = (sx: number, rx: number) => (Math.abs(rx - sx) * Math.cos(dip)) / v2 + (perpendicular(sx) + perpendicular(rx)) * k;
  const xs = range(48, 2);
  const curve = (sourceId: string, sourceX: number) => ({ sourceId, sourceX, xs, times: xs.map((x) => head(sourceX, x)), phantomXs: [], shiftOverlaps: [] });
  const pair = { forward: curve('A', 0), reverse: curve('B', 94), reciprocal: head(0, 94), reciprocalReadings: 2 };
  const profile = grm(pair, 1, 2, 0.3e-3, () => 4)!;

  it('grm(plane dipping 4°, closed-form times) reads V′ = V2 / cos δ = 2405.86 m/s within 0.01 %, with a standard error under 0.1 m/s', () => {
    const expected = v2 / Math.cos(dip); // 2400 / 0.997564 = 2405.86 m/s
    expect(Math.abs(profile.velocity!.velocity / expected - 1)).toBeLessThan(1e-4);
    expect(profile.velocity!.se).toBeLessThan(0.1);
  });

  it('grm(plane dipping 4°): the velocity-analysis function has the same slope at every XY tried (within 0.01 %)', () => {
    const trials = profile.info.xy_trials as { xy_m: number; velocity_mps: number }[];
    expect(trials.length).toBeGreaterThan(10);
    for (const t of trials) expect(Math.abs(t.velocity_mps / (v2 / Math.cos(dip)) - 1)).toBeLessThan(1e-4);
  });
});

describe('velocityAnalysisCheck (the layer velocity against the velocity analysis)', () => {
  const refractor = (velocity: number, se: number) => ({
    index: 1, method: 'GRM', points: [], pointMethods: [], byMethod: {},
    methodInfo: { GRM: { velocity_mps: velocity, velocity_se_mps: se, optimum_xy_m: 4, velocity_analysis_stations: 40, source_forward: 'S1', source_reverse: 'S5' } },
  });
  const layers = (velocity: number, se: number) => [{ index: 1, velocity: 500, velocitySe: 5 }, { index: 2, velocity, velocitySe: se }] as Layer[];
  const run = (va: [number, number], layer: [number, number]) => {
    const log = new WarningLog();
    const [check] = velocityAnalysisCheck([refractor(...va)], layers(...layer), log);
    return { check, warned: log.withCode('velocity-analysis-differs') };
  };

  it('velocityAnalysisCheck warns, naming both values, when they differ by 7.7 % and 5.6 combined standard errors', () => {
    // 2400 ± 20 against 2600 ± 30: 200 m/s apart, √(20² + 30²) = 36 m/s, 200 / 2600 = 7.7 %.
    const { check, warned } = run([2400, 20], [2600, 30]);
    expect(check.agrees).toBe(false);
    expect(check.difference).toBeCloseTo(-200 / 2600, 6);
    expect(warned).toHaveLength(1);
    expect(warned[0].message).toMatch(/gives 2400 m\/s ± 20 m\/s for layer 2, against the layer velocity of 2600 m\/s ± 30 m\/s/);
    expect(warned[0].layer).toBe(2);
  });

  it('velocityAnalysisCheck does not warn under 5 % (3.2 %, 7 standard errors) nor within the combined error (6.7 %, 0.9 of 180 m/s)', () => {
    expect(run([2400, 5], [2480, 10]).warned).toHaveLength(0);
    // 2400 ± 150 against 2560 ± 100: 160 m/s apart, combined √(150² + 100²) = 180 m/s.
    expect(run([2400, 150], [2560, 100]).warned).toHaveLength(0);
    // The same values with smaller errors (combined 141 m/s) do warn.
    expect(run([2400, 100], [2560, 100]).warned).toHaveLength(1);
  });
});
