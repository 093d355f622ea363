import { describe, expect, it } from 'vitest';
import { InputError } from '../../src/core/errors.js';
import { compareWithPLine } from '../../src/site/pLineCheck.js';
import { assessSite, type SiteInput } from '../../src/site/siteAssessment.js';
import { vs30 } from '../../src/site/vs30.js';
import { syntheticCsv } from '../reference/layeredTravelTimes.js';
import { interpretCsv, range } from '../helpers.js';

// 4 m @ 185, 10 m @ 430 over 880 m/s, with standard errors, at three stations.
const input: SiteInput = {
  velocities: [185, 430, 880],
  velocitySes: [6, 15, 30],
  stations: [4, 4.5, 5].map((d, i) => ({ x: i * 10, depths: [d, d + 10], depthSes: [0.2, 0.5] })),
  estimatedFromVp: false,
};

describe('assessSite', () => {
  it('assessSite with the same seed gives the same result, and another seed a slightly different one', () => {
    const a = assessSite(input, { seed: 9 });
    const b = assessSite(input, { seed: 9 });
    const c = assessSite(input, { seed: 10 });
    expect(b).toEqual(a);
    expect(c.vs30Low).not.toBe(a.vs30Low);
    expect(a.vs30Low).toBeDefined();
    expect(Math.abs(c.vs30Low! / a.vs30Low! - 1)).toBeLessThan(0.01);
  });

  it('assessSite class probabilities sum to 1 for every standard', () => {
    for (const c of assessSite(input).classes) {
      expect(Object.values(c.probabilities).reduce((x, y) => x + y, 0)).toBeCloseTo(1, 12);
    }
  });

  it('assessSite of a profile in the middle of a class gives that class with probability near 1', () => {
    // 600 m/s throughout: ASCE 7-16 C (365.76 to 762), ASCE 7-22 C (441.96 to 640.08), EN 1998-1 B (360 to 800).
    // Known to 28 m, so the widened extension (1 % per metre extrapolated) hardly spreads it.
    const middle: SiteInput = { velocities: [600, 600], velocitySes: [10, 10], stations: [{ x: 0, depths: [28], depthSes: [0.5] }], estimatedFromVp: false };
    const classes = assessSite(middle).classes;
    expect(classes.map((c) => c.class)).toEqual(['C', 'C', 'B']);
    for (const c of classes) {
      expect(c.probability).toBeGreaterThan(0.99);
      expect(c.borderline).toBe(false);
    }
  });

  it('assessSite calls a profile near a bound borderline and names the neighbouring class', () => {
    // vs,30 ≈ 360 m/s sits on the EN 1998-1 B/C bound: the class probability must fall well under 90 %.
    const edge: SiteInput = { velocities: [360, 360], velocitySes: [20, 20], stations: [{ x: 0, depths: [10], depthSes: [0.5] }], estimatedFromVp: false };
    const en = assessSite(edge).classes.find((c) => c.standard === 'EN 1998-1:2004')!;
    expect(en.borderline).toBe(true);
    expect(en.probability).toBeLessThan(0.9);
    expect(['B', 'C']).toContain(en.neighbour);
  });

  it('assessSite gives Vs30 within its Monte Carlo range and reports the metres extrapolated', () => {
    const site = assessSite(input);
    // The central station (depths 4.5 and 14.5 m): 30 / (4.5/185 + 10/430 + 15.5/880), by hand.
    expect(site.vs30).toBeCloseTo(30 / (4.5 / 185 + 10 / 430 + 15.5 / 880), 6);
    expect(site.vs30Low).toBeLessThan(site.vs30);
    expect(site.vs30High).toBeGreaterThan(site.vs30);
    expect(site.extrapolated).toBeCloseTo(15.5, 9);
    expect(site.cautions.map((c) => c.code)).toContain('vs30-extrapolated');
  });

  it('assessSite of Vs estimated from Vp applies the ASCE 7-22 rule (v̄s/1.3, v̄s, 1.3 v̄s; factor from memory) and says estimated', () => {
    const site = assessSite({ ...input, estimatedFromVp: true, poisson: [0.3, 0.3, 0.3] });
    const asce22 = site.classes.find((c) => c.standard === 'ASCE 7-22')!;
    expect(asce22.estimatedRange!.low.velocity).toBeCloseTo(asce22.averageVelocity / 1.3, 9);
    expect(asce22.estimatedRange!.high.velocity).toBeCloseTo(asce22.averageVelocity * 1.3, 9);
    expect(site.cautions.map((c) => c.code)).toEqual(expect.arrayContaining(['vs-estimated-from-vp']));
    expect(site.classes.find((c) => c.standard === 'ASCE 7-16')!.estimatedRange).toBeUndefined();
  });

  it('assessSite always names class F, S1 and S2, the hidden soft layer and professional judgement', () => {
    const text = assessSite(input).cautions.map((c) => c.message).join(' ');
    expect(text).toMatch(/Class F/);
    expect(text).toMatch(/S1/);
    expect(text).toMatch(/S2/);
    expect(text).toMatch(/soft layer under a stiffer one is invisible.*unconservative/);
    expect(text).toMatch(/licensed professional.*local codes govern/);
  });

  it('assessSite(10 m @ 200 m/s over 1000 m/s) gives vs,30 428.6 m/s, EN 1998-1 E by profile (B by vs,30) and ASCE 7-22 CD', () => {
    // SITE-CLASSES.md check value: 30 / (10/200 + 20/1000) = 428.57 m/s; ASCE over 100 ft
    // 30.48 / (10/200 + 20.48/1000) = 432.5 m/s = 1418.8 ft/s: 7-16 C (1200-2500), 7-22 CD (1000-1450), by hand.
    const site = assessSite({ velocities: [200, 1000], velocitySes: [0, 0], stations: [{ x: 0, depths: [10], depthSes: [0] }], estimatedFromVp: false });
    expect(site.vs30).toBeCloseTo(428.57, 2);
    expect(site.classes.map((c) => c.class)).toEqual(['C', 'CD', 'E']);
    expect(site.classes[2]).toMatchObject({ basis: 'profile shape', velocityClass: 'B' });
  });

  it('assessSite rejects fewer than 2000 draws', () => {
    expect(() => assessSite(input, { draws: 100 })).toThrow(/at least 2000/);
  });
});

