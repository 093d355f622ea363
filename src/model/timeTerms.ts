import { lsqr, type LinearOperator } from '../core/lsqr.js';
import { SparseRows } from '../core/sparseRows.js';
import { directLeastSquares } from '../core/sparseLeastSquares.js';

/** Relative tolerance of the least-squares solution (LSQR's atol and btol, and the direct solution's test). */
const TOLERANCE = 1e-12;

/** One first break as the joint model sees it. */
export interface ModelPick {
  /** Index into the geometry's sources and receivers. */
  source: number;
  receiver: number;
  /** Horizontal source-receiver distance, in metres. */
  offset: number;
  /** Straight-line (slope) source-receiver distance, in metres. */
  distance: number;
  /** First-break time, in seconds. */
  time: number;
}

/** Where the sources and receivers are, in metres along the line; receivers ascending. */
export interface ModelGeometry {
  sourceXs: number[];
  receiverXs: number[];
  /** Receiver spacing, in metres. */
  spacing: number;
}

export interface TimeTermOptions {
  /**
   * Weight of the rows asking the second difference of neighbouring receiver delays to vanish,
   * against 1 for a pick (both in seconds); default SMOOTHING_WEIGHT.
   */
  smoothing?: number;
  /** Compute the standard errors of the slownesses (one extra solve each); default true. */
  errors?: boolean;
  /**
   * Slownesses held fixed (s/m, with their standard errors), by layer (0 = direct wave): a
   * refractor whose receivers are each recorded from one direction only leaves its slowness to
   * trade with a trend of its time terms, so it is given from elsewhere.
   */
  held?: ({ slowness: number; se: number } | undefined)[];
}

/**
 * Weight of the smoothness rows on receiver delays. Small on purpose: a receiver seen by three or
 * more picks keeps its own delay (relief of a quarter of the depth over 30 m changes the second
 * difference of the delays by a few tenths of a millisecond, which a weight of 0.1 leaves almost
 * untouched), while a receiver seen by one pick, or a receiver between two gaps, is held near its
 * neighbours instead of taking up that one pick's noise alone. Our choice, checked on forward-model
 * lines (test/model/jointModel.test.ts).
 */
export const SMOOTHING_WEIGHT = 1;

/**
 * Weight of the rows tying the delay of a source inside the spread to the receiver delay at its
 * position (Willmore & Bancroft 1960: a shot at a station has that station's time term). Strong,
 * so that the tie acts as a constraint; it fixes the constant that could otherwise pass between
 * source and receiver delays.
 */
export const TIE_WEIGHT = 30;

/** The solved model: one slowness per layer and the time terms on each refractor. */
export interface TimeTermModel {
  /** Refractors in the model (layers = refractors + 1). */
  refractors: number;
  /** Slowness of each layer (0 = the direct wave), in s/m, and its standard error. */
  slowness: number[];
  slownessSe: number[];
  /** Delay time of each source and each receiver on each refractor (NaN where it has no picks), in seconds. */
  sourceDelays: Float64Array[];
  receiverDelays: Float64Array[];
  /** Pick minus model time of each pick (NaN for picks left out), in seconds. */
  residuals: Float64Array;
  /** Sum of squared pick residuals, in s², and the number of picks used. */
  rss: number;
  used: number;
  /** Number of unknowns solved for (slownesses and time terms). */
  parameters: number;
  /** Residual standard deviation, in seconds: √(rss / (used − parameters)). */
  sigma: number;
  /** Iterations LSQR took for the solution (0 when the normal equations gave it directly). */
  lsqrIterations: number;
}

/**
 * The time-term model of all shots together (Scheidegger & Willmore 1957, Geophysics 22, 9-22;
 * Willmore & Bancroft 1960, Geophys. J. R. astr. Soc. 3, 419-432): a direct-wave pick is
 * t = d / V₁ (d the slope distance), a head-wave pick from refractor k is
 * t = aₛₖ + bᵣₖ + |xᵣ − xₛ| / Vₖ₊₁, with one velocity per layer shared by every shot, a time term
 * (delay time) aₛₖ for every source and bᵣₖ for every receiver that has picks on refractor k.
 * Sources inside the spread are tied to the receiver delay at their position (interpolated); a
 * refractor with no tied source gets equal mean source and receiver delays. Neighbouring receiver
 * delays are held weakly smooth (SMOOTHING_WEIGHT on their second difference). Solved as sparse
 * least squares with unit-norm column scaling: by the normal equations (core/sparseLeastSquares,
 * Cholesky in skyline storage, one refinement step) where they are well conditioned and meet LSQR's
 * stopping rules, else by LSQR (Paige & Saunders 1982). Standard errors of
 * the slownesses from σ²(AᵀA)⁻¹, σ² = rss / (n − p); the diagonal element of the inverse for
 * column j comes from the Cholesky factor, or with LSQR is 1 / ‖aⱼ − A₋ⱼc‖², the residual of that
 * column regressed on the others (one more LSQR solve per layer, no dense matrix).
 *
 * For a plane refractor dipping at δ the head-wave slowness along the horizontal is cos δ / V
 * (exact; Telford et al. 1990, §4.2.3 rearranged), so the slowness here is apparent by that factor.
 *
 * @param arrival - for each pick, 0 for the direct wave, k for refractor k, −1 to leave it out
 * @param refractors - number of refractors (arrival values above it are not allowed)
 * @returns undefined when no pick is used
 * @throws Error for an arrival value above `refractors`
 */
