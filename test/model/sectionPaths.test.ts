import { describe, expect, it } from 'vitest';
import { packParameters, sampleNodeSection, unpackParameters, type NodeSection } from '../../src/model/nodeSection.js';
import { sectionPaths, type Shot } from '../../src/model/sectionPaths.js';
import { firstArrivals } from '../reference/layeredTravelTimes.js';

const receivers = Array.from({ length: 48 }, (_, i) => i * 2);

function shotsAt(sources: number[], ground: (x: number) => number): Shot[] {
  return sources.map((x) => ({ x, z: ground(x), receivers: receivers.filter((r) => r !== x).map((r) => ({ x: r, z: ground(r) })) }));
}

function nodeSection(ground: (x: number) => number, interfaces: ((x: number) => number)[], velocities: number[], nodeStep: number, gradients?: number[]): NodeSection {
  const nodeXs = Float64Array.from({ length: Math.round(160 / nodeStep) + 1 }, (_, i) => -40 + i * nodeStep);
  return {
    ground,
    nodeXs,
    xRef: 47,
    elevations: interfaces.map((f) => Float64Array.from(nodeXs, f)),
    velocities: Float64Array.from(velocities),
    gradients: Float64Array.from(gradients ?? velocities.map(() => 0)),
  };
}

const span: [number, number] = [-44, 124];

