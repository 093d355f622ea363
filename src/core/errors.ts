/**
 * Where in the user's input a problem was found. Every field is optional because a problem may
 * concern a whole file (a missing column) or a single cell (a non-numeric time).
 */
export interface InputLocation {
  /** File name as the user gave it. */
  file?: string;
  /** 1-based row number in the file, counting the header as row 1. */
  row?: number;
  /** Column or field name. */
  column?: string;
  /** Source id, for problems of a whole branch. */
  source?: string;
  /** 1-based trace number, for shot records. */
  trace?: number;
}

/** Formats a location as "file.csv, row 12, column time_ms". */
export function formatLocation(where: InputLocation): string {
  const parts: string[] = [];
  if (where.file !== undefined) parts.push(where.file);
  if (where.row !== undefined) parts.push(`row ${where.row}`);
  if (where.trace !== undefined) parts.push(`trace ${where.trace}`);
  if (where.column !== undefined) parts.push(`column ${where.column}`);
  if (where.source !== undefined) parts.push(`source ${where.source}`);
  return parts.join(', ');
}

/**
 * Bad input from the user: the command line exits with status 2 and prints the message alone.
 * The message has one shape: where, what was found, what was expected.
 */
export class InputError extends Error {
  readonly where: InputLocation;
  constructor(where: InputLocation, message: string) {
    const prefix = formatLocation(where);
    super(prefix ? `${prefix}: ${message}` : message);
    this.name = 'InputError';
    this.where = where;
  }
}

/** Several input errors found in one pass, reported together so the user can fix them at once. */
export class InputErrors extends InputError {
  readonly errors: InputError[];
  constructor(errors: InputError[]) {
    super({}, errors.map((e) => e.message).join('\n'));
    this.name = 'InputErrors';
    this.errors = errors;
  }
}
