import { describe, expect, it } from 'vitest';
import { sampleSection, sectionTimes } from '../../src/forward/sectionTimes.js';
import { forwardCheck, isForwardMisfit } from '../../src/forward/forwardCheck.js';
import { flatFirstArrival } from '../reference/flatLayerTimes.js';
import type { BranchFit, Layer } from '../../src/core/types.js';

// The section times against the textbook first arrivals (Telford, Geldart & Sheriff 1990, §4.2
// for flat layers, written out in test/reference/flatLayerTimes.ts; §4.3 for a dipping one).

describe('sectionTimes against closed-form first arrivals', () => {
  it('sectionTimes over three flat layers (3 m at 400, 6 m at 900 over 1800 m/s) equals Telford et al. eq. 4.28 within 0.05 ms at every offset', () => {
    const section = {
      ground: () => 100,
      refractors: [[{ x: -20, elev: 97 }, { x: 120, elev: 97 }], [{ x: -20, elev: 91 }, { x: 120, elev: 91 }]],
      velocities: [400, 900, 1800],
    };
    const receivers = [2, 5, 10, 15, 20, 30, 40, 60, 80, 100];
    const times = sectionTimes(sampleSection(section, [-10, 110], 0.5), 0, receivers);
    receivers.forEach((x, i) => expect(Math.abs(times[i] - flatFirstArrival([3, 6], [400, 900, 1800], x))).toBeLessThan(5e-5));
    // Far out the deepest head wave is first: x/1800 + 2·3 cos θ₁₃/400 + 2·6 cos θ₂₃/900 (by hand, 14.625 + 11.547 ms).
    expect(times[9] * 1e3).toBeCloseTo(100 / 1.8 + 14.625 + 11.547, 1);
  });

  it('sectionTimes over a refractor dipping 5° gives the down-dip and up-dip times of Telford et al. (1990, §4.3) within 0.1 ms', () => {
    // V1 = 600, V2 = 2400 m/s, perpendicular depth h = 4 m under the source at x = 0, deepening
    // towards +x: down-dip t = x sin(θ + δ)/V1 + 2h cos θ/V1; from a source at x = 80 m, where
    // h = 4 + 80 sin δ, shooting up-dip: t = x sin(θ − δ)/V1 + 2h' cos θ/V1.
    const dip = (5 * Math.PI) / 180;
    const theta = Math.asin(600 / 2400);
    // Vertical depth 4 / cos δ under x = 0, growing by tan δ per metre.
    const elev = (x: number) => 100 - 4 / Math.cos(dip) - x * Math.tan(dip);
    const section = { ground: () => 100, refractors: [[{ x: -20, elev: elev(-20) }, { x: 120, elev: elev(120) }]], velocities: [600, 2400] };
    const sampled = sampleSection(section, [-10, 110], 0.25);
    const down = sectionTimes(sampled, 0, [50, 70]);
    [50, 70].forEach((x, i) => expect(Math.abs(down[i] - (x * Math.sin(theta + dip) + 2 * 4 * Math.cos(theta)) / 600)).toBeLessThan(1e-4));
    const hB = 4 + 80 * Math.sin(dip);
    const up = sectionTimes(sampled, 80, [30, 10]);
    [30, 10].forEach((x, i) => expect(Math.abs(up[i] - ((80 - x) * Math.sin(theta - dip) + 2 * hB * Math.cos(theta)) / 600)).toBeLessThan(1e-4));
  });

  it('sectionTimes on sloping ground gives the direct wave along the straight line, slope distance / V1', () => {
    // Ground falling 10 %: at 6 m the slope distance is 6 √1.01 = 6.0299 m, 12.060 ms at 500 m/s.
    const section = { ground: (x: number) => 100 - 0.1 * x, refractors: [[{ x: -20, elev: 80 }, { x: 120, elev: 70 }]], velocities: [500, 2000] };
    const [t] = sectionTimes(sampleSection(section, [-10, 110], 0.5), 0, [6]);
    expect(t * 1e3).toBeCloseTo(12.06, 2);
  });

  it('sampleSection keeps a refractor at least 1 cm under the ground and under the refractor above', () => {
    const section = { ground: () => 100, refractors: [[{ x: 0, elev: 101 }, { x: 10, elev: 101 }], [{ x: 0, elev: 105 }, { x: 10, elev: 105 }]], velocities: [500, 1000, 2000] };
    const sampled = sampleSection(section, [0, 10], 1);
    expect(sampled.xs).toHaveLength(11);
    for (let i = 0; i < 11; i++) {
      expect(sampled.levels[0][i]).toBeCloseTo(99.99, 9);
      expect(sampled.levels[1][i]).toBeCloseTo(99.98, 9);
    }
  });
});

