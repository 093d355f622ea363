import { checkLayerCautions } from '../core/cautions.js';
import type { BranchFit, Layer, RefractorPoint, Wave } from '../core/types.js';
import { WarningLog } from '../core/warnings.js';
import { si, vel } from '../core/siText.js';
import { hiddenLayerOf, type RefractorMethods } from '../depth/profiles.js';
import { MIN_REVERSED_RECEIVERS } from './jointModel.js';
import { groundAlongLine, type NodeSection } from './nodeSection.js';
import { DEFAULT_SMOOTHING, layeredInversion, type InversionPick, type LayeredInversion, type LayeredInversionOptions } from './layeredInversion.js';

/** The inverted section is kept only when it lowers the RMS misfit over every pick by at least this fraction… */
export const KEEP_MARGIN = 0.05;
/**
 * …and by at least this much, in seconds: about the error of the least-time sampling itself
 * (refractors sampled every half geophone spacing), which exact first breaks show as an RMS of
 * 0.01-0.03 ms that the inversion would otherwise "fit" by moving depths a few centimetres.
 */
export const KEEP_MARGIN_SECONDS = 0.03e-3;

/** Method name of the inverted profile in refractors[].method and by_method. */
export const INVERSION_METHOD = 'inversion';

/** What the layered inversion did, for the summary, qc.inversion and the history. */
export interface InversionSummary {
  kept: boolean;
  /** Why it was kept or not, in a sentence. */
  reason: string;
  /** RMS of pick minus computed time over every pick, in seconds, through the start and the inverted section. */
  rmsBefore?: number;
  rmsAfter?: number;
  iterations: number;
  stopReason?: LayeredInversion['stopReason'];
  picks: number;
  unknowns?: number;
  effectiveUnknowns?: number;
  smoothing: number;
  nodeSpacing: number;
  lateralGradient: boolean;
  /** Layer velocities before and after, in m/s, with the standard errors after. */
  startVelocities: number[];
  /**
   * Layers (1 = top) whose start velocity entered as a prior with its standard error: their head
   * waves are recorded from both directions at fewer than MIN_REVERSED_RECEIVERS receivers.
   */
  priorLayers: number[];
  velocities?: number[];
  velocitySes?: number[];
  /** A time shift common to every pick (trigger delay), in seconds, with its standard error: fitted where the direct-wave lines miss the origin. */
  timeShift?: number;
  timeShiftSe?: number;
  /**
   * The inverted section itself, nodes beyond the geophones included (when kept), without its
   * ground (the ground is straight between receivers and sources): the forward check runs
   * through it. Plain data, so the result can be posted between threads.
   */
  section?: Omit<NodeSection, 'ground'>;
  /** Lateral velocity gradients, in (m/s)/m, and their standard errors (with lateralGradient). */
  gradients?: number[];
  gradientSes?: number[];
}

export interface RefineInput {
  fits: BranchFit[];
  /** Layers down to the deepest refractor with depths; their velocities are replaced when the result is kept. */
  layers: Layer[];
  /** Depth profiles from the delay-time methods; the inverted profile is added and recommended when kept. */
  refractors: RefractorMethods[];
  receivers: { x: number; elev: number }[];
  spacing: number;
  wave: Wave;
  /** Pick noise, in seconds: the weight of the velocity priors (model/pickNoise). */
  pickNoise: number;
}

/**
 * Refines the interpreted section by the layered inversion (model/layeredInversion) started from
 * the recommended depth profiles and the layer velocities, over every pick the line fits used
 * (off-end sources included). The inverted section is kept when it lowers the RMS misfit by at
 * least KEEP_MARGIN: then each refractor's recommended profile becomes the inverted one (method
 * "inversion"; the other methods stay in byMethod) and the layer velocities become the inverted
 * ones (and a layer now in the band of saturated soil gets its water-table caution). Otherwise
 * nothing changes and a warning says why.
 *
 * @returns undefined when switched off (options false) or when there is no refractor with depths
 */
