import { describe, expect, it } from 'vitest';
import { arrivalTime, fillTimeTerms, reassignBranch } from '../../src/model/arrivalTimes.js';
import type { ModelGeometry, ModelPick, TimeTermModel } from '../../src/model/timeTerms.js';
import { range } from '../helpers.js';

// The time-term model time of a pick (Willmore & Bancroft 1960, Geophys. J. R. astr. Soc. 3,
// 419-432): t = aₛ + bᵣ + |xᵣ − xₛ| / V₂ on a refractor, d / V₁ for the direct wave over the slope
// distance d; a shot at a station has the station's time term (ibid.). Every expected value
// below is worked by hand from these and linear interpolation.
function model(slowness: number[], sourceDelays: number[][], receiverDelays: number[][]): TimeTermModel {
  return {
    refractors: slowness.length - 1,
    slowness,
    slownessSe: slowness.map(() => 0),
    sourceDelays: sourceDelays.map((d) => Float64Array.from(d)),
    receiverDelays: receiverDelays.map((d) => Float64Array.from(d)),
  } as unknown as TimeTermModel;
}

describe('fillTimeTerms', () => {
  // Receivers every 2 m from 0 to 10; time terms 10 ms at 2 m and 16 ms at 8 m only.
  const receiverXs = range(6, 2);
  const receiverDelays = [NaN, 0.01, NaN, NaN, 0.016, NaN];

  it('interpolates a receiver time term linearly between the receivers that have one, and holds the end values beyond them', () => {
    const geometry: ModelGeometry = { sourceXs: [], receiverXs, spacing: 2 };
    const filled = fillTimeTerms(model([1 / 500, 1 / 2000], [[]], [receiverDelays]), geometry);
    // At 4 m: 10 + (2/6)·6 = 12 ms; at 6 m: 14 ms; 0 m and 10 m take the end values (10, 16 ms).
    [0.01, 0.01, 0.012, 0.014, 0.016, 0.016].forEach((v, i) => expect(filled.receivers[0][i]).toBeCloseTo(v, 12));
  });

  it('gives a source without its own time term the receiver time term at its position within 1.5 spacings (3 m) of them, none farther', () => {
    // Sources at −1 (3 m before the first receiver with a time term), −1.5 (3.5 m), 5 (between:
    // 10 + (3/6)·6 = 13 ms), 11 (3 m past the last), 11.5 (3.5 m), and one with its own 20 ms.
    const geometry: ModelGeometry = { sourceXs: [-1, -1.5, 5, 11, 11.5, 4], receiverXs, spacing: 2 };
    const filled = fillTimeTerms(model([1 / 500, 1 / 2000], [[NaN, NaN, NaN, NaN, NaN, 0.02]], [receiverDelays]), geometry);
    const s = [...filled.sources[0]];
    expect(s[0]).toBeCloseTo(0.01, 12);
    expect(s[1]).toBeNaN();
    expect(s[2]).toBeCloseTo(0.013, 12);
    expect(s[3]).toBeCloseTo(0.016, 12);
    expect(s[4]).toBeNaN();
    expect(s[5]).toBe(0.02);
  });

  it('leaves every time term NaN on a refractor no receiver has one for', () => {
    const geometry: ModelGeometry = { sourceXs: [3], receiverXs, spacing: 2 };
    const filled = fillTimeTerms(model([1 / 500, 1 / 2000], [[NaN]], [receiverXs.map(() => NaN)]), geometry);
    expect([...filled.receivers[0]].every(Number.isNaN)).toBe(true);
    expect(filled.sources[0][0]).toBeNaN();
  });
});

describe('arrivalTime', () => {
  const m = model([1 / 500, 1 / 2000, 1 / 4000], [[0.01], [0.03]], [[0.012, 0.014], [0.025, NaN]]);
  const geometry: ModelGeometry = { sourceXs: [0], receiverXs: [20, 40], spacing: 20 };
  const filled = fillTimeTerms(m, geometry);

  it('gives d / V₁ over the slope distance for the direct wave and aₛ + bᵣ + x / V on a refractor', () => {
    const pick: ModelPick = { source: 0, receiver: 1, offset: 40, distance: 41, time: 0 };
    expect(arrivalTime(m, filled, pick, 0)).toBeCloseTo(41 / 500, 12);
    // 10 + 14 + 40 000 / 2000 = 44 ms on refractor 1; refractor 2: 30 + 25 (end value) + 10 = 65 ms.
    expect(arrivalTime(m, filled, pick, 1)).toBeCloseTo(0.044, 12);
    expect(arrivalTime(m, filled, pick, 2)).toBeCloseTo(0.065, 12);
  });

  it('gives none where the source has no time term', () => {
    const none = model([1 / 500, 1 / 2000], [[NaN]], [[0.012, 0.014]]);
    const far: ModelGeometry = { sourceXs: [-100], receiverXs: [20, 40], spacing: 20 };
    expect(arrivalTime(none, fillTimeTerms(none, far), { source: 0, receiver: 0, offset: 120, distance: 120, time: 0 }, 1)).toBeUndefined();
  });
});

