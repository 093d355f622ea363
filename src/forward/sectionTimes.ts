import { linearAt } from '../core/interpolate.js';

/** An interpreted section: ground and refractor elevations along the line, and layer velocities. */
export interface Section {
  /** Ground elevation at x, in metres. */
  ground: (x: number) => number;
  /** Refractor elevations, top down, each as points (x ascending, elevation), held flat beyond its ends. */
  refractors: { x: number; elev: number }[][];
  /** Layer velocities, top down, in m/s (one more than the refractors). */
  velocities: number[];
}

/** A section sampled for travel-time computation (made once, used for every source). */
export interface SampledSection {
  section: Section;
  xs: Float64Array;
  levels: Float64Array[];
  /** Sideways reach of the last leg through the top layer, in samples. */
  topReach: number;
}

/**
 * Samples the refractors of a section every `step` metres over `span` (refractors held flat
 * beyond their ends and kept below the ground and the refractor above).
 */
export function sampleSection(section: Section, span: [number, number], step: number): SampledSection {
  const count = Math.max(2, Math.round((span[1] - span[0]) / step) + 1);
  const xs = Float64Array.from({ length: count }, (_, i) => span[0] + (i * (span[1] - span[0])) / (count - 1));
  const ground = Float64Array.from(xs, (x) => section.ground(x));
  const levels: Float64Array[] = [];
  section.refractors.forEach((points, k) => {
    const px = points.map((p) => p.x);
    const pe = points.map((p) => p.elev);
    const above = k === 0 ? ground : levels[k - 1];
    levels.push(Float64Array.from(xs, (x, i) => Math.min(linearAt(px, pe, x), above[i] - 0.01)));
  });
  let topThickness = 0;
  if (levels.length > 0) for (let i = 0; i < count; i++) topThickness = Math.max(topThickness, ground[i] - levels[0][i]);
  return { section, xs, levels, topReach: Math.ceil((3 * topThickness) / (xs[1] - xs[0])) + 1 };
}

/**
 * First-arrival times from a surface source to surface receivers through a layered section, by
 * Fermat's principle over the sampled refractors: straight legs inside each layer, travel along a
 * refractor at the speed beneath it (head waves), the least total time by dynamic programming over
 * the samples. Used to check an interpretation against its own picks.
 *
 * @returns times in seconds, one per receiver
 */
export function sectionTimes(sampled: SampledSection, sourceX: number, receiverXs: number[]): number[] {
  const { section, xs, levels, topReach } = sampled;
  const count = xs.length;
  const sz = section.ground(sourceX);
  const v = section.velocities;
  const times = receiverXs.map((rx) => Math.hypot(rx - sourceX, section.ground(rx) - sz) / v[0]);
  let arriving: Float64Array = Float64Array.from(xs, (x, i) => (levels.length > 0 ? Math.hypot(x - sourceX, levels[0][i] - sz) / v[0] : Infinity));
  const receiverZ = receiverXs.map((rx) => section.ground(rx));
  for (let k = 0; k < levels.length; k++) {
    const head = relax(arriving, xs, levels[k], v[k + 1]);
    let rising: Float64Array = head;
    for (let j = k; j >= 1; j--) rising = cross(rising, xs, levels[j], levels[j - 1], v[j]);
    receiverXs.forEach((rx, r) => {
      // The last leg climbs the top layer: within three of its thicknesses sideways (see cross).
      const centre = Math.round((rx - xs[0]) / (xs[1] - xs[0]));
      for (let i = Math.max(0, centre - topReach); i < Math.min(count, centre + topReach + 1); i++) {
        const dx = xs[i] - rx;
        const dz = levels[0][i] - receiverZ[r];
        const t = rising[i] + Math.sqrt(dx * dx + dz * dz) / v[0];
        if (t < times[r]) times[r] = t;
      }
    });
    if (k + 1 < levels.length) arriving = cross(head, xs, levels[k], levels[k + 1], v[k + 1]);
  }
  return times;
}

// Math.sqrt of the sum of squares rather than Math.hypot in the loops: several times faster in V8.

/** Least times along an interface polyline at `speed`, swept both ways. */
function relax(start: Float64Array, xs: Float64Array, zs: Float64Array, speed: number): Float64Array {
  const t = Float64Array.from(start);
  for (let i = 1; i < t.length; i++) t[i] = Math.min(t[i], t[i - 1] + Math.hypot(xs[i] - xs[i - 1], zs[i] - zs[i - 1]) / speed);
  for (let i = t.length - 2; i >= 0; i--) t[i] = Math.min(t[i], t[i + 1] + Math.hypot(xs[i] - xs[i + 1], zs[i] - zs[i + 1]) / speed);
  return t;
}

/**
 * Least times at the samples of level `to` by one straight leg at `speed` from a sample of level
 * `from`. Legs are searched within three layer thicknesses sideways: a flatter leg through a layer
 * is never faster than a head wave along its floor or the route above it.
 */
function cross(times: Float64Array, xs: Float64Array, from: Float64Array, to: Float64Array, speed: number): Float64Array {
  const out = new Float64Array(xs.length);
  let thickest = 0;
  for (let i = 0; i < xs.length; i++) thickest = Math.max(thickest, Math.abs(from[i] - to[i]));
  const step = xs.length > 1 ? xs[1] - xs[0] : 1;
  const reach = Math.ceil((3 * thickest) / step) + 1;
  const slowness = 1 / speed;
  for (let j = 0; j < xs.length; j++) {
    let best = Infinity;
    for (let i = Math.max(0, j - reach); i < Math.min(xs.length, j + reach + 1); i++) {
      const dx = xs[i] - xs[j];
      const dz = from[i] - to[j];
      const t = times[i] + Math.sqrt(dx * dx + dz * dz) * slowness;
      if (t < best) best = t;
    }
    out[j] = best;
  }
  return out;
}
