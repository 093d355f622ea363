import { describe, expect, it } from 'vitest';
import { realisticCsv, realisticLine } from '../reference/realisticLines.js';
import { interpretCsv } from '../helpers.js';

// Lines of the sweep generator (test/reference/realisticLines.ts over the independent forward
// model test/reference/layeredTravelTimes.ts, Fermat least time over sampled interfaces, sharing no
// code with src/), with its seeded pick noise. The truth is the reference model's section; the
// velocities are asserted within 5 % (the sweep's "fully right" tolerance).

function velocityErrors(seed: number) {
  const line = realisticLine(seed);
  const { result } = interpretCsv(realisticCsv(line, seed));
  return { line, result, errors: result.layers.map((l, i) => Math.abs(l.velocity / line.section.velocities[i] - 1)) };
}

describe('layer count of the joint model', () => {
  it('interpret(weathered rock over a stepped rock head seen first by four shots) keeps the rock refractor with depths: three layers within 5 %', () => {
    // Seed 60: 72 geophones at 1 m, 269 / 1744 / 3401 m/s, refractors at 4.2 and 9.7 m, rock
    // stepped; pick noise 0.34 ms. The two-refractor model without the rock leaves residuals of
    // 0.68 ms; the rock refractor has 117 picks from four sources, both directions.
    const { line, result, errors } = velocityErrors(60);
    expect(result.layers, line.name).toHaveLength(3);
    expect(result.joint!.possible).toHaveLength(0);
    expect(result.refractors).toHaveLength(2);
    errors.forEach((e, i) => expect(e, `layer ${i + 1}`).toBeLessThan(0.05));
  });

  it('interpret(a 2.7 m weathered cover over a stepped rock head, shots off both ends) keeps all three layers within 5 %', () => {
    // Seed 2: 48 geophones at 2 m, 687 / 1736 / 4425 m/s at 2.7 and 20.1 m, pick noise 0.28 ms;
    // without the rock refractor the two-layer model was driven by the inversion to 1152 / 4070 m/s.
    const { line, result, errors } = velocityErrors(2);
    expect(result.layers, line.name).toHaveLength(3);
    errors.forEach((e, i) => expect(e, `layer ${i + 1}`).toBeLessThan(0.05));
  });

  it('interpret(a channelled rock head under rolling ground, shots off both ends) invents no layer from an off-end shot: two layers within 5 %', () => {
    // Seed 46: 48 geophones at 1 m, 654 over 2017 m/s at 7.1 m, pick noise 0.40 ms. The segments
    // put the shot 41 m off the end on a refractor of its own (1395 m/s in the joint model) above
    // the rock seen by the shots inside the spread, whose picks lie at shorter offsets.
    const { line, result, errors } = velocityErrors(46);
    expect(result.layers, line.name).toHaveLength(2);
    errors.forEach((e, i) => expect(e, `layer ${i + 1}`).toBeLessThan(0.05));
    const three = result.joint!.candidates.find((c) => c.refractors === 2)!;
    expect(three.rejected).toMatch(/arrives first at larger offsets/);
  });
});
