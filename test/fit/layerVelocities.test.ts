import { describe, expect, it } from 'vitest';
import { assignLayers, layerVelocities } from '../../src/fit/layers.js';
import { WarningLog } from '../../src/core/warnings.js';
import type { BranchFit, Segment, Side } from '../../src/core/types.js';
import { headWaveTime, type PlaneModel } from '../reference/planeLayerRays.js';

// layerVelocities and assignLayers on branch fits built by hand, so each formula is checked on its
// own, against closed forms worked by hand beside each check:
// - the direct wave runs straight from source to receiver, so its time is the slope (straight-line)
//   distance over V1 (common practice);
// - a dipping refractor, Telford, Geldart & Sheriff (1990), §4.3:
//   θ = ½[asin(V1·sf) + asin(V1·sr)], δ = ½[asin(V1·sf) − asin(V1·sr)], V2 = V1 / sin θ;
// - standard errors by the delta method (first-order propagation, common practice), and the
//   slope of a least-squares line through the origin, s = Σ d t / Σ d², with SE σ / √(Σ d²).

interface Pick { x: number; elev: number; t: number }

/** A branch fit of picks with the given segments ([start, end) pick ranges, layer, slowness, intercept). */
function fitOf(sourceId: string, sourceX: number, side: Side, picks: Pick[], segments: Partial<Segment>[], residualSd = 1e-4): BranchFit {
  const offsets = picks.map((p) => Math.abs(p.x - sourceX));
  return {
    branch: {
      sourceId, sourceX, sourceElev: 0, side,
      picks: picks.map((p, i) => ({ sourceId, sourceX, sourceElev: 0, receiverX: p.x, receiverElev: p.elev, time: p.t, row: i + 2 })),
      offsets,
      distances: picks.map((p) => Math.hypot(p.x - sourceX, p.elev)),
      times: picks.map((p) => p.t),
    },
    segments: segments.map((s, i) => ({
      order: i + 1, layer: i + 1, start: 0, end: picks.length, firstOffset: offsets[s.start ?? 0], lastOffset: offsets[(s.end ?? picks.length) - 1],
      slowness: 1e-3, slownessSe: 1e-6, intercept: 0, interceptSe: 1e-5, apparentVelocity: 1 / (s.slowness ?? 1e-3), used: (s.end ?? picks.length) - (s.start ?? 0), throughOrigin: false,
      ...s,
    })),
    outlierRows: [],
    residualSd,
    criterionBySegments: [],
    chosenBy: 'criterion',
  };
}

/** Least-squares slope and intercept of t against x (the segment line a branch fit would report). */
function line(x: number[], t: number[]) {
  const n = x.length;
  const mx = x.reduce((a, b) => a + b, 0) / n;
  const mt = t.reduce((a, b) => a + b, 0) / n;
  const sxx = x.reduce((a, v) => a + (v - mx) ** 2, 0);
  const slope = x.reduce((a, v, i) => a + (v - mx) * (t[i] - mt), 0) / sxx;
  return { slope, intercept: mt - slope * mx };
}

const deg = Math.PI / 180;

