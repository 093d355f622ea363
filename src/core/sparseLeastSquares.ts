import { skyline, skylineCholesky, skylineSolve, type Skyline } from '../depth/skylineCholesky.js';

/** A sparse matrix in compressed rows: row i has entries starts[i] ≤ k < starts[i + 1]. */
export interface CompressedRows {
  rows: number;
  cols: number;
  starts: Int32Array;
  columns: Int32Array;
  values: Float64Array;
}

/** A least-squares solution by the normal equations, with what is needed for its variances. */
export interface DirectLeastSquares {
  x: Float64Array;
  /** (AᵀA)⁻¹ⱼⱼ, the diagonal element of the inverse for column j (Infinity for an empty column). */
  inverseDiagonal(j: number): number;
}

/**
 * Smallest Cholesky pivot l_ii² accepted against the diagonal a_ii of AᵀA: below it the columns
 * are so nearly dependent that the normal equations lose more digits than LSQR would, and the
 * caller solves by LSQR instead.
 */
export const MIN_PIVOT = 1e-10;

/**
 * The least-squares solution of A x ≈ b by the normal equations AᵀA x = Aᵀb, factored by
 * Cholesky in skyline storage (depth/skylineCholesky) with the unknowns in the order given, so
 * that a matrix banded but for a few coupling columns costs little; then one step of iterative
 * refinement (x += (AᵀA)⁻¹ Aᵀ(b − Ax); Björck 1996, Numerical Methods for Least Squares Problems,
 * §2.9). A column with no entries gets x = 0 (the minimum-norm choice, as LSQR from x = 0).
 *
 * Accepted only when every pivot is at least MIN_PIVOT of its diagonal and the solution meets
 * LSQR's stopping rule S1 or S2 at `atol` (‖r‖ ≤ atol (‖b‖ + ‖A‖_F ‖x‖) or ‖Aᵀr‖ ≤ atol ‖A‖_F ‖r‖;
 * Paige & Saunders 1982, §6), so that
 * it is at least as converged as the LSQR solution it stands for.
 *
 * @param order - the columns in the order of elimination (a permutation of 0..cols − 1)
 * @param atol - the tolerance of the stopping rules (atol = btol)
 * @returns undefined when the matrix is (nearly) rank-deficient or the test fails: solve by LSQR
 */
export function directLeastSquares(a: CompressedRows, b: Float64Array, order: Int32Array, atol: number): DirectLeastSquares | undefined {
  const { rows, cols, starts, columns, values } = a;
  const position = new Int32Array(cols).fill(-1);
  order.forEach((c, p) => { position[c] = p; });
  // The envelope: row p of the lower triangle starts at the first position any row couples it to.
  const first = Int32Array.from({ length: cols }, (_, p) => p);
  for (let i = 0; i < rows; i++) {
    let low = cols;
    for (let k = starts[i]; k < starts[i + 1]; k++) low = Math.min(low, position[columns[k]]);
    for (let k = starts[i]; k < starts[i + 1]; k++) {
      const p = position[columns[k]];
      if (low < first[p]) first[p] = low;
    }
  }
  const normal = skyline(first);
  const rhs = new Float64Array(cols);
  for (let i = 0; i < rows; i++) {
    for (let k = starts[i]; k < starts[i + 1]; k++) {
      const p = position[columns[k]];
      const v = values[k];
      rhs[p] += v * b[i];
      for (let q = starts[i]; q < starts[i + 1]; q++) {
        const r = position[columns[q]];
        if (r <= p) normal.values[normal.start[p] + r - first[p]] += v * values[q];
      }
    }
  }
  const diagonal = new Float64Array(cols);
  let frobenius = 0;
  for (let p = 0; p < cols; p++) {
    const at = normal.start[p] + p - first[p];
    diagonal[p] = normal.values[at];
    frobenius += diagonal[p];
    // An empty column: x = 0 there, as from LSQR.
    if (diagonal[p] === 0) normal.values[at] = 1;
  }
  const factor = skylineCholesky(normal);
  if (factor === undefined) return undefined;
  for (let p = 0; p < cols; p++) {
    if (diagonal[p] === 0) continue;
    const l = factor.values[factor.start[p] + p - first[p]];
    if (!(l * l >= MIN_PIVOT * diagonal[p])) return undefined;
  }
  const y = skylineSolve(factor, rhs);
  // Residual r = b − A x and Aᵀ r, in the order of elimination.
  const normalResidual = (r: Float64Array) => {
    const g = new Float64Array(cols);
    let squares = 0;
    for (let i = 0; i < rows; i++) {
      let sum = b[i];
      for (let k = starts[i]; k < starts[i + 1]; k++) sum -= values[k] * y[position[columns[k]]];
      r[i] = sum;
      squares += sum * sum;
      for (let k = starts[i]; k < starts[i + 1]; k++) g[position[columns[k]]] += values[k] * sum;
    }
    for (let p = 0; p < cols; p++) if (diagonal[p] === 0) g[p] = 0;
    return { g, norm: Math.sqrt(squares) };
  };
  const residual = new Float64Array(rows);
  const correction = skylineSolve(factor, normalResidual(residual).g);
  for (let p = 0; p < cols; p++) y[p] += correction[p];
  const { g, norm } = normalResidual(residual);
  let gNorm = 0;
  for (let p = 0; p < cols; p++) gNorm += g[p] * g[p];
  let xNorm = 0;
  let bNorm = 0;
  for (let p = 0; p < cols; p++) xNorm += y[p] * y[p];
  for (let i = 0; i < rows; i++) bNorm += b[i] * b[i];
  const aNorm = Math.sqrt(frobenius);
  const smallResidual = norm <= atol * Math.sqrt(bNorm) + atol * aNorm * Math.sqrt(xNorm);
  if (!(smallResidual || Math.sqrt(gNorm) <= atol * aNorm * norm)) return undefined;
  const x = new Float64Array(cols);
  for (let c = 0; c < cols; c++) x[c] = y[position[c]];
  return { x, inverseDiagonal: (j) => (diagonal[position[j]] === 0 ? Infinity : inverseDiagonalAt(factor, position[j])) };
}

/** (L Lᵀ)⁻¹ₚₚ = ‖L⁻¹ eₚ‖², by forward substitution from row p (L⁻¹ eₚ vanishes above it). */
function inverseDiagonalAt(l: Skyline, p: number): number {
  const { n, first, start, values } = l;
  const z = new Float64Array(n);
  z[p] = 1 / values[start[p] + p - first[p]];
  let sum = z[p] * z[p];
  for (let i = p + 1; i < n; i++) {
    const s = start[i] - first[i];
    let t = 0;
    for (let k = Math.max(first[i], p); k < i; k++) t -= values[s + k] * z[k];
    z[i] = t / values[s + i];
    sum += z[i] * z[i];
  }
  return sum;
}
