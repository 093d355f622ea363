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

  it('layerVelocities keeps the apparent velocity of a layer seen from one side only and says which side', () => {
    // 5 m of 500 m/s on 2000 m/s, flat (Telford et al. 1990 §4.2): the apparent velocity is the true one.
    const time = (s: number, r: number) => flatFirstArrival([5], [500, 2000], r - s);
    const forward = interpretCsv(csvFrom([-0.5], range(48, 1), time));
    expect(forward.result.layers[1].reversed).toBe(false);
    expect(forward.result.layers[0].reversed).toBe(false);
    // Standard error of an apparent velocity: SE(1/s) = SE(s)/s² (delta method).
    const segment = forward.result.fits[0].segments.find((x) => x.layer === 2)!;
    expect(forward.result.layers[1].velocitySe).toBeCloseTo(segment.slownessSe / segment.slowness ** 2, 9);
    expect(forward.result.layers[1].dipDeg).toBeUndefined();
    expect(Math.abs(forward.result.layers[1].velocity / 2000 - 1)).toBeLessThan(0.005);
    expect(forward.log.withCode('unreversed-layer')[0].message).toMatch(/^layer 2 is seen only by forward \(\+x\) branches; its velocity 2000 m\/s is apparent, not true, and its dip is unknown/);
    const reverse = interpretCsv(csvFrom([47.5], range(48, 1), time));
    expect(reverse.log.withCode('unreversed-layer')[0].message).toMatch(/only by reverse \(-x\) branches/);
    expect(reverse.result.layers[1].reverseApparent).toBeCloseTo(reverse.result.layers[1].velocity, 6);
    expect(reverse.result.layers[1].forwardApparent).toBeUndefined();
  });

  it('layerVelocities warns when the direct wave rests on 4 picks per branch or fewer, not on 5', () => {
    // Crossover 2 h √((V2 + V1)/(V2 − V1)) = 12.91 m (Telford et al. 1990, eq. 4.29), by hand:
    // geophones every 4 m from a source 0.5 m off give 4 direct picks (0.5 to 12.5 m), every 3 m give 5.
    const time = (s: number, r: number) => flatFirstArrival([5], [500, 2000], r - s);
    const four = interpretCsv(csvFrom([-0.5, 96.5], range(25, 4), time));
    expect(four.log.withCode('few-direct-picks')[0].message).toMatch(/rests on 4 picks per branch \(median\)/);
    const five = interpretCsv(csvFrom([-0.5, 72.5], range(25, 3), time));
    expect(five.log.withCode('few-direct-picks')).toHaveLength(0);
  });

  it('assignLayers finds no direct wave when every branch starts with a head wave, and says that no depth can be computed', () => {
    // 1 m of 300 m/s on 2000 m/s: intercept 2 h cos θ / V1 = 2·1·0.9887/300 = 6.59 ms and
    // crossover 2.33 m (Telford et al. 1990, eqs. 4.28-4.29), by hand; geophones every 2 m with
    // the sources 2.5 m off the ends (within two spacings: near the source) record no direct wave.
    const time = (s: number, r: number) => flatFirstArrival([1], [300, 2000], r - s);
    const { result, log } = interpretCsv(csvFrom([-2.5, 48.5], range(24, 2), time));
    expect(log.withCode('no-direct-wave')[0].message).toMatch(/intercepts 6\.\d, 6\.\d ms/);
    expect(result.layers.some((l) => l.index === 1)).toBe(false);
    expect(result.refractors).toHaveLength(0);
  });

  it('assignLayers takes the segments of a branch without direct-wave picks as refracted, with a warning naming it', () => {
    // As above, with three more geophones 0.5 to 1.5 m from the second source: it sees the direct wave.
    const time = (s: number, r: number) => flatFirstArrival([1], [300, 2000], r - s);
    const receivers = [...range(24, 2), 47, 47.5, 48];
    const { result, log } = interpretCsv(csvFrom([-2.5, 48.5], receivers, time));
    expect(log.withCode('direct-wave-unsampled')[0].message).toMatch(/^S1:forward branch starts with a segment of intercept 6\.\d ms, not a direct wave/);
    expect(result.layers.map((l) => l.index)).toEqual([1, 2]);
    expect(Math.abs(result.layers[0].velocity / 300 - 1)).toBeLessThan(0.01);
    expect(Math.abs(result.layers[1].velocity / 2000 - 1)).toBeLessThan(0.01);
  });
});

