/** A linear operator given by its products, so that no matrix need be stored densely. */
export interface LinearOperator {
  rows: number;
  cols: number;
  /** y += A x (x of length cols, y of length rows). */
  multiply(x: Float64Array, y: Float64Array): void;
  /** x += Aᵀ y (y of length rows, x of length cols). */
  multiplyTranspose(y: Float64Array, x: Float64Array): void;
}

export interface LsqrOptions {
  /** Damping λ: minimises ‖Ax − b‖² + λ²‖x‖²; default 0. */
  damp?: number;
  /** Relative tolerance on ‖Aᵀr‖ (and on A's entries); default 1e-10. */
  atol?: number;
  /** Relative tolerance on ‖r‖ against ‖b‖; default 1e-10. */
  btol?: number;
  /** Iteration limit; default 4 × cols + 50. */
  maxIterations?: number;
}

export interface LsqrResult {
  x: Float64Array;
  iterations: number;
  /** ‖b − Ax‖ (with damping, of the augmented system), as estimated by the recurrence. */
  residualNorm: number;
  /** Why it stopped: 'b is zero', 'residual small', 'normal equations met' or 'iteration limit'. */
  stop: string;
}

/**
 * LSQR: the least-squares solution of Ax ≈ b (optionally damped) by Golub-Kahan
 * bidiagonalisation, using only products with A and Aᵀ (Paige & Saunders 1982, ACM Trans. Math.
 * Softw. 8, 43-71, algorithm LSQR of §4 with the damped variant of §4.1 and stopping rules S1, S2
 * of §6). Mathematically equivalent to conjugate gradients on the normal equations, but stabler.
 * On a rank-deficient A it converges to the minimum-norm solution from x = 0.
 *
 * @param operator - A as products (rows × cols)
 * @param b - right-hand side, length rows
 * @throws Error when b's length is not the operator's row count
 * @example
 * // A = [[1, 0], [0, 2], [1, 1]], b = [1, 2, 2]: x = [1, 1] exactly.
 */
export function lsqr(operator: LinearOperator, b: Float64Array, options: LsqrOptions = {}): LsqrResult {
  const { rows, cols } = operator;
  if (b.length !== rows) throw new Error(`lsqr needs b of length ${rows}; got ${b.length}`);
  const damp = options.damp ?? 0;
  const atol = options.atol ?? 1e-10;
  const btol = options.btol ?? 1e-10;
  const maxIterations = options.maxIterations ?? 4 * cols + 50;
  const x = new Float64Array(cols);
  const u = Float64Array.from(b);
  const v = new Float64Array(cols);
  const w = new Float64Array(cols);
  let beta = norm(u);
  const bNorm = beta;
  if (beta === 0) return { x, iterations: 0, residualNorm: 0, stop: 'b is zero' };
  scale(u, 1 / beta);
  operator.multiplyTranspose(u, v);
  let alpha = norm(v);
  if (alpha === 0) return { x, iterations: 0, residualNorm: beta, stop: 'normal equations met' };
  scale(v, 1 / alpha);
  w.set(v);
  let phiBar = beta;
  let rhoBar = alpha;
  // Running estimate of the Frobenius norm of A (for the stopping rules) and of ‖x‖.
  let aNormSquared = 0;
  let xNorm = 0;
  let residualNorm = beta;
  let iterations = 0;
  let stop = 'iteration limit';
  while (iterations < maxIterations) {
    iterations++;
    // Bidiagonalisation: β u = A v − α u, α v = Aᵀ u − β v.
    scale(u, -alpha);
    operator.multiply(v, u);
    beta = norm(u);
    if (beta > 0) {
      scale(u, 1 / beta);
      aNormSquared += alpha * alpha + beta * beta + damp * damp;
      scale(v, -beta);
      operator.multiplyTranspose(u, v);
      alpha = norm(v);
      if (alpha > 0) scale(v, 1 / alpha);
    }
    // Eliminate the damping (a plane rotation), then the subdiagonal β.
    const rhoBar1 = Math.hypot(rhoBar, damp);
    const c1 = rhoBar / rhoBar1;
    const s1 = damp / rhoBar1;
    const psi = s1 * phiBar;
    phiBar = c1 * phiBar;
    const rho = Math.hypot(rhoBar1, beta);
    const c = rhoBar1 / rho;
    const s = beta / rho;
    const theta = s * alpha;
    rhoBar = -c * alpha;
    const phi = c * phiBar;
    phiBar = s * phiBar;
    const step = phi / rho;
    const back = theta / rho;
    let xSquared = 0;
    for (let j = 0; j < cols; j++) {
      x[j] += step * w[j];
      w[j] = v[j] - back * w[j];
      xSquared += x[j] * x[j];
    }
    xNorm = Math.sqrt(xSquared);
    residualNorm = Math.hypot(phiBar, psi);
    const aNorm = Math.sqrt(aNormSquared);
    const normalResidual = Math.abs(phiBar * alpha * c);
    // S1: the residual is as small as the data allow; S2: the normal equations hold.
    if (residualNorm <= btol * bNorm + atol * aNorm * xNorm) { stop = 'residual small'; break; }
    if (normalResidual <= atol * aNorm * residualNorm) { stop = 'normal equations met'; break; }
    if (beta === 0 || alpha === 0) { stop = 'normal equations met'; break; }
  }
  return { x, iterations, residualNorm, stop };
}

function norm(a: Float64Array): number {
  let sum = 0;
  for (let i = 0; i < a.length; i++) sum += a[i] * a[i];
  return Math.sqrt(sum);
}

function scale(a: Float64Array, factor: number): void {
  for (let i = 0; i < a.length; i++) a[i] *= factor;
}
