import { describe, expect, it } from 'vitest';
import {
  MIN_SAMPLE_THICKNESS, elevationIndex, gradientIndex, groundAlongLine, packParameters, parameterCount, sampleNodeSection, unpackParameters, velocityAt, velocityIndex, type NodeSection,
} from '../../src/model/nodeSection.js';

// The node section is linear interpolation between nodes (held at the end values beyond them)
// and a velocity linear along the line; every expected value here is worked by hand from that
// definition: z(x) = (1 − t) z_a + t z_{a+1}, t = (x − x_a) / (x_{a+1} − x_a).
const section = (over: Partial<NodeSection> = {}): NodeSection => ({
  ground: () => 100,
  nodeXs: Float64Array.from([0, 10, 30]),
  elevations: [Float64Array.from([95, 91, 93]), Float64Array.from([80, 85, 70])],
  velocities: Float64Array.from([400, 1500, 3000]),
  gradients: Float64Array.from([0, 2, -5]),
  xRef: 15,
  ...over,
});

describe('groundAlongLine', () => {
  it('interpolates linearly between receivers and sources, holds the end values, and lets a receiver win over a source at the same x', () => {
    const ground = groundAlongLine(
      [{ x: 10, elev: 102 }, { x: 0, elev: 100 }, { x: 20, elev: 96 }, { x: 30, elev: 97 }],
      [{ x: -5, elev: 99 }, { x: 20, elev: 50 }, { x: 40, elev: 101 }],
    );
    expect(ground(-10)).toBe(99);
    expect(ground(-5)).toBe(99);
    expect(ground(-2.5)).toBeCloseTo(99.5, 12); // halfway from 99 (−5 m) to 100 (0 m)
    expect(ground(0)).toBeCloseTo(100, 12);
    expect(ground(4)).toBeCloseTo(100.8, 12); // 100 + 0.4 · 2
    expect(ground(10)).toBeCloseTo(102, 12);
    expect(ground(17.5)).toBeCloseTo(97.5, 12); // 102 − 0.75 · 6
    expect(ground(20)).toBeCloseTo(96, 12); // the receiver's 96, not the source's 50
    expect(ground(25)).toBeCloseTo(96.5, 12);
    expect(ground(35)).toBeCloseTo(99, 12); // 97 + 0.5 · 4
    expect(ground(40)).toBe(101);
    expect(ground(60)).toBe(101);
  });

  it('gives the one elevation everywhere for a single station', () => {
    const ground = groundAlongLine([{ x: 5, elev: 42 }], []);
    expect([ground(-1), ground(5), ground(9)]).toEqual([42, 42, 42]);
  });
});

describe('parameter layout', () => {
  it('counts elevations at every node of every refractor, then one velocity (and gradient) per layer', () => {
    // 2 refractors × 3 nodes + 3 velocities = 9; with gradients 12.
    expect(parameterCount(2, 3, false)).toBe(9);
    expect(parameterCount(2, 3, true)).toBe(12);
    expect([elevationIndex(3, 1, 2), velocityIndex(2, 3, 0), velocityIndex(2, 3, 2), gradientIndex(2, 3, 0), gradientIndex(2, 3, 2)]).toEqual([5, 6, 8, 9, 11]);
  });

  it('packs and unpacks the unknowns in that layout, keeping ground, nodes and xRef', () => {
    const s = section();
    const p = packParameters(s, true);
    expect([...p]).toEqual([95, 91, 93, 80, 85, 70, 400, 1500, 3000, 0, 2, -5]);
    expect([...packParameters(s, false)]).toEqual([95, 91, 93, 80, 85, 70, 400, 1500, 3000]);
    const back = unpackParameters(s, Float64Array.from([1, 2, 3, 4, 5, 6, 7, 8, 9, 10, 11, 12]), true);
    expect(back.elevations.map((e) => [...e])).toEqual([[1, 2, 3], [4, 5, 6]]);
    expect([...back.velocities]).toEqual([7, 8, 9]);
    expect([...back.gradients]).toEqual([10, 11, 12]);
    expect([back.ground, back.nodeXs, back.xRef]).toEqual([s.ground, s.nodeXs, s.xRef]);
    const flat = unpackParameters(s, Float64Array.from([1, 2, 3, 4, 5, 6, 7, 8, 9]), false);
    expect([...flat.velocities]).toEqual([7, 8, 9]);
    expect([...flat.gradients]).toEqual([0, 0, 0]);
  });

  it('gives v(x) = velocity + gradient · (x − xRef)', () => {
    expect(velocityAt(section(), 1, 25)).toBe(1520);
    expect(velocityAt(section(), 2, 5)).toBe(3050);
  });
});

