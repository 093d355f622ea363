import { describe, expect, it } from 'vitest';
import { firstArrivals } from './layeredTravelTimes.js';
import { headWaveTime, type PlaneModel } from './planeLayerRays.js';

// The two reference forward models of the tests are themselves checked against closed-form
// head-wave times written out here from Telford, Geldart & Sheriff (1990) Applied Geophysics,
// 2nd ed.: flat layers §4.2 (eqs. 4.24-4.30), t = x / Vn + Σⱼ 2 hⱼ cos θⱼ,ₙ / Vⱼ with
// sin θⱼ,ₙ = Vⱼ / Vₙ; one dipping refractor §4.3, t = x sin(θ ± δ) / V1 + 2 h cos θ / V1 with h
// the perpendicular distance from the source to the refractor (+ down-dip, − up-dip).
const rad = (deg: number) => (deg * Math.PI) / 180;

function flatHeadWave(thicknesses: number[], velocities: number[], n: number, x: number): number {
  let t = x / velocities[n];
  for (let j = 0; j < n; j++) t += (2 * thicknesses[j] * Math.sqrt(1 - (velocities[j] / velocities[n]) ** 2)) / velocities[j];
  return t;
}

function flatFirstArrival(thicknesses: number[], velocities: number[], x: number): number {
  let best = x / velocities[0];
  for (let n = 1; n < velocities.length; n++) best = Math.min(best, flatHeadWave(thicknesses, velocities, n, x));
  return best;
}

/** Telford §4.3, one refractor of dip δ (deg, deepening to +x), perpendicular distance h under the source. */
function dippingHeadWave(h: number, dipDeg: number, v1: number, v2: number, offset: number): number {
  const theta = Math.asin(v1 / v2);
  const downDip = offset > 0 ? 1 : -1;
  return (Math.abs(offset) * Math.sin(theta + downDip * rad(dipDeg))) / v1 + (2 * h * Math.cos(theta)) / v1;
}

describe('firstArrivals (the Fermat least-time reference) against closed-form head-wave times', () => {
  it('firstArrivals over two flat layers (500 over 2000 m/s, 5 m) matches Telford eq. 4.28 within 5 µs', () => {
    const receivers = [2, 10, 20, 30, 45];
    const times = firstArrivals({ surface: () => 0, interfaces: [() => -5], velocities: [500, 2000] }, 0, receivers, [-5, 50]);
    receivers.forEach((x, i) => expect(Math.abs(times[i] - flatFirstArrival([5], [500, 2000], x))).toBeLessThan(5e-6));
    // At 30 m the head wave is first: 30/2000 + 2·5·cos(asin 0.25)/500 = 15 + 19.365 = 34.365 ms, by hand.
    expect(times[3] * 1e3).toBeCloseTo(34.365, 2);
  });

  it('firstArrivals over three flat layers (400, 1200, 3000 m/s; 4 m and 8 m) matches Telford eq. 4.30 within 5 µs', () => {
    const receivers = [3, 15, 30, 50, 70, 90];
    const section = { surface: () => 0, interfaces: [() => -4, () => -12], velocities: [400, 1200, 3000] };
    const times = firstArrivals(section, 0, receivers, [-5, 95]);
    receivers.forEach((x, i) => expect(Math.abs(times[i] - flatFirstArrival([4, 8], [400, 1200, 3000], x))).toBeLessThan(5e-6));
    // At 90 m the deepest head wave is first: 90/3000 + 32.0416 ms (intercept worked in
    // test/depth/interceptTime.test.ts) = 62.042 ms, by hand.
    expect(times[5] * 1e3).toBeCloseTo(62.042, 2);
  });

  it('firstArrivals over a refractor dipping 10° matches Telford §4.3 down-dip and up-dip within 5 µs', () => {
    // 600 over 2400 m/s, 4 m below the source at x = 0 and deepening 10° towards +x: the
    // perpendicular distance under the source is h = 4 cos 10°.
    const dip = 10;
    const section = { surface: () => 0, interfaces: [(x: number) => -4 - x * Math.tan(rad(dip))], velocities: [600, 2400] };
    const h = 4 * Math.cos(rad(dip));
    const down = firstArrivals(section, 0, [30, 50], [-20, 60]);
    [30, 50].forEach((x, i) => expect(Math.abs(down[i] - dippingHeadWave(h, dip, 600, 2400, x))).toBeLessThan(5e-6));
    // Up-dip: a source at x = 60 (depth 4 + 60 tan 10° = 14.580 m, h = 14.580 cos 10°), receivers at 0 and 10 m.
    const hUp = (4 + 60 * Math.tan(rad(dip))) * Math.cos(rad(dip));
    const up = firstArrivals(section, 60, [0, 10], [-20, 70]);
    [0, 10].forEach((x, i) => expect(Math.abs(up[i] - dippingHeadWave(hUp, dip, 600, 2400, x - 60))).toBeLessThan(5e-6));
  });

  it('firstArrivals over two non-parallel dipping refractors matches the plane-layer ray tracer within 5 µs', () => {
    // 5° over 15° (500, 1200, 3000 m/s): the two references share no code.
    const model: PlaneModel = { depthAtZero: [3, 9], dipDeg: [5, 15], velocities: [500, 1200, 3000] };
    const section = {
      surface: () => 0,
      interfaces: model.dipDeg.map((d, k) => (x: number) => -(model.depthAtZero[k] + x * Math.tan(rad(d)))),
      velocities: model.velocities,
    };
    const receivers = [40, 55, 70];
    const times = firstArrivals(section, 0, receivers, [-10, 80]);
    receivers.forEach((x, i) => {
      const deepest = headWaveTime(model, 2, 0, x)!;
      expect(deepest).toBeDefined();
      expect(Math.abs(times[i] - Math.min(deepest, headWaveTime(model, 1, 0, x)!, x / 500))).toBeLessThan(5e-6);
    });
  });
});

describe('headWaveTime (the plane-layer ray tracer) against closed-form head-wave times', () => {
  it('headWaveTime over one refractor dipping 18° matches Telford §4.3 down-dip and up-dip within 1 ns', () => {
    const model: PlaneModel = { depthAtZero: [3], dipDeg: [18], velocities: [800, 2000] };
    const h = 3 * Math.cos(rad(18));
    for (const x of [40, 70]) expect(Math.abs(headWaveTime(model, 1, 0, x)! - dippingHeadWave(h, 18, 800, 2000, x))).toBeLessThan(1e-9);
    const hUp = (3 + 70 * Math.tan(rad(18))) * Math.cos(rad(18));
    for (const x of [0, 20]) expect(Math.abs(headWaveTime(model, 1, 70, x)! - dippingHeadWave(hUp, 18, 800, 2000, x - 70))).toBeLessThan(1e-9);
  });

  it('headWaveTime over three flat layers matches Telford eq. 4.30 within 1 ns, and is undefined inside the critical distance', () => {
    const model: PlaneModel = { depthAtZero: [4, 12], dipDeg: [0, 0], velocities: [400, 1200, 3000] };
    for (const x of [40, 90]) expect(Math.abs(headWaveTime(model, 2, 0, x)! - flatHeadWave([4, 8], [400, 1200, 3000], 2, x))).toBeLessThan(1e-9);
    // Critical distance of the first refractor: 2 h tan θ = 8 tan(asin(1/3)) = 2.83 m, by hand.
    expect(headWaveTime(model, 1, 0, 2.5)).toBeUndefined();
    expect(headWaveTime(model, 1, 0, 3)).toBeDefined();
  });
});
