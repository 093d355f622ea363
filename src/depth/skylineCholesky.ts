/**
 * A symmetric positive-definite matrix in skyline (envelope, profile) storage: row i holds its
 * entries from column first[i] to the diagonal, so a banded matrix, or one banded but for a few
 * full last rows (an "arrow"), costs memory and time in proportion to its envelope, never n².
 * The Cholesky factor of such a matrix has the same envelope (George & Liu 1981, Computer Solution
 * of Large Sparse Positive Definite Systems, ch. 4), and so does the part of the inverse used for
 * variances (Takahashi, Fagan & Chen 1973).
 */
export interface Skyline {
  n: number;
  /** First stored column of each row (at most the row index). */
  first: Int32Array;
  /** Where row i starts in `values`: entry (i, j) is values[start[i] + j - first[i]]. */
  start: Int32Array;
  values: Float64Array;
}

/** An empty skyline matrix with the given first column of each row. */
export function skyline(first: Int32Array): Skyline {
  const n = first.length;
  const start = new Int32Array(n + 1);
  for (let i = 0; i < n; i++) start[i + 1] = start[i] + (i - first[i] + 1);
  return { n, first, start, values: new Float64Array(start[n]) };
}

/** Adds `value` to entry (i, j) of the lower triangle (j ≤ i, j ≥ first[i]). */
export function skylineAdd(a: Skyline, i: number, j: number, value: number): void {
  a.values[a.start[i] + j - a.first[i]] += value;
}

/**
 * Cholesky factor L (A = L Lᵀ) in the same envelope, by the row-oriented recurrence
 * l_ij = (a_ij − Σ_k l_ik l_jk) / l_jj over k from max(first_i, first_j) to j − 1.
 *
 * @returns the factor, or undefined when A is not positive definite
 */
export function skylineCholesky(a: Skyline): Skyline | undefined {
  const { n, first, start } = a;
  const l = new Float64Array(a.values);
  for (let i = 0; i < n; i++) {
    const fi = first[i];
    const si = start[i] - fi;
    for (let j = fi; j <= i; j++) {
      const fj = first[j];
      const sj = start[j] - fj;
      let sum = l[si + j];
      for (let k = fi > fj ? fi : fj; k < j; k++) sum -= l[si + k] * l[sj + k];
      if (j < i) l[si + j] = sum / l[sj + j];
      else {
        if (!(sum > 0)) return undefined;
        l[si + i] = Math.sqrt(sum);
      }
    }
  }
  return { n, first, start, values: l };
}

/** Solves L Lᵀ x = b with the factor from skylineCholesky. */
export function skylineSolve(l: Skyline, b: ArrayLike<number>): Float64Array {
  const { n, first, start, values } = l;
  const x = Float64Array.from(b);
  for (let i = 0; i < n; i++) {
    const s = start[i] - first[i];
    let sum = x[i];
    for (let k = first[i]; k < i; k++) sum -= values[s + k] * x[k];
    x[i] = sum / values[s + i];
  }
  for (let i = n - 1; i >= 0; i--) {
    const s = start[i] - first[i];
    x[i] /= values[s + i];
    const xi = x[i];
    for (let k = first[i]; k < i; k++) x[k] -= values[s + k] * xi;
  }
  return x;
}

/**
 * Diagonal of A⁻¹ from the factor, by Takahashi's recurrence on the envelope: with Z = A⁻¹,
 * Z_ji = −(1/l_ii) Σ_{k>i} l_ki Z_kj for j > i in the envelope of column i, and
 * Z_ii = 1/l_ii² − (1/l_ii) Σ_{k>i} l_ki Z_ki; only entries inside the envelope are needed
 * (Takahashi, Fagan & Chen 1973; Erisman & Tinney 1975, Comm. ACM 18, 177-179).
 */
export function skylineInverseDiagonal(l: Skyline): Float64Array {
  const { n, first, start, values } = l;
  // Rows k > i whose envelope reaches column i: the pattern of column i of L.
  const counts = new Int32Array(n + 1);
  for (let k = 0; k < n; k++) for (let j = first[k]; j < k; j++) counts[j + 1]++;
  for (let j = 0; j < n; j++) counts[j + 1] += counts[j];
  const rows = new Int32Array(counts[n]);
  const fill = counts.slice(0, n);
  for (let k = 0; k < n; k++) for (let j = first[k]; j < k; j++) rows[fill[j]++] = k;
  const z = new Float64Array(values.length);
  const at = (i: number, j: number) => (i >= j ? start[i] + j - first[i] : start[j] + i - first[j]);
  const diagonal = new Float64Array(n);
  for (let i = n - 1; i >= 0; i--) {
    const lii = values[start[i] + i - first[i]];
    const from = counts[i];
    const to = counts[i + 1];
    for (let q = to - 1; q >= from; q--) {
      const j = rows[q];
      let sum = 0;
      for (let p = from; p < to; p++) {
        const k = rows[p];
        sum += values[start[k] + i - first[k]] * z[at(k, j)];
      }
      z[start[j] + i - first[j]] = -sum / lii;
    }
    let sum = 0;
    for (let p = from; p < to; p++) {
      const k = rows[p];
      sum += values[start[k] + i - first[k]] * z[start[k] + i - first[k]];
    }
    const zii = 1 / (lii * lii) - sum / lii;
    z[start[i] + i - first[i]] = zii;
    diagonal[i] = zii;
  }
  return diagonal;
}
