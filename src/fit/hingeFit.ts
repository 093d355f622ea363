import { MultivariateLinearRegression } from 'ml-regression';

/**
 * A continuous piecewise-linear ("hinge") least-squares fit of y on x with given knots:
 * y = a + b·x + Σⱼ cⱼ·max(0, x − κⱼ). First-arrival times are continuous in offset (the least of
 * continuous travel times), so the lines of a branch meet at the crossover distances; fitting them
 * jointly through the hinges avoids the bias that free breakpoints give short segments, whose
 * end picks are chosen by the noise.
 */
export interface HingeLine {
  slope: number;
  slopeSe: number;
  intercept: number;
  interceptSe: number;
}

export interface HingeResult {
  lines: HingeLine[];
  rss: number;
  /** Residual standard deviation with n − p degrees of freedom. */
  sd: number;
}

function designRow(xi: number, knots: number[]): number[] {
  return [xi, ...knots.map((k) => Math.max(0, xi - k))];
}

/** Residual sum of squares of the hinge fit, by the normal equations (fast path for the knot search). */
export function hingeRss(x: number[], y: number[], knots: number[], throughOrigin: boolean): number {
  const k = knots.length;
  const columns = k + 1 + (throughOrigin ? 0 : 1);
  const xtx: number[][] = [];
  for (let a = 0; a < columns; a++) xtx.push(new Array(columns).fill(0));
  const xty = new Array(columns).fill(0);
  const row = new Float64Array(columns).fill(1);
  let yy = 0;
  for (let i = 0; i < x.length; i++) {
    const xi = x[i];
    row[0] = xi;
    for (let j = 0; j < k; j++) row[j + 1] = xi > knots[j] ? xi - knots[j] : 0;
    const yi = y[i];
    yy += yi * yi;
    for (let a = 0; a < columns; a++) {
      const ra = row[a];
      xty[a] += ra * yi;
      const line = xtx[a];
      for (let b = a; b < columns; b++) line[b] += ra * row[b];
    }
  }
  for (let a = 0; a < columns; a++) for (let b = 0; b < a; b++) xtx[a][b] = xtx[b][a];
  const beta = solve(xtx, xty);
  if (beta === undefined) return Infinity;
  // RSS = yᵀy − βᵀXᵀy at the least-squares solution; times here are tenths of a second and the
  // residuals tenths of a millisecond, well inside double precision for this difference.
  let explained = 0;
  for (let a = 0; a < columns; a++) explained += beta[a] * xty[a];
  return Math.max(0, yy - explained);
}

/** Gaussian elimination with partial pivoting; undefined for a singular system. */
function solve(matrix: number[][], vector: number[]): number[] | undefined {
  const n = vector.length;
  const a = matrix.map((row, i) => [...row, vector[i]]);
  for (let col = 0; col < n; col++) {
    let pivot = col;
    for (let r = col + 1; r < n; r++) if (Math.abs(a[r][col]) > Math.abs(a[pivot][col])) pivot = r;
    if (Math.abs(a[pivot][col]) < 1e-300) return undefined;
    [a[col], a[pivot]] = [a[pivot], a[col]];
    for (let r = col + 1; r < n; r++) {
      const factor = a[r][col] / a[col][col];
      for (let c = col; c <= n; c++) a[r][c] -= factor * a[col][c];
    }
  }
  const result = new Array(n).fill(0);
  for (let r = n - 1; r >= 0; r--) {
    let sum = a[r][n];
    for (let c = r + 1; c < n; c++) sum -= a[r][c] * result[c];
    result[r] = sum / a[r][r];
  }
  return result;
}

/**
 * The hinge fit with its coefficient covariance, by ml-regression's multivariate linear regression,
 * turned into one line (slope, intercept and their standard errors) per segment.
 */
