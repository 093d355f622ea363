import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { syntheticCsv } from './reference/layeredTravelTimes.js';
import { csvFrom, interpretCsv, range } from './helpers.js';

const base = syntheticCsv(
  { surface: () => 30, interfaces: [() => 25], velocities: [480, 2100] },
  [-4, 0, 23.5, 47, 51], range(48, 1), 0.3, 5,
);
const [header, ...rows] = base.trim().split('\n');
const reference = interpretCsv(base).result;

describe('interpret properties (fast-check)', () => {
  it('interpret gives the same layers and depths whatever the order of the rows', () => {
    fc.assert(fc.property(fc.shuffledSubarray(rows.map((_, i) => i), { minLength: rows.length, maxLength: rows.length }), (order) => {
      const shuffled = [header, ...order.map((i) => rows[i])].join('\n') + '\n';
      const { result } = interpretCsv(shuffled);
      expect(result.layers.map((l) => l.velocity)).toEqual(reference.layers.map((l) => expect.closeTo(l.velocity, 9)));
      expect(result.refractors[0].points.map((p) => p.depth)).toEqual(reference.refractors[0].points.map((p) => expect.closeTo(p.depth, 9)));
    }), { numRuns: 25, seed: 42 });
  });

  it('interpret of branches that are each a single straight line gives one layer and no refractor', () => {
    fc.assert(fc.property(
      fc.double({ min: 150, max: 4000, noNaN: true }),
      // Trigger delays of a sound recording are well under a millisecond (common practice); a first
      // segment starting 3 ms or more after the shot is taken for a refracted arrival instead.
      fc.double({ min: 0, max: 0.002, noNaN: true }),
      fc.integer({ min: 6, max: 60 }),
      (velocity, delay, count) => {
        const { result } = interpretCsv(csvFrom([-0.5, count + 0.5], range(count, 1), (s, r) => delay + Math.abs(r - s) / velocity));
        expect(result.layers).toHaveLength(1);
        expect(result.layers[0].velocity).toBeCloseTo(velocity, 0);
        expect(result.refractors).toHaveLength(0);
      },
    ), { numRuns: 40, seed: 7 });
  });
});
