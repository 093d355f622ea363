import { gradientIndex, parameterCount, velocityIndex, type SampledNodeSection } from './nodeSection.js';

/** One shot: the source on the ground and the receivers it was recorded at (elevations in metres). */
export interface Shot {
  x: number;
  z: number;
  receivers: { x: number; z: number }[];
}

/** One row of the Jacobian: the derivative of a first-arrival time with respect to the unknowns it depends on. */
export interface SparseRow {
  index: Int32Array;
  /** ∂t/∂p: seconds per metre for elevations, seconds per (m/s) for velocities, seconds per ((m/s)/m) for gradients. */
  value: Float64Array;
}

export interface SectionPaths {
  /** First-arrival time of every receiver of every shot, in seconds. */
  times: Float64Array[];
  /** Jacobian rows, shot by shot and receiver by receiver (with derivatives only). */
  rows?: SparseRow[][];
  /**
   * Per refractor and node: how many least-time paths cross that refractor (go down into or up
   * out of the layer below it) beside the node, weighted by the interpolation weights. A node no
   * path crosses near is constrained only by its neighbours (with derivatives only).
   */
  crossings?: Float64Array[];
}

// Sideways reach of a straight leg through a layer, in layer thicknesses: a flatter leg is never
// faster than a head wave along the layer's floor or the route above it.
const REACH_THICKNESSES = 3;

/**
 * First-arrival times through a node section by Fermat's principle over the sampled refractors:
 * straight legs through each layer, travel along a refractor at the speed of the layer beneath it
 * (head waves), the direct wave along the ground, the least total time by dynamic programming over
 * the samples (the leg times through each layer tabulated once for every shot, with
 * back-pointers). Sources anywhere on the ground, off the ends of the
 * receivers included, and ground of any shape.
 *
 * With `derivatives`, the least-time path of each arrival is traced back and its time
 * differentiated analytically with the path's sample positions held fixed: by Fermat's principle
 * the time is stationary with respect to the path, so this is its first-order change (and exactly
 * the derivative of the sampled least time away from the points where the least-time path jumps).
 * A leg of length L from (x₁, z₁) to (x₂, z₂) through layer m takes L / v_m(x̄), x̄ its midpoint:
 * ∂t/∂z₁ = (z₁ − z₂)/(L v), ∂t/∂v = −L/v², ∂t/∂g = −L (x̄ − x_ref)/v²; an elevation at a sample
 * passes to the two nodes around it with the interpolation weights.
 */
/** Buffers of the Jacobian rows, kept between calls (the rows of one call are views into them, valid until the next call with the same workspace). */
export interface PathWorkspace {
  index: Int32Array;
  value: Float64Array;
}

