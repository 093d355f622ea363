import { describe, expect, it } from 'vitest';
import { syntheticCsv, type LayeredSection } from '../reference/layeredTravelTimes.js';
import { flatFirstArrival } from '../reference/flatLayerTimes.js';
import { csvFrom, interpretCsv, range } from '../helpers.js';

describe('layerVelocities', () => {
  it('layerVelocities fits the direct wave on slope distance: V1 within 0.3 % on ground sloping 20 %', () => {
    // The direct wave runs straight from source to receiver along the ground, so its time is the
    // slope distance over V1 (common practice); on a 20 % slope the slope distance is √1.04 = 1.0198
    // times the horizontal offset, so a fit on offset would give V1 2 % too high. Exact first
    // breaks from the Fermat least-time reference (test/reference/layeredTravelTimes.ts), no noise.
    const section: LayeredSection = { surface: (x) => 100 - 0.2 * x, interfaces: [(x) => 93 - 0.2 * x], velocities: [500, 2000] };
    const csv = syntheticCsv(section, [0, 23.5, 47], range(48, 1), 0, 1);
    const { result } = interpretCsv(csv);
    expect(result.layers[0].throughOrigin).toBe(true);
    expect(Math.abs(result.layers[0].velocity / 500 - 1)).toBeLessThan(0.003);
    // The same picks 1.5 ms late (a trigger delay, common practice): the direct-wave lines no
    // longer pass through the origin and are fitted with an intercept, still on slope distance.
    const late = csv.trim().split('\n').map((row, i) => {
      if (i === 0) return row;
      const cells = row.split(',');
      cells[5] = (Number(cells[5]) + 1.5).toFixed(3);
      return cells.join(',');
    }).join('\n') + '\n';
    const delayed = interpretCsv(late).result;
    expect(delayed.layers[0].throughOrigin).toBe(false);
    expect(Math.abs(delayed.layers[0].velocity / 500 - 1)).toBeLessThan(0.003);
  });

  it('layerVelocities gives each of four flat layers its own velocity within 0.5 % (each from its own segments)', () => {
    // Exact flat-layer first breaks (Telford et al. 1990 §4.2, test/reference/flatLayerTimes.ts):
    // 3 m at 400, 6 m at 900, 10 m at 1800 m/s over 4000 m/s, 120 geophones at 1 m.
    const velocities = [400, 900, 1800, 4000];
    const { result } = interpretCsv(csvFrom([-0.5, 59.5, 119.5], range(120, 1), (s, r) => flatFirstArrival([3, 6, 10], velocities, r - s)));
    expect(result.layers.map((l) => l.index)).toEqual([1, 2, 3, 4]);
    velocities.forEach((v, i) => expect(Math.abs(result.layers[i].velocity / v - 1)).toBeLessThan(0.005));
    // Depths 3, 9 and 19 m under every source (the model).
    [3, 9, 19].forEach((depth, k) => {
      for (const p of result.refractors[k].byMethod['intercept-time']) expect(Math.abs(p.depth - depth)).toBeLessThan(0.05);
    });
  });
});
