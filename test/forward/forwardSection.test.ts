import { describe, expect, it } from 'vitest';
import { forwardCheck, isForwardMisfit } from '../../src/forward/forwardCheck.js';
import { MIN_SAMPLE_THICKNESS, sampleNodeSection, type NodeSection } from '../../src/model/nodeSection.js';
import { sectionPaths } from '../../src/model/sectionPaths.js';
import { flatFirstArrival } from '../reference/flatLayerTimes.js';
import type { BranchFit, Layer } from '../../src/core/types.js';

// The least-time model the forward check runs on (model/sectionPaths over model/nodeSection)
// against the textbook first arrivals (Telford, Geldart & Sheriff 1990, §4.2 for flat layers,
// written out in test/reference/flatLayerTimes.ts; §4.3 for a dipping one).

/** A section of refractors given as points (held flat beyond them), in the form the forward check builds. */
interface Section { ground: (x: number) => number; refractors: { x: number; elev: number }[][]; velocities: number[] }
function nodeSection(section: Section): NodeSection {
  const nodeXs = Float64Array.from([...new Set(section.refractors.flatMap((r) => r.map((p) => p.x)))].sort((a, b) => a - b));
  const at = (points: { x: number; elev: number }[], x: number) => {
    if (x <= points[0].x) return points[0].elev;
    for (let i = 1; i < points.length; i++) if (x <= points[i].x) return points[i - 1].elev + ((points[i].elev - points[i - 1].elev) * (x - points[i - 1].x)) / (points[i].x - points[i - 1].x);
    return points[points.length - 1].elev;
  };
  return {
    ground: section.ground, nodeXs, xRef: 0,
    elevations: section.refractors.map((r) => Float64Array.from(nodeXs, (x) => at(r, x))),
    velocities: Float64Array.from(section.velocities), gradients: new Float64Array(section.velocities.length),
  };
}
const sampleSection = (section: Section, span: [number, number], step: number) => sampleNodeSection(nodeSection(section), span, step);
function sectionTimes(sampled: ReturnType<typeof sampleSection>, sourceX: number, receiverXs: number[]): number[] {
  const g = sampled.section.ground;
  return Array.from(sectionPaths(sampled, [{ x: sourceX, z: g(sourceX), receivers: receiverXs.map((x) => ({ x, z: g(x) })) }]).times[0]);
}

