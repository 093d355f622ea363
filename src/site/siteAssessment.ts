import type { Caution } from '../core/cautions.js';
import { median } from '../core/stats.js';
import { normalFrom, quantile, seededUniform } from './random.js';
import { ASCE_7_16, ASCE_7_22, classify, EN_1998_1_2004, groundTypeE, type SiteClassStandard } from './standards/index.js';
import { vs30, type ShearProfile } from './vs30.js';

/** The standards classed, in the order they are reported. */
export const STANDARDS: SiteClassStandard[] = [ASCE_7_16, ASCE_7_22, EN_1998_1_2004];

/** Probability below which a class is called borderline. */
export const BORDERLINE_PROBABILITY = 0.9;

/** A station along the line: the depth to each refractor there, with its standard error. */
export interface SiteStation {
  /** Position along the line, in metres. */
  x: number;
  /** Depth to refractor k (k = 0 is the top of layer 2), in metres, increasing. */
  depths: number[];
  depthSes: number[];
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
  /** Class of the central profile. */
  class: string;
  /** What decided it: the averaged velocity, or (EN 1998-1 type E) the profile shape. */
  basis: 'velocity' | 'profile shape';
  /** Probability of that class under the Monte Carlo. */
  probability: number;
  /** Probability of every class that occurred. */
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
  notes: string[];
}

export interface SiteAssessment {
  /** vs,30 (30 m, EN 1998-1 Eq. 3.1) of the central profile, in m/s. */
  vs30: number;
  /** 5th and 95th percentiles of the Monte Carlo, in m/s. */
  vs30Low: number;
  vs30High: number;
  /** Metres of the top 30 m below the deepest known boundary of the central profile. */
  extrapolated: number;
  estimatedFromVp: boolean;
  /** True when the velocities are estimates (from Vp, or as the user said). */
  estimated: boolean;
  /** vs,30 at every station, in m/s. */
  alongLine: { x: number; vs30: number }[];
  classes: StandardClass[];
  cautions: Caution[];
  draws: number;
  seed: number;
}

function profileAt(velocities: number[], depths: number[]): ShearProfile {
  const layers = depths.map((depth, k) => ({ thickness: depth - (k === 0 ? 0 : depths[k - 1]), velocity: velocities[k] }));
  return { layers, halfspace: velocities[depths.length] };
}

function classOf(standard: SiteClassStandard, profile: ShearProfile): { vs: number; cls: string; velocityClass: string; byShape: boolean } {
  const vs = vs30(profile, standard.averagingDepth).vs30;
  const velocityClass = classify(standard, vs).class;
  if (standard === EN_1998_1_2004) {
    const shape = groundTypeE([...profile.layers, { thickness: Infinity, velocity: profile.halfspace ?? profile.layers[profile.layers.length - 1].velocity }]);
    if (shape !== undefined) return { vs, cls: 'E', velocityClass, byShape: true };
  }
  return { vs, cls: velocityClass, velocityClass, byShape: false };
}

/**
 * Vs30 and the site classes of ASCE 7-16 (Table 20.3-1), ASCE 7-22 (Table 20.2-1) and
 * EN 1998-1:2004 (Table 3.1, with ground type E judged from the profile shape), with a seeded
 * Monte Carlo over the layer velocities and refractor depths (normal, from their standard errors,
 * truncated to positive velocities and increasing depths) and over the along-line variation (a
 * station drawn at random for each draw). A class whose probability is under 90 % is borderline,
 * with its most likely neighbour named.
 *
 * @throws RangeError for fewer than 2000 draws or an input with no station
 */
