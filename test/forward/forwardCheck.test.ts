import { describe, expect, it } from 'vitest';
import { sampleSection, sectionTimes } from '../../src/forward/sectionTimes.js';
import { syntheticCsv } from '../reference/layeredTravelTimes.js';
import { interpretCsv, range } from '../helpers.js';

describe('sectionTimes', () => {
  it('sectionTimes over a flat two-layer section equals the textbook head-wave time within 0.05 ms', () => {
    // t = x/V2 + 2h·cos(asin(V1/V2))/V1 beyond the crossover (Telford, Geldart & Sheriff 1990, eq. 4.28), by hand:
    // h = 5 m, V1 = 500, V2 = 2000 m/s: intercept 19.365 ms; at x = 60 m, t = 30 + 19.365 = 49.365 ms.
    const section = { ground: () => 100, refractors: [[{ x: 0, elev: 95 }, { x: 100, elev: 95 }]], velocities: [500, 2000] };
    const [t60, t5] = sectionTimes(sampleSection(section, [-10, 110], 0.5), 0, [60, 5]);
    expect(t60 * 1e3).toBeCloseTo(49.365, 1);
    // Before the crossover (12.9 m) the direct wave is first: 5 m / 500 m/s = 10 ms.
    expect(t5 * 1e3).toBeCloseTo(10, 6);
  });
});

describe('the forward check of an interpretation', () => {
  const section = { surface: () => 100, interfaces: [(x: number) => 94 - 0.02 * x], velocities: [500, 2200] };
  const csv = syntheticCsv(section, [-10, 0, 35.5, 71, 81], range(72, 1), 0.3, 8);

  it('interpret(forward-model line with 0.3 ms noise) fits its picks to about the pick noise (0.25 to 0.4 ms RMS)', () => {
    const { result, log } = interpretCsv(csv);
    expect(result.forward!.rms).toBeGreaterThan(0.25e-3);
    expect(result.forward!.rms).toBeLessThan(0.4e-3);
    expect(log.withCode('forward-misfit')).toHaveLength(0);
  });

  it('interpret warns when the interpreted section does not explain the picks (a layer left out)', () => {
    // Three layers (350, 1200, 3500 m/s; 3 m and 10 m), fitted with at most two segments per branch:
    // the section then has no 3500 m/s refractor and cannot explain the far, early arrivals.
    const three = syntheticCsv({ surface: () => 50, interfaces: [() => 47, () => 40], velocities: [350, 1200, 3500] }, [-10, 0, 47.5, 95, 105], range(96, 1), 0.3, 2);
    // The layered inversion is off: the check is of the section the depth methods give.
    const { result, log } = interpretCsv(three, { maxSegments: 2, inversion: false });
    expect(result.layers).toHaveLength(2);
    expect(result.forward!.rms).toBeGreaterThan(1e-3);
    expect(log.withCode('forward-misfit')[0].message).toMatch(/does not explain the picks well/);
  });
});
