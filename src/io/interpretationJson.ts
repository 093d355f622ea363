import type { BranchFit, RefractorPoint } from '../core/types.js';
import { round } from './numbers.js';
import type { InterpretationResult } from '../interpret.js';
import { VERSION } from '../interpret.js';
import { siteJson, siteNotClassifiedJson } from './siteJson.js';
import { COUNT_CRITERION, type JointModel } from '../model/jointModel.js';
import { timeTermVelocities } from '../model/timeTermVelocities.js';
import type { InversionSummary } from '../model/refineByInversion.js';
import type { ForwardCheck } from '../forward/forwardCheck.js';
import type { VelocityAnalysisCheck } from '../depth/grm.js';

/** Version tag of the JSON document; change it when a stable field changes meaning. */
export const INTERPRETATION_SCHEMA = 'hammerline/interpretation@1';

function point(p: RefractorPoint, method?: string) {
  return { x_m: round(p.x, 3), depth_m: round(p.depth, 3), elev_m: round(p.elev, 3), depth_se_m: round(p.depthSe, 3), ...(p.sourceId ? { source_id: p.sourceId } : {}), ...(method ? { method } : {}) };
}

function branch(fit: BranchFit) {
  return {
    source_id: fit.branch.sourceId,
    side: fit.branch.side,
    source_x_m: round(fit.branch.sourceX, 3),
    picks: fit.branch.picks.length,
    segments: fit.segments.map((s) => ({
      layer: s.layer,
      first_offset_m: round(s.firstOffset, 3),
      last_offset_m: round(s.lastOffset, 3),
      apparent_velocity_mps: round(s.apparentVelocity, 1),
      apparent_velocity_se_mps: round(s.slownessSe / s.slowness ** 2, 1),
      intercept_ms: round(s.intercept * 1e3, 3),
      intercept_se_ms: round(s.interceptSe * 1e3, 3),
      crossover_offset_m: round(s.crossoverOffset, 3),
      picks_used: s.used,
      through_origin: s.throughOrigin,
    })),
    outlier_rows: fit.outlierRows,
    residual_sd_ms: round(fit.residualSd * 1e3, 3),
    segments_chosen_by: fit.chosenBy === 'user' ? 'user' : 'BIC',
    bic_by_segment_count: fit.criterionBySegments.map((b) => round(b, 2)),
  };
}

/** Addition to each refractor: Palmer's velocity analysis against the layer velocity. */
function velocityAnalysisJson(check: VelocityAnalysisCheck | undefined) {
  if (check === undefined) return {};
  return {
    velocity_analysis: {
      method: 'GRM velocity analysis (Palmer 1980)',
      velocity_mps: round(check.velocity, 1),
      velocity_se_mps: round(check.se, 1),
      xy_m: round(check.xy, 3),
      stations: check.stations,
      source_forward: check.sourceForward,
      source_reverse: check.sourceReverse,
      layer_velocity_mps: round(check.layerVelocity, 1),
      layer_velocity_se_mps: round(check.layerSe, 1),
      difference_percent: round(check.difference * 100, 2) || 0,
      agrees: check.agrees,
    },
  };
}

/** Seconds as milliseconds to three decimals, a rounded −0 written as 0 (it reads back as 0). */
const ms3 = (seconds: number) => { const v = round(seconds * 1e3, 3); return v === 0 ? 0 : v; };

/** Additions to qc of the forward check: picks checked, the time shift carried, and every source's misfit (those off the ends included). */
function forwardJson(forward: ForwardCheck) {
  return {
    forward_picks: forward.picks,
    forward_time_shift_ms: ms3(forward.timeShift),
    forward_sources: forward.sources.map((s) => ({
      source_id: s.sourceId,
      source_x_m: round(s.sourceX, 3),
      off_end: s.offEnd,
      picks: s.picks,
      rms_ms: ms3(s.rms),
      mean_ms: ms3(s.mean),
      ...(s.offEnd ? { beyond_spread_delays: s.corrections.map((c) => ({ layer: c.layer, delay_ms: ms3(c.correction), picks: c.picks })) } : {}),
    })),
  };
}

