import { checkHiddenLayers, checkLayerCautions, checkShearTopLayer, depthCautions, type Caution } from './core/cautions.js';
import { len, si, vel, type SiText } from './core/siText.js';
import { median } from './core/stats.js';
import { seDecimals } from './core/units.js';
import type { BranchFit, FirstBreakTable, Interpretation, Layer, Wave } from './core/types.js';
import { WarningLog } from './core/warnings.js';
import { interceptTimeDepths } from './depth/interceptTime.js';
import { DISAGREE_FRACTION, DISAGREE_METRES, refractorProfiles, type RefractorMethods } from './depth/profiles.js';
import { reciprocalChecks, reciprocalTolerance, type ReciprocalCheck } from './depth/reciprocal.js';
import { splitBranches } from './fit/branches.js';
import type { BranchChoices } from './fit/fitBranches.js';
import { fitLine } from './fit/fitLine.js';
import { velocityAnalysisCheck, type VelocityAnalysisCheck } from './depth/grm.js';
import { checkedPicks, forwardCheck, isForwardMisfit, type ForwardCheck } from './forward/forwardCheck.js';
import { PATTERN_Z, residualPattern } from './forward/residualPattern.js';
import type { LayeredInversionOptions } from './model/layeredInversion.js';
import { KEEP_MARGIN, KEEP_MARGIN_SECONDS, refineByInversion, type InversionSummary } from './model/refineByInversion.js';
import { assignLayers, layerVelocities } from './fit/layers.js';
import { COUNT_CRITERION, jointModel, type JointModel } from './model/jointModel.js';
import { pickNoise as estimatePickNoise, type PickNoise } from './model/pickNoise.js';
import { planSite, type VsFromVpOptions } from './site/fromInterpretation.js';
import type { PLineCheck } from './site/pLineCheck.js';
import { assessSite, type SiteAssessment, type SiteOptions, type VsLayer } from './site/siteAssessment.js';
import { pushAll } from './core/extent.js';

export const VERSION = '0.5.1';

/** Options of one interpretation. */
export interface InterpretOptions extends BranchChoices {
  /** Wave type when the table does not say; default P. */
  wave?: Wave;
  /** Leave out sides of a source with fewer than three picks instead of stopping. */
  allowShortBranches?: boolean;
  /** For a P line: the Poisson's ratio or Vp/Vs from which to estimate Vs for a site class. */
  vsFromVp?: VsFromVpOptions;
  /** Monte Carlo settings of the site assessment. */
  site?: SiteOptions;
  /** The shot-record files the picks come from, when they were picked from records. */
  records?: string[];
  /**
   * Fit one model to all shots (time terms, pick reassignment, layer count on the joint model);
   * default true. Off, or where the user fixed segments or breakpoints, the layers come from the
   * per-branch segments.
   */
  jointModel?: boolean;
  /**
   * The layered inversion that refines the depth profiles and layer velocities against every pick
   * (model/layeredInversion): its options (smoothing, node spacing, lateral velocity gradient), or
   * false to switch it off. Default on, with the defaults of LayeredInversionOptions.
   */
  inversion?: false | LayeredInversionOptions;
  /**
   * Most refractors the joint model may choose. interpret sets it itself when its check through
   * the layered inversion finds the deepest refractor not needed (see deepestNeeded).
   */
  maxRefractors?: number;
}

