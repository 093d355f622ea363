import { describe, expect, it } from 'vitest';
import { checkShearTopLayer, SHEAR_TOP_LAYER_MAX } from '../../src/core/cautions.js';
import { WarningLog } from '../../src/core/warnings.js';
import { readFirstBreaks } from '../../src/io/firstBreaksCsv.js';
import { interpret } from '../../src/interpret.js';
import { syntheticCsv } from '../reference/layeredTravelTimes.js';

// The bound: 2,500 ft/s = 762 m/s, the lower bound of site class B (rock) in ASCE 7-16
// Table 20.3-1 (../shared/SITE-CLASSES.md, [public]); soil at the surface is slower.
const layer = (velocity: number) => ({ index: 1, velocity, velocitySe: 5 }) as Parameters<typeof checkShearTopLayer>[0][number];

describe('checkShearTopLayer', () => {
  it('SHEAR_TOP_LAYER_MAX is 2,500 ft/s in m/s (ASCE 7-16 Table 20.3-1, class B lower bound)', () => {
    expect(Math.abs(SHEAR_TOP_LAYER_MAX - 2500 * 0.3048)).toBeLessThan(0.5);
  });

  it('checkShearTopLayer warns on an S line whose top layer is faster than 762 m/s, not at 700 m/s nor on a P line', () => {
    const codes = (velocity: number, wave: 'P' | 'S') => {
      const log = new WarningLog();
      checkShearTopLayer([layer(velocity)], wave, log);
      return log.items.map((w) => w.code);
    };
    expect(codes(800, 'S')).toEqual(['shear-top-layer-fast']);
    expect(codes(700, 'S')).toEqual([]);
    expect(codes(800, 'P')).toEqual([]);
  });

  it('interpret warns when first breaks of soil (Vp 820 m/s) are read as an S line', () => {
    // A P line over dry soil (820 m/s over 2400 m/s rock at 6 m, forward model of test/reference),
    // taken for an S line: the top "Vs" of 820 m/s is the P of the soil.
    const section = { surface: () => 20, interfaces: [() => 14], velocities: [820, 2400] };
    const receivers = Array.from({ length: 24 }, (_, i) => i * 2);
    const log = new WarningLog();
    const table = readFirstBreaks(syntheticCsv(section, [-4, 0, 23, 46, 50], receivers, 0.1, 5), 'line.csv', log, { wave: 'S' });
    const result = interpret(table, {}, log);
    const warning = result.warnings.find((w) => w.code === 'shear-top-layer-fast');
    expect(warning?.message).toMatch(/Vs 8[12]\d m\/s, above 762 m\/s, the lower bound of site class B.*ASCE 7-16 Table 20\.3-1/);
  });
});
