/** The exact search behind segmentedRegression: range residuals from prefix sums, dynamic
 * programming over partitions, and the constrained exhaustive search. */

/**
 * Adjacent segments must differ in apparent velocity by at least this factor: a smaller contrast
 * is within what noise and mild curvature of one layer's branch produce, and gives no usable
 * refractor depth (the depth factor 1 / cos θ grows without bound as the contrast vanishes).
 * Our own rule, stated here and in DEVELOPERS.md.
 */
export const MIN_VELOCITY_CONTRAST = 1.1;

export interface Sums { n: number[]; sx: number[]; sy: number[]; sxx: number[]; sxy: number[]; syy: number[] }

export function prefixSums(x: number[], y: number[]): Sums {
  const s: Sums = { n: [0], sx: [0], sy: [0], sxx: [0], sxy: [0], syy: [0] };
  for (let i = 0; i < x.length; i++) {
    s.n.push(i + 1);
    s.sx.push(s.sx[i] + x[i]);
    s.sy.push(s.sy[i] + y[i]);
    s.sxx.push(s.sxx[i] + x[i] * x[i]);
    s.sxy.push(s.sxy[i] + x[i] * y[i]);
    s.syy.push(s.syy[i] + y[i] * y[i]);
  }
  return s;
}

/** Least-squares line of points [i, j) from the prefix sums: slope and residual sum of squares. */
export function rangeLine(s: Sums, i: number, j: number, throughOrigin: boolean): { slope: number; rss: number } {
  const n = j - i;
  const sx = s.sx[j] - s.sx[i];
  const sy = s.sy[j] - s.sy[i];
  const sxx = s.sxx[j] - s.sxx[i];
  const sxy = s.sxy[j] - s.sxy[i];
  const syy = s.syy[j] - s.syy[i];
  if (throughOrigin) {
    const slope = sxx > 0 ? sxy / sxx : 0;
    return { slope, rss: Math.max(0, syy - slope * sxy) };
  }
  const cxx = sxx - (sx * sx) / n;
  const cxy = sxy - (sx * sy) / n;
  const cyy = syy - (sy * sy) / n;
  if (cxx <= 0) return { slope: 0, rss: Math.max(0, cyy) };
  const slope = cxy / cxx;
  return { slope, rss: Math.max(0, cyy - slope * cxy) };
}

export interface Partition { cuts: number[]; rss: number }

export function partitionRss(s: Sums, cuts: number[], n: number, origin: boolean): number {
  const bounds = [0, ...cuts, n];
  let rss = 0;
  for (let k = 0; k + 1 < bounds.length; k++) rss += rangeLine(s, bounds[k], bounds[k + 1], origin && k === 0).rss;
  return rss;
}

export function segmentSlopes(s: Sums, cuts: number[], n: number, origin: boolean): number[] {
  const bounds = [0, ...cuts, n];
  return bounds.slice(1).map((end, k) => rangeLine(s, bounds[k], end, origin && k === 0).slope);
}

/**
 * True when the slopes of every two adjacent segments differ by more than MIN_BREAK_T standard
 * errors of their difference (pooled residual deviation): the breakpoint search picks the best of
 * many positions, so the criterion alone lets noise split one straight branch.
 */
export interface RangeTable { free: Float64Array; slope: Float64Array; first: Float64Array; firstSlope: Float64Array }

// The tables are rebuilt for every fit of every branch; one pair of buffers, grown when needed,
// saves the garbage collector most of its work. A table is used up before the next is made.
let freeBuffer = new Float64Array(0);
let slopeBuffer = new Float64Array(0);

export function costTable(s: Sums, n: number, origin: boolean): RangeTable {
  const size = (n + 1) * (n + 1);
  if (freeBuffer.length < size) {
    freeBuffer = new Float64Array(size);
    slopeBuffer = new Float64Array(size);
  }
  const free = freeBuffer.subarray(0, size);
  const slope = slopeBuffer.subarray(0, size);
  const first = new Float64Array(n + 1);
  const firstSlope = new Float64Array(n + 1);
  // rangeLine written out, without an object per range: this table is the search's inner loop.
  const { sx, sy, sxx, sxy, syy } = s;
  for (let i = 0; i < n; i++) {
    for (let j = i + 1; j <= n; j++) {
      const count = j - i;
      const ax = sx[j] - sx[i];
      const ay = sy[j] - sy[i];
      const cxx = sxx[j] - sxx[i] - (ax * ax) / count;
      const cxy = sxy[j] - sxy[i] - (ax * ay) / count;
      const cyy = syy[j] - syy[i] - (ay * ay) / count;
      const at = i * (n + 1) + j;
      if (cxx <= 0) {
        free[at] = cyy > 0 ? cyy : 0;
        slope[at] = 0;
      } else {
        const b = cxy / cxx;
        const rss = cyy - b * cxy;
        free[at] = rss > 0 ? rss : 0;
        slope[at] = b;
      }
    }
  }
  for (let j = 1; j <= n; j++) {
    if (origin) {
      const line = rangeLine(s, 0, j, true);
      first[j] = line.rss;
      firstSlope[j] = line.slope;
    } else {
      first[j] = free[j];
      firstSlope[j] = slope[j];
    }
  }
  return { free, slope, first, firstSlope };
}