export interface InterpretationResult extends Interpretation {
  refractors: RefractorMethods[];
  cautions: Caution[];
  /** Reciprocal-time check of every pair of sources whose branches reach each other. */
  reciprocal: ReciprocalCheck[];
  /** Picks against first arrivals computed through the interpreted section, when there is one. */
  forward?: ForwardCheck;
  /** Vs30 and site classes: for S lines, and for P lines given a Poisson's ratio or Vp/Vs. */
  site?: SiteAssessment;
  /** An S line checked against the P line over the same ground (interpret --p-line), layer by layer at the same depths. */
  pLineCheck?: PLineCheck;
  /** A P line given a Poisson's ratio whose Vs could not be had for every layer: the Vs profile and why no class. */
  siteNotClassified?: { vsLayers: VsLayer[]; reason: SiText };
  /** The shot-record files the picks come from (options.records). */
  records?: string[];
  /** The joint model of all shots, when it was fitted. */
  joint?: JointModel;
  /** Pick noise from the picks themselves (second differences, reciprocal times). */
  pickNoise: PickNoise;
  /** What the layered inversion did (undefined when switched off or when there is no refractor). */
  inversion?: InversionSummary;
  /** Each refractor's layer velocity against Palmer's velocity analysis over its reversed pair (refractors with a GRM profile). */
  velocityAnalysis?: VelocityAnalysisCheck[];
}

/**
 * The pipeline after picking: branches, segmented regression, layers, depths, cautions.
 * The command line and the web app both call this and hold no interpretation logic of their own.
 *
 * @param table - first breaks, in SI units (see readFirstBreaks)
 * @param options - segment choices and wave type
 * @param log - collects warnings; the reader's warnings, if passed the same log, are kept with them
 * @throws InputError for input the interpretation cannot use (too few picks, impossible choices)
 */
