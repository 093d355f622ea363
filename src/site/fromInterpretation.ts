import { InputError } from '../core/errors.js';
import { depthAt } from '../depth/delayProfile.js';
import type { Interpretation, Layer, Refractor } from '../core/types.js';
import type { InterpretationResult } from '../interpret.js';
import type { SiteInput, SiteStation } from './siteAssessment.js';
import { poissonFromRatio, vpVsRatio } from './vsFromVp.js';

/** How to get shear-wave velocities from a P-wave line: one Poisson's ratio or Vp/Vs per layer, or one for all. */
export interface VsFromVpOptions {
  poisson?: number[];
  vpVs?: number[];
}

/**
 * The site-assessment input of an interpretation: its layer velocities (S lines as measured; P
 * lines through a Poisson's ratio the user must give) and a station at every receiver position
 * covered by every refractor, with depths interpolated linearly between refractor points.
 *
 * @returns undefined for a P line without a Poisson's ratio or Vp/Vs (Vs cannot be had from Vp alone)
 * @throws InputError for a ratio list whose length is neither 1 nor the layer count, or a ratio out of range
 */
export function siteInputFromInterpretation(
  result: Pick<Interpretation, 'file' | 'wave' | 'layers' | 'refractors'>, receiverXs: number[], vsFromVp: VsFromVpOptions = {},
): SiteInput | undefined {
  // Without the top layer (no direct wave) there is no profile from the surface to average.
  if (result.layers[0]?.index !== 1) return undefined;
  const layers = result.layers.slice(0, result.refractors.length + 1);
  let velocities = layers.map((l) => l.velocity);
  let velocitySes = layers.map((l) => l.velocitySe);
  let poisson: number[] | undefined;
  if (result.wave === 'P') {
    poisson = poissonList(vsFromVp, layers, result.file);
    if (poisson === undefined) return undefined;
    const ratios = poisson.map(vpVsRatio);
    velocities = velocities.map((v, i) => v / ratios[i]);
    velocitySes = velocitySes.map((se, i) => se / ratios[i]);
  }
  return { velocities, velocitySes, stations: stationsAlong(result.refractors, receiverXs), estimatedFromVp: result.wave === 'P', poisson };
}

function poissonList(options: VsFromVpOptions, layers: Layer[], file: string): number[] | undefined {
  const given = options.poisson ?? options.vpVs?.map((r) => {
    try { return poissonFromRatio(r); } catch (error) { throw new InputError({ file }, `--vp-vs: ${(error as Error).message}`); }
  });
  if (given === undefined) return undefined;
  if (given.length !== 1 && given.length !== layers.length) {
    throw new InputError({ file }, `${options.poisson ? '--poisson' : '--vp-vs'} gives ${given.length} values; expected 1 (for every layer) or ${layers.length} (one per layer, top down)`);
  }
  for (const nu of given) {
    if (!(nu >= 0 && nu < 0.5)) throw new InputError({ file }, `Poisson's ratio ${nu} is out of range; expected at least 0 and below 0.5`);
  }
  return layers.map((_, i) => given[given.length === 1 ? 0 : i]);
}

/** Stations at receiver positions inside every refractor's coverage (or at the points themselves). */
function stationsAlong(refractors: Refractor[], receiverXs: number[]): SiteStation[] {
  if (refractors.length === 0) return [{ x: receiverXs[0] ?? 0, depths: [], depthSes: [] }];
  const lo = Math.max(...refractors.map((r) => Math.min(...r.points.map((p) => p.x))));
  const hi = Math.min(...refractors.map((r) => Math.max(...r.points.map((p) => p.x))));
  if (refractors.some((r) => r.points.length === 0) || !(hi >= lo)) return [];
  const xs = [...new Set(receiverXs.filter((x) => x >= lo && x <= hi))].sort((a, b) => a - b);
  const positions = xs.length > 0 ? xs : [lo];
  return positions.map((x) => {
    const depths: number[] = [];
    const depthSes: number[] = [];
    for (const r of refractors) {
      // Every station lies within every refractor's points, so the interpolation is defined.
      const { depth, se } = depthAt(r.points, x)!;
      depths.push(Math.max(depth, depths[depths.length - 1] ?? 0));
      depthSes.push(se);
    }
    return { x, depths, depthSes };
  });
}

/**
 * Rejects an S line faster than the P line over the same ground: Vs < Vp in the same material
 * (common practice), so such a pair means a mislabelled file or a wrong pick.
 *
 * @throws InputError naming both files and the layer
 */
export function checkShearSlowerThanP(sLine: InterpretationResult, pLine: InterpretationResult): void {
  const count = Math.min(sLine.layers.length, pLine.layers.length);
  for (let i = 0; i < count; i++) {
    const vs = sLine.layers[i].velocity;
    const vp = pLine.layers[i].velocity;
    if (vs >= vp) {
      throw new InputError({ file: sLine.file },
        `layer ${i + 1} has Vs ${Math.round(vs)} m/s, not slower than Vp ${Math.round(vp)} m/s on the P line ${pLine.file}; shear waves are always slower than P waves in the same material, so check that the files are not swapped and that the S picks are shear arrivals`);
    }
  }
}