describe('site class of a line', () => {
  // An SH line from the independent forward model (Fermat least time), pick noise 0.4 ms.
  const velocities = [160, 300, 1050];
  const csv = syntheticCsv({ surface: () => 10, interfaces: [() => 8, () => -1], velocities }, [-4.5, 0, 36, 70.5, 75], range(48, 1.5), 0.4, 4);
  // True vs,30 = 30 / (2/160 + 9/300 + 19/1050) = 495.1 m/s (EN 1998-1 Eq. 3.1), by hand.
  const trueVs30 = 30 / (2 / 160 + 9 / 300 + 19 / 1050);

  it('interpret(SH line, wave S) gives Vs30 within 4 % of the true model and the classes of the true profile', () => {
    const { result } = interpretCsv(csv, { wave: 'S' });
    const site = result.site!;
    expect(Math.abs(site.vs30 / trueVs30 - 1)).toBeLessThan(0.04);
    expect(site.estimatedFromVp).toBe(false);
    // Classes of the true profile, by hand: ASCE v̄s over 100 ft = 30.48/(2/160 + 9/300 + 19.48/1050) = 499.2 m/s
    // = 1638 ft/s: ASCE 7-16 C (1200-2500), ASCE 7-22 C (1450-2100); EN 1998-1: 11 m of soil at
    // 11/(2/160 + 9/300) = 258.8 m/s over 1050 m/s, so ground type E by profile shape.
    const truth = vs30({ layers: [{ thickness: 2, velocity: 160 }, { thickness: 9, velocity: 300 }], halfspace: 1050 }, 30.48).vs30;
    expect(truth / 0.3048).toBeCloseTo(1637.9, 0);
    expect(site.classes.map((c) => c.class)).toEqual(['C', 'C', 'E']);
    expect(site.classes[2].basis).toBe('profile shape');
  });

  it('interpret of a P line computes no site class unless a Poisson ratio is given, and then labels it estimated', () => {
    const pCsv = syntheticCsv({ surface: () => 10, interfaces: [() => 8, () => -1], velocities: [300, 560, 2100] }, [-4.5, 0, 36, 70.5, 75], range(48, 1.5), 0.3, 4);
    expect(interpretCsv(pCsv).result.site).toBeUndefined();
    const site = interpretCsv(pCsv, { vsFromVp: { poisson: [0.3] } }).result.site!;
    expect(site.estimatedFromVp).toBe(true);
  });

  it('compareWithPLine rejects an S line faster than the P line over the same ground (Vs < Vp, common practice)', () => {
    const sLine = interpretCsv(csv, { wave: 'S' }).result;
    const slowP = interpretCsv(syntheticCsv({ surface: () => 10, interfaces: [() => 8, () => -1], velocities: [140, 280, 900] }, [-4.5, 0, 36, 70.5, 75], range(48, 1.5), 0.3, 4)).result;
    expect(() => compareWithPLine(sLine, slowP)).toThrow(InputError);
    expect(() => compareWithPLine(sLine, slowP)).toThrow(/layer 1 \(0\.0 to 2\.\d m\) has Vs 16\d m\/s, not slower than Vp 1\d\d m\/s/);
  });
});
