import { describe, expect, it } from 'vitest';
import { ASCE_DEPTH_M, vs30 } from '../../src/site/vs30.js';

const FT = 0.3048; // international foot, exact

describe('vs30', () => {
  it('vs30(5 m @ 150, 10 m @ 250, 15 m @ 500 m/s) is 290.32 m/s (SITE-CLASSES.md check value)', () => {
    // 30 / (5/150 + 10/250 + 15/500) = 30 / 0.103333 = 290.32 m/s, EN 1998-1 Eq. 3.1 and ASCE 7-16 Eq. 20.4-1, by hand.
    const result = vs30({ layers: [{ thickness: 5, velocity: 150 }, { thickness: 10, velocity: 250 }, { thickness: 15, velocity: 500 }] });
    expect(result.vs30).toBeCloseTo(290.32, 2);
    expect(result.vs30 / FT).toBeCloseTo(952.5, 1);
    expect(result.extrapolated).toBe(0);
  });

  it('vs30 over 100 ft of 20 ft @ 600, 30 ft @ 1000, 50 ft @ 2000 ft/s is 1132.1 ft/s (SITE-CLASSES.md)', () => {
    // 100 / (20/600 + 30/1000 + 50/2000) = 100 / 0.088333 = 1132.08 ft/s, ASCE 7-16 Eq. 20.4-1, by hand.
    const result = vs30({ layers: [{ thickness: 20 * FT, velocity: 600 * FT }, { thickness: 30 * FT, velocity: 1000 * FT }, { thickness: 50 * FT, velocity: 2000 * FT }] }, ASCE_DEPTH_M);
    expect(result.vs30 / FT).toBeCloseTo(1132.08, 1);
  });

  it('vs30 extends the deepest velocity of a profile ending at 20 m and reports 10 m extrapolated', () => {
    // 30 / (8/200 + 22/400) = 30 / 0.095 = 315.79 m/s (SITE-CLASSES.md check value; Boore 2004), by hand.
    const result = vs30({ layers: [{ thickness: 8, velocity: 200 }, { thickness: 12, velocity: 400 }] });
    expect(result.vs30).toBeCloseTo(315.79, 2);
    expect(result.extrapolated).toBeCloseTo(10, 9);
  });

  it('vs30 of 10 m @ 200 m/s over a 1000 m/s half-space is 428.57 m/s, a harmonic not an arithmetic mean', () => {
    // 30 / (10/200 + 20/1000) = 30 / 0.07 = 428.57 m/s; the arithmetic mean would be 733.3 m/s (SITE-CLASSES.md).
    const result = vs30({ layers: [{ thickness: 10, velocity: 200 }], halfspace: 1000 });
    expect(result.vs30).toBeCloseTo(428.57, 2);
    expect(result.extrapolated).toBeCloseTo(20, 9);
  });

  it('vs30 rejects a zero velocity', () => {
    expect(() => vs30({ layers: [{ thickness: 5, velocity: 0 }] })).toThrow(RangeError);
  });

  it('vs30 rejects a zero velocity or a negative thickness in any layer, naming the values, and a profile with nothing to extend', () => {
    // Eq. 3.1 / Eq. 20.4-1 divide each thickness by its velocity: a zero velocity or a negative
    // thickness has no meaning, wherever it is in the profile.
    expect(() => vs30({ layers: [{ thickness: 5, velocity: 0 }, { thickness: 10, velocity: 300 }], halfspace: 600 })).toThrow(/velocity above 0 m\/s; got 5 m at 0 m\/s/);
    expect(() => vs30({ layers: [{ thickness: -1, velocity: 200 }, { thickness: 10, velocity: 300 }] })).toThrow(/thickness of 0 m or more.*got -1 m at 200 m\/s/);
    expect(() => vs30({ layers: [{ thickness: Number.NaN, velocity: 200 }] })).toThrow(RangeError);
    // No layer and no half-space, or a half-space of 0 m/s: nothing to extend to 30 m.
    expect(() => vs30({ layers: [] })).toThrow(/needs at least one layer or a half-space velocity above 0 m\/s/);
    expect(() => vs30({ layers: [{ thickness: 10, velocity: 200 }], halfspace: 0 })).toThrow(/half-space velocity above 0/);
    // A half-space alone is a uniform ground: v̄s is its velocity, all 30 m extrapolated.
    expect(vs30({ layers: [], halfspace: 450 })).toEqual({ vs30: 450, extrapolated: 30 });
    // A layer of zero thickness is allowed and changes nothing: 30 / (10/200 + 20/400) = 300 m/s.
    expect(vs30({ layers: [{ thickness: 10, velocity: 200 }, { thickness: 0, velocity: 50 }, { thickness: 40, velocity: 400 }] }).vs30).toBeCloseTo(300, 9);
  });
});