/** The joint model of all shots: how the layer count was chosen, its iterations and possible refractors. */
function modelJson(joint: JointModel, layers: InterpretationResult['layers']) {
  return {
    method: 'time terms (Scheidegger & Willmore 1957; Willmore & Bancroft 1960)',
    refractors: joint.refractors,
    iterations: joint.iterations,
    converged: joint.converged,
    reassigned_picks: joint.reassigned,
    residual_sd_ms: round(joint.model.sigma * 1e3, 3),
    time_term_velocities: timeTermVelocities(joint, layers).map((v) => ({ index: v.index, velocity_mps: round(v.velocity, 1), velocity_se_mps: round(v.velocitySe, 1) })),
    refractor_count_criterion: {
      name: COUNT_CRITERION,
      values: joint.candidates.map((c) => ({ refractors: c.refractors, value: round(c.value, 2) ?? null, parameters: c.parameters, rss_ms2: round(c.rss * 1e6, 4), ...(c.rejected ? { rejected: c.rejected } : {}) })),
    },
    possible_refractors: joint.possible.map((p) => ({
      below_layer: p.index, velocity_mps: round(p.velocity, 1), velocity_se_mps: round(p.velocitySe, 1), picks: p.picks, sources: p.sources,
      reversed: p.reversed, delta_criterion: round(p.deltaBic, 2), failed: p.failed,
    })),
  };
}

/** qc.inversion: what the layered inversion did (README documents each field). */
function inversionJson(inv: InversionSummary) {
  const ms = (s: number | undefined) => (s === undefined ? null : round(s * 1e3, 3));
  return {
    kept: inv.kept,
    reason: inv.reason,
    rms_before_ms: ms(inv.rmsBefore),
    rms_after_ms: ms(inv.rmsAfter),
    iterations: inv.iterations,
    stopped: inv.stopReason ?? null,
    picks: inv.picks,
    unknowns: inv.unknowns ?? null,
    effective_unknowns: inv.effectiveUnknowns === undefined ? null : round(inv.effectiveUnknowns, 1),
    smoothing: inv.smoothing,
    node_spacing_m: round(inv.nodeSpacing, 3),
    lateral_gradient: inv.lateralGradient,
    start_velocities_mps: inv.startVelocities.map((v) => round(v, 1)),
    velocities_mps: inv.velocities?.map((v) => round(v, 1)) ?? null,
    velocity_ses_mps: inv.velocitySes?.map((v) => round(v, 1)) ?? null,
    prior_layers: inv.priorLayers,
    ...(inv.timeShift !== undefined ? { time_shift_ms: round(inv.timeShift * 1e3, 3), time_shift_se_ms: round((inv.timeShiftSe ?? NaN) * 1e3, 3) } : {}),
    ...(inv.gradients ? { gradients_mps_per_m: inv.gradients.map((v) => round(v, 4)), gradient_ses_mps_per_m: inv.gradientSes?.map((v) => round(v, 4)) } : {}),
  };
}

/**
 * The JSON document of one interpretation (DESIGN.md contract, schema hammerline/interpretation@1).
 * Always SI: lengths in metres, velocities in m/s, times in milliseconds where a field says _ms.
 */
