import type { Caution } from '../core/cautions.js';
import { len, si, vel, type SiText } from '../core/siText.js';
import { median } from '../core/stats.js';
import { normalFrom, quantile, seededUniform } from './random.js';
import { ASCE_7_16, ASCE_7_22, classify, EN_1998_1_2004, groundTypeE, type SiteClassStandard } from './standards/index.js';
import { vs30, type ShearProfile } from './vs30.js';
import { vpVsRatio } from './vsFromVp.js';

/** The standards classed, in the order they are reported. */
export const STANDARDS: SiteClassStandard[] = [ASCE_7_16, ASCE_7_22, EN_1998_1_2004];

/** Probability below which a class is called borderline. */
export const BORDERLINE_PROBABILITY = 0.9;

/**
 * Below the deepest boundary the deepest velocity is extended (Boore 2004); in the Monte Carlo
 * that extended velocity is drawn with a relative standard deviation of 1 % per metre
 * extrapolated, added in quadrature to its own standard error (19 m extrapolated: ±19 %). A rule
 * of this program, stated to the user and in DEVELOPERS.md: nothing in the standards gives one.
 */
export const EXTRAPOLATION_SPREAD_PER_M = 0.01;

/** A station along the line: the depth to each refractor there, with its standard error. */
export interface SiteStation {
  /** Position along the line, in metres. */
  x: number;
  /** Depth to refractor k (k = 0 is the top of layer 2), in metres, increasing. */
  depths: number[];
  depthSes: number[];
}

/** How one layer's shear-wave velocity was had, for the Vs profile shown with the classes. */
export interface VsLayer {
  /** Layer index, 1 = top. */
  index: number;
  /** measured (S line or hand-entered), poisson (from Vp), given-vs (the user's Vs for this layer), not-estimated (cannot be had from Vp). */
  basis: 'measured' | 'poisson' | 'given-vs' | 'not-estimated';
  /** P-wave velocity and its standard error, in m/s (P lines). */
  vp?: number;
  vpSe?: number;
  /** Poisson's ratio used (central value) and the range it is drawn from uniformly in the Monte Carlo. */
  poisson?: number;
  poissonRange?: [number, number];
  /** True when the Poisson's ratio or Vs was given for this layer alone (not one value for all). */
  ownValue?: boolean;
  /** Shear-wave velocity and its standard error, in m/s (the standard error from the Monte Carlo when one ran). */
  vs?: number;
  vsSe?: number;
  /** Saturated soil suspected: Vp in 1400-2000 m/s (SATURATED_VP_MIN..SATURATED_VP_MAX), or a layer below such a one. */
  saturated?: 'water-band' | 'below-water-table';
}

/**
 * A saturated layer a P line may hide above one refractor (no layer in the saturated band was
 * found, but the refractor jumps across it): Soske's largest such layer and the depth error.
 */
export interface HiddenSaturatedLayer {
  /** The refractor it would lie above (1 = top of layer 2). */
  refractor: number;
  /** Its assumed Vp, in m/s. */
  vp: number;
  /** Largest thickness that would never arrive first, in metres. */
  maxThickness: number;
  /** How much deeper the refractor (and every one below) would then be, in metres. */
  depthUnderestimate: number;
}

/** What the site assessment needs: shear-wave velocities per layer and the stations. */
export interface SiteInput {
  /** Shear-wave velocity of each layer, top down (the last is below the deepest refractor), m/s. */
  velocities: number[];
  velocitySes: number[];
  stations: SiteStation[];
  /** True when the velocities were derived from Vp, not measured. */
  estimatedFromVp: boolean;
  /** True when the user says the velocities are estimates (a hand-entered profile). */
  estimatedByUser?: boolean;
  /**
   * Depth, in metres, to which the velocities are known; below it the deepest velocity is
   * extended. Defaults to the deepest refractor at each station.
   */
  profileBase?: number;
  /** Poisson's ratio per layer used for the estimate, when estimated from Vp. */
  poisson?: number[];
  /** Per layer, how Vs was had (P lines: Vp, Poisson's ratio range; drawn from in the Monte Carlo). */
  vsLayers?: VsLayer[];
  /** Where the profile comes from: a refraction line (default) or entered by hand (downhole, crosshole, ...). */
  source?: 'refraction' | 'hand-entered';
  /** Vs from Vp on a line that may hide a saturated layer: what the classes would be with it. */
  hiddenSaturated?: HiddenSaturatedLayer;
}

