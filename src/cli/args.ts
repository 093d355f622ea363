import { InputError } from '../core/errors.js';

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