describe('reassignBranch', () => {
  // A flat two-layer line: V₁ = 500, V₂ = 2000 m/s, time terms 10 ms everywhere, so the head wave
  // 20 ms + x / 2000 overtakes the direct wave x / 500 at the crossover x = 0.02 / 0.0015 = 13.3 m
  // (Telford et al. 1990, §4.2.2); at 14 m the direct wave is 1 ms later, at 12 m 2 ms earlier.
  const receiverXs = range(20, 2, 2);
  const m = model([1 / 500, 1 / 2000], [[0.01]], [receiverXs.map(() => 0.01)]);
  const geometry: ModelGeometry = { sourceXs: [0], receiverXs, spacing: 2 };
  const filled = fillTimeTerms(m, geometry);
  const picks: ModelPick[] = receiverXs.map((x, r) => ({ source: 0, receiver: r, offset: x, distance: x, time: 0 }));
  const order = picks.map((_, i) => i);

  it('moves the picks past the crossover to the refractor when the direct wave is later there by more than σ', () => {
    const labels = reassignBranch(m, filled, picks, order, new Int8Array(picks.length), 0.5e-3, () => false);
    expect(labels).toEqual(receiverXs.map((x) => (x >= 14 ? 1 : 0)));
  });

  it('keeps a pick on its arrival within σ of the earliest (14 m: 1 ms later, σ = 1.2 ms), and the zero-offset pick fixed', () => {
    const labels = reassignBranch(m, filled, picks, order, new Int8Array(picks.length), 1.2e-3, () => false);
    expect(labels).toEqual(receiverXs.map((x) => (x >= 16 ? 1 : 0)));
    // Everything on the refractor at first: the picks before the crossover go back to the direct wave (12 m: 2 ms > σ; 14 m stays, its direct wave within σ).
    const back = reassignBranch(m, filled, picks, order, new Int8Array(picks.length).fill(1), 1.2e-3, () => false);
    expect(back).toEqual(receiverXs.map((x) => (x >= 14 ? 1 : 0)));
    // The nearest pick held on the refractor: the labels may not decrease, so all stay there.
    const fixedFirst = reassignBranch(m, filled, picks, order, Int8Array.from(picks, (_, i) => (i === 0 ? 1 : 0)), 1e-3, (i) => i === 0);
    expect(fixedFirst).toEqual(picks.map(() => 1));
  });

  it('chooses the cheapest non-decreasing labelling when one receiver has a larger time term', () => {
    const bumped = model([1 / 500, 1 / 2000], [[0.01]], [receiverXs.map((x) => (x === 30 ? 0.025 : 0.01))]);
    // At 30 m the head wave is 35 + 15 = 50 ms against 60 ms direct: still earlier.
    const f = fillTimeTerms(bumped, geometry);
    expect(reassignBranch(bumped, f, picks, order, new Int8Array(picks.length), 0.5e-3, () => false)).toEqual(receiverXs.map((x) => (x >= 14 ? 1 : 0)));
    const big = model([1 / 500, 1 / 2000], [[0.01]], [receiverXs.map((x) => (x === 20 ? 0.035 : 0.01))]);
    const labels = reassignBranch(big, fillTimeTerms(big, geometry), picks, order, new Int8Array(picks.length), 0.5e-3, () => false);
    // A 35 ms time term at 20 m puts its head wave at 55 ms, 15 ms (30σ, cost 900) after the
    // direct wave's 40 ms. The labels may not go back from the refractor to the direct wave, so
    // either 20 m joins the refractor (900) or 14-18 m stay direct: 1, 4 and 7 ms later than the
    // head wave, cost (2² − 1) + 8² − 1 + 14² − 1 = 3 + 63 + 195 = 261 (the −1 for a pick's
    // current arrival). The cheaper: direct up to 20 m; at 22 m the direct wave is 13 ms late (675).
    expect(labels).toEqual(receiverXs.map((x) => (x >= 22 ? 1 : 0)));
    for (let i = 1; i < labels.length; i++) expect(labels[i]).toBeGreaterThanOrEqual(labels[i - 1]);
  });

  it('keeps a branch that ends before the crossover, or within σ of it, on the direct wave (the shallower arrival on a tie)', () => {
    // Picks from 2 m to 14 m, all direct at first, σ = 1.2 ms: at 14 m the direct wave is 1 ms
    // (under σ) later than the head wave, so both cost nothing there and the labels stay direct.
    const short = order.slice(0, 7);
    expect(reassignBranch(m, filled, picks, short, new Int8Array(picks.length), 1.2e-3, () => false)).toEqual(short.map(() => 0));
    const shorter = order.slice(0, 5); // to 10 m, all before the crossover
    expect(reassignBranch(m, filled, picks, shorter, new Int8Array(picks.length), 0.5e-3, () => false)).toEqual(shorter.map(() => 0));
  });

  it('returns the labels as they were when no non-decreasing labelling is finite (two fixed picks out of order)', () => {
    const current = Int8Array.from(picks, (_, i) => (i === 2 ? 1 : 0));
    const labels = reassignBranch(m, filled, picks, order, current, 1e-3, (i) => i === 2 || i === 5);
    expect(labels).toEqual([...current]);
  });
});