export interface SiteOptions {
  /** Monte Carlo draws; at least 2000, default 4000. */
  draws?: number;
  /** Seed of the Monte Carlo; default 1. */
  seed?: number;
}

export interface StandardClass {
  standard: string;
  table: string;
  /** Class of the central profile; for an estimate in a class reserved for measured velocities, the standard's label ("B or stiffer"). */
  class: string;
  /** The class the estimate falls in, when it was replaced by the label above. */
  classByEstimate?: string;
  /** The clause that reserves that class for measured velocities, when it applied. */
  measuredOnlyClause?: string;
  /** What decided it: the averaged velocity, or (EN 1998-1 type E) the profile shape. */
  basis: 'velocity' | 'profile shape';
  /** Probability of that class under the Monte Carlo; undefined when no uncertainty was given (no Monte Carlo). */
  probability?: number;
  /** Probability of every class that occurred (empty without a Monte Carlo). */
  probabilities: Record<string, number>;
  borderline: boolean;
  /** The most likely other class, when borderline. */
  neighbour?: string;
  /** Time-averaged velocity over the standard's own depth (30 m or 100 ft), in m/s. */
  averageVelocity: number;
  averagingDepth: number;
  /** ASCE 7-22 rule for estimated velocities: the classes of v̄s / 1.3, v̄s and 1.3 v̄s. */
  estimatedRange?: { factor: number; low: { velocity: number; class: string }; central: { velocity: number; class: string }; high: { velocity: number; class: string } };
  /** Class by velocity alone, when the profile shape decided otherwise. */
  velocityClass?: string;
  /** Notes for the user, SI text (noteTexts holds the same with their quantities). */
  notes: string[];
  noteTexts: SiText[];
}

export interface SiteAssessment {
  /** vs,30 (30 m, EN 1998-1 Eq. 3.1) of the central profile, in m/s. */
  vs30: number;
  /** 5th and 95th percentiles of the Monte Carlo, in m/s; undefined when none ran. */
  vs30Low?: number;
  vs30High?: number;
  /** Metres of the top 30 m below the deepest known boundary of the central profile. */
  extrapolated: number;
  /** Depth of that boundary, in metres. */
  deepestKnown: number;
  estimatedFromVp: boolean;
  /** True when the velocities are estimates (from Vp, or as the user said). */
  estimated: boolean;
  /** vs,30 at every station, in m/s. */
  alongLine: { x: number; vs30: number }[];
  classes: StandardClass[];
  cautions: Caution[];
  /** Monte Carlo draws, 0 when no uncertainty was given and none ran. */
  draws: number;
  seed: number;
  /** Per layer, how Vs was had, with Vs ± standard error. */
  vsProfile: VsLayer[];
}

function profileAt(velocities: number[], depths: number[], extension?: number, base?: number): ShearProfile {
  const layers = depths.map((depth, k) => ({ thickness: depth - (k === 0 ? 0 : depths[k - 1]), velocity: velocities[k] }));
  const last = velocities[depths.length];
  if (base !== undefined && base > (depths[depths.length - 1] ?? 0)) {
    // A hand-entered last layer with a thickness: it is known down to `base`, extended below.
    layers.push({ thickness: base - (depths[depths.length - 1] ?? 0), velocity: last });
  }
  return { layers, halfspace: extension ?? last };
}

interface RawClass { vs: number; cls: string; velocityClass: string; byShape: boolean }

function classOf(standard: SiteClassStandard, profile: ShearProfile): RawClass {
  const vs = vs30(profile, standard.averagingDepth).vs30;
  const velocityClass = classify(standard, vs).class;
  if (standard === EN_1998_1_2004) {
    const shape = groundTypeE([...profile.layers, { thickness: Infinity, velocity: profile.halfspace ?? profile.layers[profile.layers.length - 1].velocity }]);
    if (shape !== undefined) return { vs, cls: 'E', velocityClass, byShape: true };
  }
  return { vs, cls: velocityClass, velocityClass, byShape: false };
}

