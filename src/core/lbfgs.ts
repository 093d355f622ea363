/** Options of the bounded L-BFGS minimiser. */
export interface LbfgsOptions {
  /** Number of correction pairs kept; default 7. */
  memory?: number;
  /** Largest number of iterations; default 50. */
  maxIterations?: number;
  /** Stop when the objective falls by less than this fraction in an iteration; default 1e-4. */
  relativeTolerance?: number;
  /** Lower and upper bound of every parameter (the step is projected onto the box). */
  lower?: number;
  upper?: number;
  /** Called after every accepted iteration with the objective; return false to stop. */
  onIteration?: (iteration: number, value: number, x: Float64Array) => boolean | void;
}

/**
 * Minimises f by limited-memory BFGS (Nocedal 1980, Math. Comp. 35, 773-782; the two-loop
 * recursion of Nocedal & Wright 2006, Algorithm 7.4) with the steps projected onto box bounds and
 * a backtracking Armijo line search. `evaluate` returns the objective and writes its gradient.
 *
 * @param evaluate - f(x), writing ∇f(x) into `gradient`
 * @param start - starting parameters (not modified)
 * @returns the parameters reached, their objective, and the iterations taken
 * @example
 * // f = (x − 3)²: minimise from 0 → x ≈ 3 in two or three iterations
 */
export function lbfgs(evaluate: (x: Float64Array, gradient: Float64Array) => number, start: Float64Array, options: LbfgsOptions = {}): { x: Float64Array; value: number; iterations: number } {
  const n = start.length;
  const memory = options.memory ?? 7;
  const maxIterations = options.maxIterations ?? 50;
  const tolerance = options.relativeTolerance ?? 1e-4;
  const lower = options.lower ?? -Infinity;
  const upper = options.upper ?? Infinity;
  const clamp = (v: number) => Math.min(upper, Math.max(lower, v));
  let x = Float64Array.from(start, clamp);
  let gradient = new Float64Array(n);
  let value = evaluate(x, gradient);
  const sList: Float64Array[] = [];
  const yList: Float64Array[] = [];
  const rhoList: number[] = [];
  const direction = new Float64Array(n);
  const alpha = new Float64Array(memory);
  let iterations = 0;
  for (; iterations < maxIterations; iterations++) {
    // Two-loop recursion: direction = −H ∇f.
    for (let i = 0; i < n; i++) direction[i] = -gradient[i];
    for (let m = sList.length - 1; m >= 0; m--) {
      alpha[m] = rhoList[m] * dot(sList[m], direction);
      axpy(-alpha[m], yList[m], direction);
    }
    if (sList.length > 0) {
      const last = sList.length - 1;
      const gamma = dot(sList[last], yList[last]) / dot(yList[last], yList[last]);
      for (let i = 0; i < n; i++) direction[i] *= gamma;
    } else {
      const norm = Math.sqrt(dot(gradient, gradient));
      if (norm === 0) break;
      const scale = 1 / norm;
      for (let i = 0; i < n; i++) direction[i] *= scale;
    }
    for (let m = 0; m < sList.length; m++) {
      const beta = rhoList[m] * dot(yList[m], direction);
      axpy(alpha[m] - beta, sList[m], direction);
    }
    // Parameters held at a bound by the gradient do not move.
    for (let i = 0; i < n; i++) {
      if ((x[i] <= lower && direction[i] < 0) || (x[i] >= upper && direction[i] > 0)) direction[i] = 0;
    }
    let slope = dot(gradient, direction);
    if (!(slope < 0)) {
      // Not a descent direction: restart from steepest descent.
      sList.length = 0;
      yList.length = 0;
      rhoList.length = 0;
      for (let i = 0; i < n; i++) direction[i] = -gradient[i];
      slope = -dot(gradient, gradient);
      if (slope === 0) break;
    }
    let step = 1;
    let accepted = false;
    const trial = new Float64Array(n);
    const trialGradient = new Float64Array(n);
    let trialValue = value;
    for (let tries = 0; tries < 30; tries++) {
      for (let i = 0; i < n; i++) trial[i] = clamp(x[i] + step * direction[i]);
      trialValue = evaluate(trial, trialGradient);
      let moved = 0;
      for (let i = 0; i < n; i++) moved += gradient[i] * (trial[i] - x[i]);
      if (Number.isFinite(trialValue) && trialValue <= value + 1e-4 * moved) {
        accepted = true;
        break;
      }
      step *= 0.5;
    }
    if (!accepted) break;
    const s = new Float64Array(n);
    const y = new Float64Array(n);
    for (let i = 0; i < n; i++) {
      s[i] = trial[i] - x[i];
      y[i] = trialGradient[i] - gradient[i];
    }
    const sy = dot(s, y);
    if (sy > 1e-12 * Math.sqrt(dot(s, s) * dot(y, y))) {
      if (sList.length === memory) {
        sList.shift();
        yList.shift();
        rhoList.shift();
      }
      sList.push(s);
      yList.push(y);
      rhoList.push(1 / sy);
    }
    const previous = value;
    x = trial;
    gradient = trialGradient;
    value = trialValue;
    if (options.onIteration?.(iterations + 1, value, x) === false) {
      iterations++;
      break;
    }
    if (previous - value < tolerance * Math.abs(previous)) {
      iterations++;
      break;
    }
  }
  return { x, value, iterations };
}

function dot(a: Float64Array, b: Float64Array): number {
  let sum = 0;
  for (let i = 0; i < a.length; i++) sum += a[i] * b[i];
  return sum;
}

function axpy(a: number, x: Float64Array, y: Float64Array): void {
  for (let i = 0; i < x.length; i++) y[i] += a * x[i];
}
