import { describe, expect, it } from 'vitest';
import { depthFromDelay, velocitiesFor } from '../../src/depth/convert.js';
import { depthAt, pointsFromDelays } from '../../src/depth/delayProfile.js';
import { layerThickness } from '../../src/depth/interceptTime.js';
import { plusMinus } from '../../src/depth/plusMinus.js';
import { grm } from '../../src/depth/grm.js';
import { hiddenLayerLimit } from '../../src/depth/hiddenLayer.js';
import { reciprocalChecks, reciprocalTolerance } from '../../src/depth/reciprocal.js';
import { WarningLog } from '../../src/core/warnings.js';
import type { BranchFit } from '../../src/core/types.js';
import type { ReversedPair } from '../../src/depth/reversedPair.js';

// Delay-time conversions and the plus-minus method on times written out by hand from the
// delay-time model of a refractor (Hagedoorn 1959; Telford, Geldart & Sheriff 1990, §4.3):
// t_AG = a_A + b_G + |x_G − x_A| / V, with a_A and b_G the delays at the source and at the
// receiver. The flat-layer delay of a layer h thick over refractor velocity V is h cos θ / V1,
// sin θ = V1 / V (Telford et al. 1990, eq. 4.27: the intercept time is twice it).

const cosOf = (v1: number, v2: number) => Math.sqrt(1 - (v1 / v2) ** 2);

describe('depthFromDelay', () => {
  it('depthFromDelay(5 cos θ / 500 s, 500 over 2000 m/s) is 5 m, with SE V1 σ / cos θ (delta method)', () => {
    const delay = (5 * cosOf(500, 2000)) / 500; // 9.682 ms, by hand
    const result = depthFromDelay(delay, 1e-4, [], [], [500, 2000], [0, 0])!;
    expect(result.depth).toBeCloseTo(5, 9);
    // ∂z/∂delay = V1 / cos θ = 500 / 0.96825 = 516.4 m/s: 0.1 ms gives 5.164 cm.
    expect(result.se).toBeCloseTo((500 * 1e-4) / cosOf(500, 2000), 6);
  });

  it('depthFromDelay of the second refractor adds its thickness to the depth above: 3 m at 400, then 6 m at 900 over 1800 m/s', () => {
    // One-way delay to refractor 2: 3 cos θ₁₃ / 400 + 6 cos θ₂₃ / 900 (Telford et al. 1990, eq. 4.28, halved).
    const delay = (3 * cosOf(400, 1800)) / 400 + (6 * cosOf(900, 1800)) / 900;
    const result = depthFromDelay(delay, 0, [3], [0], [400, 900, 1800], [0, 0, 0])!;
    expect(result.depth).toBeCloseTo(9, 9);
    // The SE of the depth above passes with ∂z/∂z₁ = 1 − (cos θ₁₃ / 400)·(900 / cos θ₂₃), by hand.
    const withUpper = depthFromDelay(delay, 0, [3], [0.1], [400, 900, 1800], [0, 0, 0])!;
    const dz = 1 - (cosOf(400, 1800) / 400) * (900 / cosOf(900, 1800));
    expect(withUpper.se).toBeCloseTo(Math.abs(dz) * 0.1, 6);
  });

  it('depthFromDelay returns undefined for a refractor no faster than the layer above', () => {
    expect(depthFromDelay(0.01, 0, [], [], [800, 700], [0, 0])).toBeUndefined();
  });

  it('velocitiesFor replaces only the refractor\'s velocity and its SE with the method\'s own estimate', () => {
    const layers = [{ index: 1, velocity: 500, velocitySe: 5, segmentCount: 2, reversed: true }, { index: 2, velocity: 2000, velocitySe: 20, segmentCount: 2, reversed: true }];
    expect(velocitiesFor(layers, 1, { velocity: 2100, se: 30 })).toEqual({ velocities: [500, 2100], ses: [5, 30] });
    expect(velocitiesFor(layers, 1)).toEqual({ velocities: [500, 2000], ses: [5, 20] });
  });

  it('layerThickness returns undefined when the intercept is too small for the layers above (a negative thickness)', () => {
    // 3 m at 400 over 900 m/s alone give 2·3·cos θ₁₃/400 = 14.56 ms at V3 = 1800 m/s (eq. 4.28): 10 ms is too little.
    expect(layerThickness(0.01, [3], [400, 900, 1800])).toBeUndefined();
    expect(layerThickness(0.02, [3], [400, 900, 1800])).toBeCloseTo(((0.02 - (6 * cosOf(400, 1800)) / 400) * 900) / (2 * cosOf(900, 1800)), 9);
    // A refractor (1800 m/s) slower than a layer above it (1900 m/s): no head wave.
    expect(layerThickness(0.02, [3], [400, 1900, 1800])).toBeUndefined();
  });
});

