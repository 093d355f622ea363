import { describe, expect, it } from 'vitest';
import { METRES_PER_FOOT, formatLength, formatVelocity, fromMetres, toMetres, velocityLabel } from '../../src/core/units.js';

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

  it('formatLength(4.7 m, ft) prints 15.4 ft with the metres in brackets (4.7 / 0.3048 = 15.42 ft, by hand)', () => {
    expect(formatLength(4.7, 'ft', 1)).toBe('15.4 ft [4.7 m]');
    expect(formatLength(30, 'ft', 0)).toBe('98 ft [30 m]');
    expect(formatLength(4.7, 'm', 1)).toBe('4.7 m');
    // A list in one unit label, joined by ", " unless told otherwise.
    expect(formatLength([12, 14], 'm', 1)).toBe('12.0, 14.0 m');
    expect(formatLength([3.048, 6.096], 'ft', 0, '-')).toBe('10-20 ft [3-6 m]');
  });

  it('formatVelocity(304.8 m/s, ft) prints 1000 ft/s [305 m/s]', () => {
    expect(formatVelocity(304.8, 'ft')).toBe('1000 ft/s [305 m/s]');
    expect(formatVelocity([1450, 1650], 'm', 0, '-')).toBe('1450-1650 m/s');
    expect(formatVelocity(1500, 'm')).toBe('1500 m/s');
    // A list joined by ", " unless told otherwise, as formatLength.
    expect(formatVelocity([1450, 1650], 'm')).toBe('1450, 1650 m/s');
  });

  it('formatLength never prints a negative zero, and keeps the sign of a negative value', () => {
    expect(formatLength(-0.01, 'm', 1)).toBe('0.0 m');
    expect(formatLength(-0.2, 'm', 0)).toBe('0 m');
    expect(formatLength(-0.001, 'm', 2)).toBe('0.00 m');
    expect(formatLength(-0.5, 'm', 1)).toBe('-0.5 m');
    expect(formatLength(-12.5, 'm', 1)).toBe('-12.5 m');
  });
});