describe('layerVelocities on hand-built branch fits', () => {
  // Ground sloping 20 % down towards +x, receivers 2 to 10 m from the source: the slope distance is
  // √(1 + 0.2²) = 1.0198 times the offset. Direct wave at 500 m/s.
  const xs = [2, 4, 6, 8, 10];
  const slopePicks = (delay: number) => xs.map((x) => ({ x, elev: -0.2 * x, t: delay + Math.hypot(x, 0.2 * x) / 500 }));

  it('layerVelocities fits V1 through the origin on slope distance: 500.0 m/s, not 500/1.0198 = 490.3 m/s on offset', () => {
    const picks = slopePicks(0);
    const onOffset = line(picks.map((p) => p.x), picks.map((p) => p.t));
    // The segment line (against offset) has slope 1.0198/500 s/m and passes through the origin.
    const fit = fitOf('S1', 0, 'forward', picks, [{ layer: 1, slowness: onOffset.slope, intercept: onOffset.intercept, interceptSe: 1e-4 }]);
    const [layer1] = layerVelocities([fit], 1, new WarningLog());
    expect(layer1.throughOrigin).toBe(true);
    expect(layer1.velocity).toBeCloseTo(500, 6);
    // SE of V1 = V1² σ / √(Σ d²) with σ = 0.1 ms: Σ d² = 1.04 (4+16+36+64+100) = 228.8 m², by hand.
    expect(layer1.velocitySe).toBeCloseTo(500 ** 2 * 1e-4 / Math.sqrt(228.8), 6);
    expect(layer1.segmentCount).toBe(1);
    expect(layer1.reversed).toBe(false);
  });

  it('layerVelocities fits V1 with an intercept on slope distance when the picks are 1.5 ms late: 500.0 m/s', () => {
    const picks = slopePicks(1.5e-3);
    const onOffset = line(picks.map((p) => p.x), picks.map((p) => p.t));
    const fit = fitOf('S1', 0, 'forward', picks, [{ layer: 1, slowness: onOffset.slope, intercept: onOffset.intercept, interceptSe: 1e-5 }]);
    const [layer1] = layerVelocities([fit], 1, new WarningLog());
    expect(layer1.throughOrigin).toBe(false);
    expect(layer1.velocity).toBeCloseTo(500, 6);
    // SE of the slope of a line with intercept, σ / √Σ(d − d̄)²: Σ(x − x̄)² = 40, times 1.04 = 41.6 m², by hand.
    expect(layer1.velocitySe).toBeCloseTo(500 ** 2 * 1e-4 / Math.sqrt(41.6), 6);
  });

  it('layerVelocities leaves out the picks flagged as outliers from the direct-wave fit', () => {
    const picks = slopePicks(0);
    picks[2].t += 5e-3; // a pick 5 ms late, flagged (row 4)
    const fit = fitOf('S1', 0, 'forward', picks, [{ layer: 1, slowness: 1.0198 / 500, intercept: 0, interceptSe: 1e-4 }]);
    fit.outlierRows = [4];
    expect(layerVelocities([fit], 1, new WarningLog())[0].velocity).toBeCloseTo(500, 6);
  });

  it('layerVelocities of a refractor dipping 10° under 500 m/s with V2 = 2000 m/s recovers V2, the dip and their standard errors', () => {
    // θ = asin(500/2000) = 14.4775°; down-dip (forward) sf = sin(θ + 10°)/500, up-dip sr = sin(θ − 10°)/500 (Telford et al. 1990, §4.3).
    const theta = Math.asin(0.25);
    const sf = Math.sin(theta + 10 * deg) / 500;
    const sr = Math.sin(theta - 10 * deg) / 500;
    const direct = (id: string, x0: number, side: Side) => {
      const picks = [1, 2, 3, 4].map((d) => ({ x: x0 + (side === 'forward' ? d : -d), elev: 0, t: d / 500 }));
      return { picks, segment: { layer: 1, slowness: 1 / 500, slownessSe: 1e-6, intercept: 0, interceptSe: 1e-5 } };
    };
    const fits = [
      ['S1', 0, 'forward', sf], ['S2', 100, 'reverse', sr],
    ].map(([id, x0, side, s]) => {
      const d = direct(id as string, x0 as number, side as Side);
      return fitOf(id as string, x0 as number, side as Side, d.picks, [d.segment, { layer: 2, start: 2, slowness: s as number, slownessSe: 2e-6, intercept: 0.02, interceptSe: 1e-4 }], 0);
    });
    const layers = layerVelocities(fits, 2, new WarningLog());
    expect(layers.map((l) => l.index)).toEqual([1, 2]);
    expect(layers[0].reversed).toBe(true);
    expect(layers[1].velocity).toBeCloseTo(2000, 6);
    expect(layers[1].dipDeg!).toBeCloseTo(10, 8);
    expect(layers[1].forwardApparent!).toBeCloseTo(1 / sf, 6);
    expect(layers[1].reverseApparent!).toBeCloseTo(1 / sr, 6);
    expect(layers[1].reversed).toBe(true);
    expect(layers[1].segmentCount).toBe(2);
    // Delta method, by hand, with σ(sf) = σ(sr) = 2e-6 s/m and V1 exact (residual SD 0):
    // V2 = V1 / sin θ, θ = ½(asin V1 sf + asin V1 sr): ∂V2/∂sf = −V1 cos θ / sin² θ · ½ V1 / cos φ,
    // with cos φ = √(1 − (V1 sf)²); the same with ψ for sr. ∂δ/∂sf = ½ V1 / cos φ, ∂δ/∂sr = −½ V1 / cos ψ.
    const cosPhi = Math.cos(theta + 10 * deg);
    const cosPsi = Math.cos(theta - 10 * deg);
    const k = (500 * Math.cos(theta)) / Math.sin(theta) ** 2;
    const vSe = Math.hypot(k * 0.5 * 500 / cosPhi * 2e-6, k * 0.5 * 500 / cosPsi * 2e-6);
    const dipSe = Math.hypot(0.5 * 500 / cosPhi * 2e-6, 0.5 * 500 / cosPsi * 2e-6) / deg;
    expect(layers[1].velocitySe / vSe).toBeCloseTo(1, 4);
    expect(layers[1].dipSeDeg! / dipSe).toBeCloseTo(1, 4);
  });

  it('layerVelocities on flat ground with 1.5 ms late picks keeps the segment\'s own slowness and SE (offset is distance)', () => {
    // Flat ground: the slope distance is the offset, so the segment line is the direct-wave fit.
    const picks = [2, 4, 6, 8, 10].map((x) => ({ x, elev: 0, t: 1.5e-3 + x / 500 }));
    const fit = fitOf('S1', 0, 'forward', picks, [{ layer: 1, slowness: 1 / 500, slownessSe: 3e-6, intercept: 1.5e-3, interceptSe: 1e-5 }]);
    const [layer1] = layerVelocities([fit], 1, new WarningLog());
    expect(layer1.throughOrigin).toBe(false);
    expect(layer1.velocity).toBeCloseTo(500, 9);
    // SE(V) = SE(s) V² = 3e-6 · 500² = 0.75 m/s (delta method).
    expect(layer1.velocitySe).toBeCloseTo(0.75, 9);
  });

  it('layerVelocities solves a refractor dipping 5° under a layer seen from one side only, taking that layer as flat (Snell\'s law through a flat interface)', () => {
    // 500 m/s over 1200 m/s (flat, seen only by the forward branch) over 3000 m/s dipping 5°. Through a
    // flat interface the horizontal slowness is kept, so the head wave of the third layer has, by hand,
    // sf = sin(θ + δ)/1200, sr = sin(θ − δ)/1200 with θ = asin(1200/3000) (Telford et al. 1990, §4.3,
    // with V2 in place of V1).
    const theta = Math.asin(0.4);
    const sf = Math.sin(theta + 5 * deg) / 1200;
    const sr = Math.sin(theta - 5 * deg) / 1200;
    const forward = fitOf('S1', 0, 'forward', [1, 2, 3, 4, 5, 6, 7, 8, 9].map((d) => ({ x: d, elev: 0, t: d / 500 })),
      [{ layer: 1, end: 3, slowness: 1 / 500, intercept: 0 }, { layer: 2, start: 3, end: 6, slowness: 1 / 1200, slownessSe: 4e-6, intercept: 0.01 }, { layer: 3, start: 6, slowness: sf, intercept: 0.02 }], 0);
    // The reverse source is off the far end: it sees only the deepest refractor.
    const reverse = fitOf('S2', 130, 'reverse', [30, 31, 32, 33].map((d) => ({ x: 130 - d, elev: 0, t: 0.05 + d * sr })),
      [{ layer: 3, slowness: sr, intercept: 0.03 }], 0);
    const log = new WarningLog();
    const layers = layerVelocities([forward, reverse], 3, log);
    expect(layers.map((l) => l.index)).toEqual([1, 2, 3]);
    // Layers 1 and 2 are seen from one side only.
    expect(layers[0].reversed).toBe(false);
    expect(layers[1]).toMatchObject({ reversed: false, segmentCount: 1 });
    expect(layers[1].velocity).toBeCloseTo(1200, 6);
    expect(layers[1].velocitySe).toBeCloseTo(4e-6 * 1200 ** 2, 6);
    expect(layers[1].forwardApparent!).toBeCloseTo(1200, 6);
    expect(layers[1].reverseApparent).toBeUndefined();
    expect(log.withCode('unreversed-layer').map((w) => w.layer)).toEqual([2]);
    expect(layers[2].velocity).toBeCloseTo(3000, 6);
    expect(layers[2].dipDeg!).toBeCloseTo(5, 8);
    expect(layers[2].reversed).toBe(true);
  });

  it('layerVelocities solves the second of two reversed dipping refractors through the first (5° over 18°), from ray-traced apparent slownesses', () => {
    // 600 over 1500 m/s dipping 5°, over 4000 m/s dipping 18° (invented); head-wave times traced ray
    // by ray in test/reference/planeLayerRays.ts (Telford et al. 1990, §4.3; no formula of the
    // program): two receivers on each straight branch give its apparent slowness exactly.
    const model: PlaneModel = { depthAtZero: [6, 20], dipDeg: [5, 18], velocities: [600, 1500, 4000] };
    // Slope of time against offset |x − source| (signed: the reverse branch of the 18° refractor
    // slopes down, −4.08e-5 s/m, as it climbs towards −x faster than the offset grows).
    const slope = (m: number, source: number, [a, b]: [number, number]) => {
      const ta = headWaveTime(model, m, source, a);
      const tb = headWaveTime(model, m, source, b);
      if (ta === undefined || tb === undefined) throw new Error(`no head wave from interface ${m}`);
      return (tb - ta) / (Math.abs(b - source) - Math.abs(a - source));
    };
    const fits = [['S1', 0, 'forward', [70, 90]], ['S2', 200, 'reverse', [130, 110]]].map(([id, x0, side, at]) => {
      const towards = side === 'forward' ? 1 : -1;
      const picks = [1, 2, 3, 4, 5, 6].map((d) => ({ x: (x0 as number) + towards * d, elev: 0, t: d / 600 }));
      return fitOf(id as string, x0 as number, side as Side, picks, [
        { layer: 1, end: 2, slowness: 1 / 600, intercept: 0 },
        { layer: 2, start: 2, end: 4, slowness: slope(1, x0 as number, at as [number, number]), slownessSe: 1e-6, intercept: 0.01 },
        { layer: 3, start: 4, slowness: slope(2, x0 as number, at as [number, number]), slownessSe: 1e-6, intercept: 0.03 },
      ], 0);
    });
    const layers = layerVelocities(fits, 3, new WarningLog());
    expect(layers.map((l) => l.index)).toEqual([1, 2, 3]);
    expect(layers[1].velocity / 1500).toBeCloseTo(1, 6);
    expect(layers[1].dipDeg!).toBeCloseTo(5, 5);
    expect(layers[2].velocity / 4000).toBeCloseTo(1, 6);
    expect(layers[2].dipDeg!).toBeCloseTo(18, 5);
    expect(layers[2].velocitySe).toBeGreaterThan(0);
  });

  it('layerVelocities takes the inverse-variance weighted mean of the segments on one side', () => {
    // Two forward segments of a flat 2000 m/s refractor, slowness 1/1900 (SE 2e-6) and 1/2100
    // (SE 1e-6): weights 1/4 and 1, mean (0.25/1900 + 1/2100)/1.25 s/m; reverse 1/2000 exactly.
    const mk = (id: string, x0: number, side: Side, s: number, se: number) =>
      fitOf(id, x0, side, [1, 2, 3, 4, 5].map((d) => ({ x: x0 + (side === 'forward' ? d : -d), elev: 0, t: d / 500 })),
        [{ layer: 1, slowness: 1 / 500, intercept: 0 }, { layer: 2, start: 3, slowness: s, slownessSe: se, intercept: 0.02 }], 0);
    const fits = [mk('S1', 0, 'forward', 1 / 1900, 2e-6), mk('S2', 10, 'forward', 1 / 2100, 1e-6), mk('S3', 100, 'reverse', 1 / 2000, 1e-6)];
    const sf = (0.25 / 1900 + 1 / 2100) / 1.25;
    const layers = layerVelocities(fits, 2, new WarningLog());
    expect(layers[1].forwardApparent!).toBeCloseTo(1 / sf, 6);
    expect(layers[1].reverseApparent!).toBeCloseTo(2000, 6);
    expect(layers[1].segmentCount).toBe(3);
  });

  it('layerVelocities without a top-layer velocity gives a reversed layer the harmonic mean of its apparent velocities, 2/(sf + sr)', () => {
    // No direct-wave segment: no ray can be traced, so no true velocity; the harmonic mean of the
    // up-dip and down-dip apparent velocities is the small-dip estimate (Telford et al. 1990, §4.3).
    const mk = (id: string, x0: number, side: Side, s: number) =>
      fitOf(id, x0, side, [3, 4, 5, 6].map((d) => ({ x: x0 + (side === 'forward' ? d : -d), elev: 0, t: 0.01 + d * s })),
        [{ layer: 2, slowness: s, slownessSe: 1e-6, intercept: 0.01 }], 0);
    const layers = layerVelocities([mk('S1', 0, 'forward', 1 / 1800), mk('S2', 100, 'reverse', 1 / 2200)], 2, new WarningLog());
    expect(layers.map((l) => l.index)).toEqual([2]);
    expect(layers[0].velocity).toBeCloseTo(2 / (1 / 1800 + 1 / 2200), 6); // 1980.0 m/s
    expect(layers[0].dipDeg).toBeUndefined();
    expect(layers[0]).toMatchObject({ reversed: true, segmentCount: 2 });
    expect(layers[0].forwardApparent!).toBeCloseTo(1800, 6);
    expect(layers[0].reverseApparent!).toBeCloseTo(2200, 6);
    // SE of 2/(sf + sr) = 2 √(σf² + σr²)/(sf + sr)², delta method, by hand.
    expect(layers[0].velocitySe).toBeCloseTo((2 * Math.SQRT2 * 1e-6) / (1 / 1800 + 1 / 2200) ** 2, 6);
  });
});