describe('pointsFromDelays and depthAt', () => {
  const layers = [400, 900, 1800].map((velocity, i) => ({ index: i + 1, velocity, velocitySe: 0, segmentCount: 2, reversed: true }));

  it('pointsFromDelays puts each point at the ground elevation minus its depth, and refractor 2 under the depths above', () => {
    // Refractor 1 at 3 m: delay 3 cos θ₁₂ / 400 with θ₁₂ = asin(400/900); the method's own V (900) is used.
    const first = pointsFromDelays({ method: 'm', refractor: 1, stations: [{ x: 10, delay: (3 * cosOf(400, 900)) / 400, delaySe: 0 }], velocity: { velocity: 900, se: 0 }, info: {} },
      layers, () => undefined, (x) => 100 - 0.1 * x);
    expect(first).toHaveLength(1);
    expect(first[0].depth).toBeCloseTo(3, 9);
    expect(first[0].elev).toBeCloseTo(99 - 3, 9);
    // Refractor 2 at 9 m under 3 m; a station without depths above (x = 20) is left out.
    const delay = (3 * cosOf(400, 1800)) / 400 + (6 * cosOf(900, 1800)) / 900;
    const second = pointsFromDelays({ method: 'm', refractor: 2, stations: [{ x: 10, delay, delaySe: 0 }, { x: 20, delay, delaySe: 0 }], info: {} },
      layers, (x) => (x === 10 ? { depths: [3], ses: [0] } : undefined), () => 50);
    expect(second.map((p) => p.x)).toEqual([10]);
    expect(second[0].depth).toBeCloseTo(9, 9);
    expect(second[0].elev).toBeCloseTo(41, 9);
  });

  it('depthAt interpolates depth and SE linearly between points and is undefined outside them', () => {
    const points = [{ x: 0, depth: 2, elev: 0, depthSe: 0.1 }, { x: 10, depth: 4, elev: 0, depthSe: 0.3 }, { x: 20, depth: 3, elev: 0, depthSe: 0.2 }];
    expect(depthAt(points, 2.5)!.depth).toBeCloseTo(2.5, 12);
    expect(depthAt(points, 2.5)!.se).toBeCloseTo(0.15, 12);
    expect(depthAt(points, 15)!.depth).toBeCloseTo(3.5, 12);
    expect(depthAt(points, 10)).toEqual({ depth: 4, se: 0.3 });
    expect(depthAt(points, 20)).toEqual({ depth: 3, se: 0.2 });
    expect(depthAt(points, -0.1)).toBeUndefined();
    expect(depthAt(points, 20.1)).toBeUndefined();
    expect(depthAt([], 0)).toBeUndefined();
  });
});

