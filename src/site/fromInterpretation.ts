import { InputError } from '../core/errors.js';
import { si, vel, type SiText } from '../core/siText.js';
import { depthAt } from '../depth/delayProfile.js';
import { hiddenLayerLimit } from '../depth/hiddenLayer.js';
import { median } from '../core/stats.js';
import type { Interpretation, Layer, Refractor } from '../core/types.js';
import type { HiddenSaturatedLayer, SiteInput, SiteStation, VsLayer } from './siteAssessment.js';
import { poissonFromRatio, vpVsRatio } from './vsFromVp.js';
import { minOf, maxOf } from '../core/extent.js';

/**
 * Highest Vp, in m/s, taken as possibly saturated soil when Vs is estimated from Vp: saturated
 * soil shows Vp from about the speed of sound in water (1480-1500 m/s) up to about 2000 m/s in
 * dense soils (common practice, recalled from memory). Wider than the water-table warning's band
 * (1450-1650 m/s) because the fitted Vp of a thin saturated layer runs high (forward-model lines
 * gave 1706-1849 m/s for 1539-1607 m/s layers): a Vs estimate needs the wider, safer band.
 */
export const SATURATED_VP_MAX = 2000;

/**
 * Lowest Vp, in m/s, taken as possibly saturated soil when Vs is estimated from Vp: 5 % under
 * the speed of sound in water (about 1480 m/s), below the water-table warning's 1450 m/s because
 * the fitted Vp of a saturated layer also runs low (forward-model water-table lines gave 1410 and
 * 1431 m/s for layers of 1481 and 1487 m/s; Vs from those at ν 0.3 would be 754 and 765 m/s).
 */
export const SATURATED_VP_MIN = 1400;

/** Whether a P layer's velocity may be that of saturated soil, for the Vs estimate. */
function maybeSaturated(velocity: number): boolean {
  return velocity >= SATURATED_VP_MIN && velocity <= SATURATED_VP_MAX;
}

/** Half-width of the range a Poisson's ratio is drawn from uniformly in the Monte Carlo, by default. */
export const POISSON_HALF_WIDTH = 0.05;
/** Largest Poisson's ratio drawn (0.5 is a fluid, with no Vs). */
export const POISSON_MAX = 0.49;

/**
 * How to get shear-wave velocities from a P-wave line: one Poisson's ratio or Vp/Vs per layer, or
 * one for all; and, for single layers (those in or below the water table need them), their own
 * Poisson's ratio or Vs.
 */
export interface VsFromVpOptions {
  poisson?: number[];
  vpVs?: number[];
  /** Poisson's ratio of single layers, by layer index (1 = top). */
  layerPoisson?: Record<number, number>;
  /** Shear-wave velocity of single layers, by layer index, in m/s, with its standard error. */
  layerVs?: Record<number, { velocity: number; se: number }>;
  /** Half-width of the uniform range each Poisson's ratio is drawn from; default POISSON_HALF_WIDTH. */
  poissonHalfWidth?: number;
}

/** The site-assessment input of a line, or why it has none although Vs from Vp was asked for. */
export interface SitePlan {
  input?: SiteInput;
  /** Per layer, how Vs was had or why it could not be (P lines given a Poisson's ratio or Vs). */
  vsLayers?: VsLayer[];
  /** Why no class is given, when Vs could not be had for every layer. */
  refused?: SiText;
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
  return planSite(result, receiverXs, vsFromVp).input;
}

/**
 * The site-assessment input of an interpretation, with the per-layer Vs profile. On a P line,
 * Vs is had from Vp only where it can be: never through a layer whose Vp lies in the band of
 * saturated soil (1400-2000 m/s, SATURATED_VP_MIN..SATURATED_VP_MAX) nor through a layer below it (below the water table Vp follows
 * the pore water, about 1480-1500 m/s, whatever the soil's stiffness: common practice), unless
 * the user gives that layer's own Poisson's ratio or Vs. Otherwise no input, and `refused` says
 * why and what to provide.
 *
 * @throws InputError for a ratio list of the wrong length, a ratio out of range, or a layer index that does not exist
 */