/** The class as reported: an estimate in a class reserved for measured velocities becomes the standard's label. */
function reported(standard: SiteClassStandard, cls: string, estimated: boolean): string {
  const reserved = standard.measuredOnly;
  return estimated && reserved !== undefined && reserved.classes.includes(cls) ? reserved.label : cls;
}

/** True when the input carries any uncertainty for a Monte Carlo to spread. */
function hasUncertainty(input: SiteInput): boolean {
  return input.stations.length > 1
    || input.velocitySes.some((s) => s > 0)
    || input.stations.some((s) => s.depthSes.some((d) => d > 0))
    || (input.vsLayers ?? []).some((l) => (l.vpSe ?? 0) > 0 || (l.poissonRange !== undefined && l.poissonRange[1] > l.poissonRange[0]) || (l.vsSe ?? 0) > 0);
}

/**
 * Vs30 and the site classes of ASCE 7-16 (Table 20.3-1), ASCE 7-22 (Table 20.2-1) and
 * EN 1998-1:2004 (Table 3.1, with ground type E judged from the profile shape), with a seeded
 * Monte Carlo over the layer velocities and refractor depths (normal, from their standard errors,
 * truncated to positive velocities and increasing depths), the Poisson's ratio of layers whose Vs
 * comes from Vp (uniform over its stated range), the velocity extended below the deepest boundary
 * (its standard error widened by EXTRAPOLATION_SPREAD_PER_M per metre) and the along-line
 * variation (a station drawn at random for each draw). A class whose probability is under 90 %
 * is borderline, with its most likely neighbour named. Estimated velocities never give a rock class
 * (ASCE 7 classes A and B, EN 1998-1 ground type A): the standard's label ("B or stiffer") instead.
 * Without any uncertainty in the input no Monte Carlo runs and no probability is given.
 *
 * @throws RangeError for fewer than 2000 draws or an input with no station
 */