describe('plusMinus (Hagedoorn 1959) on delay-time-model times', () => {
  // Sources A at 0 and B at 48 m, receivers every 2 m, refractor at 2000 m/s with delays
  // b(x) = 4 ms + 2 ms · sin(x / 10) under the receivers and 5 ms, 6 ms under A and B.
  const V = 2000;
  const xs = Array.from({ length: 23 }, (_, i) => 2 + 2 * i);
  const b = (x: number) => 4e-3 + 2e-3 * Math.sin(x / 10);
  const aA = 5e-3;
  const aB = 6e-3;
  const curve = (sourceId: string, sourceX: number, a: number, phantomXs: number[] = []) => ({
    sourceId, sourceX, xs: [...xs], times: xs.map((x) => a + b(x) + Math.abs(x - sourceX) / V), phantomXs, shiftOverlaps: [],
  });
  const pairOf = (phantomXs: number[] = [], noise = 0): ReversedPair => {
    const forward = curve('A', 0, aA, phantomXs);
    // Pick noise on the forward curve only: ±noise alternately.
    forward.times = forward.times.map((t, i) => t + (i % 2 === 0 ? noise : -noise));
    return { forward, reverse: curve('B', 48, aB), reciprocal: aA + aB + 48 / V, reciprocalReadings: 2 };
  };

  it('plusMinus gives the delay b(x) at every receiver between the sources (T⁺ / 2) and V from the minus times (slope 2/V)', () => {
    const profile = plusMinus(pairOf(), 2)!;
    expect(profile.method).toBe('plus-minus');
    expect(profile.refractor).toBe(2);
    expect(profile.stations.map((s) => s.x)).toEqual(xs);
    for (const s of profile.stations) expect(s.delay).toBeCloseTo(b(s.x), 12);
    expect(profile.velocity!.velocity).toBeCloseTo(V, 6);
    expect(profile.velocity!.se).toBeCloseTo(0, 9);
    expect(profile.info.reciprocal_time_ms).toBeCloseTo((aA + aB + 48 / V) * 1e3, 3);
  });

  it('plusMinus measures the pick noise from the scatter of the minus times and propagates it to the delays and the velocity', () => {
    // ±0.2 ms on one curve: the minus times scatter about their line; σ_pick = SD(T⁻ residuals)/√2,
    // SE(delay) = √(2σ² + σ²/2) / 2 with two reciprocal readings, SE(V) = 2 SE(slope) / slope²
    // with SE(slope) = SD / √Σ(x − x̄)² (least squares, common practice), all worked below.
    const profile = plusMinus(pairOf([], 2e-4), 1)!;
    const minus = xs.map((x, i) => (i % 2 === 0 ? 2e-4 : -2e-4) + aA - aB + (2 * x - 48) / V);
    const n = xs.length;
    const mx = xs.reduce((a, v) => a + v, 0) / n;
    const mm = minus.reduce((a, v) => a + v, 0) / n;
    const sxx = xs.reduce((a, v) => a + (v - mx) ** 2, 0);
    const slope = xs.reduce((a, v, i) => a + (v - mx) * (minus[i] - mm), 0) / sxx;
    const sd = Math.sqrt(xs.reduce((a, v, i) => a + (minus[i] - (mm + slope * (v - mx))) ** 2, 0) / (n - 2));
    const pick = sd / Math.SQRT2;
    expect(Number(profile.info.pick_noise_ms)).toBeCloseTo(pick * 1e3, 3);
    expect(profile.velocity!.velocity).toBeCloseTo(2 / slope, 6);
    expect(profile.velocity!.se).toBeCloseTo((2 * sd) / Math.sqrt(sxx) / slope ** 2, 6);
    for (const s of profile.stations) expect(s.delaySe).toBeCloseTo(Math.sqrt(2 * pick ** 2 + pick ** 2 / 2) / 2, 9);
    // A phantomed station adds 2σ²/3 to the variance of its plus time.
    const phantomed = plusMinus(pairOf([10], 2e-4), 1)!;
    expect(phantomed.stations.find((s) => s.x === 10)!.delaySe).toBeCloseTo(Math.sqrt(2 * pick ** 2 + pick ** 2 / 2 + (2 * pick ** 2) / 3) / 2, 9);
    expect(phantomed.info.phantomed_stations).toBe(1);
  });

  it('plusMinus uses only receivers strictly between the sources and recorded by both, and needs three of them', () => {
    const pair = pairOf();
    pair.reverse.xs = pair.reverse.xs.slice(0, 20); // the reverse curve stops at x = 40 m
    pair.reverse.times = pair.reverse.times.slice(0, 20);
    expect(plusMinus(pair, 1)!.stations.map((s) => s.x)).toEqual(xs.slice(0, 20));
    // A receiver the reverse source did not record (x = 20 m) is left out, not interpolated.
    const gap = pairOf();
    const at20 = gap.reverse.xs.indexOf(20);
    gap.reverse.xs.splice(at20, 1);
    gap.reverse.times.splice(at20, 1);
    expect(plusMinus(gap, 1)!.stations.map((s) => s.x)).toEqual(xs.filter((x) => x !== 20));
    const short = pairOf();
    short.reverse.xs = [2, 4];
    short.reverse.times = short.reverse.times.slice(0, 2);
    expect(plusMinus(short, 1)).toBeUndefined();
  });
});

