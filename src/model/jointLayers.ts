import type { Layer } from '../core/types.js';
import type { JointModel } from './jointModel.js';

/**
 * The layers of the joint model: velocity V = 1 / u and its standard error from its shared
 * slownesses, with the apparent velocities, dip and coverage of the segments rebuilt on its
 * assignment (layerVelocities over the joint fits). For a plane refractor dipping at δ the
 * time-term slowness is cos δ / V in theory (solveTimeTerms); dividing by cos δ was tried and, on a
 * forward-model line dipping 6° (test/depth/profiles.forward.test.ts), moved V from 2498 to
 * 2485 m/s for a true 2500 m/s, so it is not applied (under 1 % below 8° either way). The standard
 * error is σ_u / u² by the delta method, but never less than the segments' own standard error of the layer
 * velocity: the covariance of the joint model knows only the pick noise, not how far the time-term
 * model (a locally flat refractor under each geophone) departs from the section, while the scatter
 * of the branches' apparent velocities shows it: the floor is the standard error of the segments
 * rebuilt on the joint assignment and, where the per-branch segments gave as many layers, theirs. (On a refractor dipping 6° the covariance alone
 * gave depth standard errors that covered the truth at 71 % of the geophones, against 80 % or more
 * with the floor; test/depth/profiles.forward.test.ts.)
 */
export function jointLayers(joint: JointModel, segmentLayers: Layer[], firstGuess: Layer[] = []): Layer[] {
  const layers: Layer[] = [];
  const sameCount = firstGuess.length === joint.refractors + 1;
  for (let k = 0; k <= joint.refractors; k++) {
    const u = joint.model.slowness[k];
    const uSe = joint.model.slownessSe[k];
    const fromSegments = segmentLayers.find((l) => l.index === k + 1);
    const cosine = 1;
    const counts = { segmentCount: fromSegments?.segmentCount ?? 0, reversed: fromSegments?.reversed ?? false };
    layers.push({
      ...(fromSegments ?? { index: k + 1, ...counts }),
      index: k + 1,
      velocity: cosine / u,
      velocitySe: Math.max((cosine * uSe) / (u * u), finiteOr0(fromSegments?.velocitySe), sameCount ? finiteOr0(firstGuess[k]?.velocitySe) : 0),
      ...(k === 0 ? { throughOrigin: true } : {}),
    });
  }
  return layers;
}

const finiteOr0 = (value: number | undefined) => (value !== undefined && Number.isFinite(value) ? value : 0);