export function interpret(table: FirstBreakTable, options: InterpretOptions = {}, log: WarningLog = new WarningLog()): InterpretationResult {
  const wave: Wave = options.wave ?? table.wave ?? 'P';
  const history: Interpretation['history'] = [];
  const logStart = log.items.length;
  const branches = splitBranches(table.picks, log, { file: table.file, allowShortBranches: options.allowShortBranches });
  history.push({ step: 'split_branches', parameters: { branches: branches.length, allow_short_branches: options.allowShortBranches ?? false } });

  const spacing = receiverSpacing(table);
  const { fits: segmentFits, warnings: fitWarnings, statics } = fitLine(branches, options, table.file, spacing, wave);
  pushAll(log.items, fitWarnings);
  history.push({
    step: 'segmented_regression',
    parameters: { statics, criterion: 'BIC', max_segments: options.maxSegments ?? 4, direct_through_origin: options.directThroughOrigin ?? false, fixed_segments: options.segments ?? {}, fixed_breakpoints_m: Object.fromEntries(Object.entries(options.breakpoints ?? {}).map(([k, v]) => [k, v.map((x) => Number(x.toFixed(3)))])), outlier_rule: 'modified z-score > 5' },
  });

  const layerCount = assignLayers(segmentFits, spacing, log);
  const userFixed = Object.keys(options.segments ?? {}).length > 0 || Object.keys(options.breakpoints ?? {}).length > 0;
  const joint = options.jointModel === false || userFixed ? undefined : jointModel(segmentFits, spacing, { maxRefractors: options.maxRefractors });
  const fits = joint?.fits ?? segmentFits;
  let layers: Layer[];
  if (joint !== undefined) {
    // Velocities by the plane-layer formulas over the joint assignment (see timeTermVelocities for why).
    layers = layerVelocities(fits, joint.refractors + 1, log);
    for (const p of joint.possible) {
      log.add('possible-refractor',
        si`a refractor of about ${vel(p.velocity)} ± ${vel(p.velocitySe, seDecimals(p.velocitySe, 0))} below layer ${p.index} is suggested by ${p.picks} picks of source${p.sources.length > 1 ? 's' : ''} ${p.sources.join(', ')}, but the evidence is too thin for depths (${p.failed.join('; ')}): it is reported as possible, without depths, and its picks are left out of the layers above. Shoot farther off both ends, or lengthen the spread, to confirm it`,
        { layer: p.index + 1 });
    }
    history.push({
      step: 'joint_model',
      parameters: {
        method: 'time terms, all shots together (Scheidegger & Willmore 1957; Willmore & Bancroft 1960), LSQR (Paige & Saunders 1982)',
        refractors: joint.refractors, iterations: joint.iterations, converged: joint.converged, reassigned_picks: joint.reassigned,
        count_criterion: COUNT_CRITERION,
        possible_refractors: joint.possible.length,
      },
    });
  } else {
    layers = layerVelocities(fits, layerCount, log);
  }
  history.push({ step: 'layers', parameters: { layers: layers.length, receiver_spacing_m: Number(spacing.toFixed(3)), true_velocity: joint ? 'Johnson 1976 plane dipping layers (up/down-dip) over the joint assignment' : 'Johnson 1976 plane dipping layers (up/down-dip)' } });
  checkLayerCautions(layers, wave, log);
  checkShearTopLayer(layers, wave, log);

  const usable = usableLayers(layers);
  const intercept = interceptTimeDepths(fits, usable, log);
  const receivers = receiverGround(table);
  checkGeometry(table, receivers, spacing, fits, log);
  const pickNoise = lineFitRms(segmentFits);
  const reciprocal = reciprocalChecks(fits, pickNoise, log);
  const refractors: RefractorMethods[] = refractorProfiles({ fits, layers: usable, interceptPoints: intercept, receivers, spacing, pickNoise }, log);
  const noise = estimatePickNoise(fits, spacing, reciprocal.map((c) => c.timeAB - c.timeBA), pickNoise, pickConfidences(table));
  // The layered inversion: kept (and recommended) only when it explains the picks better.
  const inversion = refineByInversion({ fits, layers: usable, refractors, receivers, spacing, wave, pickNoise: noise.sigma }, options.inversion, log);
  if (inversion !== undefined) {
    history.push({ step: 'inversion', parameters: { method: 'Levenberg-Marquardt (Levenberg 1944; Marquardt 1963)', kept: inversion.kept, smoothing: inversion.smoothing, node_spacing_m: inversion.nodeSpacing, lateral_gradient: inversion.lateralGradient, iterations: inversion.iterations, keep_margin: `RMS lower by ${KEEP_MARGIN * 100} % and ${(KEEP_MARGIN_SECONDS * 1e3).toFixed(2)} ms`, time_shift: inversion.timeShift !== undefined } });
  }
  // The deepest refractor against the best model without it, both through the layered inversion.
  if (joint?.alternative !== undefined && inversion?.kept) {
    const check = deepestNeeded(joint.alternative, joint.refractors, inversion, { receivers, spacing, wave, pickNoise, sigma: noise.sigma }, options.inversion);
    if (check !== undefined && !check.needed) {
      log.items.length = logStart;
      const rerun = interpret(table, { ...options, maxRefractors: joint.refractors - 1 }, log);
      const upper = usable[joint.refractors - 1]?.velocity ?? NaN;
      const lower = usable[joint.refractors]?.velocity ?? NaN;
      log.add('refractor-not-needed',
        si`the picks were also fitted with one refractor more (layer ${joint.refractors} of ${vel(upper)} over layer ${joint.refractors + 1} of ${vel(lower)}); through the layered inversion that section explains them no better, for the unknowns it adds, than the one reported (RMS ${(check.with.rms * 1e3).toFixed(2)} ms with it against ${(check.without.rms * 1e3).toFixed(2)} ms without, pick noise ${(noise.sigma * 1e3).toFixed(2)} ms, judged by an information criterion that charges each added unknown, Hannan & Quinn 1979), so the extra refractor is left out. Relief on a refractor, such as a channel or a step, can bend the travel times like a deeper layer: confirm the layering with a boring or a longer spread before relying on it`,
        { layer: joint.refractors + 1 });
      rerun.history.splice(rerun.history.findIndex((h) => h.step === 'inversion') + 1, 0, checkStep(joint.refractors, check));
      return rerun;
    }
    if (check !== undefined) history.push(checkStep(joint.refractors, check));
  }
  // The final layer velocities against the GRM velocity analysis of each refractor.
  const velocityAnalysis = velocityAnalysisCheck(refractors, usable, log);
  // A time shift the kept inversion fitted belongs to its section.
  const timeShift = inversion?.kept ? inversion.timeShift ?? 0 : 0;
  const forward = forwardCheck({ fits, layers: usable, refractors, receivers, spacing, timeShift, section: inversion?.kept ? inversion.section : undefined });
  if (forward !== undefined && isForwardMisfit(forward.rms, noise.sigma)) {
    log.add('forward-misfit', si`first arrivals computed through the interpreted section differ from the picks by ${(forward.rms * 1e3).toFixed(2)} ms RMS, against a pick noise of ${(noise.sigma * 1e3).toFixed(2)} ms (from the ${noise.source} of the picks), worst ${(forward.worst.difference * 1e3).toFixed(1)} ms for source ${forward.worst.sourceId} at x = ${len(forward.worst.receiverX, 2)}: the section does not explain the picks well; look for a missed layer, a wrong segment choice or a lateral change`);
  }
  // A pattern in the residuals that their RMS does not show (runs of one sign along the geophones).
  const pattern = forward === undefined ? undefined : residualPattern(forward.residuals);
  if (forward !== undefined && pattern !== undefined && pattern.z > PATTERN_Z && !log.items.some((w) => w.code === 'forward-misfit')) {
    log.add('residual-pattern', si`the differences between the picks and the arrivals computed through the section run in stretches of one sign along the geophones (lag-1 autocorrelation ${pattern.r1.toFixed(2)} over ${pattern.n} picks, ${pattern.z.toFixed(1)} standard deviations from what independent pick errors give; Box & Pierce 1970), although their RMS (${(forward.rms * 1e3).toFixed(2)} ms) is near the pick noise (${(noise.sigma * 1e3).toFixed(2)} ms): the section leaves something in the picks unexplained, such as a thin layer missed near a crossover, relief on a refractor sharper than the section follows, or a change of velocity along the line. Compare the computed arrivals with the picks on the time-distance plot before relying on the depths and velocities`);
  }
  checkHiddenLayers(refractors, log);
  history.push({ step: 'depths', parameters: { methods: ['intercept-time', 'plus-minus', 'GRM', 'delay-time'], recommended: refractors.map((r) => r.method), reciprocal_tolerance_ms: Number((reciprocalTolerance(pickNoise) * 1e3).toFixed(3)), disagreement: `max(${DISAGREE_METRES} m, ${DISAGREE_FRACTION * 100} %)` } });

  const receiverXs = [...new Set(table.picks.map((p) => p.receiverX))].sort((a, b) => a - b);
  const plan = planSite({ file: table.file, wave, layers, refractors }, receiverXs, options.vsFromVp);
  const siteInput = plan.input;
  let site: SiteAssessment | undefined;
  let siteNotClassified: InterpretationResult['siteNotClassified'];
  if (siteInput !== undefined && siteInput.stations.length > 0) {
    site = assessSite(siteInput, options.site);
    history.push({ step: 'site', parameters: { draws: site.draws, seed: site.seed, estimated_from_vp: site.estimatedFromVp, poisson: siteInput.poisson?.map((p) => Number(p.toFixed(3))) ?? null, stations: siteInput.stations.length } });
  } else if (siteInput !== undefined) {
    log.add('site-not-computed', 'no receiver lies where every refractor has a depth, so Vs30 cannot be computed along the line');
  } else if (plan.refused !== undefined && plan.vsLayers !== undefined) {
    siteNotClassified = { vsLayers: plan.vsLayers, reason: plan.refused };
    log.add('vs-from-vp-saturated', plan.refused);
  }

  // Each pick once: a zero-offset pick joins every branch of its source.
  const used = checkedPicks(fits).length;
  return {
    file: table.file,
    wave,
    layers,
    refractors,
    fits,
    warnings: log.items,
    cautions: depthCautions(wave, layers),
    history,
    fitRmsSeconds: pickNoise,
    reciprocal,
    forward,
    picksUsed: used,
    picksTotal: table.picks.length,
    site,
    ...(siteNotClassified ? { siteNotClassified } : {}),
    ...(options.records ? { records: options.records } : {}),
    joint,
    pickNoise: noise,
    inversion,
    velocityAnalysis,
  };
}

