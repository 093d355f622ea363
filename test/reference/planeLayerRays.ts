/**
 * Head-wave times over plane dipping interfaces under a flat ground surface, by tracing the ray
 * (Telford, Geldart & Sheriff 1990, Applied Geophysics, 2nd ed., §4.3: the head wave travels along
 * the refractor at the speed beneath it and leaves it at the critical angle; Snell's law at every
 * interface above). Written for tests with vectors, line-plane intersections and Snell's law for
 * the component of slowness along each interface; it uses no angle formula of the program and
 * shares no code with it.
 *
 * Coordinates: x along the line, z positive down, the ground at z = 0.
 */
export interface PlaneModel {
  /** Depth of each interface below x = 0, in metres, top down. */
  depthAtZero: number[];
  /** Dip of each interface, in degrees, positive when it deepens towards +x. */
  dipDeg: number[];
  /** Velocity of each layer, top down, in m/s (one more than the interfaces). */
  velocities: number[];
}

type Vec = [number, number];
const dot = (a: Vec, b: Vec) => a[0] * b[0] + a[1] * b[1];
const scale = (a: Vec, k: number): Vec => [a[0] * k, a[1] * k];
const add = (a: Vec, b: Vec): Vec => [a[0] + b[0], a[1] + b[1]];
const rad = (deg: number) => (deg * Math.PI) / 180;

/** Depth of interface k (0-based) at x. */
export function interfaceDepth(model: PlaneModel, k: number, x: number): number {
  return model.depthAtZero[k] + x * Math.tan(rad(model.dipDeg[k]));
}

/** Unit normal of interface k, pointing down. */
function normal(model: PlaneModel, k: number): Vec {
  const d = rad(model.dipDeg[k]);
  return [-Math.sin(d), Math.cos(d)];
}

/**
 * Snell's law at interface k for a unit direction in the layer of velocity `from` into the layer of
 * velocity `to`: the component of slowness along the interface is kept, the normal one follows
 * from |slowness| = 1/velocity, on the same side as before. Undefined past the critical angle.
 */
function refract(direction: Vec, n: Vec, from: number, to: number): Vec | undefined {
  const along = add(direction, scale(n, -dot(direction, n)));
  const alongNew = scale(along, to / from);
  const rest = 1 - dot(alongNew, alongNew);
  if (rest < 0) return undefined;
  return add(alongNew, scale(n, Math.sign(dot(direction, n)) * Math.sqrt(rest)));
}

/** Distance along a ray from `start` in `direction` to interface k (undefined when it points away). */
function reach(model: PlaneModel, k: number, start: Vec, direction: Vec): number | undefined {
  const slope = Math.tan(rad(model.dipDeg[k]));
  // start.z + λ d.z = depth0 + (start.x + λ d.x) slope
  const denominator = direction[1] - direction[0] * slope;
  const lambda = (model.depthAtZero[k] + start[0] * slope - start[1]) / denominator;
  return lambda > 0 && Number.isFinite(lambda) ? lambda : undefined;
}

/**
 * Time of the head wave from interface m (1-based) from a source at (sourceX, 0) to a receiver at
 * (receiverX, 0), by tracing its two rays: down from the source and down (backwards) from the
 * receiver, each to interface m, plus the leg along it at the speed beneath.
 *
 * @returns the time in seconds, or undefined where the head wave does not reach the receiver
 *   (inside the critical distance, a ray past a critical angle, or layers crossing on the path)
 */
export function headWaveTime(model: PlaneModel, m: number, sourceX: number, receiverX: number): number | undefined {
  const v = model.velocities;
  const towards = Math.sign(receiverX - sourceX);
  const n = normal(model, m - 1);
  const tangent: Vec = scale([n[1], -n[0]], towards); // along interface m, towards the receiver
  const critical = Math.asin(v[m - 1] / v[m]);
  if (!(v[m - 1] < v[m])) return undefined;
  // In layer m: down-going ray into interface m, up-going ray out of it, at the critical angle.
  const downs: Vec[] = new Array(m);
  const ups: Vec[] = new Array(m);
  downs[m - 1] = add(scale(tangent, Math.sin(critical)), scale(n, Math.cos(critical)));
  ups[m - 1] = add(scale(tangent, Math.sin(critical)), scale(n, -Math.cos(critical)));
  for (let j = m - 1; j >= 1; j--) {
    const d = refract(downs[j], normal(model, j - 1), v[j], v[j - 1]);
    const u = refract(ups[j], normal(model, j - 1), v[j], v[j - 1]);
    if (d === undefined || u === undefined) return undefined;
    downs[j - 1] = d;
    ups[j - 1] = u;
  }
  const descend = (start: Vec, directions: Vec[]) => {
    let point = start;
    let time = 0;
    for (let j = 0; j < m; j++) {
      const lambda = reach(model, j, point, directions[j]);
      if (lambda === undefined) return undefined;
      point = add(point, scale(directions[j], lambda));
      // The point must lie below every interface above it (no crossing layers on the path).
      for (let i = 0; i < j; i++) if (point[1] < interfaceDepth(model, i, point[0]) - 1e-9) return undefined;
      time += lambda / v[j];
    }
    return { point, time };
  };
  const down = descend([sourceX, 0], downs);
  // The up-going ray followed backwards from the receiver.
  const up = descend([receiverX, 0], ups.map((u) => scale(u, -1)));
  if (down === undefined || up === undefined) return undefined;
  const along = dot(add(up.point, scale(down.point, -1)), tangent);
  if (along < 0) return undefined;
  return down.time + along / v[m] + up.time;
}

/** First-arrival time: the least of the direct wave and every head wave that reaches the receiver. */
export function firstArrivalTime(model: PlaneModel, sourceX: number, receiverX: number): number {
  let best = Math.abs(receiverX - sourceX) / model.velocities[0];
  for (let m = 1; m < model.velocities.length; m++) {
    const t = headWaveTime(model, m, sourceX, receiverX);
    if (t !== undefined && t < best) best = t;
  }
  return best;
}