export function solveTimeTerms(geometry: ModelGeometry, picks: ModelPick[], arrival: Int8Array, refractors: number, options: TimeTermOptions = {}): TimeTermModel | undefined {
  const smoothing = options.smoothing ?? SMOOTHING_WEIGHT;
  const sourceCount = geometry.sourceXs.length;
  const receiverCount = geometry.receiverXs.length;
  // Unknowns: the slownesses 0..refractors, then per refractor its source and receiver delays.
  const sourceColumn: Int32Array[] = [];
  const receiverColumn: Int32Array[] = [];
  let columns = refractors + 1;
  for (let k = 1; k <= refractors; k++) {
    const s = new Int32Array(sourceCount).fill(-1);
    const r = new Int32Array(receiverCount).fill(-1);
    picks.forEach((p, i) => {
      if (arrival[i] > refractors) throw new Error(`solveTimeTerms needs arrivals up to ${refractors}; got ${arrival[i]} for pick ${i}`);
      if (arrival[i] !== k) return;
      if (s[p.source] < 0) s[p.source] = columns++;
      if (r[p.receiver] < 0) r[p.receiver] = columns++;
    });
    sourceColumn.push(s);
    receiverColumn.push(r);
  }
  const matrix = new SparseRows(columns);
  let used = 0;
  const held = options.held ?? [];
  picks.forEach((p, i) => {
    const k = arrival[i];
    if (k < 0) return;
    used++;
    const distance = k === 0 ? p.distance : p.offset;
    const slownessEntry: [number, number][] = held[k] ? [] : [[k, distance]];
    const target = held[k] ? p.time - distance * held[k]!.slowness : p.time;
    if (k === 0) matrix.add(slownessEntry, target);
    else matrix.add([...slownessEntry, [sourceColumn[k - 1][p.source], 1], [receiverColumn[k - 1][p.receiver], 1]], target);
  });
  if (used === 0) return undefined;
  let constraints = 0;
  const xs = geometry.receiverXs;
  for (let k = 1; k <= refractors; k++) {
    const sc = sourceColumn[k - 1];
    const rc = receiverColumn[k - 1];
    const estimated: number[] = [];
    for (let r = 0; r < receiverCount; r++) if (rc[r] >= 0) estimated.push(r);
    if (estimated.length === 0) continue;
    // Smoothness of the second (divided) difference between neighbouring estimated receivers,
    // across gaps of at most three spacings.
    for (let j = 1; j + 1 < estimated.length; j++) {
      const [a, b, c] = [estimated[j - 1], estimated[j], estimated[j + 1]];
      const h1 = xs[b] - xs[a];
      const h2 = xs[c] - xs[b];
      if (h1 > 3 * geometry.spacing || h2 > 3 * geometry.spacing) continue;
      // Scaled so that equal spacings give (1, −2, 1).
      const mean = (h1 + h2) / 2;
      matrix.add([[rc[a], mean / h1], [rc[b], -mean / h1 - mean / h2], [rc[c], mean / h2]], 0, smoothing);
    }
    let tied = 0;
    for (let s = 0; s < sourceCount; s++) {
      if (sc[s] < 0) continue;
      const tie = interpolationWeights(estimated.map((r) => xs[r]), geometry.sourceXs[s], geometry.spacing);
      if (tie === undefined) continue;
      matrix.add([[sc[s], 1], ...tie.map(([j, w]) => [rc[estimated[j]], -w] as [number, number])], 0, TIE_WEIGHT);
      tied++;
      constraints++;
    }
    if (tied === 0) {
      const sourcesOn = [...sc].filter((c) => c >= 0);
      matrix.add([
        ...sourcesOn.map((c) => [c, 1 / sourcesOn.length] as [number, number]),
        ...estimated.map((r) => [rc[r], -1 / estimated.length] as [number, number]),
      ], 0, TIE_WEIGHT);
      constraints++;
    }
  }
  const frozen = matrix.freeze();
  const { operator, scales, b } = frozen;
  const direct = directLeastSquares(frozen.matrix, b, eliminationOrder(refractors, sourceColumn, receiverColumn, columns), TOLERANCE);
  const solved = direct ?? lsqr(operator, b, { atol: TOLERANCE, btol: TOLERANCE });
  const solution = Float64Array.from(solved.x, (v, j) => v * scales[j]);
  const residuals = new Float64Array(picks.length).fill(NaN);
  let rss = 0;
  let row = 0;
  picks.forEach((p, i) => {
    if (arrival[i] < 0) return;
    const residual = b[row] - operator.row(row, solved.x);
    residuals[i] = residual;
    rss += residual * residual;
    row++;
  });
  const parameters = columns - constraints - held.filter((h) => h !== undefined).length;
  const sigma = Math.sqrt(rss / Math.max(1, used - parameters));
  const slowness = Array.from(solution.subarray(0, refractors + 1), (u, j) => held[j]?.slowness ?? u);
  const slownessSe = slowness.map((_, j) => {
    if (held[j]) return held[j]!.se;
    if (options.errors === false) return NaN;
    const inverse = direct !== undefined ? direct.inverseDiagonal(j) : inverseDiagonal(operator, j);
    return Number.isFinite(inverse) ? sigma * Math.sqrt(inverse) * scales[j] : Infinity;
  });
  const delaysOf = (table: Int32Array[], count: number) => table.map((c) => Float64Array.from({ length: count }, (_, i) => (c[i] >= 0 ? solution[c[i]] : NaN)));
  return {
    refractors,
    slowness,
    slownessSe,
    sourceDelays: delaysOf(sourceColumn, sourceCount),
    receiverDelays: delaysOf(receiverColumn, receiverCount),
    residuals,
    rss,
    used,
    parameters,
    sigma,
    lsqrIterations: direct !== undefined ? 0 : (solved as { iterations: number }).iterations,
  };
}

