import { describe, expect, it } from 'vitest';
import { headWaveAngles, solveInterface, solveInterfaces, verticalThickness } from '../../src/fit/dippingLayers.js';
import { firstArrivalTime, headWaveTime, interfaceDepth, type PlaneModel } from '../reference/planeLayerRays.js';
import { syntheticCsv, type LayeredSection } from '../reference/layeredTravelTimes.js';
import { csvFrom, interpretCsv, range } from '../helpers.js';

// Reference times: head waves over plane dipping interfaces traced ray by ray in
// test/reference/planeLayerRays.ts (Telford, Geldart & Sheriff 1990, §4.3: critical angle at the
// refractor, Snell's law at each interface above, vectors and line-plane intersections; no angle
// formula of the program). Plane layers give straight head-wave branches, so two receivers give the
// apparent slowness exactly and the line through them the intercept time at the source.
const rad = (deg: number) => (deg * Math.PI) / 180;
const deg = (r: number) => (r * 180) / Math.PI;

/** Apparent slownesses and intercepts of every head wave, forward from sourceA, reverse from sourceB. */
function measured(model: PlaneModel, sourceA: number, sourceB: number, forwardAt: [number, number], reverseAt: [number, number]) {
  return model.dipDeg.map((_, k) => {
    const m = k + 1;
    const time = (s: number, r: number) => {
      const t = headWaveTime(model, m, s, r);
      if (t === undefined) throw new Error(`no head wave from interface ${m} between ${s} and ${r} m`);
      return t;
    };
    const [f1, f2] = forwardAt.map((r) => time(sourceA, r));
    const [r1, r2] = reverseAt.map((r) => time(sourceB, r));
    const sf = (f2 - f1) / (forwardAt[1] - forwardAt[0]);
    const sr = (r2 - r1) / (reverseAt[0] - reverseAt[1]);
    return { sf, sr, interceptA: f1 - sf * (forwardAt[0] - sourceA), interceptB: r1 - sr * (sourceB - reverseAt[0]) };
  });
}

// Non-parallel models with dips of 15 to 20 degrees (invented for the test). Each is checked to
// have rays for the source-receiver pairs used (measured() throws otherwise).
const models: { name: string; model: PlaneModel }[] = [
  { name: 'one interface dipping 18°', model: { depthAtZero: [3], dipDeg: [18], velocities: [800, 2000] } },
  { name: 'one interface rising 15° towards +x', model: { depthAtZero: [35], dipDeg: [-15], velocities: [600, 1800] } },
  { name: 'two interfaces, 5° over 18°', model: { depthAtZero: [6, 20], dipDeg: [5, 18], velocities: [600, 1500, 4000] } },
  { name: 'two interfaces, 15° over −5°', model: { depthAtZero: [2, 50], dipDeg: [15, -5], velocities: [700, 1400, 3500] } },
  { name: 'three interfaces, 4°, −8° and 16°', model: { depthAtZero: [5, 38, 46], dipDeg: [4, -8, 16], velocities: [400, 1000, 2200, 4500] } },
];