describe('layerVelocities on a layer whose picks come earlier with offset', () => {
  // Apparent slownesses of a plane refractor: down-dip sin(θc + δ)/V1, up-dip sin(θc − δ)/V1
  // (Telford et al. 1990, §4.3), so θc = ½[asin(V1 sf) + asin(V1 sr)]. With V1 = 500 m/s,
  // sf = −1/2000 and sr = 1/20000 s/m: θc = ½[asin(−0.25) + asin(0.025)] = −0.114 rad < 0, no plane
  // refractor gives them, and the harmonic mean would be 2/(sf + sr) = −4444 m/s (by hand).
  const direct = (id: string, x0: number, side: Side) =>
    fitOf(id, x0, side, [2, 4, 6, 8].map((d) => ({ x: x0 + (side === 'forward' ? d : -d), elev: 0, t: d / 500 })),
      [{ layer: 1, slowness: 1 / 500, slownessSe: 1e-6, intercept: 0, interceptSe: 1e-4 }]);
  const head = (id: string, x0: number, side: Side, s: number) =>
    fitOf(id, x0, side, [30, 34, 38, 42].map((d) => ({ x: x0 + (side === 'forward' ? d : -d), elev: 0, t: 0.05 + d * s })),
      [{ layer: 2, slowness: s, slownessSe: 1e-6, intercept: 0.05 }]);

  it('layerVelocities(forward slowness −1/2000 s/m, reverse 1/20000) reports layer 1 only and an unresolved-layer warning naming layer 2, the side and the offsets', () => {
    const log = new WarningLog();
    const layers = layerVelocities([direct('S1', 0, 'forward'), direct('S2', 46, 'reverse'), head('S1', 0, 'forward', -1 / 2000), head('S2', 46, 'reverse', 1 / 20000)], 2, log);
    expect(layers.map((l) => l.index)).toEqual([1]);
    expect(layers[0].velocity).toBeCloseTo(500, 6);
    const warning = log.items.find((w) => w.code === 'unresolved-layer');
    expect(warning?.layer).toBe(2);
    expect(warning?.message).toContain('forward branches');
    expect(warning?.message).toContain('offsets 30 m to 42 m');
  });

  it('layerVelocities(both slownesses positive, 1/2200 and 1/2500 s/m) keeps layer 2 with a positive velocity and no unresolved-layer warning', () => {
    const log = new WarningLog();
    const layers = layerVelocities([direct('S1', 0, 'forward'), direct('S2', 46, 'reverse'), head('S1', 0, 'forward', 1 / 2200), head('S2', 46, 'reverse', 1 / 2500)], 2, log);
    expect(layers.map((l) => l.index)).toEqual([1, 2]);
    // Flat-layer limit of the dipping formulas: V2 between the apparent velocities 2200 and 2500 m/s.
    expect(layers[1].velocity).toBeGreaterThan(2200);
    expect(layers[1].velocity).toBeLessThan(2500);
    expect(log.items.some((w) => w.code === 'unresolved-layer')).toBe(false);
  });
});

