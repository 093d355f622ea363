import { describe, expect, it } from 'vitest';
import { layeredInversion, type InversionPick, type InversionStart } from '../../src/model/layeredInversion.js';
import { firstArrivals, seededNormal, type LayeredSection } from '../reference/layeredTravelTimes.js';

const receivers = Array.from({ length: 48 }, (_, i) => i * 2);
const sources = [-30, 0, 23, 47, 71, 94, 124];

/** Picks of every source at every receiver from a time function, with seeded Gaussian noise. */
function picksFrom(time: (sx: number, rxs: number[]) => number[], ground: (x: number) => number, noiseSeconds: number, seed: number): InversionPick[] {
  const normal = seededNormal(seed);
  return sources.flatMap((sx) => {
    const rxs = receivers.filter((r) => r !== sx);
    const t = time(sx, rxs);
    return rxs.map((rx, i) => ({ sourceX: sx, sourceZ: ground(sx), receiverX: rx, receiverZ: ground(rx), time: t[i] + noiseSeconds * normal() }));
  });
}

function referencePicks(section: LayeredSection, noiseSeconds: number, seed: number): InversionPick[] {
  return picksFrom((sx, rxs) => firstArrivals(section, sx, rxs, [-40, 135]), section.surface, noiseSeconds, seed);
}

function start(ground: (x: number) => number, depths: ((x: number) => number)[], velocities: number[]): InversionStart {
  return { ground, spacing: 2, receiverXs: receivers, velocities, refractors: depths.map((d) => receivers.map((x) => ({ x, elev: ground(x) - d(x) }))) };
}

