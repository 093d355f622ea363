import { parseArgs, type ParseArgsConfig } from 'node:util';
import { InputError } from '../core/errors.js';
import type { Wave } from '../core/types.js';
import type { LengthUnit } from '../core/units.js';
import type { SiteOptions } from '../site/siteAssessment.js';
import { decodeUtf8 } from '../io/decodeUtf8.js';
import type { CliIo } from './io.js';

/** Parses "NAME=VALUE" into its parts, for options like --segments S1:forward=3. */
export function keyValue(option: string, text: string): [string, string] {
  const at = text.lastIndexOf('=');
  if (at <= 0) throw new InputError({}, `--${option} ${text}: expected BRANCH=VALUE, for example S1:forward=3`);
  return [text.slice(0, at), text.slice(at + 1)];
}

/** Parses a number option, with a message naming the option and what was expected. */
export function numberOption(option: string, text: string, expected: string): number {
  const value = Number(text);
  if (text.trim() === '' || !Number.isFinite(value)) throw new InputError({}, `--${option} ${text}: not a number; expected ${expected}`);
  return value;
}

/** Parses a command's options; unknown or malformed options are bad input. */
export function parse(args: string[], options: NonNullable<ParseArgsConfig['options']>) {
  try {
    return parseArgs({ args, options, allowPositionals: true, strict: true });
  } catch (error) {
    const message = (error as Error).message;
    const ambiguous = /Option '(--[\w-]+)' argument is ambiguous/.exec(message);
    if (ambiguous) throw new InputError({}, `${ambiguous[1]}: a value starting with "-" must be joined with "=", for example ${ambiguous[1]}=-6`);
    throw new InputError({}, `${message.split('\n')[0].replace(/\. To specify.*$/s, '')}; see hammerline --help`);
  }
}

/** Options of the site-class Monte Carlo, shared by interpret and site. */
export const SITE_OPTIONS = {
  draws: { type: 'string' },
  seed: { type: 'string' },
} as const;

export function siteOptions(values: Record<string, unknown>): SiteOptions {
  const options: SiteOptions = {};
  if (values.draws !== undefined) {
    options.draws = numberOption('draws', values.draws as string, 'a whole number of at least 2000');
    if (!(Number.isInteger(options.draws) && options.draws >= 2000)) throw new InputError({}, `--draws ${values.draws as string}: expected a whole number of at least 2000`);
  }
  if (values.seed !== undefined) options.seed = numberOption('seed', values.seed as string, 'a whole number');
  return options;
}

export function listOption(option: string, text: string, expected: string): number[] {
  return text.split(',').map((v) => numberOption(option, v, expected));
}

/** Reads a text input (a table) as strict UTF-8: a byte that is not UTF-8 is an error naming its line and field. */
export function readInput(io: CliIo, file: string): string {
  let bytes: Uint8Array;
  try {
    bytes = io.readBytes(file);
  } catch (error) {
    throw new InputError({ file }, `cannot be read (${(error as NodeJS.ErrnoException).code ?? (error as Error).message}); expected a readable first-break table`);
  }
  return decodeUtf8(bytes, file);
}

export function lengthUnitOption(text: string | undefined): LengthUnit {
  if (text === undefined || text === 'm') return 'm';
  if (text === 'ft') return 'ft';
  throw new InputError({}, `--units ${text}: expected m or ft`);
}

export function waveOption(text: string | undefined): Wave | undefined {
  if (text === undefined) return undefined;
  const upper = text.toUpperCase();
  if (upper === 'P' || upper === 'S') return upper;
  throw new InputError({}, `--wave ${text}: expected P or S`);
}
