import { checkLayerCautions, depthCautions, type Caution } from './core/cautions.js';
import { median } from './core/stats.js';
import type { BranchFit, FirstBreakTable, Interpretation, Layer, Refractor, Wave } from './core/types.js';
import { WarningLog } from './core/warnings.js';
import { interceptTimeDepths } from './depth/interceptTime.js';
import { splitBranches } from './fit/branches.js';
import { branchName, fitBranches, type BranchChoices } from './fit/fitBranches.js';
import { assignLayers, layerVelocities } from './fit/layers.js';
import { siteInputFromInterpretation, type VsFromVpOptions } from './site/fromInterpretation.js';
import { assessSite, type SiteAssessment, type SiteOptions } from './site/siteAssessment.js';

export const VERSION = '0.2.0';

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
}

export interface InterpretationResult extends Interpretation {
  cautions: Caution[];
  /** Vs30 and site classes: for S lines, and for P lines given a Poisson's ratio or Vp/Vs. */
  site?: SiteAssessment;
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
  const branches = splitBranches(table.picks, log, { file: table.file, allowShortBranches: options.allowShortBranches });
  history.push({ step: 'splitBranches', parameters: { branches: branches.length, allowShortBranches: options.allowShortBranches ?? false } });

  const spacing = receiverSpacing(table);
  const readerWarnings = log.items.length;
  let fits = fitBranches(branches, options, table.file, log);
  const capped = loneDeepestBranches(fits, spacing);
  if (capped.length > 0) {
    // Fit again from scratch so that no warning of the discarded fits survives.
    log.items.length = readerWarnings;
    const segments = { ...(options.segments ?? {}) };
    for (const { fit } of capped) segments[branchName(fit.branch)] = fit.segments.length - 1;
    fits = fitBranches(branches, { ...options, segments }, table.file, log);
    for (const { fit, seenBeyond } of capped) {
      log.add('layer-dropped',
        `${branchName(fit.branch)} branch: its last segment (from ${fit.segments[fit.segments.length - 1].firstOffset.toFixed(1)} m offset) would be a layer no other branch sees, although ${seenBeyond} reach${seenBeyond.includes(',') ? '' : 'es'} farther on the same side; fitted with one segment fewer. Fix its segments if the layer is real`,
        { where: { file: table.file, source: fit.branch.sourceId } });
    }
  }
  history.push({
    step: 'segmentedRegression',
    parameters: { criterion: 'BIC', maxSegments: options.maxSegments ?? 4, directThroughOrigin: options.directThroughOrigin ?? false, fixedSegments: options.segments ?? {}, fixedBreakpoints_m: options.breakpoints ?? {}, outlierRule: 'modified z-score > 3.5' },
  });

  const layerCount = assignLayers(fits, spacing, log);
  const layers: Layer[] = layerVelocities(fits, layerCount, log);
  history.push({ step: 'layers', parameters: { layers: layers.length, receiverSpacing_m: spacing, trueVelocity: 'Telford et al. 1990 §4.3 (up/down-dip)' } });
  checkLayerCautions(layers, wave, log);

  const usable = usableLayers(layers);
  const intercept = interceptTimeDepths(fits, usable, log);
  const refractors: Refractor[] = intercept.map((points, i) => ({
    index: i + 1,
    method: 'intercept-time',
    points,
    byMethod: { 'intercept-time': points },
  }));
  history.push({ step: 'depths', parameters: { methods: ['intercept-time'], refractors: refractors.length } });

  const receiverXs = [...new Set(table.picks.map((p) => p.receiverX))].sort((a, b) => a - b);
  const siteInput = siteInputFromInterpretation({ file: table.file, wave, layers, refractors }, receiverXs, options.vsFromVp);
  let site: SiteAssessment | undefined;
  if (siteInput !== undefined && siteInput.stations.length > 0) {
    site = assessSite(siteInput, options.site);
    history.push({ step: 'site', parameters: { draws: site.draws, seed: site.seed, estimatedFromVp: site.estimatedFromVp, poisson: siteInput.poisson ?? null, stations: siteInput.stations.length } });
  } else if (siteInput !== undefined) {
    log.add('site-not-computed', 'no receiver lies where every refractor has a depth, so Vs30 cannot be computed along the line');
  }

  const used = fits.reduce((n, f) => n + f.branch.picks.length - f.outlierRows.length, 0);
  const sumSquares = fits.reduce((a, f) => a + f.residualSd ** 2 * Math.max(1, f.branch.picks.length - f.outlierRows.length - 2 * f.segments.length), 0);
  const dof = fits.reduce((a, f) => a + Math.max(1, f.branch.picks.length - f.outlierRows.length - 2 * f.segments.length), 0);
  return {
    file: table.file,
    wave,
    layers,
    refractors,
    fits,
    warnings: log.items,
    cautions: depthCautions(wave),
    history,
    fitRmsSeconds: Math.sqrt(sumSquares / dof),
    picksUsed: used,
    picksTotal: table.picks.length,
    site,
  };
}

/** Layers down to the first one not faster than the layer above (no depths below an inversion). */
function usableLayers(layers: Layer[]): Layer[] {
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

/**
 * Branches near their source whose deepest segment is a layer seen by no other such branch
 * although others on the same side reach farther: a deeper layer shows on every branch long enough
 * to see it, so a lone one is taken for noise. Branches whose segments the user fixed are left alone.
 */
function loneDeepestBranches(fits: BranchFit[], spacing: number): { fit: BranchFit; seenBeyond: string }[] {
  const near = fits.filter((f) => f.branch.offsets.find((o) => o > 0)! <= 2.01 * spacing);
  if (near.length < 2) return [];
  const deepest = Math.max(...near.map((f) => f.segments.length));
  const members = near.filter((f) => f.segments.length === deepest);
  if (deepest < 2 || members.length !== 1 || members[0].chosenBy === 'user') return [];
  const fit = members[0];
  const last = fit.segments[fit.segments.length - 1];
  const longer = near.filter((f) => f !== fit && f.branch.side === fit.branch.side
    && f.branch.offsets[f.branch.offsets.length - 1] >= last.firstOffset + 2 * spacing);
  if (longer.length === 0) return [];
  return [{ fit, seenBeyond: longer.map((f) => branchName(f.branch)).join(', ') }];
}