describe('layeredInversion', () => {
  it('layeredInversion recovers a flat refractor at 6 m within 0.1 m and both velocities within 1 % from a start 1.5 m too deep (Telford et al. 1990, §4.2)', () => {
    // Head-wave times t = x/V₂ + 2h cos θc/V₁, direct x/V₁ (Telford, Geldart & Sheriff 1990, §4.2,
    // worked here), V₁ = 500 m/s, V₂ = 2500 m/s, h = 6 m, noise 0.1 ms (seeded).
    const v1 = 500;
    const v2 = 2500;
    const cosCritical = Math.sqrt(1 - (v1 / v2) ** 2);
    const time = (sx: number, rxs: number[]) => rxs.map((rx) => Math.min(Math.abs(rx - sx) / v1, Math.abs(rx - sx) / v2 + (2 * 6 * cosCritical) / v1));
    const ground = () => 40;
    const picks = picksFrom(time, ground, 0.1e-3, 3);
    const result = layeredInversion(picks, start(ground, [(x) => 7.5 + 0.5 * Math.sin(x / 7)], [540, 2330]));
    for (const p of result.profiles[0]) expect(Math.abs(p.depth - 6)).toBeLessThan(0.1);
    expect(Math.abs(result.section.velocities[0] / v1 - 1)).toBeLessThan(0.01);
    expect(Math.abs(result.section.velocities[1] / v2 - 1)).toBeLessThan(0.01);
    // Converged (misfit stopped falling) well within the iteration limit, to the pick noise.
    expect(result.stopReason).toBe('misfit stopped falling');
    expect(result.iterations).toBeLessThanOrEqual(8);
    expect(result.rmsAfter).toBeLessThan(0.12e-3);
    expect(result.rmsBefore).toBeGreaterThan(1e-3);
  });

  it('layeredInversion with timeShift recovers a trigger delay of 1.5 ms within 0.1 ms and 3 SE, and the depth within 0.1 m (Telford et al. 1990, §4.2)', () => {
    // The flat case above with every pick 1.5 ms late (a trigger delay, common practice).
    const v1 = 500;
    const v2 = 2500;
    const cosCritical = Math.sqrt(1 - (v1 / v2) ** 2);
    const time = (sx: number, rxs: number[]) => rxs.map((rx) => 1.5e-3 + Math.min(Math.abs(rx - sx) / v1, Math.abs(rx - sx) / v2 + (2 * 6 * cosCritical) / v1));
    const ground = () => 40;
    const result = layeredInversion(picksFrom(time, ground, 0.1e-3, 4), start(ground, [() => 7], [520, 2400]), { timeShift: true });
    // Within 0.1 ms and three of its standard errors (it trades a little with V1 over the nearest picks).
    expect(Math.abs(result.timeShift - 1.5e-3)).toBeLessThan(0.1e-3);
    expect(Math.abs(result.timeShift - 1.5e-3)).toBeLessThan(3 * result.timeShiftSe);
    for (const p of result.profiles[0]) expect(Math.abs(p.depth - 6)).toBeLessThan(0.1);
    expect(Math.abs(result.section.velocities[0] / v1 - 1)).toBeLessThan(0.01);
  });

  it('layeredInversion with timeShift on a three-layer line with shots far off the ends gives finite standard errors, and no delay where there is none (within 3 SE)', () => {
    // 448 / 2101 / 4135 m/s, refractors flat at 4.4 and 21.2 m, 48 geophones at 3 m, shots at the
    // ends, the middle and 113 m and 120 m off the ends; independent reference model, no delay,
    // noise 0.34 ms (seeded). The head waves of the far shots bend along the refractors, whose
    // small derivatives JᵀJ leaves out; the time shift's column must leave out the same ones, or
    // the normal matrix is not a Gram matrix and its Cholesky factor (the covariance) breaks down.
    const xs = Array.from({ length: 48 }, (_, i) => i * 3);
    const section: LayeredSection = { surface: () => 100, interfaces: [() => 95.6, () => 78.8], velocities: [448, 2101, 4135] };
    const normal = seededNormal(1);
    const picks = [-113, 0, 72, 141, 261].flatMap((sx) => {
      const rxs = xs.filter((r) => r !== sx);
      const t = firstArrivals(section, sx, rxs, [-118, 266], 0.2);
      return rxs.map((rx, i) => ({ sourceX: sx, sourceZ: 100, receiverX: rx, receiverZ: 100, time: t[i] + 0.34e-3 * normal() }));
    });
    const result = layeredInversion(picks, { ground: () => 100, spacing: 3, receiverXs: xs, velocities: [448, 2101, 4135], refractors: [4.4, 21.2].map((d) => xs.map((x) => ({ x, elev: 100 - d }))) }, { timeShift: true });
    expect(Number.isFinite(result.timeShiftSe)).toBe(true);
    expect(Math.abs(result.timeShift)).toBeLessThan(3 * result.timeShiftSe);
    for (const se of result.velocitySe) expect(Number.isFinite(se)).toBe(true);
    for (const profile of result.profiles) for (const p of profile) expect(Number.isFinite(p.depthSe)).toBe(true);
  });

  it('layeredInversion recovers a refractor dipping 4° within 0.15 m from a flat start (Telford et al. 1990, §4.2)', () => {
    // Down-dip t = x sin(θc + δ)/V₁ + 2 h cos θc/V₁, up-dip with θc − δ, h the perpendicular depth
    // under the source (Telford, Geldart & Sheriff 1990, §4.2, dipping refractor, worked here).
    const v1 = 600;
    const v2 = 3000;
    const dip = (4 * Math.PI) / 180;
    const critical = Math.asin(v1 / v2);
    const vertical = (x: number) => 5 + x * Math.tan(dip);
    const time = (sx: number, rxs: number[]) => rxs.map((rx) => {
      const x = Math.abs(rx - sx);
      const head = (x * Math.sin(critical + (rx > sx ? dip : -dip))) / v1 + (2 * vertical(sx) * Math.cos(dip) * Math.cos(critical)) / v1;
      return Math.min(x / v1, head);
    });
    const ground = () => 20;
    const result = layeredInversion(picksFrom(time, ground, 0.1e-3, 5), start(ground, [() => 8], [600, 3000]));
    for (const p of result.profiles[0].filter((q) => q.covered)) expect(Math.abs(p.depth - vertical(p.x))).toBeLessThan(0.15);
    expect(result.profiles[0].filter((q) => q.covered).length).toBe(48);
    expect(Math.abs(result.section.velocities[1] / v2 - 1)).toBeLessThan(0.01);
  });

  it('layeredInversion recovers undulating rock under a water table within max(0.25 m, 5 %) at every geophone (reference model, 0.25 ms noise)', () => {
    // Independent forward model test/reference/layeredTravelTimes.ts, seeded noise 0.25 ms: 450 m/s
    // dry soil, water table 3 m down (1500 m/s), 3300 m/s rock at 10 ± 2.5 m (60 m wavelength),
    // ground falling 3 %, sources off both ends.
    const ground = (x: number) => 100 - 0.03 * x;
    const water = (x: number) => 3 + 0 * x;
    const rock = (x: number) => 10 + 2.5 * Math.sin((2 * Math.PI * x) / 60);
    const section = { surface: ground, interfaces: [(x: number) => ground(x) - water(x), (x: number) => ground(x) - rock(x)], velocities: [450, 1500, 3300] };
    const result = layeredInversion(referencePicks(section, 0.25e-3, 5), start(ground, [() => 3.5, () => 10], [430, 1600, 3000]));
    [water, rock].forEach((depth, k) => {
      for (const p of result.profiles[k]) expect(Math.abs(p.depth - depth(p.x))).toBeLessThanOrEqual(Math.max(0.25, 0.05 * depth(p.x)));
    });
    [450, 1500, 3300].forEach((v, m) => expect(Math.abs(result.section.velocities[m] / v - 1)).toBeLessThan(0.03));
    expect(result.rmsAfter).toBeLessThan(0.3e-3);
  });

  it('layeredInversion recovers a buried channel 3 m deep within max(0.25 m, 5 %) at every geophone with smoothing 1, and on average with the default (reference model, 0.25 ms noise)', () => {
    // Rock 6 m down, 9 m in a channel from x = 42 to 60 m with sides sloping over 6 m (27°).
    const ground = (x: number) => 60 - 0.05 * x;
    const rock = (x: number) => 6 + 3 * Math.min(1, Math.max(0, Math.min((x - 36) / 6, (66 - x) / 6)));
    const section = { surface: ground, interfaces: [(x: number) => ground(x) - rock(x)], velocities: [500, 3000] };
    const picks = referencePicks(section, 0.25e-3, 7);
    const sharp = layeredInversion(picks, start(ground, [() => 7.5], [470, 3200]), { smoothing: 1 });
    for (const p of sharp.profiles[0]) expect(Math.abs(p.depth - rock(p.x))).toBeLessThanOrEqual(Math.max(0.25, 0.05 * rock(p.x)));
    expect(Math.abs(sharp.section.velocities[1] / 3000 - 1)).toBeLessThan(0.02);
    // The default smoothing rounds the channel's edges a little: the mean error stays within the
    // tolerance, the worst within 1 m.
    const smooth = layeredInversion(picks, start(ground, [() => 7.5], [470, 3200]));
    const errors = smooth.profiles[0].map((p) => Math.abs(p.depth - rock(p.x)));
    expect(errors.reduce((a, b) => a + b, 0) / errors.length).toBeLessThanOrEqual(0.25);
    expect(Math.max(...errors)).toBeLessThan(1);
  });

  it('layeredInversion standard errors cover the true depth within 2 SE at 85 % or more of the geophones (nominal 95 %) and within 1 SE at 90 % or fewer (nominal 68 %)', () => {
    const ground = (x: number) => 100 - 0.05 * x;
    const rock = (x: number) => 8 + 2 * Math.sin((2 * Math.PI * x) / 50);
    const section = { surface: ground, interfaces: [(x: number) => ground(x) - rock(x)], velocities: [500, 3000] };
    let inside = 0;
    let insideOne = 0;
    let count = 0;
    for (const seed of [11, 12]) {
      const result = layeredInversion(referencePicks(section, 0.25e-3, seed), start(ground, [() => 7.5], [470, 3200]));
      for (const p of result.profiles[0]) {
        count++;
        if (Math.abs(p.depth - rock(p.x)) < 2 * p.depthSe) inside++;
        if (Math.abs(p.depth - rock(p.x)) < p.depthSe) insideOne++;
      }
      expect(Math.abs(result.section.velocities[1] - 3000)).toBeLessThan(3 * result.velocitySe[1] + 1);
    }
    expect(inside / count).toBeGreaterThanOrEqual(0.85);
    // …and are not inflated: within 1 SE at no more than 90 % (nominal 68 %).
    expect(insideOne / count).toBeLessThanOrEqual(0.9);
  });

  it('layeredInversion with settle stops once a step gains under 3 % while the misfit is above the bound, and runs as without it when the bound is not reached', () => {
    // Three layers (400 / 1300 / 3200 m/s, flat at 4 and 14 m; independent reference model, 0.25 ms
    // noise) fitted with one refractor only: the section cannot explain the picks, its misfit stays
    // far above the noise while the steps gain less and less. The rule of settle is worked here
    // from the iteration history of the unsettled run.
    const section: LayeredSection = { surface: () => 50, interfaces: [() => 46, () => 36], velocities: [400, 1300, 3200] };
    const picks = referencePicks(section, 0.25e-3, 11);
    const begin = start(section.surface, [() => 6], [420, 2600]);
    const free = layeredInversion(picks, begin);
    expect(free.rmsAfter).toBeGreaterThan(4 * 0.25e-3);
    const settled = layeredInversion(picks, begin, { settle: { misfitAbove: 0, relativeStop: 0.03 } });
    expect(settled.stopReason).toBe('settled far from the section compared');
    expect(settled.iterations).toBeLessThan(free.iterations);
    // A step that gains under 3 % on a fit that is not yet at its end: the RMS is still above the free run's.
    expect(settled.rmsAfter).toBeGreaterThanOrEqual(free.rmsAfter);
    expect(settled.rmsAfter).toBeLessThan(1.2 * free.rmsAfter);
    // A bound above the misfit: the same run as without settle.
    const unreached = layeredInversion(picks, begin, { settle: { misfitAbove: Infinity, relativeStop: 0.03 } });
    expect(unreached.iterations).toBe(free.iterations);
    expect(unreached.rmsAfter).toBe(free.rmsAfter);
  });

  it('layeredInversion throws RangeError for a section without refractors, a velocity count that does not match, or a negative smoothing', () => {
    const ground = () => 0;
    const picks = [{ sourceX: 0, sourceZ: 0, receiverX: 2, receiverZ: 0, time: 0.004 }, { sourceX: 0, sourceZ: 0, receiverX: 4, receiverZ: 0, time: 0.008 }];
    expect(() => layeredInversion(picks, { ...start(ground, [], [500]) })).toThrow(RangeError);
    expect(() => layeredInversion(picks, start(ground, [() => 5], [500]))).toThrow(/2 layer velocities/);
    expect(() => layeredInversion(picks, start(ground, [() => 5], [500, 2000]), { smoothing: -1 })).toThrow(/smoothing/);
  });
});
