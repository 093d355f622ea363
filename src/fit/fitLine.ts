import { checkLayerCautions } from '../core/cautions.js';
import type { Branch, BranchFit, Wave } from '../core/types.js';
import { WarningLog, type Warning } from '../core/warnings.js';
import { startsAtSource } from './branches.js';
import { branchName, fitBranches, isUserFixed, segmentLimit, type BranchChoices } from './fitBranches.js';
import { assignLayers, layerVelocities } from './layers.js';
import { MIN_VELOCITY_CONTRAST, segmentedRegression } from './segmentedRegression.js';
import { staticsCorrectedFits } from './statics.js';
import { maxOf, minOf, pushAll } from '../core/extent.js';
import { InputError } from '../core/errors.js';
import { len, si } from '../core/siText.js';

/** Warnings that show a fit took bends of the branches for layers (see staticsCorrectedFits). */
const IRREGULAR = new Set(['apparent-velocity-decrease', 'layer-consistency', 'unreversed-layer', 'velocity-inversion', 'layer-merged']);

/**
 * The fits of a line's branches, with the layer-count guards: a lone deepest segment, a layer
 * less than MIN_VELOCITY_CONTRAST faster than the one above (or slower), or a deepest layer seen
 * by one branch alone, each refitted with at most one segment fewer where that fits about as well.
 * When the result still shows inconsistencies, the branches are fitted again after refraction
 * statics (staticsCorrectedFits), and the attempt with fewer inconsistencies is kept.
 *
 * @returns the fits, the warnings they raise, and whether statics were applied
 */
export function fitLine(given: Branch[], options: BranchChoices, file: string, spacing: number, wave: Wave): { fits: BranchFit[]; warnings: Warning[]; statics: boolean } {
  const leftOut = new WarningLog();
  const branches = fittableBranches(given, options, file, leftOut);
  const attempt = (useStatics: boolean) => {
    const attemptLog = new WarningLog();
    const fitWith = (choices: BranchChoices, into: WarningLog = attemptLog) => (useStatics
      ? staticsCorrectedFits(branches, choices, file, spacing, into)
      : fitBranches(branches, choices, file, into));
    const caps: Record<string, number> = {};
    let fits = fitWith(options);
    if (fits === undefined) return undefined;
    const capped = loneDeepestBranches(fits, spacing);
    if (capped.length > 0) {
      // Fit again from scratch so that no warning of the discarded fits survives.
      attemptLog.items.length = 0;
      for (const { fit } of capped) caps[branchName(fit.branch)] = fit.segments.length - 1;
      fits = fitWith({ ...options, segmentCaps: caps })!;
      for (const { fit, seenBeyond } of capped) {
        attemptLog.add('layer-dropped',
          `${branchName(fit.branch)} branch: its last segment (from ${fit.segments[fit.segments.length - 1].firstOffset.toFixed(1)} m offset) would be a layer no other branch sees, although ${seenBeyond} reach${seenBeyond.includes(',') ? '' : 'es'} farther on the same side; fitted with at most one segment fewer. Fix its segments if the layer is real`,
          { where: { file: file, source: fit.branch.sourceId } });
      }
    }
    // A layer less than MIN_VELOCITY_CONTRAST faster than the one above is one layer split in two
    // (a bend of its branches), and one slower than the layer above cannot send back a head wave at
    // all: either way the branches that show it are fitted with one segment fewer.
    for (let round = 0; round < 3; round++) {
      const scratch = new WarningLog();
      const trial = layerVelocities(fits, assignLayers(fits, spacing, scratch), scratch);
      let split = trial.findIndex((l, i) => i > 0 && l.velocity < MIN_VELOCITY_CONTRAST * trial[i - 1].velocity);
      // A deepest layer seen by one branch alone, from one side, although other branches on that
      // side reach as far, is a bend of that branch (off-end branches included).
      const deepest = trial[trial.length - 1];
      const loneFits = deepest ? fits.filter((f) => f.segments.some((sg) => sg.layer === deepest.index)) : [];
      let lone = false;
      if (split < 0 && trial.length > 2 && !deepest.reversed && loneFits.length === 1) {
        const segment = loneFits[0].segments.find((sg) => sg.layer === deepest.index)!;
        lone = fits.some((f) => f !== loneFits[0] && f.branch.side === loneFits[0].branch.side && f.branch.offsets[f.branch.offsets.length - 1] >= segment.firstOffset + 2 * spacing);
        if (lone) split = trial.length - 1;
      }
      if (split < 0) break;
      const layer = trial[split].index;
      const showing = fits.filter((f) => f.chosenBy !== 'user' && f.segments.length > 1 && f.segments.some((sg) => sg.layer === layer));
      if (showing.length === 0) break;
      const trialCaps = { ...caps };
      for (const f of showing) trialCaps[branchName(f.branch)] = f.segments.length - 1;
      const trialLog = new WarningLog();
      const merged = fitWith({ ...options, segmentCaps: trialCaps }, trialLog);
      if (merged === undefined) break;
      // Where one segment fewer fits the branch much worse (residual deviation more than doubled),
      // the bend is in the data, not in the fit: keep the segments, and the warnings they raise.
      const worse = showing.some((f) => merged.find((m) => m.branch === f.branch)!.residualSd > 2 * f.residualSd);
      if (worse) break;
      Object.assign(caps, trialCaps);
      const kept = attemptLog.items.filter((w) => w.code === 'layer-dropped' || w.code === 'layer-merged' || (w.code === 'velocity-inversion' && w.message.includes('one segment fewer')));
      attemptLog.items.length = 0;
      pushAll(attemptLog.items, [...kept, ...trialLog.items]);
      fits = merged;
      const names = showing.map((f) => branchName(f.branch)).join(', ');
      if (lone) {
        attemptLog.add('layer-dropped',
          `layer ${layer} (${Math.round(trial[split].velocity)} m/s) is seen by ${names} alone, from one side, although other branches on that side reach as far: taken for a bend of that branch, fitted with at most one segment fewer`);
      } else if (trial[split].velocity <= trial[split - 1].velocity) {
        attemptLog.add('velocity-inversion',
          `layer ${layer} (${Math.round(trial[split].velocity)} m/s) is not faster than layer ${layer - 1} (${Math.round(trial[split - 1].velocity)} m/s): a layer slower than the one above sends back no head wave, so these segments are bends of the branches (a lateral change, an irregular refractor or mispicks), not a layer; ${names} fitted with at most one segment fewer. Check the picks there`,
          { layer });
      } else {
        attemptLog.add('layer-merged',
          `layer ${layer} (${Math.round(trial[split].velocity)} m/s) is less than ${Math.round((MIN_VELOCITY_CONTRAST - 1) * 100)} % faster than layer ${layer - 1} (${Math.round(trial[split - 1].velocity)} m/s), so it is taken for the same refractor: ${names} fitted with at most one segment fewer`);
      }
    }
    // Judge the attempt by the inconsistencies its layers would raise.
    const judge = new WarningLog();
    const count = assignLayers(fits, spacing, judge);
    checkLayerCautions(layerVelocities(fits, count, judge), wave, judge);
    const flags = [...attemptLog.items, ...judge.items].filter((w) => IRREGULAR.has(w.code)).length;
    return { fits, items: attemptLog.items, flags };
  };
  const plain = attempt(false)!;
  let chosen = plain;
  let statics = false;
  if (plain.flags > 0) {
    const corrected = attempt(true);
    if (corrected !== undefined && corrected.flags < plain.flags) {
      chosen = corrected;
      statics = true;
    }
  }
  if (statics) {
    chosen.items.push({ code: 'statics-applied', message: `the branches bend in ways that straight segments took for extra layers (${plain.flags} inconsistencies); they were segmented again after removing each receiver's delay time (refraction statics), which left ${chosen.flags}. The refractor is probably irregular: prefer the GRM and delay-time depths to the intercept-time ones` });
  }
  return { fits: chosen.fits, warnings: [...leftOut.items, ...chosen.items], statics };
}