describe('grm (Palmer 1980) on times built with a known optimum XY', () => {
  // Palmer's model: the forward ray leaves the refractor XY/2 before the geophone and the reverse
  // ray XY/2 after it. With XY = 4 m: t_AG = a_A + b(G − 2) + (G − A)/V, t_BG = a_B + b(G + 2) + (B − G)/V,
  // t_AB = a_A + a_B + (B − A)/V, b(x) = 4 ms + 2 ms · sin(x / 10), V = 2000 m/s; A at 0, B at 48 m,
  // geophones every 2 m. Then at XY = 4 m, by hand, t_V = (t_AY − t_BX + t_AB)/2 is a straight line
  // of slope 1/V and t_G = [t_AY + t_BX − (t_AB + XY/V)]/2 = b(G) exactly; at any other XY t_V bends.
  const V = 2000;
  const b = (x: number) => 4e-3 + 2e-3 * Math.sin(x / 10);
  const aA = 5e-3;
  const aB = 6e-3;
  const forwardXs = Array.from({ length: 24 }, (_, i) => 2 + 2 * i); // 2 … 48
  const reverseXs = Array.from({ length: 24 }, (_, i) => 2 * i); // 0 … 46
  const pair: ReversedPair = {
    forward: { sourceId: 'A', sourceX: 0, xs: forwardXs, times: forwardXs.map((x) => aA + b(x - 2) + x / V), phantomXs: [], shiftOverlaps: [] },
    reverse: { sourceId: 'B', sourceX: 48, xs: reverseXs, times: reverseXs.map((x) => aB + b(x + 2) + (48 - x) / V), phantomXs: [], shiftOverlaps: [] },
    reciprocal: aA + aB + 48 / V,
    reciprocalReadings: 2,
  };

  it('grm finds XY = 4 m by the velocity analysis when the geometry says 0 m, and gives the delays b(G) and V there', () => {
    let seen: { velocity: number; delays: { x: number; delay: number }[] } | undefined;
    const profile = grm(pair, 1, 2, 3e-4, (velocity, delays) => { seen = { velocity, delays }; return 0; })!;
    expect(profile.info.optimum_xy_m).toBe(4);
    expect(profile.info.optimum_xy_basis).toBe('velocity analysis');
    expect(profile.info.geometric_xy_m).toBe(0);
    // Trials every half spacing from 0 to min(12 spacings, span/4) = 12 m.
    expect((profile.info.xy_trials as { xy_m: number }[]).map((t) => t.xy_m)).toEqual(Array.from({ length: 13 }, (_, i) => i));
    expect(profile.stations.map((s) => s.x)).toEqual(forwardXs.filter((x) => x <= 46));
    for (const s of profile.stations) expect(s.delay).toBeCloseTo(b(s.x), 12);
    expect(profile.velocity!.velocity).toBeCloseTo(V, 6);
    // SE of a time-depth: √(2σ² + σ²/2)/2 for σ = 0.3 ms and two reciprocal readings.
    expect(profile.stations[0].delaySe).toBeCloseTo(Math.sqrt(2.5) * 3e-4 / 2, 12);
    // The geometric XY is computed from the XY = 0 time-depths, (t_AG + t_BG − t_AB)/2 = (b(G − 2) + b(G + 2))/2.
    expect(seen!.delays.length).toBeGreaterThan(10);
    for (const d of seen!.delays) expect(d.delay).toBeCloseTo((b(d.x - 2) + b(d.x + 2)) / 2, 12);
  });

  it('grm keeps the geometric XY when it fits as well as the best: the geometry says 4 m and 4 m is the best', () => {
    const profile = grm(pair, 1, 2, 3e-4, () => 4.2)!;
    expect(profile.info.optimum_xy_m).toBe(4);
    expect(profile.info.optimum_xy_basis).toBe('geometry');
    for (const s of profile.stations) expect(s.delay).toBeCloseTo(b(s.x), 12);
  });
});