describe('sampleNodeSection', () => {
  it('samples every step over the span, interpolating the refractors between nodes and holding the end values', () => {
    // Span −5 to 35 m at 5 m: 9 samples. Refractor 1 (95, 91, 93 at 0, 10, 30 m): at 5 m 93, at
    // 20 m 92, at 25 m 92.5; beyond the nodes 95 and 93.
    const sampled = sampleNodeSection(section(), [-5, 35], 5);
    expect([...sampled.xs]).toEqual([-5, 0, 5, 10, 15, 20, 25, 30, 35]);
    expect(sampled.step).toBe(5);
    expect([...sampled.groundZ]).toEqual(Array(9).fill(100));
    const expected = [95, 95, 93, 91, 91.5, 92, 92.5, 93, 93];
    expected.forEach((z, i) => expect(sampled.levels[0][i]).toBeCloseTo(z, 12));
    // Refractor 2 (80, 85, 70): 82.5 at 5 m, 81.25 at 15 m.
    [80, 80, 82.5, 85, 81.25, 77.5, 73.75, 70, 70].forEach((z, i) => expect(sampled.levels[1][i]).toBeCloseTo(z, 12));
    expect([...sampled.owners[0]]).toEqual(Array(9).fill(0));
    expect([...sampled.owners[1]]).toEqual(Array(9).fill(1));
    expect([...sampled.node]).toEqual([0, 0, 0, 0, 1, 1, 1, 1, 1]);
    [0, 0, 0.5, 1, 0.25, 0.5, 0.75, 1, 1].forEach((t, i) => expect(sampled.weight[i]).toBeCloseTo(t, 12));
  });

  it('rounds the step to fit the span, with two samples at least', () => {
    const sampled = sampleNodeSection(section(), [0, 10], 3);
    // round(10 / 3) + 1 = 4 samples, step 10 / 3.
    expect(sampled.xs.length).toBe(4);
    expect(sampled.step).toBeCloseTo(10 / 3, 12);
    expect(sampleNodeSection(section(), [0, 1], 10).xs.length).toBe(2);
  });

  it(`keeps each refractor ${MIN_SAMPLE_THICKNESS} m below the ground and the refractor above, following its owner`, () => {
    // Refractor 1 above the ground (101 > 100) at the first node: pushed to 99.95 there, owned by
    // the ground (−1); refractor 2 at 99.99 there is pushed under it to 99.90 and follows the ground
    // too. At 5 m refractor 1 is at (101 + 91) / 2 = 96, its own; refractor 2 at 96.495 is pushed
    // under it to 95.95, owned by refractor 1; at 10 m, 93 above 91: 90.95, owned by refractor 1.
    const s = section({ elevations: [Float64Array.from([101, 91, 93]), Float64Array.from([99.99, 93, 70])] });
    const sampled = sampleNodeSection(s, [0, 10], 5);
    expect(sampled.levels[0][0]).toBeCloseTo(100 - MIN_SAMPLE_THICKNESS, 12);
    expect(sampled.owners[0][0]).toBe(-1);
    expect(sampled.levels[1][0]).toBeCloseTo(100 - 2 * MIN_SAMPLE_THICKNESS, 12);
    expect(sampled.owners[1][0]).toBe(-1);
    expect(sampled.levels[0][1]).toBeCloseTo(96, 12);
    expect(sampled.owners[0][1]).toBe(0);
    expect(sampled.levels[1][1]).toBeCloseTo(96 - MIN_SAMPLE_THICKNESS, 12);
    expect(sampled.owners[1][1]).toBe(0);
    expect(sampled.levels[1][2]).toBeCloseTo(91 - MIN_SAMPLE_THICKNESS, 12);
    expect(sampled.owners[1][2]).toBe(0);
    // Exactly MIN_SAMPLE_THICKNESS below is allowed as it is (the bound is strict).
    const touching = sampleNodeSection(section({ elevations: [Float64Array.from([100 - MIN_SAMPLE_THICKNESS, 90, 90])], velocities: Float64Array.from([400, 1500]), gradients: Float64Array.from([0, 0]) }), [0, 0], 1);
    expect(touching.owners[0][0]).toBe(0);
    expect(touching.levels[0][0]).toBe(100 - MIN_SAMPLE_THICKNESS);
  });

  it('holds a single node flat', () => {
    const sampled = sampleNodeSection(section({ nodeXs: Float64Array.from([10]), elevations: [Float64Array.from([90]), Float64Array.from([80])] }), [0, 20], 10);
    expect([...sampled.levels[0]]).toEqual([90, 90, 90]);
    expect([...sampled.levels[1]]).toEqual([80, 80, 80]);
    expect([...sampled.weight]).toEqual([0, 0, 0]);
  });
});
