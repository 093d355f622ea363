import { describe, expect, it } from 'vitest';
import { syntheticCsv, type LineCase } from './reference/layeredTravelTimes.js';
import { interpretCsv, range } from './helpers.js';

// Lines made by the independent forward model of test/reference/layeredTravelTimes.ts (least
// time by Fermat's principle over finely sampled interfaces; no refraction formula) plus seeded
// Gaussian pick noise of 0.3 ms. Tolerances from the issue: every velocity within 2 %, every
// intercept-time depth under a source within 0.3 m.

const tan6 = Math.tan((6 * Math.PI) / 180);
const cases: LineCase[] = [
  {
    name: 'flat two-layer (500 over 2200 m/s, 6 m)',
    section: { surface: () => 100, interfaces: [() => 94], velocities: [500, 2200] },
    sources: [-5, 0, 35.5, 71, 76], receivers: range(72, 1), depth: [() => 6],
  },
  {
    name: 'refractor dipping 6 degrees (600 over 2500 m/s, 4 to 9 m)',
    section: { surface: () => 100, interfaces: [(x) => 96 - x * tan6], velocities: [600, 2500] },
    sources: [-6, 0, 47, 94, 100], receivers: range(48, 2), depth: [(x) => 4 + x * tan6],
  },
  {
    name: 'three layers (350, 1200, 3000 m/s; 3 m and 10 m)',
    section: { surface: () => 50, interfaces: [() => 47, () => 40], velocities: [350, 1200, 3000] },
    sources: [-10, 0, 47.5, 95, 105], receivers: range(96, 1), depth: [() => 3, () => 10],
  },
  {
    name: 'sloping ground, 8 % (450 over 2000 m/s, 5 to 6.2 m)',
    section: { surface: (x) => 80 - 0.08 * x, interfaces: [(x) => 75 - 0.1 * x], velocities: [450, 2000] },
    sources: [-5, 0, 30, 60, 65], receivers: range(61, 1), depth: [(x) => 5 + 0.02 * x],
  },
];

describe('interpret on lines from an independent forward model with 0.3 ms pick noise', () => {
  for (const c of cases) {
    for (const seed of [1, 2, 3]) {
      it(`interpret(${c.name}, seed ${seed}) recovers the layer count, every velocity within 2 % and depths within 0.3 m`, () => {
        const { result } = interpretCsv(syntheticCsv(c.section, c.sources, c.receivers, 0.3, seed));
        expect(result.layers.map((l) => l.index)).toEqual(c.section.velocities.map((_, i) => i + 1));
        c.section.velocities.forEach((v, i) => {
          expect(Math.abs(result.layers[i].velocity / v - 1)).toBeLessThan(0.02);
        });
        expect(result.refractors).toHaveLength(c.depth.length);
        c.depth.forEach((depthAt, k) => {
          const points = result.refractors[k].byMethod['intercept-time'];
          expect(points.length).toBeGreaterThanOrEqual(3);
          for (const p of points) expect(Math.abs(p.depth - depthAt(p.x))).toBeLessThan(0.3);
        });
      });
    }
  }

  it('interpret(dipping refractor) recovers the dip of 6 degrees within 0.3 degrees', () => {
    const c = cases[1];
    const { result } = interpretCsv(syntheticCsv(c.section, c.sources, c.receivers, 0.3, 7));
    // Dip positive when the refractor deepens towards +x (the model: 6 degrees down towards +x).
    expect(Math.abs(result.layers[1].dipDeg! - 6)).toBeLessThan(0.3);
  });
});
