import { describe, expect, it } from 'vitest';
import { METRES_PER_FOOT, fromMetres, toMetres, velocityLabel } from '../../src/core/units.js';

// The international foot is 0.3048 m exactly (international yard and pound agreement, 1959).
describe('units', () => {
  it('fromMetres(30.48, ft) is 100 ft and fromMetres(304.8 m/s, ft) is 1000 ft/s (1 ft = 0.3048 m exactly)', () => {
    expect(METRES_PER_FOOT).toBe(0.3048);
    expect(fromMetres(30.48, 'ft')).toBeCloseTo(100, 10);
    expect(fromMetres(304.8, 'ft')).toBeCloseTo(1000, 9);
    // 5 m = 5 / 0.3048 = 16.4042 ft, by hand.
    expect(fromMetres(5, 'ft')).toBeCloseTo(16.4042, 4);
    expect(fromMetres(5, 'm')).toBe(5);
  });

  it('toMetres(100 ft) is 30.48 m, and toMetres undoes fromMetres', () => {
    expect(toMetres(100, 'ft')).toBeCloseTo(30.48, 10);
    expect(toMetres(1, 'ft')).toBe(0.3048);
    expect(toMetres(7, 'm')).toBe(7);
    for (const v of [0.45720000000000005, 12.5, 1234.5]) expect(toMetres(fromMetres(v, 'ft'), 'ft')).toBeCloseTo(v, 9);
  });

  it('velocityLabel names ft/s for feet and m/s for metres', () => {
    expect(velocityLabel('ft')).toBe('ft/s');
    expect(velocityLabel('m')).toBe('m/s');
  });
});
