import { formatLocation, type InputLocation } from './errors.js';

/** A caution or a probable mistake that does not stop the work. */
export interface Warning {
  /** Stable machine-readable code, for example "velocity-inversion". */
  code: string;
  /** One sentence for the user, with the values that triggered it and advice. */
  message: string;
  /** Where it applies, when it concerns a particular input. */
  where?: InputLocation;
  /** Refractor or layer index it qualifies (1 = top layer), when it qualifies one. */
  layer?: number;
}

/**
 * The one helper through which every warning passes, so that tests can count them and the
 * command line, the web app and the report show the same list.
 */
export class WarningLog {
  readonly items: Warning[] = [];

  add(code: string, message: string, extra: { where?: InputLocation; layer?: number } = {}): void {
    const prefix = extra.where ? formatLocation(extra.where) : '';
    this.items.push({ code, message: prefix ? `${prefix}: ${message}` : message, ...extra });
  }

  /** Warnings with the given code. */
  withCode(code: string): Warning[] {
    return this.items.filter((w) => w.code === code);
  }
}
