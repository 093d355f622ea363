import { describe, expect, it } from 'vitest';
import { planSite } from '../../src/site/fromInterpretation.js';
import { assessSite, type SiteInput } from '../../src/site/siteAssessment.js';
import { vpVsRatio } from '../../src/site/vsFromVp.js';
import { syntheticCsv } from '../reference/layeredTravelTimes.js';
import { interpretCsv, range } from '../helpers.js';

// The case of issue 9: dry soil (360 m/s) over saturated soil (1575 m/s, water table at 2.4 m)
// over rock at 10 m (4000 m/s), from the independent forward model (Fermat least time), 0.2 ms noise.
const waterCsv = syntheticCsv({ surface: () => 100, interfaces: [() => 97.6, () => 90], velocities: [360, 1575, 4000] }, [-6, 0, 47, 94, 100], range(48, 2), 0.2, 3);
// A dry line: 400 m/s over 3000 m/s rock at 3 m, no layer in the band of saturated soil.
const dryCsv = syntheticCsv({ surface: () => 100, interfaces: [() => 97] , velocities: [400, 3000] }, [-6, 0, 47, 94, 100], range(48, 2), 0.2, 5);

describe('planSite on a P line across a water table', () => {
  const { result } = interpretCsv(waterCsv, { vsFromVp: { poisson: [0.3] } });

  it('interpret(dry 360 over saturated 1575 m/s at 2.4 m over rock at 10 m, --poisson 0.3) gives no site class, never a rock class', () => {
    // Saturated soil shows Vp near the speed of sound in water whatever its stiffness (common
    // practice), so one Poisson's ratio cannot turn layer 2 (nor the rock below it) into a Vs.
    expect(result.layers.map((l) => l.velocity / [360, 1575, 4000][l.index - 1])).toEqual([expect.closeTo(1, 1), expect.closeTo(1, 1), expect.closeTo(1, 1)]);
    expect(result.site).toBeUndefined();
    const refused = result.siteNotClassified!;
    expect(refused.vsLayers.map((l) => l.basis)).toEqual(['poisson', 'not-estimated', 'not-estimated']);
    expect(refused.vsLayers.map((l) => l.saturated)).toEqual([undefined, 'water-band', 'below-water-table']);
    const warning = result.warnings.find((w) => w.code === 'vs-from-vp-saturated')!;
    expect(warning.message).toMatch(/layer 2 \(Vp 1[56]\d\d m\/s\) lies in the range of saturated soil and layer 3 lies below the water table/);
    expect(warning.message).toMatch(/--layer-poisson 2:0\.45 or --layer-vs 2:250/);
  });

  it('planSite shows the estimated Vs of the dry layer: Vp / sqrt((2 − 2ν)/(1 − 2ν)) at ν 0.3 (elasticity, SEG Wiki "VS/VP")', () => {
    const top = result.siteNotClassified!.vsLayers[0];
    // sqrt(1.4 / 0.4) = 1.8708, by hand.
    expect(vpVsRatio(0.3)).toBeCloseTo(1.8708, 4);
    expect(top.vs).toBeCloseTo(result.layers[0].velocity / 1.8708, 0);
    expect(top.poissonRange).toEqual([0.25, 0.35]);
  });

  it('planSite with each saturated layer\'s own value classes the site, and the rock below the water table is not read as rock from Vp', () => {
    // Layer 2 saturated soil at ν 0.45 (Vs = 1575 / 3.3166 = 475 m/s), layer 3 Vs 1500 m/s as given:
    const own = interpretCsv(waterCsv, { vsFromVp: { poisson: [0.3], layerPoisson: { 2: 0.45 }, layerVs: { 3: { velocity: 1500, se: 100 } } } }).result;
    const site = own.site!;
    expect(site.vsProfile.map((l) => l.basis)).toEqual(['poisson', 'poisson', 'given-vs']);
    expect(site.vsProfile[1].vs).toBeCloseTo(own.layers[1].velocity / Math.sqrt(1.1 / 0.1), 6);
    expect(site.vsProfile[2].vs).toBe(1500);
    for (const c of site.classes.slice(0, 2)) expect(['A', 'B']).not.toContain(c.class);
  });
});

describe('estimated velocities never give a class the standard reserves for measured ones', () => {
  it('interpret(dry 400 over 3000 m/s at 3 m, ν 0.25) reports ASCE "B or stiffer" (Sections 11.4.3, 20.3; 20.2), not B or A', () => {
    const { result } = interpretCsv(dryCsv, { vsFromVp: { poisson: [0.25] } });
    const site = result.site!;
    // By hand: Vs = Vp / sqrt 3 = 231 and 1732 m/s; ASCE v̄s over 100 ft =
    // 30.48 / (3/231 + 27.48/1732) = 1058 m/s = 3472 ft/s: ASCE 7-16 B (2500-5000 ft/s), ASCE 7-22 B (3000-5000 ft/s).
    const byHand = 30.48 / (3 / (400 / Math.sqrt(3)) + 27.48 / (3000 / Math.sqrt(3)));
    expect(site.classes[0].averageVelocity / byHand).toBeCloseTo(1, 1);
    expect(site.classes[0]).toMatchObject({ class: 'B or stiffer', classByEstimate: 'B', measuredOnlyClause: 'ASCE 7-16 Sections 11.4.3 and 20.3' });
    expect(site.classes[1]).toMatchObject({ class: 'B or stiffer', classByEstimate: 'B', measuredOnlyClause: 'ASCE 7-22 Section 20.2' });
    for (const c of site.classes.slice(0, 2)) {
      expect(Object.keys(c.probabilities)).not.toContain('A');
      expect(Object.keys(c.probabilities)).not.toContain('B');
    }
    expect(site.classes[1].estimatedRange!.high.class).toBe('B or stiffer');
  });

  it('assessSite of a measured profile in the B range gives class B; the same profile entered as estimates gives "B or stiffer"', () => {
    // 30 m at 1000 m/s = 3281 ft/s: ASCE 7-16 B (2,500 to 5,000 ft/s, Table 20.3-1), by hand.
    const rock: SiteInput = { velocities: [1000, 1000], velocitySes: [20, 20], stations: [{ x: 0, depths: [30.5], depthSes: [0.1] }], estimatedFromVp: false, source: 'hand-entered', profileBase: 30.5 };
    expect(assessSite(rock).classes[0].class).toBe('B');
    expect(assessSite({ ...rock, estimatedByUser: true }).classes[0].class).toBe('B or stiffer');
  });
});

