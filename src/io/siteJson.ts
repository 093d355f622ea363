import type { SiteAssessment } from '../site/siteAssessment.js';
import { round } from './numbers.js';

/** The `site` block of the JSON contract (DESIGN.md), in m/s and metres. */
export function siteJson(site: SiteAssessment): Record<string, unknown> {
  const vsAlong = site.alongLine.map((a) => a.vs30);
  return {
    vs30_mps: round(site.vs30, 1),
    vs30_low_mps: round(site.vs30Low, 1),
    vs30_high_mps: round(site.vs30High, 1),
    vs30_interval: '5th to 95th percentile of the Monte Carlo',
    estimated_from_vp: site.estimatedFromVp,
    estimated: site.estimated,
    extrapolated_m: round(site.extrapolated, 2),
    along_line: site.alongLine.map((a) => ({ x_m: round(a.x, 3), vs30_mps: round(a.vs30, 1) })),
    along_line_min_mps: round(Math.min(...vsAlong), 1),
    along_line_max_mps: round(Math.max(...vsAlong), 1),
    classes: site.classes.map((c) => ({
      standard: c.standard,
      table: c.table,
      class: c.class,
      probability: round(c.probability, 3),
      estimated: site.estimated,
      basis: c.basis,
      borderline: c.borderline,
      ...(c.neighbour ? { neighbour: c.neighbour } : {}),
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
    monte_carlo: { draws: site.draws, seed: site.seed },
    cautions: site.cautions,
  };
}