export function sectionPaths(sampled: SampledNodeSection, shots: Shot[], derivatives = false, lateralGradient = false, workspace?: PathWorkspace): SectionPaths {
  const { section, xs, levels, owners, node, weight, step } = sampled;
  const count = xs.length;
  const refractors = levels.length;
  const nodes = section.nodeXs.length;
  const v = section.velocities;
  const g = section.gradients;
  const xRef = section.xRef;
  // Laterally uniform layers (no gradient given) have one slowness each.
  const uniform = !lateralGradient && g.every((value) => value === 0);
  const slowness = Float64Array.from(v, (value) => 1 / Math.max(1, value));
  const slownessAt = uniform ? (m: number, _x: number) => slowness[m] : (m: number, x: number) => 1 / Math.max(1, v[m] + g[m] * (x - xRef));

  // Times along each refractor between neighbouring samples, at the speed of the layer beneath.
  const along = levels.map((z, k) => {
    const t = new Float64Array(count - 1);
    for (let i = 0; i + 1 < count; i++) {
      const dz = z[i + 1] - z[i];
      t[i] = Math.sqrt(step * step + dz * dz) * slownessAt(k + 1, (xs[i] + xs[i + 1]) / 2);
    }
    return t;
  });
  // Their derivatives: ∂t/∂z_i = (z_i − z_{i+1})/(L v) for the leg from sample i to i + 1, and
  // ∂t/∂v = −L/v² (times x̄ − x_ref for the gradient).
  const alongSlope = levels.map((z, k) => {
    const d = new Float64Array(count - 1);
    for (let i = 0; i + 1 < count; i++) {
      const dz = z[i] - z[i + 1];
      d[i] = (dz / Math.sqrt(step * step + dz * dz)) * slownessAt(k + 1, (xs[i] + xs[i + 1]) / 2);
    }
    return d;
  });
  const alongVelocity = levels.map((_, k) => {
    const d = new Float64Array(count - 1);
    for (let i = 0; i + 1 < count; i++) {
      const s = slownessAt(k + 1, (xs[i] + xs[i + 1]) / 2);
      d[i] = -along[k][i] * s;
    }
    return d;
  });
  // Leg times through layer j (1 ≤ j < refractors) from sample a of refractor j−1 to sample b of
  // refractor j, for |a − b| ≤ reach[j]: legTables[j][a·(2R+1) + (b − a + R)].
  const reach = new Int32Array(refractors);
  const legTables: Float64Array[] = [];
  for (let j = 1; j < refractors; j++) {
    const top = levels[j - 1];
    const bottom = levels[j];
    let thickest = 0;
    for (let i = 0; i < count; i++) thickest = Math.max(thickest, top[i] - bottom[i]);
    const r = Math.ceil((REACH_THICKNESSES * thickest) / step) + 1;
    reach[j] = r;
    const width = 2 * r + 1;
    const table = new Float64Array(count * width).fill(Infinity);
    for (let a = 0; a < count; a++) {
      for (let b = Math.max(0, a - r); b < Math.min(count, a + r + 1); b++) {
        const dx = xs[b] - xs[a];
        const dz = bottom[b] - top[a];
        table[a * width + (b - a + r)] = Math.sqrt(dx * dx + dz * dz) * slownessAt(j, (xs[a] + xs[b]) / 2);
      }
    }
    legTables[j] = table;
  }
  let topThickness = 0;
  if (refractors > 0) for (let i = 0; i < count; i++) topThickness = Math.max(topThickness, sampled.groundZ[i] - levels[0][i]);
  const topReach = Math.ceil((REACH_THICKNESSES * topThickness) / step) + 1;

  const unknowns = parameterCount(refractors, nodes, lateralGradient);
  const velocityBase = velocityIndex(refractors, nodes, 0);
  const gradientBase = gradientIndex(refractors, nodes, 0);
  const scratch = new Float64Array(unknowns);
  const touched = new Uint8Array(unknowns);
  const touchedList: number[] = [];
  const crossings = derivatives ? levels.map(() => new Float64Array(nodes)) : undefined;
  const addTo = (index: number, value: number) => {
    if (!touched[index]) { touched[index] = 1; touchedList.push(index); }
    scratch[index] += value;
  };
  const addElevation = (k: number, i: number, d: number) => {
    const owner = owners[k][i];
    if (owner < 0) return;
    const base = owner * nodes; // elevationIndex(nodes, owner, j) = base + j
    if (nodes === 1) { addTo(base, d); return; }
    const w = weight[i];
    if (w < 1) addTo(base + node[i], (1 - w) * d);
    if (w > 0) addTo(base + node[i] + 1, w * d);
  };
  const addCrossing = (k: number, i: number) => {
    if (nodes === 1) { crossings![k][0] += 1; return; }
    crossings![k][node[i]] += 1 - weight[i];
    crossings![k][node[i] + 1] += weight[i];
  };
  // One leg through layer m between two points; k = −1 marks a fixed point (source or receiver).
  const leg = (m: number, xa: number, za: number, ka: number, ia: number, xb: number, zb: number, kb: number, ib: number): number => {
    const dx = xb - xa;
    const dz = zb - za;
    const length = Math.sqrt(dx * dx + dz * dz);
    const mid = (xa + xb) / 2;
    const s = slownessAt(m, mid);
    if (length > 0) {
      if (ka >= 0) addElevation(ka, ia, ((za - zb) / length) * s);
      if (kb >= 0) addElevation(kb, ib, ((zb - za) / length) * s);
    }
    addTo(velocityBase + m, -length * s * s);
    if (lateralGradient) addTo(gradientBase + m, -length * (mid - xRef) * s * s);
    return length * s;
  };
  // Rows are stored one after another in two growing buffers (compressed sparse rows) and handed
  // out as views, which spares the collector thousands of small arrays per evaluation.
  let indexBuffer = workspace?.index ?? new Int32Array(derivatives ? 1 << 16 : 0);
  let valueBuffer = workspace?.value ?? new Float64Array(derivatives ? 1 << 16 : 0);
  let filled = 0;
  const rowEnds: number[] = [];
  const takeRow = () => {
    const size = touchedList.length;
    if (filled + size > indexBuffer.length) {
      const grown = Math.max(2 * indexBuffer.length, filled + size, 1 << 16);
      const index = new Int32Array(grown);
      index.set(indexBuffer.subarray(0, filled));
      const value = new Float64Array(grown);
      value.set(valueBuffer.subarray(0, filled));
      indexBuffer = index;
      valueBuffer = value;
    }
    for (let a = 0; a < size; a++) {
      const i = touchedList[a];
      indexBuffer[filled + a] = i;
      valueBuffer[filled + a] = scratch[i];
      scratch[i] = 0;
      touched[i] = 0;
    }
    filled += size;
    rowEnds.push(filled);
    touchedList.length = 0;
  };

  // The leg from each receiver up to the samples of the top refractor within reach of it depends
  // on the receiver alone, not on the shot: tabulated once per receiver position.
  const legWidth = 2 * topReach + 1;
  const receiverIds = new Map<number, Map<number, number>>();
  const receiverLegs: Float64Array[] = [];
  const shotReceiverIds = refractors > 0 ? shots.map((shot) => Int32Array.from(shot.receivers, ({ x: rx, z: rz }) => {
    let byZ = receiverIds.get(rx);
    if (byZ === undefined) { byZ = new Map(); receiverIds.set(rx, byZ); }
    let id = byZ.get(rz);
    if (id === undefined) {
      id = receiverLegs.length;
      byZ.set(rz, id);
      const legs = new Float64Array(legWidth);
      const centre = Math.round((rx - xs[0]) / step);
      for (let i = Math.max(0, centre - topReach); i < Math.min(count, centre + topReach + 1); i++) {
        const dx = xs[i] - rx;
        const dz = levels[0][i] - rz;
        legs[i - centre + topReach] = Math.sqrt(dx * dx + dz * dz) * slownessAt(0, (xs[i] + rx) / 2);
      }
      receiverLegs.push(legs);
    }
    return id;
  })) : [];
  const allTimes: Float64Array[] = [];
  const head: Float64Array[] = new Array(refractors);
  const previous: Int32Array[] = levels.map(() => new Int32Array(count));
  const downFrom: Int32Array[] = levels.map(() => new Int32Array(count));
  const upFrom: Int32Array[][] = levels.map(() => levels.map(() => new Int32Array(count)));
  for (let shotIndex = 0; shotIndex < shots.length; shotIndex++) {
    const shot = shots[shotIndex];
    const n = shot.receivers.length;
    const times = new Float64Array(n);
    const bestRefractor = new Int32Array(n).fill(-1);
    const bestSample = new Int32Array(n);
    for (let r = 0; r < n; r++) {
      const rx = shot.receivers[r].x;
      const dx = rx - shot.x;
      const dz = shot.receivers[r].z - shot.z;
      times[r] = Math.sqrt(dx * dx + dz * dz) * slownessAt(0, (rx + shot.x) / 2);
    }
    if (refractors > 0) {
      let arriving: Float64Array = new Float64Array(count);
      for (let i = 0; i < count; i++) {
        const dx = xs[i] - shot.x;
        const dz = levels[0][i] - shot.z;
        arriving[i] = Math.sqrt(dx * dx + dz * dz) * slownessAt(0, (xs[i] + shot.x) / 2);
      }
      for (let k = 0; k < refractors; k++) {
        head[k] = relax(arriving, along[k], previous[k]);
        let rising = head[k];
        for (let j = k; j >= 1; j--) rising = crossUp(rising, legTables[j], reach[j], count, upFrom[k][j]);
        const ids = shotReceiverIds[shotIndex];
        for (let r = 0; r < n; r++) {
          const centre = Math.round((shot.receivers[r].x - xs[0]) / step);
          const legs = receiverLegs[ids[r]];
          const offset = topReach - centre;
          for (let i = Math.max(0, centre - topReach); i < Math.min(count, centre + topReach + 1); i++) {
            const t = rising[i] + legs[i + offset];
            if (t < times[r]) { times[r] = t; bestRefractor[r] = k; bestSample[r] = i; }
          }
        }
        if (k + 1 < refractors) arriving = crossDown(head[k], legTables[k + 1], reach[k + 1], count, downFrom[k + 1]);
      }
    }
    allTimes.push(times);
    if (!derivatives) continue;
    for (let r = 0; r < n; r++) {
      const { x: rx, z: rz } = shot.receivers[r];
      const k0 = bestRefractor[r];
      if (k0 < 0) {
        leg(0, shot.x, shot.z, -1, 0, rx, rz, -1, 0);
        takeRow();
        continue;
      }
      // Up from the receiver to the refractor the head wave ran along.
      let cur = bestSample[r];
      leg(0, rx, rz, -1, 0, xs[cur], levels[0][cur], 0, cur);
      addCrossing(0, cur);
      for (let j = 1; j <= k0; j++) {
        const below = upFrom[k0][j][cur];
        leg(j, xs[cur], levels[j - 1][cur], j - 1, cur, xs[below], levels[j][below], j, below);
        addCrossing(j, below);
        cur = below;
      }
      // Along each refractor back to where the path entered it, and down from the one above.
      for (let k = k0; k >= 0; k--) {
        const slope = alongSlope[k];
        const dv = alongVelocity[k];
        let velocitySum = 0;
        let gradientSum = 0;
        while (previous[k][cur] >= 0) {
          const before = previous[k][cur];
          // The leg between samples i and i + 1 (either way round): ∂t/∂z_i = −∂t/∂z_{i+1}.
          const i = before < cur ? before : cur;
          if (slope[i] !== 0) {
            addElevation(k, i, slope[i]);
            addElevation(k, i + 1, -slope[i]);
          }
          velocitySum += dv[i];
          if (lateralGradient) gradientSum += dv[i] * ((xs[i] + xs[i + 1]) / 2 - xRef);
          cur = before;
        }
        addTo(velocityBase + k + 1, velocitySum);
        if (lateralGradient) addTo(gradientBase + k + 1, gradientSum);
        addCrossing(k, cur);
        if (k === 0) {
          leg(0, shot.x, shot.z, -1, 0, xs[cur], levels[0][cur], 0, cur);
        } else {
          const above = downFrom[k][cur];
          leg(k, xs[above], levels[k - 1][above], k - 1, above, xs[cur], levels[k][cur], k, cur);
          addCrossing(k - 1, above);
          cur = above;
        }
      }
      takeRow();
    }
  }
  if (!derivatives) return { times: allTimes };
  if (workspace !== undefined) {
    workspace.index = indexBuffer;
    workspace.value = valueBuffer;
  }
  const rows: SparseRow[][] = [];
  let row = 0;
  for (const shot of shots) {
    rows.push(shot.receivers.map(() => {
      const begin = row === 0 ? 0 : rowEnds[row - 1];
      const end = rowEnds[row++];
      return { index: indexBuffer.subarray(begin, end), value: valueBuffer.subarray(begin, end) };
    }));
  }
  return { times: allTimes, rows, crossings };
}

