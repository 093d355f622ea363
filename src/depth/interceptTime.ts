import { propagate } from '../core/propagate.js';
import { weightedMean } from '../core/stats.js';
import type { BranchFit, Layer, RefractorPoint } from '../core/types.js';
import type { WarningLog } from '../core/warnings.js';
import { verticalThickness } from '../fit/dippingLayers.js';

/**
 * Thicknesses of the layers above refractor n from its intercept time, for flat layers
 * (Telford, Geldart & Sheriff 1990, eq. 4.27 generalised; Redpath 1973, eq. 9):
 * tᵢ,ₙ = Σⱼ₌₁ⁿ 2 hⱼ cos θⱼ,ₙ₊₁ / Vⱼ with sin θⱼ,ₙ₊₁ = Vⱼ / Vₙ₊₁, solved for hₙ given h₁ … hₙ₋₁.
 *
 * @param interceptTime - intercept time of the head wave from refractor n, in seconds
 * @param upper - thicknesses h₁ … hₙ₋₁ of the layers above layer n, in metres
 * @param velocities - V₁ … Vₙ₊₁, in m/s (layer n+1 is the refractor)
 * @returns hₙ in metres, or undefined when Vₙ₊₁ ≤ Vₙ (no head wave) or the intercept is too small
 *   for the layers above (a negative thickness)
 * @example
 * // 2 layers, V1 = 500, V2 = 2000 m/s, h = 5 m: t = 2·5·cos(asin(0.25))/500 = 19.365 ms
 * layerThickness(0.019365, [], [500, 2000]) // 5.000
 */
export function layerThickness(interceptTime: number, upper: number[], velocities: number[]): number | undefined {
  const n = upper.length + 1;
  const refractorVelocity = velocities[n];
  let remaining = interceptTime;
  for (let j = 0; j < upper.length; j++) {
    const sine = velocities[j] / refractorVelocity;
    if (sine >= 1) return undefined;
    remaining -= (2 * upper[j] * Math.sqrt(1 - sine * sine)) / velocities[j];
  }
  const sine = velocities[n - 1] / refractorVelocity;
  if (sine >= 1) return undefined;
  const thickness = (remaining * velocities[n - 1]) / (2 * Math.sqrt(1 - sine * sine));
  return thickness >= 0 ? thickness : undefined;
}

/**
 * Intercept-time depths to every refractor under every source. Each branch's intercept gives the
 * vertical thickness of each layer under the source for plane dipping layers (Johnson 1976,
 * Geophysics 41, 418-424; see fit/dippingLayers.ts): with one refractor this is the thickness
 * measured perpendicular to it, h = t V₁ / (2 cos θ), turned into vertical depth with its dip,
 * z = h / cos δ (Telford et al. 1990, §4.3); with every dip zero it is the flat-layer formula.
 * Layers of unknown dip are taken as flat. The two branches of a source are combined by
 * inverse-variance weighting. Standard errors propagate the intercept, velocity and dip standard
 * errors (delta method).
 *
 * @returns points[k-1] = points on refractor k (under layer k), one per source where it is seen
 */
export function interceptTimeDepths(fits: BranchFit[], layers: Layer[], warnings: WarningLog): RefractorPoint[][] {
  const refractorCount = layers.length - 1;
  const result: RefractorPoint[][] = Array.from({ length: Math.max(0, refractorCount) }, () => []);
  if (refractorCount < 1 || layers[0].index !== 1) return result;
  const velocities = layers.map((l) => l.velocity);
  const velocitySes = layers.map((l) => l.velocitySe);
  const dips = layers.map((l) => ((l.dipDeg ?? 0) * Math.PI) / 180);
  const dipSes = layers.map((l) => ((l.dipSeDeg ?? 0) * Math.PI) / 180);
  const bySource = new Map<string, BranchFit[]>();
  for (const f of fits) {
    if (!bySource.has(f.branch.sourceId)) bySource.set(f.branch.sourceId, []);
    bySource.get(f.branch.sourceId)!.push(f);
  }
  for (const [sourceId, sourceFits] of bySource) {
    const { sourceX, sourceElev } = sourceFits[0].branch;
    // Near the source only: off-end sources see no direct wave and their intercepts mix layers.
    const seesDirect = sourceFits.filter((f) => f.segments.some((s) => s.layer === 1));
    const thicknesses: number[] = [];
    const thicknessSes: number[] = [];
    let depth = 0;
    for (let n = 1; n <= refractorCount; n++) {
      const estimates: { h: number; se: number }[] = [];
      for (const fit of seesDirect) {
        const segment = fit.segments.find((s) => s.layer === n + 1);
        if (segment === undefined) continue;
        // Parameters: the intercept, the velocities V1..Vn+1, the dips of refractors 1..n (radians),
        // the vertical thicknesses above.
        const f = (p: number[]) => verticalThickness(p[0], p.slice(2 * n + 2), p[1],
          p.slice(2, n + 2).map((velocity, j) => ({ velocity, dip: p[n + 2 + j] }))) ?? NaN;
        const params = [segment.intercept, ...velocities.slice(0, n + 1), ...dips.slice(1, n + 1), ...thicknesses];
        const h = f(params);
        if (!Number.isFinite(h)) {
          warnings.add('intercept-depth',
            `source ${sourceId}, ${fit.branch.side} branch: the intercept time of refractor ${n}, ${(segment.intercept * 1e3).toFixed(2)} ms, is too small for the layers above it (a negative thickness); no intercept-time depth from this branch`,
            { layer: n + 1 });
          continue;
        }
        estimates.push({ h, se: propagate(f, params, [segment.interceptSe, ...velocitySes.slice(0, n + 1), ...dipSes.slice(1, n + 1), ...thicknessSes]) });
      }
      const combined = weightedMean(estimates.map((e) => e.h), estimates.map((e) => e.se));
      if (combined === undefined) break;
      thicknesses.push(combined.mean);
      thicknessSes.push(combined.se);
      depth += combined.mean;
      const depthSe = Math.sqrt(thicknessSes.reduce((a, se) => a + se ** 2, 0));
      result[n - 1].push({ x: sourceX, depth, elev: sourceElev - depth, depthSe, sourceId });
    }
  }
  for (const points of result) points.sort((a, b) => a.x - b.x);
  return result;
}