describe('sectionPaths', () => {
  it('sectionPaths gives the head-wave times of a flat refractor within 0.02 ms (Telford et al. 1990, §4.2)', () => {
    // t = x/V₂ + 2h cos θc / V₁ beyond the crossover, x/V₁ before (Telford, Geldart & Sheriff 1990,
    // §4.2, flat two-layer case, worked here): V₁ = 500, V₂ = 2500 m/s, h = 6 m, flat ground.
    const v1 = 500;
    const v2 = 2500;
    const h = 6;
    const cosCritical = Math.sqrt(1 - (v1 / v2) ** 2);
    const section = nodeSection(() => 50, [() => 50 - h], [v1, v2], 2);
    const shots = shotsAt([-30, 0, 47, 94, 120], () => 50);
    const { times } = sectionPaths(sampleNodeSection(section, span, 0.25), shots);
    shots.forEach((shot, s) => shot.receivers.forEach((r, i) => {
      const x = Math.abs(r.x - shot.x);
      const expected = Math.min(x / v1, x / v2 + (2 * h * cosCritical) / v1);
      expect(Math.abs(times[s][i] - expected)).toBeLessThan(0.02e-3);
    }));
  });

  it('sectionPaths gives the up-dip and down-dip head-wave times of a dipping refractor within 0.03 ms (Telford et al. 1990, §4.2)', () => {
    // Down-dip t = x sin(θc + δ)/V₁ + 2 h_A cos θc / V₁, up-dip with θc − δ, h_A the perpendicular
    // depth under the source (Telford, Geldart & Sheriff 1990, §4.2, dipping refractor, worked here).
    const v1 = 600;
    const v2 = 3000;
    const dip = (4 * Math.PI) / 180;
    const critical = Math.asin(v1 / v2);
    const vertical = (x: number) => 5 + x * Math.tan(dip);
    const section = nodeSection(() => 20, [(x) => 20 - vertical(x)], [v1, v2], 2);
    const shots = shotsAt([-20, 0, 94, 114], () => 20);
    const { times } = sectionPaths(sampleNodeSection(section, span, 0.25), shots);
    shots.forEach((shot, s) => shot.receivers.forEach((r, i) => {
      const x = Math.abs(r.x - shot.x);
      const downDip = r.x > shot.x;
      const perpendicular = vertical(shot.x) * Math.cos(dip);
      const head = (x * Math.sin(critical + (downDip ? dip : -dip))) / v1 + (2 * perpendicular * Math.cos(critical)) / v1;
      expect(Math.abs(times[s][i] - Math.min(x / v1, head))).toBeLessThan(0.03e-3);
    }));
  });

  it('sectionPaths agrees with the independent reference model within 0.05 ms on undulating refractors, sloping ground and off-end sources', () => {
    // test/reference/layeredTravelTimes.ts: Fermat least time over interfaces sampled every 0.1 m,
    // sharing no code with src/.
    const ground = (x: number) => 100 - 0.08 * x + 0.6 * Math.sin(x / 13);
    const water = (x: number) => ground(x) - 3 - 0.4 * Math.sin(x / 17);
    const rock = (x: number) => ground(x) - 10 - 2.5 * Math.sin((2 * Math.PI * x) / 60);
    const sources = [-40, -6, 0, 31, 63, 94, 100, 120];
    const section = nodeSection(ground, [water, rock], [450, 1500, 3300], 0.5);
    const { times } = sectionPaths(sampleNodeSection(section, span, 0.25), shotsAt(sources, ground));
    sources.forEach((sx, s) => {
      const rxs = receivers.filter((r) => r !== sx);
      const reference = firstArrivals({ surface: ground, interfaces: [water, rock], velocities: [450, 1500, 3300] }, sx, rxs, span);
      rxs.forEach((_, i) => expect(Math.abs(times[s][i] - reference[i])).toBeLessThan(0.05e-3));
    });
  });

  it('sectionPaths derivatives match central finite differences of its own times within 0.01 % or 1e-9 (elevations, velocities, lateral gradients)', () => {
    const ground = (x: number) => 100 + 0.05 * x + 0.5 * Math.sin(x / 15);
    const section = nodeSection(ground, [(x) => ground(x) - 3 - 0.5 * Math.sin(x / 9), (x) => ground(x) - 10 - 2 * Math.sin(x / 20)], [450, 1500, 3200], 4, [0.5, -2, 4]);
    const shots = shotsAt([-30, 47, 110], ground);
    const sampled = (s: NodeSection) => sampleNodeSection(s, span, 0.5);
    const base = sectionPaths(sampled(section), shots, true, true);
    const p = packParameters(section, true);
    const elevations = 2 * section.nodeXs.length;
    let checked = 0;
    let total = 0;
    for (let j = 0; j < p.length; j++) {
      // Steps small against the sample spacing, so the least-time path rarely changes within them.
      const h = j < elevations ? 1e-6 : j < elevations + 3 ? 1e-4 : 1e-6;
      const plus = Float64Array.from(p);
      plus[j] += h;
      const minus = Float64Array.from(p);
      minus[j] -= h;
      const up = sectionPaths(sampled(unpackParameters(section, plus, true)), shots, false, true).times;
      const down = sectionPaths(sampled(unpackParameters(section, minus, true)), shots, false, true).times;
      shots.forEach((shot, s) => shot.receivers.forEach((_, r) => {
        total++;
        const forward = (up[s][r] - base.times[s][r]) / h;
        const backward = (base.times[s][r] - down[s][r]) / h;
        // Where the path jumps inside the step, one-sided differences disagree: not a derivative there.
        if (Math.abs(forward - backward) > 1e-6 * Math.max(1e-3, Math.abs(forward))) return;
        checked++;
        const row = base.rows![s][r];
        const at = Array.from(row.index).indexOf(j);
        const analytic = at < 0 ? 0 : row.value[at];
        const difference = (forward + backward) / 2;
        expect(Math.abs(analytic - difference)).toBeLessThanOrEqual(1e-4 * Math.abs(difference) + 1e-9);
      }));
    }
    expect(checked / total).toBeGreaterThan(0.95);
  });

  it('sectionPaths velocity derivatives satisfy t = −Σ v ∂t/∂v (travel time scales as 1/velocity)', () => {
    // Euler's theorem for a function homogeneous of degree −1 in the velocities (every leg time is
    // length/velocity, and the least-time path does not change when all velocities scale together).
    const ground = (x: number) => 30 - 0.1 * x;
    const section = nodeSection(ground, [(x) => ground(x) - 2.5, (x) => ground(x) - 8 - Math.sin(x / 10)], [350, 1450, 2800], 2);
    const shots = shotsAt([-25, 0, 47, 94, 118], ground);
    const { times, rows } = sectionPaths(sampleNodeSection(section, span, 0.5), shots, true);
    const first = 2 * section.nodeXs.length;
    shots.forEach((shot, s) => shot.receivers.forEach((_, r) => {
      const row = rows![s][r];
      let sum = 0;
      row.index.forEach((index, a) => { if (index >= first) sum += section.velocities[index - first] * row.value[a]; });
      expect(Math.abs(times[s][r] + sum)).toBeLessThan(1e-12);
    }));
  });
});
