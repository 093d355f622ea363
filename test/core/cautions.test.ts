import { describe, expect, it } from 'vitest';
import { depthCautions } from '../../src/core/cautions.js';
import { syntheticCsv } from '../reference/layeredTravelTimes.js';
import { interpretCsv, range } from '../helpers.js';

describe('cautions that only the data can raise', () => {
  // A clean two-layer P line, 500 over 2600 m/s at 6 m, from the independent forward model, 0.2 ms noise.
  const clean = interpretCsv(syntheticCsv({ surface: () => 100, interfaces: [() => 94], velocities: [500, 2600] }, [-6, 0, 47, 94, 100], range(48, 2), 0.2, 5));

  it('interpret of a clean two-layer 500/2600 m/s line raises neither hidden-layer-limit nor water-table, and no water-table caution', () => {
    // 2600 m/s is far above the 1450-1650 m/s of saturated soil (speed of sound in water about
    // 1480-1500 m/s: common practice); no segment was dropped or merged, so no sign of a hidden layer.
    const codes = clean.result.warnings.map((w) => w.code);
    expect(codes).not.toContain('hidden-layer-limit');
    expect(codes).not.toContain('water-table');
    expect(clean.result.cautions.map((c) => c.code)).not.toContain('water-table-ambiguity');
    // The standing hidden-layer caution stays with every depth.
    expect(clean.result.cautions.map((c) => c.code)).toContain('hidden-layer');
  });

  it('depthCautions of a P line with a layer at 1575 m/s adds the water-table caution', () => {
    const layer = (index: number, velocity: number) => ({ index, velocity, velocitySe: 10, reversed: true, segmentCount: 2 });
    expect(depthCautions('P', [layer(1, 360), layer(2, 1575)] as never).map((c) => c.code)).toContain('water-table-ambiguity');
    expect(depthCautions('P', [layer(1, 360), layer(2, 1700)] as never).map((c) => c.code)).not.toContain('water-table-ambiguity');
    expect(depthCautions('S', [layer(1, 200), layer(2, 1575)] as never).map((c) => c.code)).not.toContain('water-table-ambiguity');
  });
});