export function refineByInversion(input: RefineInput, options: false | LayeredInversionOptions | undefined, log: WarningLog): InversionSummary | undefined {
  if (options === false) return undefined;
  const { fits, layers, refractors, receivers, spacing } = input;
  if (refractors.length === 0 || layers.length < refractors.length + 1) return undefined;
  const smoothing = options?.smoothing ?? DEFAULT_SMOOTHING;
  const nodeSpacing = options?.nodeSpacing ?? spacing;
  const lateralGradient = options?.lateralGradient ?? false;
  const startVelocities = layers.slice(0, refractors.length + 1).map((l) => l.velocity);
  // A layer seen from one direction only: its plane-layer velocity, with its standard error, is a
  // prior (the picks alone leave the velocity free to trade with the refractor's shape).
  const velocityPriors = options?.velocityPriors ?? layers.slice(0, refractors.length + 1).map((l, m) => (
    m > 0 && reversedReceivers(fits, m + 1) < MIN_REVERSED_RECEIVERS && l.velocitySe > 0 && Number.isFinite(l.velocitySe) ? { velocity: l.velocity, se: l.velocitySe } : undefined));
  const priorLayers = velocityPriors.flatMap((q, m) => (q !== undefined ? [m + 1] : []));
  if (options?.velocityPriors === undefined) {
    for (const m of priorLayers) {
      const layer = layers[m - 1];
      const count = reversedReceivers(fits, m);
      log.add('few-reversed-geophones',
        si`layer ${m}: its head wave is recorded from both directions ${count === 0 ? 'at no geophone' : `at ${count} geophone${count === 1 ? '' : 's'} only`}, so its velocity (${vel(layer.velocity)} ± ${vel(layer.velocitySe)} before the inversion) comes from the plane-layer formulas over its up-dip and down-dip apparent velocities, which assume a plane refractor, and the layered inversion was held near it. Where the refractor is irregular, that velocity and the depths computed with it can be off by more than the standard error shown: lengthen the spread or shoot farther off both ends so that more geophones record it from both sides`,
        { layer: m });
    }
  }
  const base = { kept: false, iterations: 0, smoothing, nodeSpacing, lateralGradient, startVelocities, priorLayers };
  const picks = fittedPicks(fits);
  const empty = refractors.find((r) => r.points.length === 0);
  if (empty !== undefined) {
    const reason = `refractor ${empty.index} has no depths to start from`;
    log.add('inversion-not-kept', `the layered inversion was not run: ${reason}; the depths shown are from the delay-time methods`);
    return { ...base, reason, picks: picks.length };
  }
  const ground = groundAlongLine(receivers, fits.map((f) => ({ x: f.branch.sourceX, elev: f.branch.sourceElev })));
  const receiverXs = receivers.map((r) => r.x);
  let result: LayeredInversion;
  try {
    result = layeredInversion(picks, {
      ground,
      spacing,
      receiverXs,
      velocities: startVelocities,
      refractors: refractors.map((r) => r.points.map((p) => ({ x: p.x, elev: p.elev }))),
    }, { ...options, smoothing, nodeSpacing, lateralGradient, velocityPriors, priorNoise: options?.priorNoise ?? input.pickNoise, timeShift: options?.timeShift ?? layers[0].throughOrigin === false });
  } catch (error) {
    if (!(error instanceof RangeError)) throw error;
    const reason = error.message;
    log.add('inversion-not-kept', `the layered inversion could not run (${reason}); the depths shown are from the delay-time methods`);
    return { ...base, reason, picks: picks.length };
  }
  const before = result.rmsBefore * 1e3;
  const after = result.rmsAfter * 1e3;
  const summary: InversionSummary = {
    ...base,
    reason: '',
    rmsBefore: result.rmsBefore,
    rmsAfter: result.rmsAfter,
    iterations: result.iterations,
    stopReason: result.stopReason,
    picks: result.picks,
    unknowns: result.unknowns,
    effectiveUnknowns: result.effectiveUnknowns,
    velocities: Array.from(result.section.velocities),
    velocitySes: result.velocitySe,
    ...(lateralGradient ? { gradients: Array.from(result.section.gradients), gradientSes: result.gradientSe } : {}),
    ...(result.timeShift !== 0 ? { timeShift: result.timeShift, timeShiftSe: result.timeShiftSe } : {}),
  };
  if (!(result.rmsAfter <= (1 - KEEP_MARGIN) * result.rmsBefore && result.rmsBefore - result.rmsAfter >= KEEP_MARGIN_SECONDS)) {
    summary.reason = `it lowered the RMS misfit over the ${result.picks} picks only from ${before.toFixed(2)} to ${after.toFixed(2)} ms, less than the ${KEEP_MARGIN * 100} % and ${(KEEP_MARGIN_SECONDS * 1e3).toFixed(2)} ms required`;
    log.add('inversion-not-kept', `the layered inversion was not kept: ${summary.reason}; the depths shown are from the delay-time methods, which already explain the picks about as well`);
    return summary;
  }
  summary.kept = true;
  const { nodeXs, elevations, velocities, gradients, xRef } = result.section;
  summary.section = { nodeXs, elevations, velocities, gradients, xRef };
  summary.reason = `it lowered the RMS misfit over the ${result.picks} picks from ${before.toFixed(2)} to ${after.toFixed(2)} ms`;
  refractors.forEach((refractor, k) => {
    const startXs = new Set(refractor.points.map((p) => p.x));
    const points: RefractorPoint[] = result.profiles[k]
      .filter((p) => p.covered || startXs.has(p.x))
      .map((p) => ({ x: p.x, depth: p.depth, elev: p.elev, depthSe: p.depthSe }));
    refractor.byMethod[INVERSION_METHOD] = points;
    refractor.points = points;
    refractor.pointMethods = points.map(() => INVERSION_METHOD);
    refractor.method = INVERSION_METHOD;
    refractor.methodInfo[INVERSION_METHOD] = {
      velocity_mps: round(result.section.velocities[k + 1], 1),
      velocity_se_mps: round(result.velocitySe[k + 1], 1),
      smoothing,
      node_spacing_m: round(nodeSpacing, 3),
    };
  });
  layers.slice(0, refractors.length + 1).forEach((layer, m) => {
    layer.velocity = result.section.velocities[m];
    if (Number.isFinite(result.velocitySe[m])) layer.velocitySe = result.velocitySe[m];
  });
  // Soske's hidden-layer limit again with the inverted velocities.
  for (const refractor of refractors) {
    const limit = hiddenLayerOf(fits, layers, refractor.index);
    if (limit === undefined) delete refractor.hiddenLayer;
    else refractor.hiddenLayer = limit;
  }
  // The layer cautions again with the inverted velocities: a layer now in the band of saturated
  // soil gets its water-table caution (those already given stay).
  const again = new WarningLog();
  checkLayerCautions(layers, input.wave, again);
  for (const w of again.withCode('water-table')) {
    if (!log.items.some((v) => v.code === 'water-table' && v.layer === w.layer)) log.items.push(w);
  }
  return summary;
}

