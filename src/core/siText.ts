import { formatLength, formatVelocity, type LengthUnit } from './units.js';

/** A length or velocity inside a sentence, kept in SI so each edge can print it in its own unit. */
export interface Quantity {
  kind: 'length' | 'velocity';
  /** Value(s) in metres or m/s; several print as a list or a range. */
  values: number[];
  /** Decimals to print. */
  digits: number;
  /** Between several values: ", " for a list, "-" for a range. */
  joiner: string;
}

/** A sentence made of text and quantities in SI: `text` is its SI rendering. */
export interface SiText {
  text: string;
  parts: (string | Quantity)[];
}

/** A length in metres (or several) for an si`` sentence. */
export function len(metres: number | number[], digits = 1, joiner = ', '): Quantity {
  return { kind: 'length', values: Array.isArray(metres) ? metres : [metres], digits, joiner };
}

/** A velocity in m/s (or several) for an si`` sentence. */
export function vel(mps: number | number[], digits = 0, joiner = ', '): Quantity {
  return { kind: 'velocity', values: Array.isArray(mps) ? mps : [mps], digits, joiner };
}

function isQuantity(value: unknown): value is Quantity {
  return typeof value === 'object' && value !== null && 'kind' in value && 'values' in value;
}

/**
 * A tagged template for sentences with quantities: si`a layer ${len(4.7)} thick` keeps 4.7 m as
 * a quantity, so the summary can print it in feet while the JSON keeps metres.
 */
export function si(strings: TemplateStringsArray, ...values: unknown[]): SiText {
  const parts: (string | Quantity)[] = [];
  strings.forEach((s, i) => {
    if (s !== '') parts.push(s);
    if (i < values.length) parts.push(isQuantity(values[i]) ? values[i] as Quantity : String(values[i]));
  });
  return { text: renderParts(parts, 'm'), parts };
}

/** The sentence in the given unit: lengths in ft and velocities in ft/s with the SI value in brackets. */
export function renderParts(parts: (string | Quantity)[], unit: LengthUnit): string {
  return parts.map((p) => {
    if (typeof p === 'string') return p;
    return p.kind === 'length' ? formatLength(p.values, unit, p.digits, p.joiner) : formatVelocity(p.values, unit, p.digits, p.joiner);
  }).join('');
}

/** Whether a message is an si`` sentence rather than plain text. */
export function isSiText(message: string | SiText): message is SiText {
  return typeof message !== 'string';
}
