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

  it('interpret holds a rock velocity seen from one direction at each geophone near its plane-layer value: within 3 % on six noise draws, rock depths within 10 %', () => {
    // 600 m/s soil over a water table at 2.5 m (1500 m/s) over 2600 m/s rock at 14 m, 72 geophones
    // at 1 m, sources at the ends, quarter points and middle, none off the ends: the rock's head
    // waves reach the geophones past x = 45 m from the shot at 0 and those short of 27 m from the
    // shot at 71, so no geophone records them from both directions. The picks then fix each
    // geophone's delay plus offset over the velocity, not each (Willmore & Bancroft 1960), and the
    // inversion alone let the velocity trade with the rock's shape (2785 m/s, 7 % fast, on the
    // first draw). Independent forward model, seeded noise of 0.4 ms.
    const section = { surface: () => 100, interfaces: [() => 97.5, () => 86], velocities: [600, 1500, 2600] };
    for (const seed of [1, 2, 3, 4, 5, 6]) {
      const { result } = interpretCsv(syntheticCsv(section, [0, 18, 36, 54, 71], range(72, 1), 0.4, seed));
      expect(result.inversion!.kept, `draw ${seed}`).toBe(true);
      expect(result.inversion!.priorLayers, `draw ${seed}`).toEqual([3]);
      expect(result.layers, `draw ${seed}`).toHaveLength(3);
      section.velocities.forEach((v, m) => expect(Math.abs(result.layers[m].velocity / v - 1), `draw ${seed} layer ${m + 1}`).toBeLessThan(0.03));
      const rock = result.refractors[1].points;
      const error = rock.reduce((a, p) => a + Math.abs(p.depth - 14), 0) / rock.length;
      expect(error, `draw ${seed}`).toBeLessThan(0.1 * 14);
    }
  });

  it('interpret with inversion false leaves the depth methods and their velocities untouched', () => {
    const off = interpretCsv(csv, { inversion: false }).result;
    expect(off.inversion).toBeUndefined();
    expect(off.refractors.every((r) => r.method !== 'inversion')).toBe(true);
    expect(off.history.some((h) => h.step === 'inversion')).toBe(false);
  });
});