describe('forwardCheck', () => {
  // 5 m of 500 m/s over 2000 m/s, flat; sources at 0 and 47 m, receivers every 1 m.
  const layers: Layer[] = [{ index: 1, velocity: 500, velocitySe: 0, segmentCount: 2, reversed: true }, { index: 2, velocity: 2000, velocitySe: 0, segmentCount: 2, reversed: true }];
  const refractors = [{ points: [0, 47].map((x) => ({ x, depth: 5, elev: 95, depthSe: 0 })) }];
  const receivers = Array.from({ length: 48 }, (_, i) => i);
  const fitOf = (sourceId: string, sourceX: number, late: (x: number) => number, outlierRows: number[] = [], keep: (x: number) => boolean = () => true): BranchFit => {
    const xs = receivers.filter((x) => x !== sourceX && keep(x));
    const picks = xs.map((x, i) => ({ sourceId, sourceX, sourceElev: 100, receiverX: x, receiverElev: 100, time: flatFirstArrival([5], [500, 2000], x - sourceX) + late(x), row: i + 2 }));
    return {
      branch: { sourceId, sourceX, sourceElev: 100, side: 'forward', picks, offsets: xs.map((x) => Math.abs(x - sourceX)), distances: xs.map((x) => Math.abs(x - sourceX)), times: picks.map((p) => p.time) },
      segments: [], outlierRows, residualSd: 0, criterionBySegments: [], chosenBy: 'criterion',
    };
  };

  it('forwardCheck of exact picks has an RMS under 0.05 ms; 0.5 ms added to every pick gives an RMS of 0.5 ms', () => {
    const exact = forwardCheck([fitOf('S1', 0, () => 0), fitOf('S2', 47, () => 0)], layers, refractors, () => 100, 1)!;
    expect(exact.picks).toBe(94);
    expect(exact.rms).toBeLessThan(5e-5);
    const late = forwardCheck([fitOf('S1', 0, () => 5e-4), fitOf('S2', 47, () => 5e-4)], layers, refractors, () => 100, 1)!;
    expect(late.rms).toBeCloseTo(5e-4, 4);
  });

  it('forwardCheck names the worst pick, leaves out the flagged outliers and the sources off the ends', () => {
    const fits = [fitOf('S1', 0, (x) => (x === 30 ? 3e-3 : 0)), fitOf('S2', 47, (x) => (x === 10 ? -2e-3 : 0))];
    const check = forwardCheck(fits, layers, refractors, () => 100, 1)!;
    expect(check.worst.sourceId).toBe('S1');
    expect(check.worst.receiverX).toBe(30);
    expect(check.worst.difference).toBeCloseTo(3e-3, 4);
    // The 3 ms pick flagged as an outlier (row 31: receiver 30 is the 30th pick, row = index + 2): the worst is then S2's −2 ms.
    const flagged = forwardCheck([fitOf('S1', 0, (x) => (x === 30 ? 3e-3 : 0), [31]), fits[1]], layers, refractors, () => 100, 1)!;
    expect(flagged.picks).toBe(93);
    expect(flagged.worst.sourceId).toBe('S2');
    expect(flagged.worst.difference).toBeCloseTo(-2e-3, 4);
    // A source 10 m off the end, 3 ms late everywhere, is not checked.
    const withOffEnd = forwardCheck([...fits, fitOf('S3', -10, () => 3e-3)], layers, refractors, () => 100, 1)!;
    expect(withOffEnd.picks).toBe(94);
    expect(forwardCheck(fits, layers, [], () => 100, 1)).toBeUndefined();
    // A refractor without points gives no section, and no source inside the spread no check.
    expect(forwardCheck(fits, layers, [...refractors, { points: [] }], () => 100, 1)).toBeUndefined();
    expect(forwardCheck([fitOf('S3', -10, () => 0, [], (x) => x >= 0)], layers, refractors, () => 100, 1)).toBeUndefined();
  });

  it('forwardCheck takes both branches of a source inside the spread, and leaves out a source 1.5 spacings beyond the end geophone', () => {
    // A source at 23.5 m: its forward and reverse branches (24 picks each) are both checked.
    const left = fitOf('S5', 23.5, () => 0, [], (x) => x < 23.5);
    const right = fitOf('S5', 23.5, () => 0, [], (x) => x > 23.5);
    const centre = forwardCheck([left, right], layers, refractors, () => 100, 1)!;
    expect(centre.picks).toBe(48);
    expect(centre.rms).toBeLessThan(5e-5);
    // Geophones every 2 m from 0 to 46 m, a source at 49 m (1.5 spacings beyond 46 m), 3 ms late: left out.
    const every2 = (x: number) => x % 2 === 0 && x <= 46;
    const inside = fitOf('S1', 0, () => 0, [], every2);
    const beyond = fitOf('S6', 49, () => 3e-3, [], every2);
    expect(forwardCheck([inside, beyond], layers, refractors, () => 100, 2)!.picks).toBe(23);
  });

  it('isForwardMisfit: RMS above max(2σ, σ + 0.3 ms), the rule its documentation states (measured on forward-model lines)', () => {
    // σ = 0.2 ms: threshold 0.5 ms; σ = 0.5 ms: threshold 1.0 ms.
    expect(isForwardMisfit(0.49e-3, 0.2e-3)).toBe(false);
    expect(isForwardMisfit(0.51e-3, 0.2e-3)).toBe(true);
    expect(isForwardMisfit(0.99e-3, 0.5e-3)).toBe(false);
    expect(isForwardMisfit(1.01e-3, 0.5e-3)).toBe(true);
  });
});