describe('the Monte Carlo carries the uncertainty of the Poisson\'s ratio and of the extrapolated depth', () => {
  it('assessSite draws ν uniformly over its range: the 5th-95th percentile of Vs30 is Vp / r(ν) at ν 0.345 and 0.255', () => {
    // One layer of Vp 1000 m/s known to 30 m, ν 0.30 ± 0.05: Vs decreases with ν, so the 5th
    // percentile of Vs is at the 95th of ν (0.25 + 0.95 × 0.1 = 0.345) and the 95th at 0.255, by hand.
    const input: SiteInput = {
      velocities: [1000 / vpVsRatio(0.3), 1000 / vpVsRatio(0.3)], velocitySes: [0, 0], stations: [{ x: 0, depths: [30] , depthSes: [0] }], estimatedFromVp: true,
      vsLayers: [0, 1].map((i) => ({ index: i + 1, basis: 'poisson' as const, vp: 1000, vpSe: 0, poisson: 0.3, poissonRange: [0.25, 0.35] as [number, number] })),
    };
    const site = assessSite(input, { draws: 20000 });
    expect(site.vs30Low! / (1000 / vpVsRatio(0.345))).toBeCloseTo(1, 2);
    expect(site.vs30High! / (1000 / vpVsRatio(0.255))).toBeCloseTo(1, 2);
  });

  it('assessSite widens the extended velocity by 1 % per metre extrapolated: 10 m @ 200 over 1000 m/s spreads as 1000 (1 ± 0.2 × 1.645)', () => {
    // 20 m extrapolated: relative SD 0.2. 95th percentile: 30 / (10/200 + 20/1329) = 461.2 m/s,
    // 5th: 30 / (10/200 + 20/671) = 375.9 m/s (EN 1998-1 Eq. 3.1, by hand; the velocity SE of
    // 1 m/s is negligible beside it).
    const input: SiteInput = { velocities: [200, 1000], velocitySes: [0, 1], stations: [{ x: 0, depths: [10], depthSes: [0] }], estimatedFromVp: false };
    const site = assessSite(input, { draws: 20000 });
    expect(site.vs30High! / 461.2).toBeCloseTo(1, 2);
    expect(site.vs30Low! / 375.9).toBeCloseTo(1, 2);
  });
});

describe('planSite rejects what it cannot use', () => {
  it('planSite names a --layer-vs faster than the layer\'s Vp and a layer that does not exist', () => {
    const { result } = interpretCsv(dryCsv);
    expect(() => planSite(result, [0, 2], { poisson: [0.3], layerVs: { 2: { velocity: 3500, se: 0 } } })).toThrow(/--layer-vs 2:3500 m\/s: expected a shear-wave velocity above 0 and below the layer's Vp, (29|30)\d\d m\/s/);
    expect(() => planSite(result, [0, 2], { poisson: [0.3], layerPoisson: { 5: 0.4 } })).toThrow(/--layer-poisson 5:\.\.\.: this line has no layer 5; expected a layer from 1 to 2/);
  });
});

describe('planSite and a saturated layer fitted fast', () => {
  it('planSite treats a fitted Vp of 1750 m/s as possibly saturated soil (1400-2000 m/s, common practice) and asks for its own value', () => {
    // Forward-model lines gave 1706-1849 m/s for saturated layers of 1539-1607 m/s; the water-table
    // warning's band (1450-1650 m/s) would miss them.
    const layer = (index: number, velocity: number) => ({ index, velocity, velocitySe: 20, reversed: true, segmentCount: 2 });
    const refractor = (depth: number) => ({ index: 1, points: [0, 10].map((x) => ({ x, depth, depthSe: 0.1, elev: 100 - depth })) });
    const plan = planSite({ file: 'x.csv', wave: 'P', layers: [layer(1, 400), layer(2, 1750), layer(3, 3500)], refractors: [refractor(3), refractor(12)] } as never, [0, 5, 10], { poisson: [0.3] });
    expect(plan.input).toBeUndefined();
    expect(plan.vsLayers!.map((l) => l.saturated)).toEqual([undefined, 'water-band', 'below-water-table']);
    const dry = planSite({ file: 'x.csv', wave: 'P', layers: [layer(1, 400), layer(2, 2100)], refractors: [refractor(3)] } as never, [0, 5, 10], { poisson: [0.3] });
    expect(dry.input).toBeDefined();
  });
});