describe('reciprocalChecks', () => {
  // Reciprocity: the first-break time from A at B equals the time from B at A (common practice
  // allows about 1 ms on a hammer line, or three SDs of the difference of two picks, 3√2σ).
  const branch = (sourceId: string, sourceX: number, side: 'forward' | 'reverse', xs: number[], time: (x: number) => number): BranchFit => ({
    branch: {
      sourceId, sourceX, sourceElev: 0, side,
      picks: xs.map((x, i) => ({ sourceId, sourceX, sourceElev: 0, receiverX: x, receiverElev: 0, time: time(x), row: i + 2 })),
      offsets: xs.map((x) => Math.abs(x - sourceX)), distances: xs.map((x) => Math.abs(x - sourceX)), times: xs.map(time),
    },
    segments: [], outlierRows: [], residualSd: 0, criterionBySegments: [], chosenBy: 'criterion',
  });
  const xs = Array.from({ length: 25 }, (_, i) => i * 2);

  it('reciprocalTolerance is 1 ms, or 3√2σ when the pick noise σ is larger: 2.12 ms at 0.5 ms', () => {
    expect(reciprocalTolerance(0.2e-3)).toBe(1e-3);
    expect(reciprocalTolerance(0.5e-3)).toBeCloseTo(3 * Math.SQRT2 * 0.5e-3, 15);
  });

  it('reciprocalChecks compares the time from A at B with the time from B at A, interpolating at a source between geophones', () => {
    // A at 0 shooting +x, B at 31 m (between geophones 30 and 32) shooting −x; t = 5 ms + x/1500,
    // the reverse branch 1.5 ms late: from A at B, 5 + 31/1.5 = 25.667 ms (interpolated), from B at A 27.167 ms.
    const a = branch('A', 0, 'forward', xs.slice(1), (x) => 5e-3 + x / 1500);
    // The reverse branch's picks in offset order (descending x), as a branch holds them.
    const b = branch('B', 31, 'reverse', xs.filter((x) => x < 31).reverse(), (x) => 6.5e-3 + (31 - x) / 1500);
    const log = new WarningLog();
    const [check] = reciprocalChecks([a, b], 0.2e-3, log);
    expect(check).toMatchObject({ sourceA: 'A', sourceB: 'B', tolerance: 1e-3, ok: false });
    expect(check.timeAB).toBeCloseTo(5e-3 + 31 / 1500, 12);
    expect(check.timeBA).toBeCloseTo(6.5e-3 + 31 / 1500, 12);
    expect(check.difference).toBeCloseTo(1.5e-3, 12);
    expect(log.withCode('reciprocal-time')[0].message).toMatch(/^reciprocal times of sources A and B differ by 1\.50 ms \(25\.67 and 27\.17 ms\), more than the 1\.00 ms tolerance/);
    // 0.5 ms apart is within the tolerance: no warning.
    const near = branch('B', 31, 'reverse', xs.filter((x) => x < 31), (x) => 5.5e-3 + (31 - x) / 1500);
    const quiet = new WarningLog();
    expect(reciprocalChecks([a, near], 0.2e-3, quiet)[0].ok).toBe(true);
    expect(quiet.items).toHaveLength(0);
    // Two reverse sources: each pair uses that source's own branch (D at 45 m, 0.2 ms from reciprocity).
    const d = branch('D', 45, 'reverse', xs.filter((x) => x < 45), (x) => 5.2e-3 + (45 - x) / 1500);
    const both = reciprocalChecks([a, b, d], 0.2e-3, new WarningLog());
    expect(both.map((c) => [c.sourceB, c.ok])).toEqual([['B', false], ['D', true]]);
    expect(both[1].timeBA).toBeCloseTo(5.2e-3 + 45 / 1500, 12);
    // A reverse source beyond the reach of A's branch is not paired.
    const far = branch('C', 60, 'reverse', xs.filter((x) => x > 10), (x) => 5e-3 + (60 - x) / 1500);
    expect(reciprocalChecks([a, far], 0.2e-3, new WarningLog())).toHaveLength(0);
  });
});

