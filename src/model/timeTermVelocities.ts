import type { Layer } from '../core/types.js';
import type { JointModel } from './jointModel.js';

/** A layer velocity of the time-term model, beside the one reported. */
export interface TimeTermVelocity {
  index: number;
  velocity: number;
  velocitySe: number;
}

/**
 * The velocities of the joint model's shared slownesses, as a cross-check of the reported layers:
 * V = cos δ / u, u the time-term slowness along the horizontal (for a plane refractor dipping at δ
 * it is cos δ / V; solveTimeTerms) and δ the layer's dip (Johnson 1976, from the segments on the
 * joint assignment); standard error σ_u cos δ / u² (delta method).
 *
 * The reported velocities are those of layerVelocities over the segments rebuilt on the joint
 * assignment (plane dipping layers, Johnson 1976), not these: measured on 40 random forward-model
 * lines (test/reference/sweep), the plane-layer velocities over the joint assignment were within
 * 5 % on 32 lines against 31 for these, and they stay exact on plane dipping refractors (to 0.5 %
 * at 15-20° dip, where the time-term slowness departs from cos δ / V once the layers above dip
 * differently; test/fit/layers.test.ts).
 */
export function timeTermVelocities(joint: JointModel, layers: Layer[]): TimeTermVelocity[] {
  const result: TimeTermVelocity[] = [];
  for (let k = 0; k <= joint.refractors; k++) {
    const u = joint.model.slowness[k];
    const dip = layers.find((l) => l.index === k + 1)?.dipDeg;
    const cosine = k > 0 && dip !== undefined && Number.isFinite(dip) ? Math.cos((dip * Math.PI) / 180) : 1;
    result.push({ index: k + 1, velocity: cosine / u, velocitySe: (cosine * joint.model.slownessSe[k]) / (u * u) });
  }
  return result;
}
