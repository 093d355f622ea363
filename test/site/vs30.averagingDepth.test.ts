import { describe, expect, it } from 'vitest';
import { ASCE_DEPTH_M, VS30_DEPTH_M, vs30 } from '../../src/site/vs30.js';
import { assessSite } from '../../src/site/siteAssessment.js';

// A profile whose deepest layer crosses both averaging depths, 30 m (EN 1998-1:2004 Eq. 3.1) and
// 100 ft = 30.48 m (ASCE 7-16 Eq. 20.4-1): 6 m at 180 m/s, 14 m at 320 m/s, 25 m at 600 m/s (to
// 45 m), then 900 m/s. Only the part of each layer above the averaging depth counts. By hand:
//   EN:   30 / (6/180 + 14/320 + 10/600)    = 30 / (0.0333333 + 0.04375 + 0.0166667) = 30 / 0.09375 = 320.00 m/s
//   ASCE: 30.48 / (6/180 + 14/320 + 10.48/600) = 30.48 / 0.0945500 = 322.37 m/s (1057.6 ft/s)
// Summing the whole 25 m layer instead would give 30 / 0.11875 = 252.6 m/s.
const layers = [{ thickness: 6, velocity: 180 }, { thickness: 14, velocity: 320 }, { thickness: 25, velocity: 600 }];

describe('vs30 over a profile deeper than the averaging depth', () => {
  it('vs30 counts only the top 30 m: 320.00 m/s (EN 1998-1 Eq. 3.1, worked by hand), nothing extrapolated', () => {
    const result = vs30({ layers, halfspace: 900 }, VS30_DEPTH_M);
    expect(result.vs30).toBeCloseTo(320.0, 2);
    expect(result.extrapolated).toBe(0);
  });

  it('vs30 over 100 ft counts only the top 30.48 m: 322.37 m/s = 1057.6 ft/s (ASCE 7-16 Eq. 20.4-1, worked by hand)', () => {
    const result = vs30({ layers, halfspace: 900 }, ASCE_DEPTH_M);
    expect(result.vs30).toBeCloseTo(322.37, 2);
    expect(result.vs30 / 0.3048).toBeCloseTo(1057.6, 1);
  });

  it('vs30 of a profile whose second boundary is at 30 m exactly ignores everything below it', () => {
    // 30 / (10/200 + 20/400) = 30 / 0.1 = 300 m/s, by hand; the 5000 m/s below must not count.
    expect(vs30({ layers: [{ thickness: 10, velocity: 200 }, { thickness: 20, velocity: 400 }, { thickness: 50, velocity: 5000 }] }).vs30).toBeCloseTo(300, 9);
  });

  it('assessSite on a station with refractors at 6, 20 and 45 m gives vs,30 320.00 m/s and the ASCE 100-ft average 322.37 m/s', () => {
    const site = assessSite({
      velocities: [180, 320, 600, 900], velocitySes: [0, 0, 0, 0],
      stations: [{ x: 0, depths: [6, 20, 45], depthSes: [0, 0, 0] }], estimatedFromVp: false,
    }, { draws: 2000 });
    expect(site.vs30).toBeCloseTo(320.0, 2);
    expect(site.extrapolated).toBe(0);
    for (const c of site.classes) {
      expect(c.averageVelocity).toBeCloseTo(c.standard.startsWith('ASCE') ? 322.37 : 320.0, 2);
    }
  });
});
