import { describe, expect, it } from 'vitest';
import type { Layer } from '../../src/core/types.js';
import type { JointModel } from '../../src/model/jointModel.js';
import { timeTermVelocities } from '../../src/model/timeTermVelocities.js';

// Along the horizontal, a plane refractor dipping at δ under a layer of velocity V₁ gives the
// head wave the slowness cos δ / V₂ on average over both directions (the forward and reverse
// apparent slownesses sin(i ∓ δ)/V₁ average to sin i cos δ / V₁ = cos δ / V₂; Telford, Geldart
// & Sheriff 1990, §4.2.3), so V₂ = cos δ / u; the standard error by the delta method,
// |dV/du| σᵤ = cos δ σᵤ / u². Worked by hand: u = 1/2000 s/m, δ = 10°, cos δ = 0.984808:
// V = 1969.62 m/s, σᵤ = 1e-5 s/m gives 0.984808 · 1e-5 · 2000² = 39.39 m/s.
const joint = (slowness: number[], slownessSe: number[]) => ({ refractors: slowness.length - 1, model: { slowness, slownessSe } }) as unknown as JointModel;
const layer = (index: number, dipDeg?: number) => ({ index, velocity: 0, velocitySe: 0, dipDeg, segmentCount: 1, reversed: true }) as Layer;

describe('timeTermVelocities', () => {
  it('gives V = cos δ / u and σ = cos δ σᵤ / u² on a dipping refractor, 1 / u for the direct wave whatever its dip', () => {
    const result = timeTermVelocities(joint([1 / 500, 1 / 2000], [2e-5, 1e-5]), [layer(1, 7), layer(2, 10)]);
    expect(result.map((r) => r.index)).toEqual([1, 2]);
    expect(result[0].velocity).toBeCloseTo(500, 9);
    expect(result[0].velocitySe).toBeCloseTo(2e-5 * 500 ** 2, 9); // 5 m/s
    expect(result[1].velocity).toBeCloseTo(1969.62, 2);
    expect(result[1].velocitySe).toBeCloseTo(39.39, 2);
  });

  it('takes each refractor its own layer dip (layer k + 1), and cos 0 = 1 where the dip is unknown or not finite', () => {
    // Three refractors: layer 2 at −20° (cos = 0.939693), layer 3 without a dip, layer 4 NaN.
    const result = timeTermVelocities(joint([1 / 400, 1 / 1000, 1 / 2500, 1 / 4000], [0, 0, 0, 0]), [layer(1), layer(2, -20), layer(3), layer(4, NaN)]);
    expect(result.map((r) => Math.round(r.velocity * 100) / 100)).toEqual([400, 939.69, 2500, 4000]);
  });

  it('takes cos 0 = 1 for a refractor whose layer is not among the layers given', () => {
    const result = timeTermVelocities(joint([1 / 400, 1 / 1000], [0, 1e-5]), [layer(1)]);
    expect(result[1].velocity).toBeCloseTo(1000, 9);
    expect(result[1].velocitySe).toBeCloseTo(10, 9); // 1e-5 · 1000²
  });

  it('lists the refractors that get depths only, not a possible one held beyond them', () => {
    const j = joint([1 / 400, 1 / 1000, 1 / 2500], [0, 0, 0]);
    (j as { refractors: number }).refractors = 1;
    expect(timeTermVelocities(j, [layer(1), layer(2, 0)]).length).toBe(2);
  });
});
