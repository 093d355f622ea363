import { formatLocation, type InputLocation } from './errors.js';
import { isSiText, type Quantity, type SiText } from './siText.js';

/** A caution or a probable mistake that does not stop the work. */
export interface Warning {
  /** Stable machine-readable code, for example "velocity-inversion". */
  code: string;
  /** One sentence for the user, with the values that triggered it and advice (SI units). */
  message: string;
  /**
   * The same sentence as text and quantities in SI, when it was written with si``: the command
   * line prints its lengths and velocities in the unit the user chose.
   */
  parts?: (string | Quantity)[];
  /** Where it applies, when it concerns a particular input. */
  where?: InputLocation;
  /** Refractor or layer index it qualifies (1 = top layer), when it qualifies one. */
  layer?: number;
}

/** Rounds the float artefacts of unit conversions (0.45720000000000005 -> 0.4572) in plain messages. */
export function tidyNumbers(text: string): string {
  return text.replace(/-?\d+\.\d{6,}/g, (n) => String(Number(Number(n).toFixed(4))));
}

/**
 * The one helper through which every warning passes, so that tests can count them and the
 * command line, the web app and the report show the same list.
 */
export class WarningLog {
  readonly items: Warning[] = [];

  add(code: string, message: string | SiText, extra: { where?: InputLocation; layer?: number } = {}): void {
    const prefix = extra.where ? formatLocation(extra.where) : '';
    const text = isSiText(message) ? message.text : tidyNumbers(message);
    const parts = isSiText(message) ? { parts: prefix ? [`${prefix}: `, ...message.parts] : message.parts } : {};
    this.items.push({ code, message: prefix ? `${prefix}: ${text}` : text, ...parts, ...extra });
  }

  /** Warnings with the given code. */
  withCode(code: string): Warning[] {
    return this.items.filter((w) => w.code === code);
  }
}