export function interpretationJson(result: InterpretationResult, extra: Record<string, unknown> = {}): Record<string, unknown> {
  return {
    schema: INTERPRETATION_SCHEMA,
    program: { name: 'hammerline', version: VERSION },
    file: result.file,
    wave: result.wave,
    units: { length: 'm', velocity: 'm/s', time: 'ms', dip: 'degrees, positive when the refractor deepens towards +x' },
    layers: result.layers.map((l) => ({
      index: l.index,
      velocity_mps: round(l.velocity, 1),
      velocity_se_mps: round(l.velocitySe, 1),
      dip_deg: round(l.dipDeg, 2),
      dip_se_deg: round(l.dipSeDeg, 2),
      reversed: l.reversed,
      forward_apparent_mps: round(l.forwardApparent, 1),
      reverse_apparent_mps: round(l.reverseApparent, 1),
      segments: l.segmentCount,
    })),
    refractors: result.refractors.map((r) => ({
      index: r.index,
      velocity_mps: round(result.layers[r.index]?.velocity, 1),
      method: r.method,
      points: r.points.map((p, i) => point(p, r.pointMethods[i])),
      by_method: Object.fromEntries(Object.entries(r.byMethod).map(([m, pts]) => [m, pts.map((p) => point(p))])),
      method_info: r.methodInfo,
      ...velocityAnalysisJson(result.velocityAnalysis?.find((c) => c.refractor === r.index)),
      ...(r.hiddenLayer ? {
        hidden_layer: {
          assumed_velocity_mps: round(r.hiddenLayer.hiddenVelocity, 1),
          max_thickness_m: round(r.hiddenLayer.maxThickness, 2),
          depth_underestimate_m: round(r.hiddenLayer.depthUnderestimate, 2),
          source: 'Soske 1959',
        },
      } : {}),
    })),
    ...(result.joint ? { model: modelJson(result.joint, result.layers) } : {}),
    branches: result.fits.map(branch),
    ...(result.pLineCheck ? {
      p_line_check: {
        file: result.pLineCheck.file,
        layers: result.pLineCheck.layers.map((c) => ({
          layer: c.layer, top_m: round(c.top, 2), bottom_m: round(c.bottom, 2), vs_mps: round(c.vs, 1), p_layer: c.pLayer, vp_mps: round(c.vp, 1),
          slowest_vp_mps: round(c.slowestVp, 1), vp_vs: round(c.ratio, 3), range: [round(c.range[0], 3), round(c.range[1], 3)], range_basis: c.basis, plausible: c.plausible,
        })),
      },
    } : {}),
    ...(result.site ? { site: siteJson(result.site) } : result.siteNotClassified ? { site: siteNotClassifiedJson(result.siteNotClassified.vsLayers, result.siteNotClassified.reason.text) } : {}),
    qc: {
      fit_rms_ms: round(result.fitRmsSeconds * 1e3, 3),
      picks_used: result.picksUsed,
      picks_total: result.picksTotal,
      forward_rms_ms: result.forward ? round(result.forward.rms * 1e3, 3) : null,
      pick_noise_ms: round(result.pickNoise.sigma * 1e3, 3),
      pick_noise_source: result.pickNoise.source,
      pick_noise_estimates: {
        ...(result.pickNoise.secondDifferences ? { second_differences: { sigma_ms: round(result.pickNoise.secondDifferences.sigma * 1e3, 3), triples: result.pickNoise.secondDifferences.count } } : {}),
        ...(result.pickNoise.reciprocal ? { reciprocal_times: { sigma_ms: round(result.pickNoise.reciprocal.sigma * 1e3, 3), pairs: result.pickNoise.reciprocal.count } } : {}),
        ...(result.pickNoise.confidence ? { confidence: { median: round(result.pickNoise.confidence.median, 3), picks: result.pickNoise.confidence.count } } : {}),
      },
      ...(result.forward ? { forward_worst: { difference_ms: round(result.forward.worst.difference * 1e3, 3), source_id: result.forward.worst.sourceId, receiver_x_m: result.forward.worst.receiverX } } : {}),
      ...(result.forward ? forwardJson(result.forward) : {}),
      ...(result.inversion ? { inversion: inversionJson(result.inversion) } : {}),
      reciprocal: result.reciprocal.map((c) => ({
        source_a: c.sourceA, source_b: c.sourceB,
        time_ab_ms: round(c.timeAB * 1e3, 3), time_ba_ms: round(c.timeBA * 1e3, 3),
        difference_ms: round(c.difference * 1e3, 3), tolerance_ms: round(c.tolerance * 1e3, 3), ok: c.ok,
      })),
    },
    ...extra,
    warnings: result.warnings.map((w) => ({ code: w.code, message: w.message, ...(w.layer ? { layer: w.layer } : {}) })),
    cautions: result.cautions,
    history: result.history,
  };
}