/** Least times along a refractor (neighbouring-sample times `along`), swept both ways; previous[i] = −1 where the path enters. */
function relax(start: Float64Array, along: Float64Array, previous: Int32Array): Float64Array {
  const t = Float64Array.from(start);
  previous.fill(-1);
  for (let i = 1; i < t.length; i++) {
    const c = t[i - 1] + along[i - 1];
    if (c < t[i]) { t[i] = c; previous[i] = i - 1; }
  }
  for (let i = t.length - 2; i >= 0; i--) {
    const c = t[i + 1] + along[i];
    if (c < t[i]) { t[i] = c; previous[i] = i + 1; }
  }
  return t;
}

/** Least times at the samples of the lower refractor by one leg down from the upper (table of legTables). */
function crossDown(times: Float64Array, table: Float64Array, reach: number, count: number, from: Int32Array): Float64Array {
  const out = new Float64Array(count);
  const width = 2 * reach + 1;
  for (let b = 0; b < count; b++) {
    let best = Infinity;
    let arg = b;
    for (let a = Math.max(0, b - reach); a < Math.min(count, b + reach + 1); a++) {
      const t = times[a] + table[a * width + (b - a + reach)];
      if (t < best) { best = t; arg = a; }
    }
    out[b] = best;
    from[b] = arg;
  }
  return out;
}

/** Least times at the samples of the upper refractor by one leg up from the lower. */
function crossUp(times: Float64Array, table: Float64Array, reach: number, count: number, from: Int32Array): Float64Array {
  const out = new Float64Array(count);
  const width = 2 * reach + 1;
  for (let a = 0; a < count; a++) {
    let best = Infinity;
    let arg = a;
    const row = a * width - a + reach;
    for (let b = Math.max(0, a - reach); b < Math.min(count, a + reach + 1); b++) {
      const t = times[b] + table[row + b];
      if (t < best) { best = t; arg = b; }
    }
    out[a] = best;
    from[a] = arg;
  }
  return out;
}
