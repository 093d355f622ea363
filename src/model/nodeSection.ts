/**
 * A layered section described by refractor elevations at nodes along the line (linear between
 * nodes, held at the end values beyond them) and a velocity per layer, optionally varying linearly
 * along the line: v(x) = velocity + gradient · (x − xRef). This is the model the layered
 * inversion adjusts. Lengths in metres, elevations up, velocities in m/s, gradients in (m/s)/m.
 */
export interface NodeSection {
  /** Ground elevation at x, in metres (fixed: not adjusted). */
  ground: (x: number) => number;
  /** Node positions along the line, ascending, in metres (shared by every refractor). */
  nodeXs: Float64Array;
  /** Elevation of each refractor (top down) at each node, in metres. */
  elevations: Float64Array[];
  /** Velocity of each layer (top down) at xRef, in m/s: one more than the refractors. */
  velocities: Float64Array;
  /** Lateral velocity gradient of each layer, in (m/s)/m (zeros for laterally uniform layers). */
  gradients: Float64Array;
  /** Position the velocities refer to, in metres. */
  xRef: number;
}

/**
 * Ground elevation along a line from its receivers and sources: linear between them, the end
 * values held beyond. A receiver's elevation wins over a source's at the same x. Found by
 * bisection, since the section asks for it at every sample of every trial section.
 *
 * @param receivers - receiver positions and ground elevations, in metres
 * @param sources - source positions and elevations, in metres
 */
export function groundAlongLine(receivers: { x: number; elev: number }[], sources: { x: number; elev: number }[]): (x: number) => number {
  const byX = new Map<number, number>();
  for (const s of sources) byX.set(s.x, s.elev);
  for (const r of receivers) byX.set(r.x, r.elev);
  const sorted = [...byX.entries()].sort((a, b) => a[0] - b[0]);
  const xs = sorted.map(([x]) => x);
  const elevations = sorted.map(([, e]) => e);
  const last = xs.length - 1;
  return (x) => {
    if (x <= xs[0]) return elevations[0];
    if (x >= xs[last]) return elevations[last];
    let low = 0;
    let high = last;
    while (high - low > 1) {
      const mid = (low + high) >> 1;
      if (xs[mid] <= x) low = mid;
      else high = mid;
    }
    const t = (x - xs[low]) / (xs[high] - xs[low]);
    return elevations[low] * (1 - t) + elevations[high] * t;
  };
}

/** Thinnest a layer may become at a sample, in metres (refractors never touch or cross). */
export const MIN_SAMPLE_THICKNESS = 0.05;

/** A node section sampled every `step` metres for least-time computation. */
export interface SampledNodeSection {
  section: NodeSection;
  xs: Float64Array;
  step: number;
  groundZ: Float64Array;
  /** Elevation of each refractor at each sample, in metres. */
  levels: Float64Array[];
  /**
   * Which refractor's nodes each sample of each refractor follows: itself, a shallower one it was
   * pushed below (MIN_SAMPLE_THICKNESS under it, so it moves with that one), or −1 for the ground.
   */
  owners: Int8Array[];
  /** Node index a at each sample and the weight t of node a + 1 (elevation (1 − t)·z[a] + t·z[a+1]). */
  node: Int32Array;
  weight: Float64Array;
}

/** Number of unknowns: elevations at every node of every refractor, then velocities, then gradients (if any). */
export function parameterCount(refractors: number, nodes: number, lateralGradient: boolean): number {
  return refractors * nodes + (refractors + 1) * (lateralGradient ? 2 : 1);
}

/** Index of the elevation of refractor k at node j, of the velocity of layer m, and of its gradient. */
export const elevationIndex = (nodes: number, k: number, j: number) => k * nodes + j;
export const velocityIndex = (refractors: number, nodes: number, m: number) => refractors * nodes + m;
export const gradientIndex = (refractors: number, nodes: number, m: number) => refractors * nodes + refractors + 1 + m;

/** The section's unknowns as one vector (layout of parameterCount). */
export function packParameters(section: NodeSection, lateralGradient: boolean): Float64Array {
  const refractors = section.elevations.length;
  const nodes = section.nodeXs.length;
  const p = new Float64Array(parameterCount(refractors, nodes, lateralGradient));
  section.elevations.forEach((e, k) => p.set(e, k * nodes));
  p.set(section.velocities, refractors * nodes);
  if (lateralGradient) p.set(section.gradients, refractors * nodes + refractors + 1);
  return p;
}

/** A section with the unknowns of vector p (ground, nodes and xRef from `like`). */
export function unpackParameters(like: NodeSection, p: Float64Array, lateralGradient: boolean): NodeSection {
  const refractors = like.elevations.length;
  const nodes = like.nodeXs.length;
  return {
    ground: like.ground,
    nodeXs: like.nodeXs,
    xRef: like.xRef,
    elevations: like.elevations.map((_, k) => p.slice(k * nodes, (k + 1) * nodes)),
    velocities: p.slice(refractors * nodes, refractors * nodes + refractors + 1),
    gradients: lateralGradient ? p.slice(refractors * nodes + refractors + 1, refractors * nodes + 2 * (refractors + 1)) : new Float64Array(refractors + 1),
  };
}

/**
 * Samples a node section every `step` metres (about) over `span`: refractor elevations by linear
 * interpolation between nodes, each kept at least MIN_SAMPLE_THICKNESS below the ground and the
 * refractor above.
 */
export function sampleNodeSection(section: NodeSection, span: [number, number], step: number): SampledNodeSection {
  const count = Math.max(2, Math.round((span[1] - span[0]) / step) + 1);
  const actualStep = (span[1] - span[0]) / (count - 1);
  const xs = Float64Array.from({ length: count }, (_, i) => span[0] + i * actualStep);
  const groundZ = Float64Array.from(xs, (x) => section.ground(x));
  const nodeXs = section.nodeXs;
  const last = nodeXs.length - 1;
  const node = new Int32Array(count);
  const weight = new Float64Array(count);
  let a = 0;
  for (let i = 0; i < count; i++) {
    const x = xs[i];
    if (last === 0 || x <= nodeXs[0]) { node[i] = 0; weight[i] = 0; continue; }
    if (x >= nodeXs[last]) { node[i] = last - 1; weight[i] = 1; continue; }
    while (a < last - 1 && nodeXs[a + 1] < x) a++;
    node[i] = a;
    weight[i] = (x - nodeXs[a]) / (nodeXs[a + 1] - nodeXs[a]);
  }
  const levels: Float64Array[] = [];
  const owners: Int8Array[] = [];
  section.elevations.forEach((elev, k) => {
    const level = new Float64Array(count);
    const owner = new Int8Array(count);
    for (let i = 0; i < count; i++) {
      const t = weight[i];
      const z = last === 0 ? elev[0] : (1 - t) * elev[node[i]] + t * elev[node[i] + 1];
      const above = k === 0 ? groundZ[i] : levels[k - 1][i];
      if (z > above - MIN_SAMPLE_THICKNESS) {
        level[i] = above - MIN_SAMPLE_THICKNESS;
        owner[i] = k === 0 ? -1 : owners[k - 1][i];
      } else {
        level[i] = z;
        owner[i] = k;
      }
    }
    levels.push(level);
    owners.push(owner);
  });
  return { section, xs, step: actualStep, groundZ, levels, owners, node, weight };
}

/** Velocity of layer m at x, in m/s. */
export function velocityAt(section: NodeSection, m: number, x: number): number {
  return section.velocities[m] + section.gradients[m] * (x - section.xRef);
}