export function assessSite(input: SiteInput, options: SiteOptions = {}): SiteAssessment {
  const seed = options.seed ?? 1;
  const requested = options.draws ?? 4000;
  if (!(requested >= 2000)) throw new RangeError(`the Monte Carlo needs at least 2000 draws; got ${requested}`);
  if (input.stations.length === 0) throw new RangeError('no station has a depth to every refractor; nothing to average');
  const draws = hasUncertainty(input) ? requested : 0;
  const estimated = input.estimatedFromVp || input.estimatedByUser === true;
  const base = input.profileBase;
  const alongLine = input.stations.map((s) => ({ x: s.x, vs30: vs30(profileAt(input.velocities, s.depths, undefined, base)).vs30 }));
  // The central profile: the station whose vs,30 is the median along the line.
  const centralVs30 = median(alongLine.map((a) => a.vs30))!;
  const centralIndex = alongLine.reduce((best, a, i) => (Math.abs(a.vs30 - centralVs30) < Math.abs(alongLine[best].vs30 - centralVs30) ? i : best), 0);
  const central = input.stations[centralIndex];
  const centralProfile = profileAt(input.velocities, central.depths, undefined, base);
  const centralResult = vs30(centralProfile);
  const deepestKnown = base ?? central.depths[central.depths.length - 1] ?? 0;
  const extrapolated = Math.max(0, 30 - deepestKnown);

  const uniform = seededUniform(seed);
  const normal = normalFrom(uniform);
  const samples: number[] = [];
  const layerDraws = input.velocities.map(() => ({ sum: 0, squares: 0 }));
  const counts = STANDARDS.map(() => new Map<string, number>());
  for (let d = 0; d < draws; d++) {
    const station = input.stations[Math.min(input.stations.length - 1, Math.floor(uniform() * input.stations.length))];
    const velocities = input.velocities.map((v, i) => drawVelocity(input, i, uniform, normal));
    velocities.forEach((v, i) => { layerDraws[i].sum += v; layerDraws[i].squares += v * v; });
    const depths: number[] = [];
    station.depths.forEach((depth, k) => {
      const drawn = depth + station.depthSes[k] * normal();
      depths.push(Math.max(k === 0 ? 0 : depths[k - 1], drawn));
    });
    const deepest = velocities[velocities.length - 1];
    const stationBase = base ?? depths[depths.length - 1] ?? 0;
    const spread = EXTRAPOLATION_SPREAD_PER_M * Math.max(0, 30 - stationBase);
    const extension = Math.max(deepest * 0.05, deepest * (1 + spread * normal()));
    const profile = profileAt(velocities, depths, extension, base);
    samples.push(vs30(profile).vs30);
    STANDARDS.forEach((standard, i) => {
      const label = reported(standard, classOf(standard, profile).cls, estimated);
      counts[i].set(label, (counts[i].get(label) ?? 0) + 1);
    });
  }
  samples.sort((a, b) => a - b);

  // A saturated layer the line may hide: the central profile with that refractor (and those below)
  // deeper by Soske's limit, the Vs of the soil above continued through it (below the water table
  // Vs follows the soil skeleton, not the pore water: common practice).
  const hidden = input.hiddenSaturated;
  const hiddenProfile = hidden === undefined ? undefined
    : profileAt(input.velocities, central.depths.map((d, k) => (k >= hidden.refractor - 1 ? d + hidden.depthUnderestimate : d)), undefined, base);
  const hiddenClasses = hiddenProfile === undefined ? undefined
    : STANDARDS.map((standard) => { const c = classOf(standard, hiddenProfile); return { vs: c.vs, cls: reported(standard, c.cls, estimated) }; });

  const classes: StandardClass[] = STANDARDS.map((standard, i) => {
    const { vs, cls: rawClass, velocityClass, byShape } = classOf(standard, centralProfile);
    const cls = reported(standard, rawClass, estimated);
    const probabilities = Object.fromEntries([...counts[i].entries()].sort((a, b) => b[1] - a[1]).map(([c, n]) => [c, n / draws]));
    const probability = draws > 0 ? probabilities[cls] ?? 0 : undefined;
    const others = Object.entries(probabilities).filter(([c]) => c !== cls);
    const borderline = probability !== undefined && probability < BORDERLINE_PROBABILITY;
    const noteTexts: SiText[] = [si`classes by ${standard.table}; ${standard.boundaryRule}. Confirm the table against the edition the jurisdiction has adopted.`];
    const entry: StandardClass = {
      standard: standard.standard,
      table: standard.table,
      class: cls,
      basis: byShape ? 'profile shape' : 'velocity',
      probability,
      probabilities,
      borderline,
      neighbour: borderline && others.length > 0 ? others[0][0] : undefined,
      averageVelocity: vs,
      averagingDepth: standard.averagingDepth,
      notes: [],
      noteTexts,
    };
    if (cls !== rawClass) {
      const reserved = standard.measuredOnly!;
      entry.classByEstimate = rawClass;
      entry.measuredOnlyClause = reserved.clause;
      noteTexts.push(reserved.note?.(vs, cls) ?? si`the estimated v̄s, ${vel(vs)}, lies in the range of class ${reserved.classes.join(' or ')}, which ${reserved.clause} reserve for shear-wave velocities measured on site: reported as "${cls}", needs measured Vs (an S-wave line, a downhole or crosshole test) before class ${reserved.classes.join(' or ')} can be assigned; confirm the requirement in the adopted edition.`);
    }
    if (byShape) {
      // The class by velocity alone, as reported: an estimate never shows a reserved class here either.
      entry.velocityClass = reported(standard, velocityClass, estimated);
      const soil = centralProfile.layers.filter((l) => l.velocity <= 800);
      const thickness = soil.reduce((a, l) => a + l.thickness, 0);
      const average = thickness / soil.reduce((a, l) => a + l.thickness / l.velocity, 0);
      noteTexts.push(si`ground type E by profile shape (Table 3.1): ${len(thickness)} of soil at ${vel(average)} over material faster than ${vel(800)}; vs,30 alone gives type ${entry.velocityClass}. Whether the surface layer is alluvium is for the geologist to judge.`);
    }
    if (estimated && standard.estimatedFactor !== undefined) {
      const f = standard.estimatedFactor;
      const at = (v: number) => reported(standard, classify(standard, v).class, true);
      entry.estimatedRange = { factor: f, low: { velocity: vs / f, class: at(vs / f) }, central: { velocity: vs, class: at(vs) }, high: { velocity: vs * f, class: at(vs * f) } };
      // Section 20.3 with the factor 1.3: SITE-CLASSES.md [memory], very likely, not confirmed.
      noteTexts.push(si`where shear-wave velocities are estimated rather than measured (Section 20.3), the design uses the most critical of the classes from v̄s / ${f}, v̄s and ${f} v̄s: ${entry.estimatedRange.low.class}, ${entry.estimatedRange.central.class}, ${entry.estimatedRange.high.class}. Which is most critical depends on the design spectra, which this report does not judge; confirm the rule and its factor in the adopted edition.`);
    }
    const withHidden = hiddenClasses?.[i];
    if (hidden !== undefined && withHidden !== undefined && withHidden.cls !== cls) {
      noteTexts.push(si`with a saturated layer hidden above refractor ${hidden.refractor} (see the cautions on the site class), v̄s would be ${vel(withHidden.vs)} and the class ${withHidden.cls}: confirm the depth to water and to rock before relying on class ${cls}.`);
    }
    entry.notes = noteTexts.map((t) => t.text);
    return entry;
  });

  const vsProfile = (input.vsLayers ?? input.velocities.map((v, i): VsLayer => ({ index: i + 1, basis: 'measured', vs: v, vsSe: input.velocitySes[i] })))
    .map((l) => {
      const k = l.index - 1;
      if (l.basis === 'not-estimated' || draws === 0 || k >= layerDraws.length) return { ...l };
      const mean = layerDraws[k].sum / draws;
      return { ...l, vsSe: Math.sqrt(Math.max(0, layerDraws[k].squares / draws - mean * mean)) };
    });

  return {
    vs30: centralResult.vs30,
    vs30Low: draws > 0 ? quantile(samples, 0.05) : undefined,
    vs30High: draws > 0 ? quantile(samples, 0.95) : undefined,
    extrapolated,
    deepestKnown,
    estimatedFromVp: input.estimatedFromVp,
    estimated,
    alongLine,
    classes,
    cautions: [
      ...siteCautions(input, extrapolated, deepestKnown, draws > 0),
      ...(hidden !== undefined && hiddenProfile !== undefined && hiddenClasses!.some((c, i) => c.cls !== classes[i].class) ? [hiddenSaturatedCaution(hidden, vs30(hiddenProfile).vs30, hiddenClasses!.map((c, i) => `${STANDARDS[i].standard} ${c.cls}`))] : []),
    ],
    draws,
    seed,
    vsProfile,
  };
}

