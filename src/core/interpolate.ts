/**
 * Linear interpolation of values given at ascending positions, holding the end values beyond
 * the first and last position (ground elevations along a line, for example).
 *
 * @param xs - positions, ascending, at least one
 * @param values - the value at each position
 * @example
 * linearAt([0, 10], [100, 102], 5) // 101
 */
export function linearAt(xs: number[], values: number[], x: number): number {
  if (x <= xs[0]) return values[0];
  const last = xs.length - 1;
  if (x >= xs[last]) return values[last];
  let i = 1;
  while (xs[i] < x) i++;
  const t = (x - xs[i - 1]) / (xs[i] - xs[i - 1]);
  return values[i - 1] * (1 - t) + values[i] * t;
}
