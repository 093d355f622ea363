/** Length units accepted at the edges of the program. Inside, everything is metres. */
export type LengthUnit = 'm' | 'ft';

/** International foot, in metres (exact by definition since 1959). */
export const METRES_PER_FOOT = 0.3048;

/** Converts a length in the given unit to metres. */
export function toMetres(value: number, unit: LengthUnit): number {
  return unit === 'ft' ? value * METRES_PER_FOOT : value;
}

/** Converts a length in metres to the given unit. */
export function fromMetres(value: number, unit: LengthUnit): number {
  return unit === 'ft' ? value / METRES_PER_FOOT : value;
}

/** Unit label for velocities ("m/s" or "ft/s"). */
export function velocityLabel(unit: LengthUnit): string {
  return unit === 'ft' ? 'ft/s' : 'm/s';
}

/**
 * A length in metres for display: in metres, or in feet with the metric value after it in
 * brackets ("15.4 ft [4.7 m]"), rounded to `digits` decimals (positions then print as 1.5, never
 * as 0.45720000000000005). 1 ft = 0.3048 m exactly.
 *
 * @param metres - one value, or several printed as a list ("12.0, 14.0 m") or a range ("1450-1650")
 * @example
 * formatLength(4.7, 'ft', 1) // "15.4 ft [4.7 m]"
 */
export function formatLength(metres: number | number[], unit: LengthUnit, digits: number, joiner = ', '): string {
  return formatValues(metres, unit, digits, joiner, 'm', 'ft');
}

/** A velocity in m/s for display: in m/s, or in ft/s with the m/s value after it in brackets. */
export function formatVelocity(mps: number | number[], unit: LengthUnit, digits = 0, joiner = ', '): string {
  return formatValues(mps, unit, digits, joiner, 'm/s', 'ft/s');
}

function formatValues(si: number | number[], unit: LengthUnit, digits: number, joiner: string, siLabel: string, ftLabel: string): string {
  const values = Array.isArray(si) ? si : [si];
  const text = (list: number[]) => list.map((v) => fixed(v, digits)).join(joiner);
  if (unit === 'm') return `${text(values)} ${siLabel}`;
  return `${text(values.map((v) => v / METRES_PER_FOOT))} ${ftLabel} [${text(values)} ${siLabel}]`;
}

/** toFixed without a negative zero ("-0.0" prints as "0.0"). */
function fixed(value: number, digits: number): string {
  const text = value.toFixed(digits);
  return /^-0(\.0*)?$/.test(text) ? text.slice(1) : text;
}

/**
 * A standard error printed with `digits` decimals, or with up to two more when it would otherwise
 * read as zero ("± 0" says exact, which a rounded 0.3 m/s is not): 0.3 at whole units prints
 * "0.3"; one too small even then prints "< 0.01" (at whole units). A standard error of exactly
 * zero (none given) prints as zero.
 */
export function formatSe(se: number, digits: number): string {
  if (!(se > 0)) return se.toFixed(digits);
  const d = seDecimals(se, digits);
  return Number(se.toFixed(d)) > 0 ? se.toFixed(d) : `< ${(10 ** -d).toFixed(d)}`;
}

/** Decimals a positive standard error needs not to print as zero: `digits`, or up to two more. */
export function seDecimals(se: number, digits: number): number {
  for (let d = digits; d < digits + 2; d++) if (Number(se.toFixed(d)) > 0) return d;
  return digits + 2;
}
