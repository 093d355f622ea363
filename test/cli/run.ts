import { readFileSync } from 'node:fs';
import type { CliIo } from '../../src/cli/io.js';
import { main } from '../../src/cli/main.js';

/** Runs the command line in memory: files given here are read from the map, others from disk. */
export function run(argv: string[], files: Record<string, string> = {}) {
  let stdout = '';
  let stderr = '';
  const written: Record<string, string> = {};
  const io: CliIo = {
    stdout: (t) => { stdout += t; },
    stderr: (t) => { stderr += t; },
    readText: (path) => (path in files ? files[path] : readFileSync(path, 'utf8')),
    readBytes: (path) => (path in files ? new TextEncoder().encode(files[path]) : new Uint8Array(readFileSync(path))),
    writeText: (path, text) => { written[path] = text; },
  };
  const code = main(argv, io);
  return { code, stdout, stderr, written };
}

/** Working notes on where the code's values came from: never in what the user reads. */
export const WORKING_NOTES = /reproduction|recalled|not confirmed|our convention|checked against public|public (copy|table|agency|reproduction)|from memory|provenance|\[memory\]|\[partial\]|\[public\]/i;