/**
 * Receivers at which the head waves of a layer (2 = under the first refractor) are picked from
 * both directions. With fewer than MIN_REVERSED_RECEIVERS, the layer's velocity trades with the
 * shape of the refractor above it at no cost in misfit: a head wave seen from one side only fixes
 * the sum of a receiver's delay and its offset over the velocity, not each of them (the time-term
 * equations, Willmore & Bancroft 1960; the up-dip and down-dip pair of Telford et al. 1990, §4.3,
 * needs a plane refractor to separate them). Its plane-layer velocity then enters as a prior.
 */
export function reversedReceivers(fits: BranchFit[], layer: number): number {
  const sides = new Map<number, Set<string>>();
  for (const f of fits) {
    const outliers = new Set(f.outlierRows);
    for (const s of f.segments) {
      if (s.layer !== layer) continue;
      for (let i = s.start; i < s.end; i++) {
        const p = f.branch.picks[i];
        if (outliers.has(p.row)) continue;
        if (!sides.has(p.receiverX)) sides.set(p.receiverX, new Set());
        sides.get(p.receiverX)!.add(f.branch.side);
      }
    }
  }
  return [...sides.values()].filter((s) => s.size === 2).length;
}

/** Every pick the line fits used (outliers left out), once each (zero-offset picks join both branches of their source). */
export function fittedPicks(fits: BranchFit[]): InversionPick[] {
  const seen = new Set<string>();
  const picks: InversionPick[] = [];
  for (const f of fits) {
    const outliers = new Set(f.outlierRows);
    for (const p of f.branch.picks) {
      const key = `${p.row}|${p.sourceId}|${p.receiverX}`;
      if (outliers.has(p.row) || seen.has(key)) continue;
      seen.add(key);
      picks.push({ sourceX: p.sourceX, sourceZ: p.sourceElev, receiverX: p.receiverX, receiverZ: p.receiverElev, time: p.time });
    }
  }
  return picks;
}

const round = (v: number, d: number) => Number(v.toFixed(d));