export function hingeFit(x: number[], y: number[], knots: number[], throughOrigin: boolean, knotsEstimated = true): HingeResult {
  const fit = new MultivariateLinearRegression(x.map((xi) => designRow(xi, knots)), y.map((yi) => [yi]), { intercept: !throughOrigin, statistics: false });
  const coefficients = fit.weights.map((w) => w[0]);
  const p = coefficients.length;
  const interceptIndex = throughOrigin ? -1 : p - 1;
  // Covariance with the knots as parameters too (Gauss-Newton, J = ∂fitted/∂(β, κ), with
  // ∂/∂κⱼ = −cⱼ where x > κⱼ): a knot found by search is uncertain, and ignoring that makes the
  // slopes of short segments look more precise than they are.
  const extra = knotsEstimated ? knots.length : 0;
  const q = p + extra;
  const jacobian = x.map((xi) => {
    const row = designRow(xi, knots);
    if (!throughOrigin) row.push(1);
    for (let j = 0; j < extra; j++) row.push(xi > knots[j] ? -coefficients[j + 1] : 0);
    return row;
  });
  let rss = 0;
  jacobian.forEach((row, i) => {
    let fitted = 0;
    for (let a = 0; a < p; a++) fitted += row[a] * coefficients[a];
    rss += (y[i] - fitted) ** 2;
  });
  const dof = Math.max(1, x.length - q);
  const variance = rss / dof;
  const jtj = Array.from({ length: q }, () => new Array(q).fill(0));
  for (const row of jacobian) for (let a = 0; a < q; a++) for (let b = 0; b < q; b++) jtj[a][b] += row[a] * row[b];
  const inverse = Array.from({ length: q }, (_, col) => solve(jtj, Array.from({ length: q }, (_, r) => (r === col ? 1 : 0))));
  const cov = (i: number, j: number) => {
    const column = inverse[j];
    return column === undefined ? NaN : column[i] * variance;
  };
  // Line k: slope = b + Σ_{j<k} cⱼ, intercept = a − Σ_{j<k} cⱼ κⱼ; each a linear combination g·(β, κ).
  const combination = (g: number[]) => {
    let value = 0;
    let v = 0;
    for (let i = 0; i < p; i++) value += g[i] * coefficients[i];
    for (let i = 0; i < q; i++) for (let j = 0; j < q; j++) v += g[i] * g[j] * cov(i, j);
    return { value, se: Math.sqrt(Math.max(0, v)) };
  };
  const lines: HingeLine[] = [];
  for (let k = 0; k <= knots.length; k++) {
    const slopeG = new Array(q).fill(0);
    const interceptG = new Array(q).fill(0);
    slopeG[0] = 1;
    if (interceptIndex >= 0) interceptG[interceptIndex] = 1;
    for (let j = 0; j < k; j++) {
      slopeG[j + 1] = 1;
      interceptG[j + 1] = -knots[j];
      if (j < extra) interceptG[p + j] = -coefficients[j + 1];
    }
    const slope = combination(slopeG);
    const intercept = interceptIndex >= 0 || k > 0 ? combination(interceptG) : { value: 0, se: 0 };
    lines.push({ slope: slope.value, slopeSe: slope.se, intercept: intercept.value, interceptSe: intercept.se });
  }
  return { lines, rss, sd: Math.sqrt(variance) };
}

/**
 * Knots that minimise the hinge fit's residual: each knot searched by golden section within its
 * interval, in turn, once (knots lie apart, so each barely moves the others' optimum; the residual
 * is smooth in each knot between data points).
 */
export function optimiseKnots(x: number[], y: number[], start: number[], intervals: [number, number][], throughOrigin: boolean): number[] {
  const knots = [...start];
  const ratio = (Math.sqrt(5) - 1) / 2;
  for (let round = 0; round < 1; round++) {
    for (let k = 0; k < knots.length; k++) {
      let [lo, hi] = intervals[k];
      if (!(hi > lo)) continue;
      const rssAt = (value: number) => {
        const trial = [...knots];
        trial[k] = value;
        return hingeRss(x, y, trial, throughOrigin);
      };
      let c = hi - ratio * (hi - lo);
      let d = lo + ratio * (hi - lo);
      let fc = rssAt(c);
      let fd = rssAt(d);
      // 10 golden-section steps shrink the interval by 0.618^10 ≈ 1/120: a few centimetres on a few-metre gap.
      for (let iteration = 0; iteration < 10; iteration++) {
        if (fc < fd) { hi = d; d = c; fd = fc; c = hi - ratio * (hi - lo); fc = rssAt(c); } else { lo = c; c = d; fc = fd; d = lo + ratio * (hi - lo); fd = rssAt(d); }
      }
      const candidate = (lo + hi) / 2;
      if (rssAt(candidate) <= rssAt(knots[k])) knots[k] = candidate;
    }
  }
  return knots;
}
