import { describe, expect, it } from 'vitest';
import { realisticCsv, realisticLine } from '../reference/realisticLines.js';
import { syntheticCsv } from '../reference/layeredTravelTimes.js';
import { interpretCsv, range } from '../helpers.js';

// Lines from the independent forward model (test/reference/layeredTravelTimes.ts, Fermat least
// time over sampled interfaces, no shared code) with seeded pick noise of 0.25 ms.

describe('jointModel through interpret', () => {
  it('interpret(dry soil over saturated soil from 3 m over rock from 10 m) gives three layers with the saturated one within 3 % and the water-table caution', () => {
    // Saturated soil shows the speed of sound in water, about 1500 m/s (common practice).
    const section = { surface: () => 100, interfaces: [() => 97, () => 90], velocities: [450, 1500, 3300] };
    const { result } = interpretCsv(syntheticCsv(section, [-60, 0, 23, 47, 71, 94, 150], range(48, 2), 0.25, 8));
    expect(result.layers).toHaveLength(3);
    section.velocities.forEach((v, i) => expect(Math.abs(result.layers[i].velocity / v - 1), `layer ${i + 1}`).toBeLessThan(0.03));
    expect(result.warnings.some((w) => w.code === 'water-table')).toBe(true);
    expect(result.joint?.refractors).toBe(2);
    // The chosen count has the least criterion among those not rejected.
    const values = result.joint!.candidates.filter((c) => c.value !== undefined);
    const chosen = values.find((c) => c.refractors === 2)!;
    for (const c of values) expect(c.value!).toBeGreaterThanOrEqual(chosen.value!);
  });

  it('interpret(rock whose head undulates by a quarter of its depth) reads the bends as relief: two layers, rock velocity within 3 %', () => {
    // Five lines of the realistic-line generator: 48 geophones at 2 m, rolling ground.
    for (const seed of [202, 203, 204, 205]) {
      const line = realisticLine(seed, { geophones: 48, spacing: 2, inside: 5, offEnd: true, noiseMs: 0.25, step: 0.25, layers: 'two', shape: 'undulating', ground: 'rolling', deepest: 9 });
      const { result } = interpretCsv(realisticCsv(line, seed));
      expect(result.layers, line.name).toHaveLength(2);
      expect(Math.abs(result.layers[1].velocity / line.section.velocities[1] - 1), line.name).toBeLessThan(0.03);
    }
  });

  it('interpret(water table over a stepped rock head, off-end shots) gives three layers where per-branch segments gave four', () => {
    // Line 14 of the sweep generator (48 geophones at 1 m, 615 / 1517 / 3383 m/s, water table at
    // 3.4 m, rock from 12.4 m with a 3 m step): segments alone read the step as a fourth layer.
    const line = realisticLine(14);
    const { result } = interpretCsv(realisticCsv(line, 14));
    const segmentsOnly = interpretCsv(realisticCsv(line, 14), { jointModel: false }).result;
    expect(segmentsOnly.layers.length).toBe(4);
    expect(result.layers).toHaveLength(3);
    line.section.velocities.forEach((v, i) => expect(Math.abs(result.layers[i].velocity / v - 1), `layer ${i + 1}`).toBeLessThan(0.05));
  });

  it('interpret(rock undulating under sloping ground, three shots) reads a bend that segments took for a 37 % faster layer as relief: two layers', () => {
    // Line 12 of the sweep generator (48 geophones at 1 m, 601 over 2819 m/s, rock at 7.6 m
    // undulating): segments alone gave 604 / 2488 / 3414 m/s; the joint model's criterion charges
    // the extra refractor its time terms. (Its rock velocity is still 12 % fast: the time terms of a
    // line of three shots hold little reversed coverage.)
    const line = realisticLine(12);
    const csv = realisticCsv(line, 12);
    expect(interpretCsv(csv, { jointModel: false }).result.layers.length).toBe(3);
    expect(interpretCsv(csv).result.layers).toHaveLength(2);
  });

  it('interpret(a deep fast layer seen only by the far picks of one off-end shot) reports it as a possible refractor, without depths', () => {
    // 500 over 2000 m/s at 5 m, and 5000 m/s from 50 m: of the sources around 48 geophones at 2 m
    // only the shot 200 m off the far end sees the deepest layer first, from one direction.
    const section = { surface: () => 100, interfaces: [() => 95, () => 50], velocities: [500, 2000, 5000] };
    const { result } = interpretCsv(syntheticCsv(section, [-20, 0, 47, 94, 294], range(48, 2), 0.25, 4));
    expect(result.layers).toHaveLength(2);
    expect(result.refractors).toHaveLength(1);
    expect(result.joint!.possible).toHaveLength(1);
    expect(result.joint!.possible[0].reversed).toBe(false);
    expect(result.warnings.some((w) => w.code === 'possible-refractor')).toBe(true);
  });

  it('interpret pick noise from second differences is within 20 % of the true 0.25 ms on a line with relief', () => {
    const line = realisticLine(201, { geophones: 48, spacing: 2, inside: 5, offEnd: true, noiseMs: 0.25, step: 0.25, layers: 'two', shape: 'undulating', ground: 'rolling', deepest: 9 });
    const { result } = interpretCsv(realisticCsv(line, 201));
    expect(result.pickNoise.source).toBe('second differences');
    expect(Math.abs(result.pickNoise.sigma / 0.25e-3 - 1)).toBeLessThan(0.2);
  });
});