export function assessSite(input: SiteInput, options: SiteOptions = {}): SiteAssessment {
  const draws = options.draws ?? 4000;
  const seed = options.seed ?? 1;
  if (!(draws >= 2000)) throw new RangeError(`the Monte Carlo needs at least 2000 draws; got ${draws}`);
  if (input.stations.length === 0) throw new RangeError('no station has a depth to every refractor; nothing to average');
  const alongLine = input.stations.map((s) => ({ x: s.x, vs30: vs30(profileAt(input.velocities, s.depths)).vs30 }));
  // The central profile: the station whose vs,30 is the median along the line.
  const centralVs30 = median(alongLine.map((a) => a.vs30))!;
  const centralIndex = alongLine.reduce((best, a, i) => (Math.abs(a.vs30 - centralVs30) < Math.abs(alongLine[best].vs30 - centralVs30) ? i : best), 0);
  const central = input.stations[centralIndex];
  const centralProfile = profileAt(input.velocities, central.depths);
  const centralResult = vs30(centralProfile);
  const deepestKnown = input.profileBase ?? central.depths[central.depths.length - 1] ?? 0;
  const extrapolated = Math.max(0, 30 - deepestKnown);
  const estimated = input.estimatedFromVp || input.estimatedByUser === true;

  const uniform = seededUniform(seed);
  const normal = normalFrom(uniform);
  const samples: number[] = [];
  const counts = STANDARDS.map(() => new Map<string, number>());
  for (let d = 0; d < draws; d++) {
    const station = input.stations[Math.min(input.stations.length - 1, Math.floor(uniform() * input.stations.length))];
    const velocities = input.velocities.map((v, i) => Math.max(v * 0.05, v + input.velocitySes[i] * normal()));
    const depths: number[] = [];
    station.depths.forEach((depth, k) => {
      const drawn = depth + station.depthSes[k] * normal();
      depths.push(Math.max(k === 0 ? 0 : depths[k - 1], drawn));
    });
    const profile = profileAt(velocities, depths);
    samples.push(vs30(profile).vs30);
    STANDARDS.forEach((standard, i) => {
      const { cls } = classOf(standard, profile);
      counts[i].set(cls, (counts[i].get(cls) ?? 0) + 1);
    });
  }
  samples.sort((a, b) => a - b);

  const classes: StandardClass[] = STANDARDS.map((standard, i) => {
    const { vs, cls, velocityClass, byShape } = classOf(standard, centralProfile);
    const probabilities = Object.fromEntries([...counts[i].entries()].sort((a, b) => b[1] - a[1]).map(([c, n]) => [c, n / draws]));
    const probability = probabilities[cls] ?? 0;
    const others = Object.entries(probabilities).filter(([c]) => c !== cls);
    const entry: StandardClass = {
      standard: standard.standard,
      table: standard.table,
      class: cls,
      basis: byShape ? 'profile shape' : 'velocity',
      probability,
      probabilities,
      borderline: probability < BORDERLINE_PROBABILITY,
      neighbour: probability < BORDERLINE_PROBABILITY && others.length > 0 ? others[0][0] : undefined,
      averageVelocity: vs,
      averagingDepth: standard.averagingDepth,
      notes: [`Bounds: ${standard.provenance}. On a bound: ${standard.boundaryRule}.`],
    };
    if (byShape) {
      entry.velocityClass = velocityClass;
      entry.notes.push(`Ground type E by profile shape: ${shapeText(centralProfile)} over material faster than 800 m/s; vs,30 alone gives type ${velocityClass}. Whether the surface layer is alluvium is the user's geological judgement.`);
    }
    if (estimated && standard.estimatedFactor !== undefined) {
      const f = standard.estimatedFactor;
      entry.estimatedRange = {
        factor: f,
        low: { velocity: vs / f, class: classify(standard, vs / f).class },
        central: { velocity: vs, class: classify(standard, vs).class },
        high: { velocity: vs * f, class: classify(standard, vs * f).class },
      };
      entry.notes.push(`Estimated velocities: the design uses the most critical of the classes from v̄s / ${f}, v̄s and ${f} v̄s (${entry.estimatedRange.low.class}, ${entry.estimatedRange.central.class}, ${entry.estimatedRange.high.class}); which is most critical depends on the design spectra, which this program does not judge. The factor ${f} and its section are recalled, not confirmed: check them in the adopted edition.`);
    }
    return entry;
  });

  return {
    vs30: centralResult.vs30,
    vs30Low: quantile(samples, 0.05),
    vs30High: quantile(samples, 0.95),
    extrapolated,
    estimatedFromVp: input.estimatedFromVp,
    estimated,
    alongLine,
    classes,
    cautions: siteCautions(input, extrapolated, deepestKnown),
    draws,
    seed,
  };
}

function shapeText(profile: ShearProfile): string {
  const soil = profile.layers.filter((l) => l.velocity <= 800);
  const thickness = soil.reduce((a, l) => a + l.thickness, 0);
  return `${thickness.toFixed(1)} m of soil at ${Math.round(thickness / soil.reduce((a, l) => a + l.thickness / l.velocity, 0))} m/s`;
}

/** The cautions shown beside every site class. */
export function siteCautions(input: SiteInput, extrapolated: number, deepest: number): Caution[] {
  const cautions: Caution[] = [];
  for (const standard of STANDARDS) {
    for (const text of standard.notFromVelocity) cautions.push({ code: 'not-from-velocity', message: `${standard.standard}: ${text}` });
  }
  cautions.push({
    code: 'hidden-soft-layer',
    message: 'A soft layer under a stiffer one is invisible to refraction; where one exists, Vs30 here is too high, which is unconservative.',
  });
  if (extrapolated > 0) {
    cautions.push({
      code: 'vs30-extrapolated',
      message: `Below ${deepest.toFixed(1)} m (the deepest ${input.profileBase === undefined ? 'refractor' : 'boundary given'}) the deepest velocity is assumed to continue to 30 m: ${extrapolated.toFixed(1)} m of the 30 m are extrapolated (Boore 2004).`,
    });
  }
  if (input.estimatedByUser && !input.estimatedFromVp) {
    cautions.push({
      code: 'vs-estimated',
      message: 'The shear-wave velocities were entered as estimates, not measurements; the classes are estimated classes.',
    });
  }
  if (input.estimatedFromVp) {
    cautions.push({
      code: 'vs-estimated',
      message: `Shear-wave velocities were ESTIMATED from P-wave velocities with an assumed Poisson's ratio (${(input.poisson ?? []).map((p) => p.toFixed(2)).join(', ')}); they are not measured, and the classes are estimated classes, not measured site classes. Near Vp 1500 m/s, ν from 0.45 to 0.49 gives Vs from about 450 down to 210 m/s.`,
    });
    cautions.push({
      code: 'water-table-ambiguity',
      message: 'Below the water table Vp rises towards the speed of sound in water (about 1480 to 1500 m/s) while Vs does not change, so Vs from Vp is least reliable there; an S-wave line or a downhole test measures it.',
    });
  }
  cautions.push({
    code: 'professional-judgement',
    message: 'The site class is for the licensed professional to confirm under the edition of the standard the jurisdiction has adopted; local codes govern.',
  });
  return cautions;
}