describe('hiddenLayerLimit (Soske 1959)', () => {
  it('hiddenLayerLimit(500 over 2500 m/s, intercept 20 ms, hidden layer at 1200 m/s): the three lines meet at one offset, and the depth it hides', () => {
    // The thickest hidden layer is the one whose head wave just touches the first arrivals: the
    // direct wave, its head wave and the refractor's all meet at x* = t3 / (1/V1 − 1/V3) = 12.5 m.
    // Head-wave intercepts from Telford et al. (1990), §4.2 (2 h cos θ / V summed over the layers above).
    const [v1, v2, v3] = [500, 1200, 2500];
    const limit = hiddenLayerLimit(2, v1, v3, 0, 0.02, v2)!;
    expect(limit.refractor).toBe(2);
    expect(limit.hiddenVelocity).toBe(1200);
    const cos = (a: number, b: number) => Math.sqrt(1 - (a / b) ** 2);
    const crossing = 0.02 / (1 / v1 - 1 / v3);
    expect(crossing).toBeCloseTo(12.5, 9);
    // h1 from the hidden layer's line passing through the crossing; h2 = the limit.
    const h1 = (crossing * (1 / v1 - 1 / v2) * v1) / (2 * cos(v1, v2));
    const t2 = (2 * h1 * cos(v1, v2)) / v1;
    const t3 = (2 * h1 * cos(v1, v3)) / v1 + (2 * limit.maxThickness * cos(v2, v3)) / v2;
    expect(t3).toBeCloseTo(0.02, 12);
    expect(t2 + crossing / v2).toBeCloseTo(crossing / v1, 12);
    // Without the hidden layer the refractor is at t3 V1 / (2 cos θ13): the true depth h1 + h2 is deeper by the underestimate.
    expect(limit.depthUnderestimate).toBeCloseTo(h1 + limit.maxThickness - (0.02 * v1) / (2 * cos(v1, v3)), 12);
    expect(limit.depthUnderestimate).toBeGreaterThan(0);
    // Only the intercept difference counts: the layers above lumped into 5 ms change nothing.
    const lumped = hiddenLayerLimit(2, v1, v3, 0.005, 0.025, v2)!;
    expect(lumped.maxThickness).toBeCloseTo(limit.maxThickness, 12);
    expect(lumped.depthUnderestimate).toBeCloseTo(limit.depthUnderestimate, 12);
  });

  it('hiddenLayerLimit needs V1 < V2 < V3 and lines that cross beyond the source', () => {
    expect(hiddenLayerLimit(1, 500, 2500, 0, 0.02, 400)).toBeUndefined();
    expect(hiddenLayerLimit(1, 500, 2500, 0, 0.02, 2600)).toBeUndefined();
    expect(hiddenLayerLimit(1, 500, 2500, 0.02, 0.02, 1200)).toBeUndefined();
    expect(hiddenLayerLimit(1, 500, 2500, 0.005, 0.02, 1200)).toBeDefined();
  });
});
