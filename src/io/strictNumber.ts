/** A plain decimal number as people write it in tables and headers: digits, one point, an exponent. */
const DECIMAL = /^[+-]?(\d+\.?\d*|\.\d+)([eE][+-]?\d+)?$/;

/**
 * Parses a plain decimal number, strictly: no hexadecimal (`0x10`), no `NaN` or `Infinity`, no
 * decimal comma, no blanks inside, and only finite values. JavaScript's Number() accepts the first
 * two and turns the empty string into 0, so readers use this instead.
 *
 * @returns the number, or undefined when the text is not one
 * @example
 * parseDecimal('-6.5e-1') // -0.65
 * parseDecimal('0x10') // undefined
 */
export function parseDecimal(text: string): number | undefined {
  const trimmed = text.trim();
  if (!DECIMAL.test(trimmed)) return undefined;
  const value = Number(trimmed);
  return Number.isFinite(value) ? value : undefined;
}

/** Parses a whole number (optional sign and digits only), strictly. */
export function parseInteger(text: string): number | undefined {
  const trimmed = text.trim();
  if (!/^[+-]?\d+$/.test(trimmed)) return undefined;
  const value = Number(trimmed);
  return Number.isSafeInteger(value) ? value : undefined;
}

/** Why a text is not a plain decimal number, for the message: a hint where one is likely. */
export function notANumberHint(text: string): string {
  const trimmed = text.trim();
  if (/^[+-]?\d+,\d+$/.test(trimmed)) return ' (a decimal comma; write a decimal point)';
  if (/^[+-]?0[xXoObB]/.test(trimmed)) return ' (hexadecimal, octal or binary notation is not read)';
  if (/^[+-]?(nan|inf|infinity)$/i.test(trimmed)) return ' (not a value)';
  if (DECIMAL.test(trimmed)) return ' (too large to hold)';
  return '';
}
