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