/** The early stop of the section without the deepest refractor: a step lowering its objective by under SETTLE_STOP while its misfit is over SETTLE_GAP times the chosen section's score (see LayeredInversionOptions.settle). */
export const SETTLE_GAP = 4;
export const SETTLE_STOP = 0.03;

/** The criterion of the deepest-refractor check, as the history and the warning name it. */
export const COUNT_CHECK = 'rss/σ² + 2 p ln ln n over the inverted sections, p their effective unknowns (Hannan & Quinn 1979)';

/**
 * Whether the deepest refractor is needed: the best joint model with one refractor fewer
 * (`alternative`, its deepest two merged) goes through the same depth methods and layered
 * inversion, and each inverted section is scored by rss / σ² + 2 p ln ln n over every pick, σ the
 * pick noise measured from the picks and p the effective number of unknowns the picks resolve
 * (trace of the resolution matrix), the criterion the joint model counts its refractors by
 * (Hannan & Quinn 1979), here on sections that bend their refractors where the time terms could
 * not: the least-time paths of a refractor with a channel or a step carry its delay past the
 * geophones above it, which per-geophone time terms read as a deeper layer (sweep seed 119,
 * test/reference/sweep). The refractor is needed unless the section without it scores as well or
 * better. The section without it is stopped early once it stays SETTLE_GAP times worse (see
 * LayeredInversionOptions.settle; `settled` says so). Undefined when the section without it
 * cannot be had (no depths, inversion not run).
 */
