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

/**
 * Linear interpolation of values given at ascending positions, only inside their range
 * (undefined outside, with a nanometre of slack at the ends).
 *
 * @example
 * linearWithin([0, 10], [1, 3], 5) // 2
 * linearWithin([0, 10], [1, 3], 11) // undefined
 */
export function linearWithin(xs: ArrayLike<number>, values: ArrayLike<number>, x: number): number | undefined {
  const last = xs.length - 1;
  if (last < 0 || x < xs[0] - 1e-9 || x > xs[last] + 1e-9) return undefined;
  let i = 0;
  while (i < last && xs[i + 1] < x) i++;
  if (i === last || Math.abs(xs[i] - x) < 1e-9) return values[i];
  const t = (x - xs[i]) / (xs[i + 1] - xs[i]);
  return values[i] * (1 - t) + values[i + 1] * t;
}
