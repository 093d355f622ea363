import type { SiteAssessment, VsLayer } from '../site/siteAssessment.js';
import { round } from './numbers.js';
import { minOf, maxOf } from '../core/extent.js';

/** The per-layer shear-wave velocity profile of the site block, in m/s. */
export function vsProfileJson(layers: VsLayer[]): Record<string, unknown>[] {
  return layers.map((l) => ({
    layer: l.index,
    basis: l.basis,
    ...(l.vp !== undefined ? { vp_mps: round(l.vp, 1), vp_se_mps: round(l.vpSe, 1) } : {}),
    ...(l.poisson !== undefined ? { poisson: round(l.poisson, 3), poisson_low: round(l.poissonRange?.[0], 3), poisson_high: round(l.poissonRange?.[1], 3) } : {}),
    ...(l.ownValue !== undefined ? { own_value: l.ownValue } : {}),
    vs_mps: round(l.vs, 1),
    vs_se_mps: round(l.vsSe, 1),
    ...(l.saturated ? { saturated: l.saturated } : {}),
  }));
}

/** The `site` block of a line whose Vs could not be had from Vp for every layer: no class, and why. */
export function siteNotClassifiedJson(layers: VsLayer[], reason: string): Record<string, unknown> {
  return { vs30_mps: null, vs30_low_mps: null, vs30_high_mps: null, estimated_from_vp: true, estimated: true, classes: [], not_classified: reason, vs_profile: vsProfileJson(layers) };
}

/** The `site` block of the JSON contract (DESIGN.md), in m/s and metres. */
export function siteJson(site: SiteAssessment): Record<string, unknown> {
  const vsAlong = site.alongLine.map((a) => a.vs30);
  return {
    vs30_mps: round(site.vs30, 1),
    vs30_low_mps: round(site.vs30Low, 1),
    vs30_high_mps: round(site.vs30High, 1),
    vs30_interval: site.draws > 0 ? '5th to 95th percentile of the Monte Carlo' : 'none: no uncertainty was given, no Monte Carlo ran',
    estimated_from_vp: site.estimatedFromVp,
    estimated: site.estimated,
    extrapolated_m: round(site.extrapolated, 2),
    deepest_known_m: round(site.deepestKnown, 2),
    vs_profile: vsProfileJson(site.vsProfile),
    along_line: site.alongLine.map((a) => ({ x_m: round(a.x, 3), vs30_mps: round(a.vs30, 1) })),
    along_line_min_mps: round(minOf(vsAlong), 1),
    along_line_max_mps: round(maxOf(vsAlong), 1),
    classes: site.classes.map((c) => ({
      standard: c.standard,
      table: c.table,
      class: c.class,
      probability: round(c.probability, 3),
      estimated: site.estimated,
      basis: c.basis,
      borderline: c.borderline,
      ...(c.neighbour ? { neighbour: c.neighbour } : {}),
      ...(c.classByEstimate ? { class_by_estimate: c.classByEstimate, needs_measured_vs: c.measuredOnlyClause } : {}),
      probabilities: Object.fromEntries(Object.entries(c.probabilities).map(([k, v]) => [k, round(v, 3)])),
      average_velocity_mps: round(c.averageVelocity, 1),
      averaging_depth_m: c.averagingDepth,
      ...(c.velocityClass ? { class_by_velocity: c.velocityClass } : {}),
      ...(c.estimatedRange ? {
        estimated_range: {
          factor: c.estimatedRange.factor,
          low: { velocity_mps: round(c.estimatedRange.low.velocity, 1), class: c.estimatedRange.low.class },
          central: { velocity_mps: round(c.estimatedRange.central.velocity, 1), class: c.estimatedRange.central.class },
          high: { velocity_mps: round(c.estimatedRange.high.velocity, 1), class: c.estimatedRange.high.class },
        },
      } : {}),
      notes: c.notes,
    })),
    monte_carlo: site.draws > 0 ? { draws: site.draws, seed: site.seed, poisson: 'uniform over each layer\'s stated range', extrapolated_velocity_se: '1 % of the velocity per metre extrapolated, in quadrature' } : null,
    cautions: site.cautions.map((c) => ({ code: c.code, message: c.message })),
  };
}
