import { decimal } from './numbers.js';

/**
 * First characters that make a spreadsheet read a cell as a formula: =, +, -, @, tab and carriage
 * return (OWASP, "CSV Injection"; the same list the guidance gives).
 */
const FORMULA_START = /^[=+\-@\t\r]/;
/** A plain decimal number ("-6", "+1.5", "2e3"): a spreadsheet reads it as a number, never as a formula. */
const PLAIN_NUMBER = /^[+-]?(\d+\.?\d*|\.\d+)([eE][+-]?\d+)?$/;

/**
 * One text cell of a CSV file (RFC 4180) that a spreadsheet will not run: a cell beginning with a
 * formula character gets a leading single quote (OWASP CSV injection guidance), unless it is a
 * plain number; a cell holding a comma, a double quote, a tab or a line break is quoted, inner quotes
 * doubled. Every CSV the program writes passes its text cells through here.
 *
 * @param text - the cell as it should read
 * @param neutralise - false only for a table the program reads back itself (never written to a file)
 * @example
 * csvText('=1+1') // "'=1+1"
 * csvText('a,b') // '"a,b"'
 * csvText('-6') // '-6'
 */
export function csvText(text: string, neutralise = true): string {
  const safe = neutralise && FORMULA_START.test(text) && !PLAIN_NUMBER.test(text) ? `'${text}` : text;
  return /[",\r\n\t]/.test(safe) ? `"${safe.replace(/"/g, '""')}"` : safe;
}

/**
 * A number cell with at most `digits` decimals (trailing zeros dropped), '' where there is none;
 * numbers are written as numbers, never neutralised.
 */
export function csvNumber(value: number | undefined, digits: number): string {
  return decimal(value, digits);
}

/**
 * A comment line above a CSV header: the text as one cell starting with `#` (quoted when it holds
 * a comma or a quote, so that no part of it becomes a cell of its own), line breaks made spaces.
 */
export function csvComment(text: string): string {
  return csvText(`# ${text.replace(/[\r\n]+/g, ' ')}`);
}
