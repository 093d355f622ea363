/**
 * An independent forward model for tests: the first-arrival time from a surface source to surface
 * receivers through a layered section, by Fermat's principle (least time over all paths made of
 * straight legs inside each layer and legs along each interface at the speed of the layer beneath
 * it, i.e. head waves). Each interface is sampled every `step` metres and the least time is found
 * by dynamic programming over the samples, so no ray angle, intercept or crossover formula is used.
 * It shares no code with the program. Exact for planar interfaces up to the sampling (the minimum
 * of a smooth function over samples 0.1 m apart errs by far less than a microsecond here).
 */
export interface LayeredSection {
  /** Ground elevation at x, in metres. */
  surface: (x: number) => number;
  /** Elevation at x of each interface, top down, in metres. */
  interfaces: ((x: number) => number)[];
  /** Velocity of each layer, top down, in m/s: interfaces.length + 1 values. */
  velocities: number[];
}

/** A test line over a section: where the sources and receivers are, and the true refractor depths. */
export interface LineCase {
  name: string;
  section: LayeredSection;
  sources: number[];
  receivers: number[];
  /** True depth of each refractor below the ground at x, in metres. */
  depth: ((x: number) => number)[];
}

export function firstArrivals(section: LayeredSection, sourceX: number, receiverXs: number[], span: [number, number], step = 0.1): number[] {
  const [x0, x1] = span;
  const count = Math.round((x1 - x0) / step) + 1;
  const xs = new Float64Array(count);
  for (let i = 0; i < count; i++) xs[i] = x0 + i * step;
  const zs = section.interfaces.map((f) => Float64Array.from(xs, (x) => f(x)));
  const sx = sourceX;
  const sz = section.surface(sourceX);
  const v = section.velocities;
  const best = receiverXs.map((rx) => Math.hypot(rx - sx, section.surface(rx) - sz) / v[0]);

  // down[k][i]: least time from the source to sample i of interface k, arriving from above.
  let down: Float64Array = Float64Array.from(xs, (x, i) => Math.hypot(x - sx, zs[0][i] - sz) / v[0]);
  for (let k = 0; k < zs.length; k++) {
    const along = alongInterface(down, xs, zs[k], v[k + 1]);
    // Come back up through layers k, k-1, ..., 0 to each receiver.
    let up: Float64Array = along;
    for (let j = k; j >= 1; j--) up = legs(up, xs, zs[j], xs, zs[j - 1], v[j]);
    receiverXs.forEach((rx, r) => {
      const rz = section.surface(rx);
      for (let i = 0; i < count; i++) {
        const t = up[i] + Math.hypot(xs[i] - rx, zs[0][i] - rz) / v[0];
        if (t < best[r]) best[r] = t;
      }
    });
    if (k + 1 < zs.length) down = legs(along, xs, zs[k], xs, zs[k + 1], v[k + 1]);
  }
  return best;
}

/** Least time to each sample when travel along the interface polyline at `speed` is allowed. */
function alongInterface(start: Float64Array, xs: Float64Array, zs: Float64Array, speed: number): Float64Array {
  const t = Float64Array.from(start);
  for (let i = 1; i < t.length; i++) {
    const c = t[i - 1] + Math.hypot(xs[i] - xs[i - 1], zs[i] - zs[i - 1]) / speed;
    if (c < t[i]) t[i] = c;
  }
  for (let i = t.length - 2; i >= 0; i--) {
    const c = t[i + 1] + Math.hypot(xs[i] - xs[i + 1], zs[i] - zs[i + 1]) / speed;
    if (c < t[i]) t[i] = c;
  }
  return t;
}

/** Least time to each sample of interface B by one straight leg from some sample of interface A. */
function legs(from: Float64Array, ax: Float64Array, az: Float64Array, bx: Float64Array, bz: Float64Array, speed: number): Float64Array {
  const out = new Float64Array(bx.length).fill(Infinity);
  const slowness = 1 / speed;
  for (let j = 0; j < bx.length; j++) {
    let m = Infinity;
    const x = bx[j];
    const z = bz[j];
    for (let i = 0; i < ax.length; i++) {
      const dx = ax[i] - x;
      const dz = az[i] - z;
      const c = from[i] + Math.sqrt(dx * dx + dz * dz) * slowness;
      if (c < m) m = c;
    }
    out[j] = m;
  }
  return out;
}

/** Seeded normal random numbers (mulberry32 and Box-Muller), so noisy tests repeat exactly. */
export function seededNormal(seed: number): () => number {
  let a = seed >>> 0;
  const uniform = () => {
    a = (a + 0x6d2b79f5) >>> 0;
    let t = a;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
  return () => {
    const u = Math.max(uniform(), 1e-12);
    return Math.sqrt(-2 * Math.log(u)) * Math.cos(2 * Math.PI * uniform());
  };
}

/** A first-break CSV for a line over the section: one row per source and receiver. */
export function syntheticCsv(
  section: LayeredSection, sourceXs: number[], receiverXs: number[], noiseMs: number, seed: number,
): string {
  const normal = seededNormal(seed);
  const span: [number, number] = [Math.min(...sourceXs, ...receiverXs) - 5, Math.max(...sourceXs, ...receiverXs) + 5];
  const rows = ['source_id,source_x,source_elev,receiver_x,receiver_elev,time_ms'];
  sourceXs.forEach((sx, s) => {
    const times = firstArrivals(section, sx, receiverXs, span);
    receiverXs.forEach((rx, r) => {
      if (rx === sx) return;
      const t = times[r] * 1e3 + noiseMs * normal();
      rows.push(`S${s + 1},${sx},${section.surface(sx).toFixed(3)},${rx},${section.surface(rx).toFixed(3)},${Math.max(0, t).toFixed(3)}`);
    });
  });
  return rows.join('\n') + '\n';
}