export function planSite(
  result: Pick<Interpretation, 'file' | 'wave' | 'layers' | 'refractors'>, receiverXs: number[], vsFromVp: VsFromVpOptions = {},
): SitePlan {
  // Without the top layer (no direct wave) there is no profile from the surface to average.
  if (result.layers[0]?.index !== 1) return {};
  const layers = result.layers.slice(0, result.refractors.length + 1);
  const stations = () => stationsAlong(result.refractors, receiverXs);
  if (result.wave !== 'P') {
    return { input: { velocities: layers.map((l) => l.velocity), velocitySes: layers.map((l) => l.velocitySe), stations: stations(), estimatedFromVp: false } };
  }
  const vsLayers = vsFromVpLayers(vsFromVp, layers, result.file);
  if (vsLayers === undefined) return {};
  const missing = vsLayers.filter((l) => l.basis === 'not-estimated');
  if (missing.length > 0) return { vsLayers, refused: refusal(missing) };
  const poisson = vsLayers.map((l) => l.poisson ?? poissonFromRatio(l.vp! / l.vs!));
  const hidden = hiddenSaturatedLayer(layers, result.refractors);
  return {
    vsLayers,
    input: {
      velocities: vsLayers.map((l) => l.vs!),
      velocitySes: vsLayers.map((l) => l.vsSe ?? 0),
      stations: stations(),
      estimatedFromVp: true,
      poisson,
      vsLayers,
      ...(hidden ? { hiddenSaturated: hidden } : {}),
    },
  };
}

/** Vp assumed for a saturated layer the line may hide: the speed of sound in water, about 1480-1500 m/s (common practice). */
export const HIDDEN_SATURATED_VP = 1500;

/**
 * A water table the fit may have lost: on a P line with no layer in the band of saturated soil,
 * the shallowest refractor that jumps across that band (the layer above slower than SATURATED_VP_MIN,
 * the refractor faster than SATURATED_VP_MAX) could hide a saturated layer of Vp about
 * HIDDEN_SATURATED_VP above it. Its largest thickness and the depth error it would cause are
 * Soske's hidden-layer limit (depth/hiddenLayer.ts), with the intercept times worked back from
 * the median refractor depths (t_k = Σ 2 h_i cos θ_ik / v_i, the flat-layer relation of
 * depth/interceptTime.ts, Telford, Geldart & Sheriff 1990 §4.3): exact for
 * the top refractor, the layers above lumped for deeper ones. Undefined when there is no such refractor.
 */
export function hiddenSaturatedLayer(layers: Layer[], refractors: Refractor[]): HiddenSaturatedLayer | undefined {
  if (layers.some((l) => maybeSaturated(l.velocity))) return undefined;
  const v = layers.map((l) => l.velocity);
  const depths = refractors.map((r) => median(r.points.map((p) => p.depth)));
  if (depths.some((d) => d === undefined)) return undefined;
  const z = depths as number[];
  const intercept = (m: number) => {
    let t = 0;
    for (let i = 0; i < m; i++) t += (2 * (z[i] - (i === 0 ? 0 : z[i - 1])) * Math.sqrt(Math.max(0, 1 - (v[i] / v[m]) ** 2))) / v[i];
    return t;
  };
  for (let k = 1; k < v.length && k <= z.length; k++) {
    if (!(v[k - 1] < SATURATED_VP_MIN && v[k] > SATURATED_VP_MAX)) continue;
    const limit = hiddenLayerLimit(k, v[k - 1], v[k], intercept(k - 1), intercept(k), HIDDEN_SATURATED_VP);
    if (limit === undefined || !(limit.depthUnderestimate > 0)) return undefined;
    return { refractor: k, vp: HIDDEN_SATURATED_VP, maxThickness: limit.maxThickness, depthUnderestimate: limit.depthUnderestimate };
  }
  return undefined;
}