function deepestNeeded(
  alternative: BranchFit[], count: number, chosen: InversionSummary,
  context: { receivers: { x: number; elev: number }[]; spacing: number; wave: Wave; pickNoise: number; sigma: number },
  options: InterpretOptions['inversion'],
): { needed: boolean; with: { rms: number; value: number }; without: { rms: number; value: number }; settled: boolean } | undefined {
  const scratch = new WarningLog();
  const layers = usableLayers(layerVelocities(alternative, count, scratch));
  if (layers.length < count) return undefined;
  const intercept = interceptTimeDepths(alternative, layers, scratch);
  const refractors = refractorProfiles({ fits: alternative, layers, interceptPoints: intercept, receivers: context.receivers, spacing: context.spacing, pickNoise: context.pickNoise }, scratch);
  // Stopped early where it stays far worse than the chosen section (SETTLE_GAP times its score).
  const withIt = sectionScore(chosen, context.sigma);
  const settle = withIt === undefined ? undefined : { misfitAbove: SETTLE_GAP * withIt.value * context.sigma * context.sigma, relativeStop: SETTLE_STOP };
  const fewer = refineByInversion({ fits: alternative, layers, refractors, receivers: context.receivers, spacing: context.spacing, wave: context.wave, pickNoise: context.sigma }, { ...(options || {}), ...(settle ? { settle } : {}) }, scratch);
  const without = sectionScore(fewer, context.sigma);
  if (withIt === undefined || without === undefined || withIt.n !== without.n) return undefined;
  return { needed: without.value > withIt.value, with: withIt, without, settled: fewer?.stopReason === 'settled far from the section compared' };
}

/** The score of one inverted section in deepestNeeded (its better RMS where it was not kept). */
function sectionScore(s: InversionSummary | undefined, sigma: number): { rms: number; value: number; n: number } | undefined {
  if (s === undefined || s.rmsAfter === undefined || s.rmsBefore === undefined || s.effectiveUnknowns === undefined) return undefined;
  const rms = s.kept ? s.rmsAfter : Math.min(s.rmsBefore, s.rmsAfter);
  const n = s.picks;
  return { rms, value: (n * rms * rms) / (sigma * sigma) + 2 * Math.log(Math.log(n)) * s.effectiveUnknowns, n };
}