describe('solveInterfaces (Johnson 1976) on ray-traced head waves', () => {
  for (const { name, model } of models) {
    it(`solveInterfaces(${name}) recovers every true velocity within 0.01 % and every dip within 0.001°`, () => {
      const data = measured(model, 0, 120, [90, 110], [30, 10]);
      const solved = solveInterfaces(model.velocities[0], data.map((d) => [d.sf, d.sr]));
      expect(solved).toHaveLength(model.dipDeg.length);
      solved.forEach((s, k) => {
        expect(Math.abs(s.velocity / model.velocities[k + 1] - 1)).toBeLessThan(1e-4);
        expect(Math.abs(deg(s.dip) - model.dipDeg[k])).toBeLessThan(1e-3);
      });
    });

    it(`verticalThickness(${name}) gives every refractor's vertical depth under both sources within 1 mm`, () => {
      const data = measured(model, 0, 120, [90, 110], [30, 10]);
      const solved = solveInterfaces(model.velocities[0], data.map((d) => [d.sf, d.sr]));
      for (const [source, key] of [[0, 'interceptA'], [120, 'interceptB']] as const) {
        const thicknesses: number[] = [];
        for (let m = 1; m <= solved.length; m++) {
          const z = verticalThickness(data[m - 1][key], thicknesses, model.velocities[0], solved);
          expect(z).toBeDefined();
          thicknesses.push(z!);
          const depth = thicknesses.reduce((a, b) => a + b, 0);
          expect(Math.abs(depth - interfaceDepth(model, m - 1, source))).toBeLessThan(1e-3);
        }
      }
    });
  }

  it('solveInterface of one 18° interface: the depth under the source is h / cos δ, not the perpendicular h (Telford et al. 1990, §4.3)', () => {
    // V1 = 800, V2 = 2000 m/s, 3 m below x = 0, dipping 18°: under the source at x = 0 the
    // perpendicular distance is h = 3 cos 18° = 2.853 m and the vertical depth 3 m, by hand.
    const { model } = models[0];
    const [d] = measured(model, 0, 120, [90, 110], [30, 10]);
    const solved = solveInterfaces(800, [[d.sf, d.sr]]);
    // Telford's single-interface intercept: t = 2 h cos θ / V1, θ = asin(800/2000).
    const h = (d.interceptA * 800) / (2 * Math.cos(Math.asin(0.4)));
    expect(h).toBeCloseTo(3 * Math.cos(rad(18)), 3);
    expect(verticalThickness(d.interceptA, [], 800, solved)!).toBeCloseTo(3, 3);
  });

  it('solveInterface reduces to the up-dip/down-dip formulas of Telford et al. (1990, §4.3) for parallel layers', () => {
    // Three layers 500, 1200, 2500 m/s under parallel interfaces dipping 8°: the ray parameter along
    // the interfaces is conserved, so θ = ½[asin(V1 sf) + asin(V1 sr)], δ = ½[asin(V1 sf) − asin(V1 sr)],
    // V3 = V1 / sin θ with V1 the top velocity (textbook formulas, written out here).
    const model: PlaneModel = { depthAtZero: [4, 12], dipDeg: [8, 8], velocities: [500, 1200, 2500] };
    const data = measured(model, 0, 120, [90, 110], [30, 10]);
    const [sf, sr] = [data[1].sf, data[1].sr];
    const theta = (Math.asin(500 * sf) + Math.asin(500 * sr)) / 2;
    const solved = solveInterfaces(500, data.map((x) => [x.sf, x.sr]));
    expect(solved[1].velocity).toBeCloseTo(500 / Math.sin(theta), 3);
    expect(deg(solved[1].dip)).toBeCloseTo(deg((Math.asin(500 * sf) - Math.asin(500 * sr)) / 2), 6);
    expect(solved[1].velocity).toBeCloseTo(2500, 3);
  });

  it('solveInterface of the worked example in its doc comment: 500 over 2000 m/s dipping 10°', () => {
    // θ = asin(0.25) = 14.4775°; sf = sin(24.4775°)/500, sr = sin(4.4775°)/500 (Telford et al. 1990, §4.3), by hand.
    const solved = solveInterface(500, [], 8.288e-4, 1.563e-4)!;
    expect(solved.velocity).toBeCloseTo(2000, -1);
    expect(deg(solved.dip)).toBeCloseTo(10, 1);
    expect(verticalThickness(0.019071, [], 500, [{ velocity: 2000, dip: rad(10) }])!).toBeCloseTo(5, 2);
  });

  it('solveInterface returns undefined for an apparent velocity below the top layer\'s and for a refractor slower than its overburden', () => {
    expect(solveInterface(500, [], 1 / 400, 1 / 2000)).toBeUndefined();
    expect(headWaveAngles(500, [{ velocity: 400, dip: 0 }], 1)).toBeUndefined();
    expect(verticalThickness(0.01, [], 500, [{ velocity: 400, dip: 0 }])).toBeUndefined();
    // A too-small intercept for the layer above gives a negative thickness: no answer.
    expect(verticalThickness(0.001, [5], 500, [{ velocity: 1500, dip: 0 }, { velocity: 3000, dip: 0 }])).toBeUndefined();
    // A zero intercept is a layer of no thickness, not "no answer".
    expect(verticalThickness(0, [], 500, [{ velocity: 1500, dip: 0 }])).toBe(0);
  });

  it('solveInterface returns undefined where a ray cannot be traced: a reverse apparent velocity below V1, a ray past the critical angle of a refractor above, or rays that would meet above the refractor', () => {
    expect(solveInterface(500, [], 1 / 2000, 1 / 450)).toBeUndefined();
    // Through a refractor above of 1500 m/s: sin φ₂ = 3 sin φ₁ exceeds 1 for an apparent velocity of 1400 m/s
    // (sin φ₁ = 500/1400 = 0.357, by hand) on either side.
    expect(solveInterface(500, [{ velocity: 1500, dip: 0 }], 1 / 1400, 1 / 3000)).toBeUndefined();
    expect(solveInterface(500, [{ velocity: 1500, dip: 0 }], 1 / 3000, 1 / 1400)).toBeUndefined();
    // Slownesses of opposite sign and equal size: the rays' mean angle is zero, no critical angle.
    expect(solveInterface(500, [], 1 / 3000, -1 / 3000)).toBeUndefined();
    // solveInterfaces stops at the first interface it cannot solve: the next needs it.
    expect(solveInterfaces(500, [[1 / 400, 1 / 400], [1 / 3000, 1 / 3000]])).toHaveLength(0);
    // Through flat layers the slowness is conserved: V3 = 1/s whatever the layers above (Telford §4.2).
    expect(solveInterface(500, [{ velocity: 1500, dip: 0 }], 1 / 3000, 1 / 3000)!.velocity).toBeCloseTo(3000, 6);
  });

  it('headWaveAngles returns undefined where the up-going ray meets a slower layer beyond its critical angle', () => {
    // 500 m/s over 400 m/s over 1000 m/s dipping 40°: φ₂ = asin(0.4) + 40° = 63.6°, and
    // (500/400) sin 63.6° = 1.12 > 1, so no ray reaches the ground (by hand).
    expect(headWaveAngles(500, [{ velocity: 400, dip: 0 }, { velocity: 1000, dip: rad(40) }], 2)).toBeUndefined();
    // Flat layers: every angle is asin(Vj / V3) on both sides (Telford et al. 1990, §4.2).
    const flat = headWaveAngles(500, [{ velocity: 1500, dip: 0 }, { velocity: 3000, dip: 0 }], 2)!;
    expect(flat.forward[0]).toBeCloseTo(Math.asin(500 / 3000), 12);
    expect(flat.reverse[0]).toBeCloseTo(Math.asin(500 / 3000), 12);
    expect(flat.forward[1]).toBeCloseTo(Math.asin(0.5), 12);
  });
});

