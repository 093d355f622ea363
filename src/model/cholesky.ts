/**
 * Cholesky factor L of a symmetric positive-definite matrix A = L Lᵀ (row-major, n × n), by the
 * Cholesky-Banachiewicz recurrence; undefined when A is not positive definite.
 */
export function choleskyFactor(a: Float64Array, n: number): Float64Array | undefined {
  const l = new Float64Array(n * n);
  for (let i = 0; i < n; i++) {
    for (let j = 0; j <= i; j++) {
      let sum = a[i * n + j];
      const ri = i * n;
      const rj = j * n;
      for (let k = 0; k < j; k++) sum -= l[ri + k] * l[rj + k];
      if (i === j) {
        if (!(sum > 0)) return undefined;
        l[ri + i] = Math.sqrt(sum);
      } else {
        l[ri + j] = sum / l[rj + j];
      }
    }
  }
  return l;
}

/** Solves L Lᵀ x = b by forward and back substitution. */
export function choleskySolve(l: Float64Array, n: number, b: Float64Array): Float64Array {
  const y = new Float64Array(n);
  for (let i = 0; i < n; i++) {
    let sum = b[i];
    for (let k = 0; k < i; k++) sum -= l[i * n + k] * y[k];
    y[i] = sum / l[i * n + i];
  }
  const x = new Float64Array(n);
  for (let i = n - 1; i >= 0; i--) {
    let sum = y[i];
    for (let k = i + 1; k < n; k++) sum -= l[k * n + i] * x[k];
    x[i] = sum / l[i * n + i];
  }
  return x;
}

/** The inverse (L Lᵀ)⁻¹ = L⁻ᵀ L⁻¹ from the Cholesky factor, row-major n × n. */
export function choleskyInverse(l: Float64Array, n: number): Float64Array {
  // L⁻¹ by forward substitution (lower triangular), then its Gram product.
  const inv = new Float64Array(n * n);
  for (let j = 0; j < n; j++) {
    inv[j * n + j] = 1 / l[j * n + j];
    for (let i = j + 1; i < n; i++) {
      let sum = 0;
      for (let k = j; k < i; k++) sum -= l[i * n + k] * inv[k * n + j];
      inv[i * n + j] = sum / l[i * n + i];
    }
  }
  const out = new Float64Array(n * n);
  for (let i = 0; i < n; i++) {
    for (let j = 0; j <= i; j++) {
      let sum = 0;
      for (let k = i; k < n; k++) sum += inv[k * n + i] * inv[k * n + j];
      out[i * n + j] = sum;
      out[j * n + i] = sum;
    }
  }
  return out;
}
