import { describe, expect, it } from 'vitest';
import { eikonalTimes } from '../../src/forward/eikonal.js';
import { eikonalAdjoint } from '../../src/forward/eikonalAdjoint.js';
import { gridFromModel, sampleGrid } from '../../src/forward/eikonalGrid.js';
import { skfmmAvailable, skfmmSurfaceTimes } from '../reference/skfmm.js';

const flat = () => 0;

describe('eikonalTimes', () => {
  it('eikonalTimes in a uniform 1000 m/s ground gives distance / velocity within 0.7 % at h = 1 m and 0.3 % at h = 0.25 m', () => {
    // t = r / v: the definition of a uniform medium. Points on nodes (no interpolation error); the
    // worst is the steep diagonal, where first-order fast marching errs most.
    for (const [h, tolerance] of [[1, 0.007], [0.25, 0.003]] as const) {
      const grid = gridFromModel({ x0: 0, x1: 100, top: 0, bottom: -30, h }, flat, () => 1000);
      const { times } = eikonalTimes(grid, { x: 10, elev: 0 });
      for (const [x, elev] of [[40, 0], [90, 0], [60, -20], [12, -28], [11, -5], [0, -30]]) {
        const exact = Math.hypot(x - 10, elev) / 1000;
        expect(Math.abs(sampleGrid(grid, times, x, elev) - exact) / exact).toBeLessThan(tolerance);
      }
    }
  });

  it('eikonalTimes in v = v0 + g·depth matches the closed-form first arrival (2/g) asinh(g x / 2 v0) within 0.4 %', () => {
    // Linear increase of velocity with depth: rays are circular arcs and the surface-to-surface
    // time is t = (2/g) asinh(g x / (2 v0)) (a standard result from Snell's law with a constant
    // ray parameter; e.g. Telford, Geldart & Sheriff 1990, ch. 4, from memory for the section).
    const v0 = 500;
    const g = 40;
    const grid = gridFromModel({ x0: 0, x1: 100, top: 0, bottom: -40, h: 0.5 }, flat, (_x, elev) => v0 + g * -elev);
    const { times } = eikonalTimes(grid, { x: 0, elev: 0 });
    for (const x of [10, 30, 60, 90]) {
      const exact = (2 / g) * Math.asinh((g * x) / (2 * v0));
      expect(Math.abs(sampleGrid(grid, times, x, 0) - exact) / exact).toBeLessThan(0.004);
    }
  });

  it('eikonalTimes over a flat two-layer ground gives the direct and head-wave times of Telford et al. within 0.35 % at h = 0.25 m', () => {
    // Telford, Geldart & Sheriff (1990) §4.2: direct t = x / V1; head wave
    // t = x / V2 + 2 z sqrt(1/V1² − 1/V2²); first arrival = the lesser. V1 600, V2 3000. Node
    // speeds change between the rows at 7.75 and 8 m, so the interface is at mid-cell, z = 7.875 m.
    const h = 0.25;
    const grid = gridFromModel({ x0: 0, x1: 120, top: 0, bottom: -25, h }, flat, (_x, elev) => (-elev < 8 ? 600 : 3000));
    const { times } = eikonalTimes(grid, { x: 10, elev: 0 });
    const z = 8 - h / 2;
    for (const x of [14, 20, 30, 45, 70, 100, 120]) {
      const offset = x - 10;
      const exact = Math.min(offset / 600, offset / 3000 + 2 * z * Math.sqrt(1 / 600 ** 2 - 1 / 3000 ** 2));
      expect(Math.abs(sampleGrid(grid, times, x, 0) - exact) / exact).toBeLessThan(0.0035);
    }
  });

  it('eikonalTimes honours the ground: a source on a hill does not shortcut through the air above a valley', () => {
    // Ground of a V-shaped valley 10 m deep: the first arrival across it follows the ground
    // (two straight legs down and up, at least), never the chord through the air (geometry).
    const ground = (x: number) => -Math.max(0, 10 - Math.abs(x - 50) / 2);
    const grid = gridFromModel({ x0: 0, x1: 100, top: 1, bottom: -40, h: 0.5 }, ground, () => 1000);
    const { times } = eikonalTimes(grid, { x: 20, elev: ground(20) });
    const arrival = sampleGrid(grid, times, 80, ground(80));
    const chord = 60 / 1000;
    expect(arrival).toBeGreaterThan(chord * 1.01);
  });

  const missing = skfmmAvailable();
  it.skipIf(missing !== undefined)(`eikonalTimes agrees with scikit-fmm within 1 % at every receiver on a layered grid${missing ? ` (skipped: ${missing})` : ''}`, () => {
    // Independent reference: scikit-fmm (python3-scikit-fmm) on the same node speeds.
    const h = 0.25;
    const grid = gridFromModel({ x0: 0, x1: 96, top: 0, bottom: -30, h }, flat, (x, elev) => {
      const rock = 6 + 3 * Math.sin(x / 15);
      if (-elev < 2.5) return 400;
      return -elev < rock ? 1500 : 3500;
    });
    const receivers = Array.from({ length: 48 }, (_, i) => 1 + 2 * i);
    const reference = skfmmSurfaceTimes(grid.nx, grid.nz, h, 0, grid.slowness.map((s) => 1 / s), 30, receivers);
    const { times } = eikonalTimes(grid, { x: 30, elev: 0 });
    receivers.forEach((x, k) => {
      const ours = sampleGrid(grid, times, x, 0);
      expect(Math.abs(ours - reference.times[k]) / reference.times[k]).toBeLessThan(0.01);
    });
  });
});

describe('eikonalAdjoint', () => {
  it('eikonalAdjoint gives the derivative of receiver times by node slowness within 2 % of central finite differences', () => {
    // The adjoint must be the exact derivative of the solver's own times: checked node by node
    // against (T(s + ε) − T(s − ε)) / 2ε on a small two-layer grid.
    const grid = gridFromModel({ x0: 0, x1: 20, top: 0, bottom: -8, h: 1 }, flat, (x, elev) => (-elev < 3 + x / 10 ? 500 : 1800));
    const receivers = [{ x: 12, elev: 0, weight: 1 }, { x: 19, elev: 0, weight: -0.5 }, { x: 7.5, elev: 0, weight: 2 }];
    const objective = (): number => {
      const { times } = eikonalTimes(grid, { x: 2, elev: 0 });
      return receivers.reduce((sum, r) => sum + r.weight * sampleGrid(grid, times, r.x, r.elev), 0);
    };
    const gradient = new Float64Array(grid.slowness.length);
    eikonalAdjoint(grid, eikonalTimes(grid, { x: 2, elev: 0 }, { record: true }), receivers, gradient);
    let checked = 0;
    for (let k = 0; k < grid.slowness.length; k++) {
      if (grid.active[k] === 0) continue;
      const s = grid.slowness[k];
      const epsilon = s * 1e-6;
      grid.slowness[k] = s + epsilon;
      const up = objective();
      grid.slowness[k] = s - epsilon;
      const down = objective();
      grid.slowness[k] = s;
      const numeric = (up - down) / (2 * epsilon);
      expect(Math.abs(gradient[k] - numeric)).toBeLessThanOrEqual(0.02 * Math.abs(numeric) + 1e-6);
      if (Math.abs(numeric) > 1e-3) checked++;
    }
    expect(checked).toBeGreaterThan(20);
  });
});
