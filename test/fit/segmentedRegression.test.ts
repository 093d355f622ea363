import { describe, expect, it } from 'vitest';
import { segmentedRegression } from '../../src/fit/segmentedRegression.js';
import { seededNormal } from '../reference/layeredTravelTimes.js';
import { csvFrom, interpretCsv, range } from '../helpers.js';

// Two lines meeting at x = 20: t = x/500 before, t = 0.03 + x/2500 after (0.04 = 0.03 + 20/2000... by construction).
const twoLines = (x: number) => Math.min(x / 500, 0.032 + x / 2500);

describe('segmentedRegression', () => {
  const x = range(40, 1, 1);

  it('segmentedRegression finds the breakpoint of two exact lines and their slopes', () => {
    const fit = segmentedRegression(x, x.map(twoLines))!;
    expect(fit.segments).toHaveLength(2);
    expect(1 / fit.segments[0].slope).toBeCloseTo(500, 3);
    expect(1 / fit.segments[1].slope).toBeCloseTo(2500, 3);
    // The lines cross where x/500 = 0.032 + x/2500: x = 0.032 / (1/500 − 1/2500) = 20 m, by hand.
    expect(fit.segments[1].knot!).toBeCloseTo(20, 3);
  });

  it('segmentedRegression gives standard errors that cover the scatter of noisy fits (about 68 % within 1 SE)', () => {
    const normal = seededNormal(3);
    let within = 0;
    const trials = 200;
    for (let t = 0; t < trials; t++) {
      const fit = segmentedRegression(x, x.map((xi) => twoLines(xi) + 0.0003 * normal()), { segments: 2 })!;
      if (Math.abs(fit.segments[1].slope - 1 / 2500) < fit.segments[1].slopeSe) within++;
    }
    // A normal estimate lies within one standard error 68.3 % of the time; 200 trials give ±3.3 % (1σ).
    expect(within / trials).toBeGreaterThan(0.58);
    expect(within / trials).toBeLessThan(0.78);
  });

  it('segmentedRegression flags a late pick as an outlier and leaves it out', () => {
    const y = x.map(twoLines);
    y[30] += 0.004;
    const fit = segmentedRegression(x, y)!;
    expect(fit.outliers).toEqual([30]);
    expect(1 / fit.segments[1].slope).toBeCloseTo(2500, 0);
  });

  it('segmentedRegression honours a fixed segment count and fixed breakpoints', () => {
    const y = x.map(twoLines);
    expect(segmentedRegression(x, y, { segments: 1 })!.segments).toHaveLength(1);
    const fixed = segmentedRegression(x, y, { breakpoints: [25] })!;
    expect(fixed.chosenBy).toBe('user');
    expect(fixed.segments[1].start).toBe(x.indexOf(25));
  });

  it('segmentedRegression forces the first segment through the origin when asked', () => {
    const y = x.map((xi) => twoLines(xi) + 0.001);
    const fit = segmentedRegression(x, y, { firstThroughOrigin: true })!;
    expect(fit.segments[0].intercept).toBe(0);
    expect(fit.segments[0].throughOrigin).toBe(true);
  });

  it('segmentedRegression returns undefined for fewer than three points and rejects a bad segment count', () => {
    expect(segmentedRegression([1, 2], [1, 2])).toBeUndefined();
    expect(() => segmentedRegression(x, x.map(twoLines), { segments: 5 })).toThrow(RangeError);
  });
});

describe('interpret and velocity inversions', () => {
  it('interpret keeps a branch slowing down with offset when the data insist, with a warning', () => {
    // A fast layer over a slower one seen laterally: the far half of the line is slower (a lateral change).
    const time = (s: number, r: number) => { const d = Math.abs(r - s); return d <= 20 ? d / 1500 : 20 / 1500 + (d - 20) / 600; };
    const { log } = interpretCsv(csvFrom([-0.5], range(40, 1), time));
    expect(log.withCode('apparent-velocity-decrease')).toHaveLength(1);
  });

  it('interpret warns of a refractor slower than the layer above and computes no depth to it', () => {
    const time = (s: number, r: number) => { const d = Math.abs(r - s); return d <= 20 ? d / 1500 : 20 / 1500 + (d - 20) / 600; };
    const { result, log } = interpretCsv(csvFrom([-0.5, 40.5], range(41, 1), time));
    expect(log.withCode('velocity-inversion')).toHaveLength(1);
    expect(log.withCode('velocity-inversion')[0].message).toMatch(/is not faster than layer 1/);
    expect(result.refractors).toHaveLength(0);
  });

  it('interpret warns that a P refractor near 1500 m/s may be the water table (common practice)', () => {
    const h = 4;
    const time = (s: number, r: number) => { const d = Math.abs(r - s); return Math.min(d / 400, d / 1520 + (2 * h * Math.sqrt(1 - (400 / 1520) ** 2)) / 400); };
    const { log } = interpretCsv(csvFrom([-0.5, 47.5], range(48, 1), time));
    expect(log.withCode('water-table')[0].message).toMatch(/may be the water table/);
  });
});

describe('interpret without a sampled direct wave', () => {
  it('interpret says the top-layer velocity is unknown and gives no depth when no branch has a direct-wave segment', () => {
    // 5 m geophone spacing over rock at 2 m (500 over 2500 m/s): the crossover, 2h·sqrt((V2+V1)/(V2−V1)) =
    // 4·1.22 = 4.9 m (Telford et al. 1990, eq. 4.29, by hand), comes before the first geophone.
    const time = (s: number, r: number) => { const d = Math.abs(r - s); return Math.min(d / 500, d / 2500 + (2 * 2 * Math.sqrt(1 - 0.04)) / 500); };
    const { result, log } = interpretCsv(csvFrom([-2.5, 117.5], range(24, 5), time));
    expect(log.withCode('no-direct-wave')[0].message).toMatch(/top-layer velocity is unknown and no depth can be computed/);
    expect(result.refractors).toHaveLength(0);
    expect(result.layers.some((l) => l.index === 1)).toBe(false);
  });
});