/** One draw of layer i's shear-wave velocity, in m/s. */
function drawVelocity(input: SiteInput, i: number, uniform: () => number, normal: () => number): number {
  const layer = input.vsLayers?.[i];
  if (layer?.basis === 'poisson' && layer.vp !== undefined && layer.poissonRange !== undefined) {
    const vp = Math.max(layer.vp * 0.05, layer.vp + (layer.vpSe ?? 0) * normal());
    const [lo, hi] = layer.poissonRange;
    return vp / vpVsRatio(lo + (hi - lo) * uniform());
  }
  const v = input.velocities[i];
  return Math.max(v * 0.05, v + input.velocitySes[i] * normal());
}

/**
 * The caution of a line that may hide a saturated layer, raised only where that layer would change
 * a class (a caution on every dry-soil-over-rock line would be read by no one).
 */
function hiddenSaturatedCaution(hidden: HiddenSaturatedLayer, vs30With: number, classes: string[]): Caution {
  return caution('vs-hidden-saturated-layer', si`No layer in the band of saturated soil was found on this line, yet a water table may lie unseen above refractor ${hidden.refractor}: a saturated layer of Vp about ${vel(hidden.vp)} up to ${len(hidden.maxThickness)} thick would never arrive first (a hidden layer, Soske 1959), and the refractor would then be up to ${len(hidden.depthUnderestimate)} deeper than computed. Below the water table Vp follows the pore water, so such a layer is soil, not rock: with the Vs of the layer above it continued through it, Vs30 would be ${vel(vs30With)} and the classes ${classes.join(', ')}. The classes given assume no such layer; confirm the depth to water and to rock with a boring, a standpipe or a shear-wave measurement.`);
}

