import { describe, expect, it } from 'vitest';
import type { BranchFit, FirstBreak, Segment } from '../../src/core/types.js';
import { MIN_TRIPLES, pickNoise } from '../../src/model/pickNoise.js';
import { seededNormal } from '../reference/layeredTravelTimes.js';
import { range } from '../helpers.js';

// Checks of the pick-noise estimate against the statistics it rests on:
// - the second difference e = t₀ − 2t₁ + t₂ of independent picks of standard deviation σ on a
//   straight branch has variance 6σ² (for unequal gaps h₁, h₂ with r = h₂/h₁,
//   e = (t₂ − t₁) − r(t₁ − t₀) has variance σ²(1 + (1 + r)² + r²)), so σ ≈ √(Σe² / (6n)) for equal
//   gaps (the sum of the variances of independent terms; e.g. Rice 1984, Ann. Stat. 12, 1215, the
//   difference-based variance estimator);
// - the normal consistency factor of the median absolute deviation, σ ≈ 1.4826 MAD (Hampel 1974);
// - a difference of two independent picks has variance 2σ².
const spacing = 2;

function fit(offsets: number[], times: number[], segments: [number, number][], outlierRows: number[] = []): BranchFit {
  const picks = offsets.map((x, i) => ({ row: i + 2, receiverX: x, time: times[i] }) as FirstBreak);
  return {
    branch: { sourceId: 'S1', sourceX: 0, sourceElev: 0, side: 'forward', picks, offsets, distances: offsets, times },
    segments: segments.map(([start, end], k) => ({ order: k + 1, layer: k + 1, start, end }) as Segment),
    outlierRows,
    residualSd: 0,
    criterionBySegments: [],
    chosenBy: 'criterion',
  };
}

/** A straight branch t = t₀ + x / V with Gaussian pick noise σ. */
function straight(offsets: number[], sigma: number, seed: number, t0 = 0.004, v = 1500) {
  const normal = seededNormal(seed);
  return offsets.map((x) => t0 + x / v + sigma * normal());
}

