/** One layer of a shear-wave velocity profile. */
export interface VelocityLayer {
  /** Thickness, in metres. */
  thickness: number;
  /** Shear-wave velocity, in m/s. */
  velocity: number;
}

/** A shear-wave velocity profile from the surface down. */
export interface ShearProfile {
  layers: VelocityLayer[];
  /**
   * Velocity below the last layer, in m/s (the deepest refractor's layer); when absent, the last
   * layer's velocity is extended.
   */
  halfspace?: number;
}

export interface Vs30Result {
  /** Time-averaged shear-wave velocity over the top 30 m, in m/s. */
  vs30: number;
  /** Metres of the top 30 m below the deepest measured boundary, where the deepest velocity was extended. */
  extrapolated: number;
}

/** Averaging depth of vs,30 in EN 1998-1:2004 Eq. 3.1: 30 m. */
export const VS30_DEPTH_M = 30;
/** Averaging depth of v̄s in ASCE 7 Section 20.4.1: the top 100 ft, 30.48 m. */
export const ASCE_DEPTH_M = 30.48;

/**
 * Time-averaged shear-wave velocity of the top `depth` metres: v̄s = Σ dᵢ / Σ (dᵢ / vᵢ), a
 * travel-time (harmonic) average (ASCE 7-16 Section 20.4.1, Eq. 20.4-1; EN 1998-1:2004
 * Section 3.1.2, Eq. 3.1). Below the deepest boundary the deepest velocity is extended to the
 * averaging depth (Boore 2004, BSSA 94, 591-597), and the metres so extrapolated are reported.
 * EN 1998-1 averages over 30 m, ASCE 7 over 100 ft (30.48 m): each standard passes its own depth.
 *
 * @param profile - layers in metres and m/s, all velocities > 0
 * @param depth - averaging depth, in metres (default 30)
 * @throws RangeError for a non-positive thickness or velocity
 * @example
 * vs30({ layers: [{ thickness: 5, velocity: 150 }, { thickness: 10, velocity: 250 }, { thickness: 15, velocity: 500 }] }).vs30 // 290.32
 */
export function vs30(profile: ShearProfile, depth = VS30_DEPTH_M): Vs30Result {
  let travelTime = 0;
  let top = 0;
  for (const layer of profile.layers) {
    if (!(layer.thickness >= 0) || !(layer.velocity > 0)) {
      throw new RangeError(`a layer needs a thickness of 0 m or more and a velocity above 0 m/s; got ${layer.thickness} m at ${layer.velocity} m/s`);
    }
    const used = Math.min(layer.thickness, depth - top);
    if (used <= 0) break;
    travelTime += used / layer.velocity;
    top += used;
  }
  const deepest = profile.halfspace ?? profile.layers[profile.layers.length - 1]?.velocity;
  if (deepest === undefined || !(deepest > 0)) throw new RangeError('a profile needs at least one layer or a half-space velocity above 0 m/s');
  const extrapolated = Math.max(0, depth - top);
  travelTime += extrapolated / deepest;
  return { vs30: depth / travelTime, extrapolated };
}