function caution(code: string, text: SiText): Caution {
  return { code, message: text.text, parts: text.parts };
}

/** The cautions shown beside every site class: those that apply to where the profile came from. */
export function siteCautions(input: SiteInput, extrapolated: number, deepest: number, monteCarlo = true): Caution[] {
  const cautions: Caution[] = [];
  const refraction = input.source !== 'hand-entered';
  for (const standard of STANDARDS) {
    for (const { code, text } of standard.notFromVelocity) cautions.push({ code, message: `${standard.standard}: ${text}` });
  }
  if (refraction) {
    cautions.push({
      code: 'hidden-soft-layer',
      message: 'A soft layer under a stiffer one is invisible to refraction; where one exists, Vs30 here is too high, which is unconservative.',
    });
  }
  if (extrapolated > 0) {
    const spread = monteCarlo ? si` In the probabilities that velocity's standard error is widened by ${EXTRAPOLATION_SPREAD_PER_M * 100} % of it for every ${len(1)} extrapolated.` : si``;
    const what = input.profileBase === undefined ? 'refractor' : 'boundary given';
    const text = si`Below ${len(deepest)} (the deepest ${what}) the deepest velocity is assumed to continue to ${len(30, 0)}: ${len(extrapolated)} of the top ${len(30, 0)} are extrapolated (Boore 2004).`;
    cautions.push(caution('vs30-extrapolated', { text: text.text + spread.text, parts: [...text.parts, ...spread.parts] }));
  }
  if (input.estimatedByUser && !input.estimatedFromVp) {
    cautions.push({
      code: 'vs-estimated-by-user',
      message: 'The shear-wave velocities were entered as estimates, not measurements; the classes are estimated classes.',
    });
  }
  if (input.estimatedFromVp) {
    const layers = input.vsLayers ?? [];
    const ranges = layers.filter((l) => l.basis === 'poisson').map((l) => `layer ${l.index} ${l.poisson!.toFixed(2)} (${l.poissonRange![0].toFixed(2)} to ${l.poissonRange![1].toFixed(2)})`).join(', ');
    cautions.push(caution('vs-estimated-from-vp', si`Shear-wave velocities were ESTIMATED from P-wave velocities with an assumed Poisson's ratio (${ranges || (input.poisson ?? []).map((p) => p.toFixed(2)).join(', ')}; drawn uniformly over that range in the probabilities); they are not measured, and the classes are estimated classes, not measured site classes. Near Vp ${vel(1500)}, ν from 0.45 to 0.49 gives Vs from about ${vel(450)} down to ${vel(210)}.`));
    const wet = layers.filter((l) => l.saturated !== undefined);
    if (wet.length > 0) {
      cautions.push({
        code: 'vs-saturated-layer-given',
        message: `Layer${wet.length > 1 ? 's' : ''} ${wet.map((l) => l.index).join(', ')} ${wet.length > 1 ? 'lie' : 'lies'} in or below the water table, where Vp follows the pore water rather than the soil; ${wet.length > 1 ? 'their' : 'its'} Vs comes from the value given for ${wet.length > 1 ? 'each' : 'it'} (see the Vs profile), on which the classes depend. Confirm it with a shear-wave measurement.`,
      });
    }
  }
  cautions.push({
    code: 'professional-judgement',
    message: 'The site class is for the licensed professional to confirm under the edition of the standard the jurisdiction has adopted; local codes govern.',
  });
  return cautions;
}
