/**
 * First-order (delta-method) propagation of independent standard errors through a function,
 * with central-difference derivatives: se(f) = sqrt(Σ (∂f/∂pᵢ · σᵢ)²).
 *
 * @param f - the function of the parameter vector
 * @param params - parameter values
 * @param ses - standard error of each parameter, same units as the parameter
 * @returns the standard error of f, or NaN when f is not finite near the parameters
 * @example
 * propagate(([a, b]) => a + b, [1, 2], [0.3, 0.4]) // 0.5
 */
export function propagate(f: (p: number[]) => number, params: number[], ses: number[]): number {
  let variance = 0;
  for (let i = 0; i < params.length; i++) {
    const sigma = ses[i];
    if (!(sigma > 0)) continue;
    // A step of a tenth of a standard error keeps the difference in the locally linear range.
    const step = sigma * 0.1;
    const up = [...params];
    const down = [...params];
    up[i] += step;
    down[i] -= step;
    const derivative = (f(up) - f(down)) / (2 * step);
    variance += (derivative * sigma) ** 2;
  }
  return Math.sqrt(variance);
}