/** The history step of the deepest-refractor check. */
function checkStep(refractor: number, check: NonNullable<ReturnType<typeof deepestNeeded>>): Interpretation['history'][number] {
  return { step: 'refractor_check', parameters: { refractor, needed: check.needed, rms_with_ms: Number((check.with.rms * 1e3).toFixed(3)), rms_without_ms: Number((check.without.rms * 1e3).toFixed(3)), ...(check.settled ? { without_stopped_early: true } : {}), criterion: COUNT_CHECK } };
}

/** Confidence of each pick where the table has a `confidence` column (0-1), as `pick` writes it. */
function pickConfidences(table: FirstBreakTable): number[] {
  if (!table.extraColumns.includes('confidence')) return [];
  return table.extraValues.map((v) => Number(v.confidence)).filter((c) => Number.isFinite(c));
}

/** Layers down to the first one not faster than the layer above (no depths below an inversion). */
export function usableLayers(layers: Layer[]): Layer[] {
  // Without the top layer's velocity no depth can be computed (see the no-direct-wave warning).
  if (layers.length === 0 || layers[0].index !== 1) return [];
  const usable: Layer[] = [];
  for (const layer of layers) {
    if (usable.length > 0 && layer.velocity <= usable[usable.length - 1].velocity) break;
    usable.push(layer);
  }
  return usable;
}

/** Median spacing of distinct receiver positions, in metres. */
export function receiverSpacing(table: FirstBreakTable): number {
  const xs = [...new Set(table.picks.map((p) => p.receiverX))].sort((a, b) => a - b);
  const gaps = xs.slice(1).map((x, i) => x - xs[i]);
  return median(gaps) ?? 1;
}

/** Residual standard deviation of all line fits together, in seconds: the pick noise. */
export function lineFitRms(fits: BranchFit[]): number {
  let sumSquares = 0;
  let dof = 0;
  for (const f of fits) {
    const free = Math.max(1, f.branch.picks.length - f.outlierRows.length - 2 * f.segments.length);
    sumSquares += f.residualSd ** 2 * free;
    dof += free;
  }
  return Math.sqrt(sumSquares / dof);
}

/** Each receiver position with its ground elevation, sorted along the line. */
export function receiverGround(table: FirstBreakTable): { x: number; elev: number }[] {
  const byX = new Map<number, number>();
  for (const p of table.picks) byX.set(p.receiverX, p.receiverElev);
  return [...byX.entries()].sort((a, b) => a[0] - b[0]).map(([x, elev]) => ({ x, elev }));
}

/** Warnings about the layout: gaps in the geophones, and sources inside the spread seen on one side only. */
function checkGeometry(table: FirstBreakTable, receivers: { x: number }[], spacing: number, fits: BranchFit[], log: WarningLog): void {
  for (let i = 1; i < receivers.length; i++) {
    const gap = receivers[i].x - receivers[i - 1].x;
    if (gap > 1.5 * spacing) {
      log.add('receiver-gap', si`no geophone between x = ${len([receivers[i - 1].x, receivers[i].x], 2, ' and ')} (a gap of ${len(gap, 2)}, ${(gap / spacing).toFixed(1)} spacings): no depth is computed inside the gap, and the methods that pair neighbouring geophones lose coverage beside it`, { where: { file: table.file } });
    }
  }
  const first = receivers[0].x;
  const last = receivers[receivers.length - 1].x;
  const sides = new Map<string, Set<string>>();
  for (const f of fits) {
    if (!sides.has(f.branch.sourceId)) sides.set(f.branch.sourceId, new Set());
    sides.get(f.branch.sourceId)!.add(f.branch.side);
  }
  for (const [id, set] of sides) {
    const x = fits.find((f) => f.branch.sourceId === id)!.branch.sourceX;
    if (set.size === 1 && x > first + spacing && x < last - spacing) {
      const side = [...set][0];
      log.add('one-sided-source', si`source ${id} at x = ${len(x, 2)} lies inside the spread but has picks on its ${side === 'forward' ? '+x' : '-x'} side only; if the other side was recorded, its picks are missing`, { where: { file: table.file, source: id } });
    }
  }
}