describe('interpret on ray-traced first arrivals over plane dipping layers', () => {
  // First arrivals: the least of the direct wave and every head wave (planeLayerRays.ts), exact.
  const lines: { name: string; model: PlaneModel }[] = [
    { name: 'one refractor dipping 15° (600 over 1800 m/s)', model: { depthAtZero: [3], dipDeg: [15], velocities: [600, 1800] } },
    { name: 'one refractor dipping 18° (800 over 2000 m/s)', model: { depthAtZero: [3], dipDeg: [18], velocities: [800, 2000] } },
    { name: 'refractors dipping 2° and 17° (400, 1100, 3000 m/s)', model: { depthAtZero: [3, 6], dipDeg: [2, 17], velocities: [400, 1100, 3000] } },
    { name: 'a flat refractor over one dipping 1.72° (350, 1200, 3000 m/s)', model: { depthAtZero: [3, 10], dipDeg: [0, 1.72], velocities: [350, 1200, 3000] } },
  ];
  for (const { name, model } of lines) {
    it(`interpret(${name}) recovers each velocity within 0.5 %, each dip within 0.1° and the depths under the sources within 5 cm`, () => {
      const { result } = interpretCsv(csvFrom([-0.5, 35.5, 71.5], range(72, 1), (s, r) => firstArrivalTime(model, s, r)));
      expect(result.layers).toHaveLength(model.velocities.length);
      model.velocities.forEach((v, i) => expect(Math.abs(result.layers[i].velocity / v - 1)).toBeLessThan(0.005));
      model.dipDeg.forEach((d, k) => expect(Math.abs(result.layers[k + 1].dipDeg! - d)).toBeLessThan(0.1));
      // Each refractor is reversed, and its apparent velocities are the traced ones (slope of time
      // against offset, 1/sf down-dip from x = -0.5 and 1/sr from x = 71.5, between receivers 40 and 70).
      model.dipDeg.forEach((_, k) => {
        const layer = result.layers[k + 1];
        expect(layer.reversed).toBe(true);
        const forward = 30 / (headWaveTime(model, k + 1, -0.5, 70)! - headWaveTime(model, k + 1, -0.5, 40)!);
        const reverse = 30 / (headWaveTime(model, k + 1, 71.5, 0)! - headWaveTime(model, k + 1, 71.5, 30)!);
        expect(Math.abs(layer.forwardApparent! / forward - 1)).toBeLessThan(0.005);
        expect(Math.abs(layer.reverseApparent! / reverse - 1)).toBeLessThan(0.005);
      });
      expect(result.layers[0].reversed).toBe(true);
      model.dipDeg.forEach((_, k) => {
        const points = result.refractors[k].byMethod['intercept-time'];
        expect(points.length).toBeGreaterThanOrEqual(2);
        for (const p of points) expect(Math.abs(p.depth - interfaceDepth(model, k, p.x))).toBeLessThan(0.05);
      });
    });
  }

  it('interpret(a flat refractor at 3 m over one dipping 1.72° to +x) reports the second dip within 0.6°, not the parallel-layer 0.45°', () => {
    // The line of test/depth/profiles.forward.test.ts (refractor 2 from 10 m deepening 0.03 m/m,
    // atan 0.03 = 1.718°), from the Fermat least-time reference with 0.3 ms pick noise. The dip of a
    // deeper refractor inherits the errors of every one above: its standard error here is 0.35 to
    // 0.7° (measured over seeds 1-4: 1.97 to 2.29°); the formula for parallel layers gave 0.45°.
    const section: LayeredSection = { surface: () => 50, interfaces: [() => 47, (x) => 40 - 0.03 * x], velocities: [350, 1200, 3000] };
    for (const seed of [1, 2]) {
      const { result } = interpretCsv(syntheticCsv(section, [-30, -10, 0, 47.5, 95, 105, 125], range(96, 1), 0.3, seed));
      expect(Math.abs(result.layers[2].dipDeg! - deg(Math.atan(0.03)))).toBeLessThan(0.6);
      expect(Math.abs(result.layers[1].dipDeg!)).toBeLessThan(0.3);
      // Standard errors by the delta method: positive, and the truth within three of them.
      [[1200, 0], [3000, deg(Math.atan(0.03))]].forEach(([velocity, dip], i) => {
        const layer = result.layers[i + 1];
        expect(layer.velocitySe).toBeGreaterThan(0);
        expect(layer.dipSeDeg!).toBeGreaterThan(0);
        expect(Math.abs(layer.velocity - velocity)).toBeLessThan(3 * layer.velocitySe);
        expect(Math.abs(layer.dipDeg! - dip)).toBeLessThan(3 * layer.dipSeDeg!);
      });
      // The deeper refractor inherits the errors of the one above: its dip is less certain.
      expect(result.layers[2].dipSeDeg!).toBeGreaterThan(result.layers[1].dipSeDeg!);
    }
  });
});
