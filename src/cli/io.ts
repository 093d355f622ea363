import { randomBytes } from 'node:crypto';
import { readFileSync, renameSync, rmSync, writeFileSync } from 'node:fs';
import { basename, dirname, join } from 'node:path';

/** What the command line touches outside itself, so tests can run it in memory. */
export interface CliIo {
  stdout: (text: string) => void;
  stderr: (text: string) => void;
  readText: (path: string) => string;
  readBytes: (path: string) => Uint8Array;
  /** Writes a file whole or not at all: a half-written file never replaces a good one. */
  writeText: (path: string, text: string) => void;
}

/** Writes to a temporary file beside the target, then renames it over the target (atomic on one file system). */
export function writeAtomic(path: string, text: string): void {
  const temporary = join(dirname(path), `.${basename(path)}.${randomBytes(4).toString('hex')}.tmp`);
  try {
    writeFileSync(temporary, text);
    renameSync(temporary, path);
  } catch (error) {
    rmSync(temporary, { force: true });
    throw error;
  }
}

export const processIo: CliIo = {
  stdout: (text) => process.stdout.write(text),
  stderr: (text) => process.stderr.write(text),
  readText: (path) => readFileSync(path, 'utf8'),
  readBytes: (path) => new Uint8Array(readFileSync(path)),
  writeText: writeAtomic,
};