/**
 * The branches segmented regression can describe. A branch whose first breaks do not come later
 * as the offset grows has no segments of positive slowness (first arrivals: a head wave's time
 * grows with offset unless its refractor dips towards the source more steeply than the critical
 * angle, Telford et al. 1990, §4.3): it is left out of the fits with a `branch-not-fitted`
 * warning naming it, rather than stopping the line. A branch whose segments the user fixed is
 * fitted as asked (and refused with a message if it cannot be).
 *
 * @throws InputError when no branch of the line can be fitted
 */
function fittableBranches(branches: Branch[], options: BranchChoices, file: string, log: WarningLog): Branch[] {
  const kept = branches.filter((branch) => {
    const name = branchName(branch);
    if (isUserFixed(options, branch)) return true;
    if (segmentedRegression(branch.offsets, branch.times, { firstThroughOrigin: options.directThroughOrigin, maxSegments: segmentLimit(options, name) }) !== undefined) return true;
    const n = branch.offsets.length;
    log.add('branch-not-fitted',
      si`${name} branch (${n} picks, offsets ${len(minOf(branch.offsets), 1)} to ${len(maxOf(branch.offsets), 1)}): its first breaks do not arrive later as the offset grows (${(branch.times[0] * 1e3).toFixed(2)} ms at the nearest geophone, ${(branch.times[n - 1] * 1e3).toFixed(2)} ms at the farthest), so no straight-line segments of positive slowness describe it and it is left out of the interpretation. Times that fall with offset come from a refractor dipping towards this source more steeply than its critical angle, or from a wrong shot time or source position: check the trigger and the position of this record`,
      { where: { file, source: branch.sourceId } });
    return false;
  });
  if (kept.length === 0) throw new InputError({ file }, 'no branch of the line can be fitted: on every branch the first breaks fail to arrive later as the offset grows; check the shot times and positions');
  return kept;
}

/**
 * Branches near their source whose deepest segment is a layer seen by no other such branch
 * although others on the same side reach farther: a deeper layer shows on every branch long enough
 * to see it, so a lone one is taken for noise. Branches whose segments the user fixed are left alone.
 */
function loneDeepestBranches(fits: BranchFit[], spacing: number): { fit: BranchFit; seenBeyond: string }[] {
  const near = fits.filter((f) => startsAtSource(f.branch, spacing));
  if (near.length < 2) return [];
  const deepest = maxOf(near.map((f) => f.segments.length));
  const members = near.filter((f) => f.segments.length === deepest);
  if (deepest < 2 || members.length !== 1 || members[0].chosenBy === 'user') return [];
  const fit = members[0];
  const last = fit.segments[fit.segments.length - 1];
  const longer = near.filter((f) => f !== fit && f.branch.side === fit.branch.side
    && f.branch.offsets[f.branch.offsets.length - 1] >= last.firstOffset + 2 * spacing);
  if (longer.length === 0) return [];
  return [{ fit, seenBeyond: longer.map((f) => branchName(f.branch)).join(', ') }];
}
