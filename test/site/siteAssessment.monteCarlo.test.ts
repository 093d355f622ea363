import { describe, expect, it } from 'vitest';
import { assessSite, type SiteInput } from '../../src/site/siteAssessment.js';

// assessSite against closed forms: vs,30 = 30 / Σ dᵢ/vᵢ (EN 1998-1:2004 Eq. 3.1) per station, and
// the Monte Carlo against the normal distribution it draws from (5th and 95th percentiles at
// μ ∓ 1.645 σ; the sample SD of n normal draws scatters by about σ / √(2n); common statistics).

describe('assessSite against closed forms', () => {
  it('assessSite takes the station whose vs,30 is the median along the line as the central profile, and gives every station its own vs,30', () => {
    // 200 over 600 m/s, the refractor at 4, 8 and 6 m: 30 / (d/200 + (30 − d)/600), by hand:
    // 4 m: 450.0, 8 m: 391.3, 6 m: 418.6 m/s; the median is the 6 m station.
    const site = assessSite({ velocities: [200, 600], velocitySes: [0, 0], stations: [4, 8, 6].map((d, i) => ({ x: i * 10, depths: [d], depthSes: [0] })), estimatedFromVp: false }, { draws: 2000 });
    const byHand = (d: number) => 30 / (d / 200 + (30 - d) / 600);
    expect(site.alongLine.map((a) => a.x)).toEqual([0, 10, 20]);
    site.alongLine.forEach((a, i) => expect(a.vs30).toBeCloseTo(byHand([4, 8, 6][i]), 9));
    expect(site.vs30).toBeCloseTo(byHand(6), 9);
    expect(site.deepestKnown).toBe(6);
    expect(site.extrapolated).toBeCloseTo(24, 12);
    // The classes are those of the central profile: 418.6 m/s is EN 1998-1 B (360-800).
    expect(site.classes[2].averageVelocity).toBeCloseTo(byHand(6), 9);
  });

  it('assessSite without any uncertainty runs no Monte Carlo: no draws, no percentiles, no probabilities', () => {
    const site = assessSite({ velocities: [250, 700], velocitySes: [0, 0], stations: [{ x: 0, depths: [12], depthSes: [0] }], estimatedFromVp: false });
    expect(site.draws).toBe(0);
    expect(site.vs30Low).toBeUndefined();
    expect(site.vs30High).toBeUndefined();
    for (const c of site.classes) {
      expect(c.probability).toBeUndefined();
      expect(c.probabilities).toEqual({});
      expect(c.borderline).toBe(false);
    }
    // 30 / (12/250 + 18/700) = 406.98 m/s, by hand.
    expect(site.vs30).toBeCloseTo(30 / (12 / 250 + 18 / 700), 9);
  });

  it('assessSite of a profile known to 30 m gives the 5th-95th percentiles of the top layer\'s normal velocity, 300 ∓ 1.645 × 30 m/s', () => {
    // The first boundary at 30 m exactly: vs,30 is the top layer's velocity, drawn N(300, 30²).
    const input: SiteInput = { velocities: [300, 900], velocitySes: [30, 0], stations: [{ x: 0, depths: [30], depthSes: [0] }], estimatedFromVp: false };
    const site = assessSite(input, { draws: 8000 });
    expect(site.draws).toBe(8000);
    expect(site.extrapolated).toBe(0);
    // The percentile of 8000 draws scatters by about 1.5 % here; 2.5 % allowed.
    expect(site.vs30Low! / (300 - 1.645 * 30)).toBeGreaterThan(0.975);
    expect(site.vs30Low! / (300 - 1.645 * 30)).toBeLessThan(1.025);
    expect(site.vs30High! / (300 + 1.645 * 30)).toBeGreaterThan(0.975);
    expect(site.vs30High! / (300 + 1.645 * 30)).toBeLessThan(1.025);
    // The Vs profile reports each layer's SD over the draws: 30 m/s within 5 % (σ/√(2n) = 0.8 %).
    expect(Math.abs(site.vsProfile[0].vsSe! / 30 - 1)).toBeLessThan(0.05);
    expect(site.vsProfile[0]).toMatchObject({ index: 1, basis: 'measured', vs: 300 });
    // EN 1998-1 C (180-360 m/s): P(v ≤ 360) = Φ(2) = 0.977 for N(300, 30²), not borderline.
    const en = site.classes[2];
    expect(en.class).toBe('C');
    expect(en.probability!).toBeGreaterThan(0.96);
    expect(en.probability!).toBeLessThan(0.99);
    expect(en.borderline).toBe(false);
    expect(en.probabilities.B! + en.probability!).toBeCloseTo(1, 12);
  });

  it('assessSite calls a class with probability under 90 % borderline and names the likeliest other class', () => {
    // N(340, 30²) against the EN 1998-1 C/B bound at 360 m/s: P(C) = Φ(0.667) = 0.748, by hand.
    const site = assessSite({ velocities: [340, 900], velocitySes: [30, 0], stations: [{ x: 0, depths: [30], depthSes: [0] }], estimatedFromVp: false }, { draws: 8000 });
    const en = site.classes[2];
    expect(en.class).toBe('C');
    expect(Math.abs(en.probability! - 0.748)).toBeLessThan(0.03);
    expect(en.borderline).toBe(true);
    expect(en.neighbour).toBe('B');
  });

  it('assessSite draws each refractor depth from its standard error: a 10 m boundary ± 2 m between 200 and 800 m/s', () => {
    // vs,30(d) = 30 / (d/200 + (30 − d)/800) is 480.0 m/s at 10 m; at 10 ∓ 1.645·2 m, by hand,
    // 553.6 and 426.1 m/s: the percentiles follow (vs,30 decreasing in d), within 3 %.
    const site = assessSite({ velocities: [200, 800], velocitySes: [0, 0], stations: [{ x: 0, depths: [10], depthSes: [2] }], estimatedFromVp: false, profileBase: 30 }, { draws: 8000 });
    const at = (d: number) => 30 / (d / 200 + (30 - d) / 800);
    expect(site.vs30).toBeCloseTo(at(10), 9);
    expect(Math.abs(site.vs30High! / at(10 - 1.645 * 2) - 1)).toBeLessThan(0.03);
    expect(Math.abs(site.vs30Low! / at(10 + 1.645 * 2) - 1)).toBeLessThan(0.03);
  });

  it('assessSite with a hand-entered base at 25 m extends the last velocity only below it and names the boundary given', () => {
    // 8 m at 180, then 400 m/s known to 25 m; the last velocity continues 5 m to 30 m:
    // 30 / (8/180 + 22/400) = 301.5 m/s, by hand (the same velocity above and below 25 m).
    const site = assessSite({ velocities: [180, 400], velocitySes: [0, 0], stations: [{ x: 0, depths: [8], depthSes: [0] }], estimatedFromVp: false, profileBase: 25, source: 'hand-entered' });
    expect(site.vs30).toBeCloseTo(30 / (8 / 180 + 22 / 400), 9);
    expect(site.deepestKnown).toBe(25);
    expect(site.extrapolated).toBe(5);
    const text = site.cautions.map((c) => c.message).join(' ');
    expect(text).toMatch(/the deepest boundary given/);
    // Refraction cannot see a soft layer under a stiff one; a hand-entered profile is not refraction.
    expect(site.cautions.map((c) => c.code)).not.toContain('hidden-soft-layer');
  });
});