describe('pickNoise: second differences', () => {
  it('recovers σ of Gaussian picks on straight branches within 6 %, and agrees with √(Σe² / 6n) within 6 %', () => {
    // 8 branches of 120 picks at 2 m: 944 triples. The MAD estimate of σ has a relative SE of
    // about 1.17/√n (asymptotic efficiency 37 %), some 4 % here with the overlap of neighbouring
    // triples; 6 % is a 1.5-SE band on a fixed seed. The same tolerance for the moment estimate.
    const sigma = 0.4e-3;
    const offsets = range(120, spacing, spacing);
    const fits = range(8, 1).map((s) => fit(offsets, straight(offsets, sigma, 101 + s), [[0, offsets.length]]));
    const noise = pickNoise(fits, spacing, [], 9e-3);
    expect(noise.source).toBe('second differences');
    expect(noise.secondDifferences!.count).toBe(8 * 118);
    expect(noise.sigma).toBeGreaterThan(sigma * 0.94);
    expect(noise.sigma).toBeLessThan(sigma * 1.06);
    let sum = 0;
    for (const f of fits) for (let i = 1; i + 1 < f.branch.times.length; i++) sum += (f.branch.times[i - 1] - 2 * f.branch.times[i] + f.branch.times[i + 1]) ** 2;
    const moment = Math.sqrt(sum / (6 * noise.secondDifferences!.count));
    expect(noise.sigma / moment).toBeGreaterThan(0.94);
    expect(noise.sigma / moment).toBeLessThan(1.06);
  });

  it('normalises unequal gaps by √(1 + (1 + r)² + r²): σ within 6 % on gaps alternating 2 m and 3 m', () => {
    // r alternates 1.5 and 2/3: the variance factors are 9.5 and 4.22 (against 6 for equal gaps),
    // so a wrong ratio or factor biases σ by 15-25 %.
    const sigma = 0.4e-3;
    const offsets: number[] = [];
    for (let x = 2, i = 0; offsets.length < 120; x += i++ % 2 === 0 ? 2 : 3) offsets.push(x);
    const fits = range(8, 1).map((s) => fit(offsets, straight(offsets, sigma, 201 + s), [[0, offsets.length]]));
    const noise = pickNoise(fits, spacing, [], 9e-3);
    expect(noise.secondDifferences!.count).toBe(8 * 118);
    expect(noise.sigma).toBeGreaterThan(sigma * 0.94);
    expect(noise.sigma).toBeLessThan(sigma * 1.06);
  });

  it('vanishes on a noise-free straight branch with unequal gaps and on a noise-free parabola (second differences all equal)', () => {
    // t = 4 ms + x / 1500: e = 0 exactly for any gaps (the slope cancels when r = h₂/h₁).
    const uneven = [2, 4, 7, 9, 12, 13, 15, 18, 20, 21, 24, 26];
    const line = uneven.map((x) => 0.004 + x / 1500);
    const a = pickNoise(range(4, 1).map(() => fit(uneven, line, [[0, uneven.length]])), spacing, [], 9e-3);
    expect(a.secondDifferences!.count).toBe(40);
    expect(a.secondDifferences!.sigma).toBeCloseTo(0, 12);
    // t = c x² at equal gaps: every e = 2c h², the same value, so its deviations from their median vanish.
    const even = range(12, spacing, spacing);
    const parabola = even.map((x) => 0.004 + 2e-6 * x * x);
    const b = pickNoise(range(4, 1).map(() => fit(even, parabola, [[0, even.length]])), spacing, [], 9e-3);
    expect(b.secondDifferences!.count).toBe(40);
    expect(b.secondDifferences!.sigma).toBeCloseTo(0, 12);
  });

  it('uses triples within one segment only, skips gaps over 1.5 spacings, outliers and the zero-offset pick', () => {
    // Two segments of 10 and 8 picks: 8 + 6 triples. A gap of 4 m (2 spacings) inside the first
    // removes the three triples that span it; an outlier row and a zero-offset pick are left out
    // before the triples are formed. Noise-free, so any triple across the kink, the gap, the
    // outlier or the zero-offset pick would show in σ (more than a third of the triples).
    const first = [0, 2, 4, 6, 8, 10, 14, 16, 18, 20, 22]; // zero offset first; the 10 -> 14 gap
    const second = [24, 26, 28, 30, 32, 34, 36, 38];
    const offsets = [...first, ...second];
    const times = offsets.map((x) => (x < 23 ? x / 600 : 0.02 + x / 2400));
    times[0] = 0.05; // the zero-offset pick, far off the line
    times[6] += 0.002; // a step of 2 ms after the gap: invisible when the gap is skipped
    for (let i = 7; i < first.length; i++) times[i] += 0.002;
    times[15] += 0.01; // an outlier, flagged by its row
    const f = fit(offsets, times, [[0, first.length], [first.length, offsets.length]], [15 + 2]);
    const noise = pickNoise([f, f], spacing, [], 9e-3);
    // First segment: 10 picks from 2 m (8 triples) less the 2 with the 10 -> 14 m gap as one of
    // their gaps. Second: 7 picks without the outlier (5 triples), whose removal leaves a 4 m gap:
    // less 2. Two copies of the branch.
    expect(noise.secondDifferences!.count).toBe(2 * (6 + 3));
    expect(noise.secondDifferences!.sigma).toBeCloseTo(0, 12);
  });

  it('skips a triple with a zero gap (two picks at one offset), whose ratio h₂/h₁ has no value', () => {
    // 12 picks with the offset 10 m twice: 10 triples, of which the 2 with the zero gap are left out.
    const offsets = [2, 4, 6, 8, 10, 10, 12, 14, 16, 18, 20, 22];
    const noise = pickNoise([fit(offsets, offsets.map((x) => 0.004 + x / 1500), [[0, offsets.length]])], spacing, [], 9e-3);
    expect(noise.secondDifferences!.count).toBe(8);
    expect(noise.secondDifferences!.sigma).toBeCloseTo(0, 12);
  });

  it(`takes the second differences from ${MIN_TRIPLES} triples on, the reciprocal times below that`, () => {
    const sigma = 0.4e-3;
    const offsets = range(MIN_TRIPLES + 2, spacing, spacing);
    const enough = pickNoise([fit(offsets, straight(offsets, sigma, 7), [[0, offsets.length]])], spacing, [1e-3, -2e-3, 3e-3], 9e-3);
    expect(enough.secondDifferences!.count).toBe(MIN_TRIPLES);
    expect(enough.source).toBe('second differences');
    expect(enough.sigma).toBe(enough.secondDifferences!.sigma);
    const few = pickNoise([fit(offsets.slice(1), straight(offsets.slice(1), sigma, 7), [[0, offsets.length - 1]])], spacing, [1e-3, -2e-3, 3e-3], 9e-3);
    expect(few.secondDifferences!.count).toBe(MIN_TRIPLES - 1);
    expect(few.source).toBe('reciprocal times');
  });
});

describe('pickNoise: reciprocal times and the fallback', () => {
  it('gives 1.4826 · median|tAB − tBA| / √2 from three pairs or more, the line-fit deviation below that', () => {
    // Differences 1, −2, 3 ms: median |d| = 2 ms, σ = 1.4826 · 2 / √2 = 2.0967 ms (by hand).
    const three = pickNoise([], spacing, [1e-3, -2e-3, 3e-3], 9e-3);
    expect(three.source).toBe('reciprocal times');
    expect(three.sigma).toBeCloseTo(2.0967e-3, 7);
    expect(three.reciprocal).toEqual({ sigma: three.sigma, count: 3 });
    const two = pickNoise([], spacing, [1e-3, -2e-3], 9e-3);
    expect(two.source).toBe('line fits');
    expect(two.sigma).toBe(9e-3);
    // median |d| of (1, 2) ms = 1.5 ms: 1.4826 · 1.5 / √2 = 1.5725 ms, reported beside the fallback.
    expect(two.reciprocal!.sigma).toBeCloseTo(1.5725e-3, 7);
    expect(two.reciprocal!.count).toBe(2);
  });

  it('reports the median pick confidence beside σ without using it', () => {
    const noise = pickNoise([], spacing, [], 9e-3, [0.9, 0.2, 0.5, 0.7]);
    expect(noise.confidence).toEqual({ median: 0.6, count: 4 });
    expect(noise.sigma).toBe(9e-3);
    expect(pickNoise([], spacing, [], 9e-3).confidence).toBeUndefined();
    expect(pickNoise([], spacing, [], 9e-3).secondDifferences).toBeUndefined();
    expect(pickNoise([], spacing, [], 9e-3).reciprocal).toBeUndefined();
  });
});