/**
 * Exact least-squares partitions into 1 … maxM contiguous segments by dynamic programming over
 * a table of every range's residual (Bellman 1961).
 */
export function bestPartitions(table: RangeTable, n: number, maxM: number, minPoints: number): Partition[] {
  // cost[k][j]: least rss of the first j points in k segments; from[k][j]: start of the last segment.
  const cost: Float64Array[] = [];
  const from: Int32Array[] = [];
  const partitions: Partition[] = [];
  for (let k = 1; k <= maxM; k++) {
    cost[k] = new Float64Array(n + 1).fill(Infinity);
    from[k] = new Int32Array(n + 1).fill(-1);
    for (let j = k * minPoints; j <= n; j++) {
      if (k === 1) {
        cost[1][j] = table.first[j];
        from[1][j] = 0;
        continue;
      }
      let best = Infinity;
      let at = -1;
      for (let i = (k - 1) * minPoints; i <= j - minPoints; i++) {
        const c = cost[k - 1][i] + table.free[i * (n + 1) + j];
        if (c < best) { best = c; at = i; }
      }
      cost[k][j] = best;
      from[k][j] = at;
    }
    const cuts: number[] = [];
    let j = n;
    for (let level = k; level > 1; level--) {
      j = from[level][j];
      cuts.unshift(j);
    }
    partitions[k] = { cuts, rss: cost[k][n] };
  }
  return partitions;
}

/**
 * Exhaustive search over every partition whose slopes decrease along x by the minimum contrast;
 * undefined if none does.
 */
export function bestDecreasingPartition(table: RangeTable, n: number, m: number, minPoints: number): Partition | undefined {
  let best: Partition | undefined;
  const cuts: number[] = [];
  const stride = n + 1;
  const visit = (k: number, start: number, previousSlope: number, rss: number) => {
    if (best !== undefined && rss >= best.rss) return;
    if (k === m) {
      const lastRss = k === 1 ? table.first[n] : table.free[start * stride + n];
      const lastSlope = k === 1 ? table.firstSlope[n] : table.slope[start * stride + n];
      if (lastSlope > 0 && lastSlope * MIN_VELOCITY_CONTRAST <= previousSlope && (best === undefined || rss + lastRss < best.rss)) {
        best = { cuts: [...cuts], rss: rss + lastRss };
      }
      return;
    }
    for (let end = start + minPoints; end <= n - (m - k) * minPoints; end++) {
      const slope = k === 1 ? table.firstSlope[end] : table.slope[start * stride + end];
      if (!(slope > 0) || slope * MIN_VELOCITY_CONTRAST > previousSlope) continue;
      const lineRss = k === 1 ? table.first[end] : table.free[start * stride + end];
      cuts.push(end);
      visit(k + 1, end, slope, rss + lineRss);
      cuts.pop();
    }
  };
  visit(1, 0, Infinity, 0);
  return best;
}

/** Each segment's own least-squares line, with standard errors from the pooled residual deviation. */
export function separateLines(x: number[], y: number[], ends: number[], origin: boolean) {
  const bounds = [0, ...ends];
  const sums = prefixSums(x, y);
  let rss = 0;
  const raw = bounds.slice(1).map((end, k) => {
    const line = rangeLine(sums, bounds[k], end, origin && k === 0);
    rss += line.rss;
    return { start: bounds[k], end, slope: line.slope };
  });
  const dof = Math.max(1, x.length - 2 * raw.length);
  const sd = Math.sqrt(rss / dof);
  return raw.map((r, k) => {
    const xs = x.slice(r.start, r.end);
    const ys = y.slice(r.start, r.end);
    const count = xs.length;
    const mean = xs.reduce((a, b) => a + b, 0) / count;
    const sxx = xs.reduce((a, b) => a + (b - mean) ** 2, 0);
    const throughOrigin = origin && k === 0;
    const intercept = throughOrigin ? 0 : ys.reduce((a, b) => a + b, 0) / count - r.slope * mean;
    return {
      slope: r.slope,
      slopeSe: throughOrigin ? sd / Math.sqrt(xs.reduce((a, b) => a + b * b, 0)) : sxx > 0 ? sd / Math.sqrt(sxx) : Infinity,
      intercept,
      interceptSe: throughOrigin ? 0 : sxx > 0 ? sd * Math.sqrt(1 / count + (mean * mean) / sxx) : Infinity,
    };
  });
}

