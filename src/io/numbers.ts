/** A number rounded to `digits` decimals for a JSON document, or null where there is none. */
export function round(value: number | undefined, digits: number): number | null {
  return value === undefined || !Number.isFinite(value) ? null : Number(value.toFixed(digits));
}

/** A number with at most `digits` decimals as CSV text (trailing zeros dropped), or '' where there is none. */
export function decimal(value: number | undefined, digits: number): string {
  return value === undefined || !Number.isFinite(value) ? '' : Number(value.toFixed(digits)).toString();
}