/**
 * The unknowns in the order of elimination for the direct solution: on each refractor its receiver
 * delays along the line (coupled only to their neighbours, by the smoothness and tie rows), then
 * its source delays (each coupled to its receivers); the slownesses, coupled to everything, last.
 * The normal matrix is then banded but for a few full rows, and so is its Cholesky factor.
 */
function eliminationOrder(refractors: number, sourceColumn: Int32Array[], receiverColumn: Int32Array[], columns: number): Int32Array {
  const order = new Int32Array(columns);
  let next = 0;
  for (let k = 0; k < refractors; k++) {
    for (const c of receiverColumn[k]) if (c >= 0) order[next++] = c;
    for (const c of sourceColumn[k]) if (c >= 0) order[next++] = c;
  }
  for (let k = 0; k <= refractors; k++) order[next++] = k;
  return order;
}

/**
 * Weights of linear interpolation at x between the nearest of the sorted positions `at` (index,
 * weight), holding the end value up to 1.5 spacings beyond the ends; undefined farther out.
 */
export function interpolationWeights(at: number[], x: number, spacing: number): [number, number][] | undefined {
  if (at.length === 0) return undefined;
  if (x <= at[0]) return at[0] - x <= 1.5 * spacing ? [[0, 1]] : undefined;
  const last = at.length - 1;
  if (x >= at[last]) return x - at[last] <= 1.5 * spacing ? [[last, 1]] : undefined;
  let j = 0;
  while (at[j + 1] < x) j++;
  const t = (x - at[j]) / (at[j + 1] - at[j]);
  return t === 0 ? [[j, 1]] : [[j, 1 - t], [j + 1, t]];
}

/**
 * (AᵀA)⁻¹ⱼⱼ of the (scaled) operator: 1 / ‖aⱼ − A₋ⱼc‖², the residual of column j regressed on the
 * other columns by LSQR.
 */
function inverseDiagonal(operator: LinearOperator, j: number): number {
  const column = new Float64Array(operator.rows);
  const unit = new Float64Array(operator.cols);
  unit[j] = 1;
  operator.multiply(unit, column);
  const without: LinearOperator = {
    rows: operator.rows,
    cols: operator.cols,
    multiply(x, y) {
      const keep = x[j];
      x[j] = 0;
      operator.multiply(x, y);
      x[j] = keep;
    },
    multiplyTranspose(y, x) {
      const keep = x[j];
      operator.multiplyTranspose(y, x);
      x[j] = keep;
    },
  };
  const fit = lsqr(without, column, { atol: 1e-12, btol: 1e-12 });
  const fitted = new Float64Array(operator.rows);
  fit.x[j] = 0;
  without.multiply(fit.x, fitted);
  let sum = 0;
  for (let i = 0; i < operator.rows; i++) sum += (column[i] - fitted[i]) ** 2;
  return sum > 0 ? 1 / sum : Infinity;
}
