import { describe, expect, it } from 'vitest';
import { interpretationJson } from '../../src/io/interpretationJson.js';
import { summary } from '../../src/report/summary.js';
import { interpretCsv, range } from '../helpers.js';
import { syntheticCsv } from '../reference/layeredTravelTimes.js';

// A water table 2.5 m down in 400 m/s soil (saturated soil at 1500 m/s, near the speed of sound in
// water: common practice) over 3400 m/s rock at 9 ± 2 m (70 m wavelength), ground falling 5 %,
// sources off both ends at half a spread; picks from the independent forward model
// (test/reference/layeredTravelTimes.ts) with seeded noise of 0.25 ms.
const ground = (x: number) => 80 - 0.05 * x;
const water = 2.5;
const rock = (x: number) => 9 + 2 * Math.sin((2 * Math.PI * (x - 10)) / 70);
const csv = syntheticCsv({ surface: ground, interfaces: [(x) => ground(x) - water, (x) => ground(x) - rock(x)], velocities: [400, 1500, 3400] }, [-24, 0, 23, 47, 71, 94, 118], range(48, 2), 0.25, 4);

describe('refineByInversion (through interpret)', () => {
  it('interpret recommends the inverted section on a water table over undulating rock: depths within max(0.25 m, 5 %), the saturated layer within 3 % of 1500 m/s, the water table flagged', () => {
    const { result, log } = interpretCsv(csv);
    expect(result.inversion!.kept).toBe(true);
    expect(result.inversion!.rmsAfter!).toBeLessThan(0.3e-3);
    expect(result.inversion!.rmsAfter!).toBeLessThan(0.95 * result.inversion!.rmsBefore!);
    expect(result.layers).toHaveLength(3);
    [400, 1500, 3400].forEach((v, m) => expect(Math.abs(result.layers[m].velocity / v - 1)).toBeLessThan(0.03));
    expect(log.withCode('water-table')).toHaveLength(1);
    [() => water, rock].forEach((depth, k) => {
      const refractor = result.refractors[k];
      expect(refractor.method).toBe('inversion');
      expect(refractor.points).toHaveLength(48);
      const errors = refractor.points.map((p) => Math.abs(p.depth - depth(p.x)));
      const mean = errors.reduce((a, b) => a + b, 0) / errors.length;
      expect(mean).toBeLessThanOrEqual(Math.max(0.25, 0.05 * depth(47)));
      // The other methods stay beside it.
      expect(Object.keys(refractor.byMethod)).toEqual(expect.arrayContaining(['delay-time', 'intercept-time', 'inversion']));
    });
    const doc = interpretationJson(result) as { qc: { inversion: Record<string, unknown> }; refractors: { method: string }[] };
    expect(doc.qc.inversion).toEqual(expect.objectContaining({ kept: true, rms_before_ms: expect.any(Number), rms_after_ms: expect.any(Number), iterations: result.inversion!.iterations }));
    expect(summary(result, 'm')).toMatch(/Layered inversion: over all 334 picks .* fits to \d+\.\d\d ms RMS and the inverted section to 0\.\d\d ms .* kept/);
  });

  it('interpret keeps the section of the depth methods and warns inversion-not-kept when the inversion lowers the misfit by less than 5 % or 0.03 ms', () => {
    // No step allowed: the misfit cannot fall, so the rule must refuse the result.
    const { result, log } = interpretCsv(csv, { inversion: { maxIterations: 0 } });
    expect(result.inversion!.kept).toBe(false);
    expect(result.refractors.every((r) => r.method !== 'inversion' && !('inversion' in r.byMethod))).toBe(true);
    expect(log.withCode('inversion-not-kept')[0].message).toMatch(/less than the 5 % and 0\.03 ms required/);
  });

  it('interpret with inversion false leaves the depth methods and their velocities untouched', () => {
    const off = interpretCsv(csv, { inversion: false }).result;
    expect(off.inversion).toBeUndefined();
    expect(off.refractors.every((r) => r.method !== 'inversion')).toBe(true);
    expect(off.history.some((h) => h.step === 'inversion')).toBe(false);
  });
});