function refusal(missing: VsLayer[]): SiText {
  const band = missing.filter((l) => l.saturated === 'water-band');
  const below = missing.filter((l) => l.saturated === 'below-water-table');
  const names = (list: VsLayer[]) => list.map((l) => l.index).join(', ');
  const example = missing[0].index;
  const inBand = band.length > 0 ? si`layer${band.length > 1 ? 's' : ''} ${names(band)} (Vp ${vel(band.map((l) => l.vp!))}) ${band.length > 1 ? 'lie' : 'lies'} in the range of saturated soil` : si``;
  const under = below.length > 0 ? si`${band.length > 0 ? ' and ' : ''}layer${below.length > 1 ? 's' : ''} ${names(below)} ${below.length > 1 ? 'lie' : 'lies'} below the water table` : si``;
  const head = si`no site class is estimated from Vp: `;
  const tail = si` (a P-wave velocity of ${vel([SATURATED_VP_MIN, SATURATED_VP_MAX], 0, '-')} may be saturated soil, the water table at its top). Below the water table Vp follows the pore water rather than the soil, so one Poisson's ratio for every layer cannot turn it into a Vs. Give each such layer its own value from a boring or a downhole test (for example --layer-poisson ${example}:0.45 or --layer-vs ${example}:250), or shoot an S-wave line`;
  const pieces = [head, inBand, under, tail];
  return { text: pieces.map((p) => p.text).join(''), parts: pieces.flatMap((p) => p.parts) };
}

/** Per layer, how its Vs is had: the user's own value for the layer, else the ratio for all (not in or below the water table). */
function vsFromVpLayers(options: VsFromVpOptions, layers: Layer[], file: string): VsLayer[] | undefined {
  const global = poissonList(options, layers, file);
  const ownPoisson = options.layerPoisson ?? {};
  const ownVs = options.layerVs ?? {};
  for (const [name, given] of [['--layer-poisson', ownPoisson], ['--layer-vs', ownVs]] as const) {
    for (const key of Object.keys(given)) {
      const index = Number(key);
      if (!(Number.isInteger(index) && index >= 1 && index <= layers.length)) {
        throw new InputError({ file }, `${name} ${key}:...: this line has no layer ${key}; expected a layer from 1 to ${layers.length} (1 = top)`);
      }
    }
  }
  for (const [key, nu] of Object.entries(ownPoisson)) {
    if (!(nu >= 0 && nu < 0.5)) throw new InputError({ file }, `--layer-poisson ${key}:${nu}: Poisson's ratio out of range; expected at least 0 and below 0.5`);
  }
  if (global === undefined && Object.keys(ownPoisson).length === 0 && Object.keys(ownVs).length === 0) return undefined;
  const half = options.poissonHalfWidth ?? POISSON_HALF_WIDTH;
  const wet = layers.findIndex((l) => maybeSaturated(l.velocity));
  return layers.map((layer, i): VsLayer => {
    const saturated: VsLayer['saturated'] = wet >= 0 && i >= wet ? (i === wet || maybeSaturated(layer.velocity) ? 'water-band' : 'below-water-table') : undefined;
    const base = { index: layer.index, vp: layer.velocity, vpSe: layer.velocitySe, ...(saturated ? { saturated } : {}) } as const;
    const vs = ownVs[layer.index];
    if (vs !== undefined) {
      if (!(vs.velocity > 0 && vs.velocity < layer.velocity)) {
        throw new InputError({ file }, `--layer-vs ${layer.index}:${Math.round(vs.velocity)} m/s: expected a shear-wave velocity above 0 and below the layer's Vp, ${Math.round(layer.velocity)} m/s (shear waves are slower than P waves in the same material)`);
      }
      return { ...base, basis: 'given-vs', ownValue: true, vs: vs.velocity, vsSe: vs.se };
    }
    const own = ownPoisson[layer.index];
    // A list with one ratio per layer gives each layer its own; one ratio for all does not reach below the water table.
    const perLayer = (options.poisson ?? options.vpVs ?? []).length > 1;
    const nu = own ?? (saturated && !perLayer ? undefined : global?.[i]);
    if (nu === undefined) return { ...base, basis: 'not-estimated' };
    const range: [number, number] = [Math.max(0, nu - half), Math.min(POISSON_MAX, nu + half)];
    const ratio = vpVsRatio(nu);
    return { ...base, basis: 'poisson', ownValue: own !== undefined || perLayer, poisson: nu, poissonRange: range, vs: layer.velocity / ratio, vsSe: layer.velocitySe / ratio };
  });
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
  const lo = maxOf(refractors.map((r) => minOf(r.points.map((p) => p.x))));
  const hi = minOf(refractors.map((r) => maxOf(r.points.map((p) => p.x))));
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