describe('the least-time model against closed-form first arrivals', () => {
  it('sectionPaths over three flat layers (3 m at 400, 6 m at 900 over 1800 m/s) equals Telford et al. eq. 4.28 within 0.05 ms at every offset', () => {
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

  it('sectionPaths over a refractor dipping 5° gives the down-dip and up-dip times of Telford et al. (1990, §4.3) within 0.1 ms', () => {
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

  it('sectionPaths on sloping ground gives the direct wave along the straight line, slope distance / V1', () => {
    // Ground falling 10 %: at 6 m the slope distance is 6 √1.01 = 6.0299 m, 12.060 ms at 500 m/s.
    const section = { ground: (x: number) => 100 - 0.1 * x, refractors: [[{ x: -20, elev: 80 }, { x: 120, elev: 70 }]], velocities: [500, 2000] };
    const [t] = sectionTimes(sampleSection(section, [-10, 110], 0.5), 0, [6]);
    expect(t * 1e3).toBeCloseTo(12.06, 2);
  });

  it('sampleNodeSection keeps a refractor at least 5 cm under the ground and under the refractor above', () => {
    const section = { ground: () => 100, refractors: [[{ x: 0, elev: 101 }, { x: 10, elev: 101 }], [{ x: 0, elev: 105 }, { x: 10, elev: 105 }]], velocities: [500, 1000, 2000] };
    const sampled = sampleSection(section, [0, 10], 1);
    expect(sampled.xs).toHaveLength(11);
    expect(MIN_SAMPLE_THICKNESS).toBe(0.05);
    for (let i = 0; i < 11; i++) {
      expect(sampled.levels[0][i]).toBeCloseTo(99.95, 9);
      expect(sampled.levels[1][i]).toBeCloseTo(99.9, 9);
    }
  });
});

describe('forwardCheck', () => {
  // 5 m of 500 m/s over 2000 m/s, flat; sources at 0 and 47 m, receivers every 1 m.
  const layers: Layer[] = [{ index: 1, velocity: 500, velocitySe: 0, segmentCount: 2, reversed: true }, { index: 2, velocity: 2000, velocitySe: 0, segmentCount: 2, reversed: true }];
  const refractors = [{ points: [0, 47].map((x) => ({ x, depth: 5, elev: 95, depthSe: 0 })) }];
  const receivers = Array.from({ length: 48 }, (_, i) => i);
  const segmentsOf = (offsets: number[]) => {
    const head = offsets.findIndex((x) => x / 2000 + (2 * 5 * Math.sqrt(1 - 0.0625)) / 500 < x / 500);
    const n = offsets.length;
    const first = head < 0 ? n : head;
    return [{ layer: 1, start: 0, end: first }, ...(first < n ? [{ layer: 2, start: first, end: n }] : [])] as BranchFit['segments'];
  };
  const check = (fits: BranchFit[], refr = refractors, spacing = 1, xs = receivers) => forwardCheck({ fits, layers, refractors: refr, receivers: xs.map((x) => ({ x, elev: 100 })), spacing });
  const fitOf = (sourceId: string, sourceX: number, late: (x: number) => number, outlierRows: number[] = [], keep: (x: number) => boolean = () => true): BranchFit => {
    const xs = receivers.filter((x) => x !== sourceX && keep(x)).sort((a, b) => Math.abs(a - sourceX) - Math.abs(b - sourceX));
    const picks = xs.map((x, i) => ({ sourceId, sourceX, sourceElev: 100, receiverX: x, receiverElev: 100, time: flatFirstArrival([5], [500, 2000], x - sourceX) + late(x), row: i + 2 }));
    return {
      branch: { sourceId, sourceX, sourceElev: 100, side: 'forward', picks, offsets: xs.map((x) => Math.abs(x - sourceX)), distances: xs.map((x) => Math.abs(x - sourceX)), times: picks.map((p) => p.time) },
      // Segments by arrival: the direct wave, then the head wave (layer 2) where it is first.
      segments: segmentsOf(xs.map((x) => Math.abs(x - sourceX))), outlierRows, residualSd: 0, criterionBySegments: [], chosenBy: 'criterion',
    };
  };

  it('forwardCheck of exact picks has an RMS under 0.05 ms; 0.5 ms added to every pick gives an RMS of 0.5 ms', () => {
    const exact = check([fitOf('S1', 0, () => 0), fitOf('S2', 47, () => 0)])!;
    expect(exact.picks).toBe(94);
    expect(exact.rms).toBeLessThan(5e-5);
    const late = check([fitOf('S1', 0, () => 5e-4), fitOf('S2', 47, () => 5e-4)])!;
    expect(late.rms).toBeCloseTo(5e-4, 4);
  });

  it('forwardCheck names the worst pick, leaves out the flagged outliers, and checks the sources off the ends with their delay beneath taken from their picks', () => {
    const fits = [fitOf('S1', 0, (x) => (x === 30 ? 3e-3 : 0)), fitOf('S2', 47, (x) => (x === 10 ? -2e-3 : 0))];
    const result = check(fits)!;
    expect(result.worst.sourceId).toBe('S1');
    expect(result.worst.receiverX).toBe(30);
    expect(result.worst.difference).toBeCloseTo(3e-3, 4);
    // The 3 ms pick flagged as an outlier (row 31: receiver 30 is the 30th pick, row = index + 2): the worst is then S2's −2 ms.
    const flagged = check([fitOf('S1', 0, (x) => (x === 30 ? 3e-3 : 0), [31]), fits[1]])!;
    expect(flagged.picks).toBe(93);
    expect(flagged.worst.sourceId).toBe('S2');
    expect(flagged.worst.difference).toBeCloseTo(-2e-3, 4);
    // A source 10 m off the end whose head waves are all 3 ms late (a delay beneath it the section
    // does not know) is checked: the 3 ms is taken out as its delay and its picks fit.
    const withOffEnd = check([...fits, fitOf('S3', -10, (x) => (x + 10 > 12.91 ? 3e-3 : 0))])!;
    expect(withOffEnd.picks).toBe(94 + 48);
    const s3 = withOffEnd.sources.find((q) => q.sourceId === 'S3')!;
    expect(s3.offEnd).toBe(true);
    expect(s3.corrections).toHaveLength(1);
    expect(s3.corrections[0].correction).toBeCloseTo(3e-3, 4);
    expect(s3.rms).toBeLessThan(5e-5);
    expect(check(fits, [])).toBeUndefined();
    // A refractor without points gives no section; a line shot only off the end is still checked.
    expect(check(fits, [...refractors, { points: [] }])).toBeUndefined();
    expect(check([fitOf('S3', -10, () => 0, [], (x) => x >= 0)])!.sources.map((q) => q.offEnd)).toEqual([true]);
  });

  it('forwardCheck takes both branches of a source inside the spread, and a source 1.5 spacings beyond the end geophone as off the end', () => {
    // A source at 23.5 m: its forward and reverse branches (24 picks each) are both checked.
    const left = fitOf('S5', 23.5, () => 0, [], (x) => x < 23.5);
    const right = fitOf('S5', 23.5, () => 0, [], (x) => x > 23.5);
    const centre = check([left, right])!;
    expect(centre.picks).toBe(48);
    expect(centre.sources).toHaveLength(1);
    expect(centre.rms).toBeLessThan(5e-5);
    // Geophones every 2 m from 0 to 46 m, a source at 49 m (1.5 spacings beyond 46 m), 3 ms late on
    // its head waves: off the end, its delay taken from its picks.
    const every2 = (x: number) => x % 2 === 0 && x <= 46;
    const inside = fitOf('S1', 0, () => 0, [], every2);
    const beyond = fitOf('S6', 49, (x) => (49 - x > 12.91 ? 3e-3 : 0), [], every2);
    const both = check([inside, beyond], refractors, 2, receivers.filter(every2))!;
    expect(both.picks).toBe(47);
    const s6 = both.sources.find((q) => q.sourceId === 'S6')!;
    expect(s6.offEnd).toBe(true);
    expect(s6.corrections[0].correction).toBeCloseTo(3e-3, 4);
  });

  it('isForwardMisfit: RMS above max(2σ, σ + 0.3 ms), the rule its documentation states (measured on forward-model lines)', () => {
    // σ = 0.2 ms: threshold 0.5 ms; σ = 0.5 ms: threshold 1.0 ms.
    expect(isForwardMisfit(0.49e-3, 0.2e-3)).toBe(false);
    expect(isForwardMisfit(0.51e-3, 0.2e-3)).toBe(true);
    expect(isForwardMisfit(0.99e-3, 0.5e-3)).toBe(false);
    expect(isForwardMisfit(1.01e-3, 0.5e-3)).toBe(true);
  });
});
