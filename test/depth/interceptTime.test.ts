import { describe, expect, it } from 'vitest';
import { layerThickness } from '../../src/depth/interceptTime.js';
import { crossoverDistance } from '../../src/fit/fitBranches.js';
import { csvFrom, interpretCsv, range } from '../helpers.js';
import { firstArrivalTime, interfaceDepth, type PlaneModel } from '../reference/planeLayerRays.js';

// Head-wave travel time over flat layers, written out by hand from Telford, Geldart & Sheriff
// (1990) Applied Geophysics, 2nd ed., §4.2 (eqs. 4.24 to 4.30): t = x / Vn + Σ 2 hj cos θj,n / Vj
// with sin θj,n = Vj / Vn. The first arrival is the least of the direct and head-wave times.
function flatLayerTime(thicknesses: number[], velocities: number[]) {
  return (_sx: number, rx: number, sx = _sx) => {
    const x = Math.abs(rx - sx);
    let best = x / velocities[0];
    for (let n = 1; n < velocities.length; n++) {
      let intercept = 0;
      for (let j = 0; j < n; j++) intercept += (2 * thicknesses[j] * Math.sqrt(1 - (velocities[j] / velocities[n]) ** 2)) / velocities[j];
      best = Math.min(best, x / velocities[n] + intercept);
    }
    return best;
  };
}

describe('layerThickness', () => {
  it('layerThickness(19.365 ms, [], [500, 2000]) gives the 5 m of the textbook two-layer case within 1 mm', () => {
    // ti = 2 h cos(asin(V1/V2)) / V1 = 2·5·0.968246/500 = 19.3649 ms (Telford et al. 1990, eq. 4.28), by hand.
    expect(layerThickness(0.0193649, [], [500, 2000])).toBeCloseTo(5, 3);
  });

  it('layerThickness gives the second layer of a three-layer case from its intercept time within 1 mm', () => {
    // ti2 = 2·4·cos(asin(400/3000))/400 + 2·8·cos(asin(1200/3000))/1200 (Telford et al. 1990, eq. 4.30), by hand:
    // = 8·0.991071/400 + 16·0.916515/1200 = 0.0198214 + 0.0122202 = 0.0320416 s.
    expect(layerThickness(0.0320416, [4], [400, 1200, 3000])).toBeCloseTo(8, 3);
  });

  it('layerThickness returns undefined for a refractor no faster than the layer above (no head wave)', () => {
    expect(layerThickness(0.02, [], [800, 600])).toBeUndefined();
  });
});

describe('interpret on exact textbook data', () => {
  const receivers = range(48, 1);

  it('interpret(two flat layers) recovers V1, V2, intercept time, crossover distance and depth', () => {
    const time = flatLayerTime([5], [500, 2000]);
    const { result } = interpretCsv(csvFrom([-0.5, 47.5], receivers, (s, r) => time(s, r)));
    expect(result.layers).toHaveLength(2);
    expect(result.layers[0].velocity).toBeCloseTo(500, 0);
    expect(result.layers[1].velocity).toBeCloseTo(2000, 0);
    const forward = result.fits.find((f) => f.branch.side === 'forward')!;
    // ti = 19.365 ms and xc = 2h·sqrt((V2 + V1)/(V2 − V1)) = 10·sqrt(2500/1500) = 12.910 m
    // (Telford et al. 1990, eqs. 4.28 and 4.29), by hand.
    expect(forward.segments[1].intercept * 1e3).toBeCloseTo(19.365, 2);
    expect(forward.segments[1].crossoverOffset!).toBeCloseTo(12.910, 1);
    for (const p of result.refractors[0].points) expect(p.depth).toBeCloseTo(5, 2);
  });

  it('interpret(three flat layers) recovers every velocity within 0.5 % and both depths within 5 cm', () => {
    const time = flatLayerTime([4, 8], [400, 1200, 3000]);
    const { result } = interpretCsv(csvFrom([-0.5, 95.5], range(96, 1), (s, r) => time(s, r)));
    expect(result.layers.map((l) => l.velocity)).toHaveLength(3);
    [400, 1200, 3000].forEach((v, i) => expect(Math.abs(result.layers[i].velocity / v - 1)).toBeLessThan(0.005));
    // Depths: 4 m to refractor 1, 4 + 8 = 12 m to refractor 2 (the model).
    for (const p of result.refractors[0].points) expect(Math.abs(p.depth - 4)).toBeLessThan(0.05);
    for (const p of result.refractors[1].points) expect(Math.abs(p.depth - 12)).toBeLessThan(0.05);
  });

  it('crossoverDistance of t = x/500 and t = 0.02 + x/2000 is 13.33 m', () => {
    // x = 0.02 / (1/500 − 1/2000) = 0.02 / 0.0015 = 13.333 m, by hand.
    expect(crossoverDistance({ intercept: 0, slowness: 1 / 500 }, { intercept: 0.02, slowness: 1 / 2000 })).toBeCloseTo(13.333, 3);
  });
});

describe('interceptTimeDepths over a dipping refractor', () => {
  it('interceptTimeDepths gives the vertical depth z = h / cos δ under each source of a refractor dipping 20°, within 5 cm', () => {
    // 800 over 2000 m/s, 3 m below x = 0, deepening 20° towards +x; exact head-wave times traced ray
    // by ray (test/reference/planeLayerRays.ts). The intercept gives the perpendicular distance
    // h = t V1 / (2 cos θ) (Telford et al. 1990, §4.3); the vertical depth is h / cos 20° = 1.064 h:
    // under the source at x = 71.5 m, z = 3 + 71.5 tan 20° = 29.02 m while h = 27.27 m, by hand.
    const model: PlaneModel = { depthAtZero: [3], dipDeg: [20], velocities: [800, 2000] };
    const { result } = interpretCsv(csvFrom([-0.5, 35.5, 71.5], range(72, 1), (s, r) => firstArrivalTime(model, s, r)));
    const points = result.refractors[0].byMethod['intercept-time'];
    expect(points.map((p) => p.x)).toEqual([-0.5, 35.5, 71.5]);
    for (const p of points) expect(Math.abs(p.depth - interfaceDepth(model, 0, p.x))).toBeLessThan(0.05);
    expect(points[2].depth).toBeCloseTo(29.02, 1);
  });
});