describe('assignLayers on hand-built branch fits', () => {
  // A flat refractor, 500 over 2000 m/s: near-source branches see the direct wave (intercept 0)
  // and then the head wave; off-end branches (sources 20 m beyond the first receiver) the head wave only.
  const near = (id: string, x0: number, side: Side) =>
    fitOf(id, x0, side, [1, 2, 3, 4, 5, 6, 7, 8].map((d) => ({ x: x0 + (side === 'forward' ? d : -d), elev: 0, t: 0 })),
      [{ slowness: 1 / 500, slownessSe: 1e-6, intercept: 0, interceptSe: 1e-4, end: 4 }, { slowness: 1 / 2000, slownessSe: 1e-6, intercept: 0.02, interceptSe: 1e-4, start: 4 }]);
  const offEnd = (id: string, x0: number, side: Side, slowness: number) =>
    fitOf(id, x0, side, [20, 21, 22, 23].map((d) => ({ x: x0 + (side === 'forward' ? d : -d), elev: 0, t: 0 })),
      [{ slowness, slownessSe: 1e-6, intercept: 0.02, interceptSe: 1e-4 }]);

  it('assignLayers puts the one segment of an off-end branch on the layer of nearest slowness (layer 2), not layer 1', () => {
    const fits = [near('S1', 0, 'forward'), near('S2', 50, 'reverse'), offEnd('S3', -20, 'forward', 1 / 1950)];
    const log = new WarningLog();
    expect(assignLayers(fits, 1, log)).toBe(2);
    expect(fits[2].segments[0].layer).toBe(2);
    expect(log.withCode('layer-consistency')).toHaveLength(0);
  });

  it('assignLayers starts a new layer for an off-end segment more than 1.25 times faster than the deepest one, and not for one within it', () => {
    // 1/4000 s/m is twice as fast as layer 2: a new layer 3. 1/2300 (1.15 times faster) stays on layer 2.
    const faster = [near('S1', 0, 'forward'), near('S2', 50, 'reverse'), offEnd('S3', -20, 'forward', 1 / 4000)];
    expect(assignLayers(faster, 1, new WarningLog())).toBe(3);
    expect(faster[2].segments[0].layer).toBe(3);
    const close = [near('S1', 0, 'forward'), near('S2', 50, 'reverse'), offEnd('S3', -20, 'forward', 1 / 2300)];
    expect(assignLayers(close, 1, new WarningLog())).toBe(2);
    expect(close[2].segments[0].layer).toBe(2);
  });

  it('assignLayers matches the segments of a two-segment off-end branch in order: 1/1950 to layer 2, 1/4000 to a new layer 3', () => {
    const fits = [near('S1', 0, 'forward'), near('S2', 50, 'reverse'), offEnd('S3', -20, 'forward', 1 / 1950)];
    fits[2].segments.push({ ...fits[2].segments[0], order: 2, layer: 2, slowness: 1 / 4000, apparentVelocity: 4000 });
    expect(assignLayers(fits, 1, new WarningLog())).toBe(3);
    expect(fits[2].segments.map((x) => x.layer)).toEqual([2, 3]);
  });

  it('assignLayers matches an off-end segment against its own side: down-dip 1/1600 is layer 2 on forward branches, although both sides together put it nearer layer 3', () => {
    // Forward (down-dip) apparent velocities 500, 1200, 3000 m/s; reverse (up-dip) 500, 600, 1300 m/s.
    // Forward side: |ln(1600/1200)| = 0.29 < |ln(3000/1600)| = 0.63, layer 2. Both sides (median
    // slownesses 1/800 and 1/1814): |ln(1600/800)| = 0.69 > |ln(1814/1600)| = 0.13, layer 3. By hand.
    const three = (id: string, x0: number, side: Side, v: number[]) =>
      fitOf(id, x0, side, [1, 2, 3, 4, 5, 6, 7, 8, 9].map((d) => ({ x: x0 + (side === 'forward' ? d : -d), elev: 0, t: 0 })),
        v.map((velocity, i) => ({ slowness: 1 / velocity, slownessSe: 1e-6, intercept: i === 0 ? 0 : 0.01 * i, interceptSe: 1e-4, start: 3 * i, end: 3 * i + 3 })));
    const fits = [three('S1', 0, 'forward', [500, 1200, 3000]), three('S2', 50, 'reverse', [500, 600, 1300]), offEnd('S3', -20, 'forward', 1 / 1600)];
    expect(assignLayers(fits, 1, new WarningLog())).toBe(3);
    expect(fits[2].segments[0].layer).toBe(2);
  });

  it('assignLayers with no branch starting at its source keeps each branch\'s own segment order as its layers', () => {
    const fits = [offEnd('S1', -20, 'forward', 1 / 2000), offEnd('S2', 70, 'reverse', 1 / 2000)];
    fits[0].segments.push({ ...fits[0].segments[0], order: 2, layer: 2, slowness: 1 / 4000 });
    expect(assignLayers(fits, 1, new WarningLog())).toBe(2);
    expect(fits.map((f) => f.segments.map((x) => x.layer))).toEqual([[1, 2], [1]]);
  });

  it('assignLayers with every near-source branch starting on a head wave shifts every segment one layer down and says why', () => {
    // Intercepts 6.6 ms, over 3 ms (a direct wave passes through the origin, common practice).
    const head = (id: string, x0: number, side: Side) =>
      fitOf(id, x0, side, [1, 2, 3, 4].map((d) => ({ x: x0 + (side === 'forward' ? d : -d), elev: 0, t: 0 })), [{ slowness: 1 / 2000, intercept: 6.6e-3, interceptSe: 1e-4 }]);
    const fits = [head('S1', 0, 'forward'), head('S2', 50, 'reverse')];
    const log = new WarningLog();
    expect(assignLayers(fits, 1, log)).toBe(2);
    expect(fits.map((f) => f.segments[0].layer)).toEqual([2, 2]);
    const [warning] = log.withCode('no-direct-wave');
    expect(warning.layer).toBe(1);
    expect(warning.message).toMatch(/intercepts 6\.6, 6\.6 ms/);
    // One near-source branch with a direct wave: only the other is shifted, with its own warning.
    const mixed = [near('S1', 0, 'forward'), head('S2', 50, 'reverse')];
    const mixedLog = new WarningLog();
    expect(assignLayers(mixed, 1, mixedLog)).toBe(2);
    expect(mixed.map((f) => f.segments.map((x) => x.layer))).toEqual([[1, 2], [2]]);
    expect(mixedLog.withCode('direct-wave-unsampled')[0].message).toMatch(/^S2:reverse branch starts with a segment of intercept 6\.6 ms/);
  });

  it('assignLayers warns when a segment departs from its layer\'s median on its side by more than the ratio 1.4, naming branch, segment and velocities', () => {
    // Three forward branches on layer 2 at 2000, 2000 and 3000 m/s: the third is 1.5 times the median.
    const odd = near('S3', 10, 'forward');
    odd.segments[1].slowness = 1 / 3000;
    odd.segments[1].apparentVelocity = 3000;
    const fits = [near('S1', 0, 'forward'), near('S2', 5, 'forward'), odd, near('S4', 50, 'reverse')];
    const log = new WarningLog();
    assignLayers(fits, 1, log);
    const warned = log.withCode('layer-consistency');
    expect(warned).toHaveLength(1);
    expect(warned[0].message).toMatch(/^S3:forward segment 2 \(apparent velocity 3000 m\/s\) is assigned to layer 2, whose median apparent velocity on forward branches is 2000 m\/s/);
    expect(warned[0].layer).toBe(2);
    // Slower by the same ratio (1300 m/s, 1.54 times the median slowness): warned too.
    odd.segments[1].slowness = 1 / 1300;
    odd.segments[1].apparentVelocity = 1300;
    const slow = new WarningLog();
    assignLayers([near('S1', 0, 'forward'), near('S2', 5, 'forward'), odd, near('S4', 50, 'reverse')], 1, slow);
    expect(slow.withCode('layer-consistency')).toHaveLength(1);
    // The same departure within three of its standard errors (a short, uncertain segment): not warned.
    odd.segments[1].slownessSe = 1e-4;
    const uncertain = new WarningLog();
    assignLayers([near('S1', 0, 'forward'), near('S2', 5, 'forward'), odd, near('S4', 50, 'reverse')], 1, uncertain);
    expect(uncertain.withCode('layer-consistency')).toHaveLength(0);
    // 1.3 times the median is within the ratio: no warning.
    odd.segments[1].slowness = 1 / 2600;
    const quiet = new WarningLog();
    assignLayers([near('S1', 0, 'forward'), near('S2', 5, 'forward'), odd, near('S4', 50, 'reverse')], 1, quiet);
    expect(quiet.withCode('layer-consistency')).toHaveLength(0);
  });
});
