/**
 * Smallest and largest of a list, by a loop: `Math.min(...values)` passes every value as an
 * argument and overflows the call stack beyond about a hundred thousand of them.
 *
 * @returns Infinity (minOf) or -Infinity (maxOf) for an empty list, as Math.min() and Math.max() do
 * @example
 * minOf([3, 1, 2]) // 1
 */
export function minOf(values: ArrayLike<number>): number {
  let least = Infinity;
  for (let i = 0; i < values.length; i++) if (values[i] < least || Number.isNaN(values[i])) least = Number.isNaN(least) ? least : values[i];
  return least;
}

/** Largest of a list, by a loop (see minOf). */
export function maxOf(values: ArrayLike<number>): number {
  let most = -Infinity;
  for (let i = 0; i < values.length; i++) if (values[i] > most || Number.isNaN(values[i])) most = Number.isNaN(most) ? most : values[i];
  return most;
}

/** Appends every item to the target, by a loop: `target.push(...items)` overflows the call stack for long lists. */
export function pushAll<T>(target: T[], items: Iterable<T>): T[] {
  for (const item of items) target.push(item);
  return target;
}
