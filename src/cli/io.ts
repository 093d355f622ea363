import { randomBytes } from 'node:crypto';
import { readFileSync, realpathSync, renameSync, rmSync, statSync, writeFileSync } from 'node:fs';
import { basename, dirname, join, resolve } from 'node:path';
import { InputError } from '../core/errors.js';

/** What the command line touches outside itself, so tests can run it in memory. */
export interface CliIo {
  stdout: (text: string) => void;
  stderr: (text: string) => void;
  readText: (path: string) => string;
  readBytes: (path: string) => Uint8Array;
  /** Writes a file whole or not at all: a half-written file never replaces a good one. */
  writeText: (path: string, text: string) => void;
}

/** Error codes of a write that the user can fix (a missing or read-only folder, a folder as target). */
const USER_WRITE_ERRORS: Record<string, string> = {
  ENOENT: 'its folder does not exist',
  ENOTDIR: 'a part of its folder path is a file, not a folder',
  EACCES: 'permission denied',
  EPERM: 'permission denied',
  EROFS: 'the file system is read-only',
  EISDIR: 'it is a folder',
  ENOSPC: 'the disk is full',
  EDQUOT: 'the disk quota is exceeded',
  ENAMETOOLONG: 'the name is too long',
};

/**
 * Writes to a temporary file beside the target, then renames it over the target (atomic on one
 * file system). A write the user can fix (missing or read-only folder, a folder as target) is an
 * InputError naming the file; the target is left as it was.
 */
export function writeAtomic(path: string, text: string): void {
  const temporary = join(dirname(path), `.${basename(path)}.${randomBytes(4).toString('hex')}.tmp`);
  try {
    writeFileSync(temporary, text);
    renameSync(temporary, path);
  } catch (error) {
    rmSync(temporary, { force: true });
    const code = (error as NodeJS.ErrnoException).code ?? '';
    if (code in USER_WRITE_ERRORS) {
      throw new InputError({ file: path }, `cannot be written (${code}: ${USER_WRITE_ERRORS[code]}); expected a file path in an existing folder you may write to`);
    }
    throw error;
  }
}

/** The identity of a path on disk: its real path (links resolved) and, when it exists, device and inode (hard links). */
function identity(path: string): { real: string; inode?: string } {
  try {
    const stat = statSync(path);
    return { real: realpathSync(path), inode: `${stat.dev}:${stat.ino}` };
  } catch {
    // A file that does not exist yet: its folder may still be a link to an input's folder.
    try {
      return { real: join(realpathSync(dirname(resolve(path))), basename(path)) };
    } catch {
      return { real: resolve(path) };
    }
  }
}

function same(a: { real: string; inode?: string }, b: { real: string; inode?: string }): boolean {
  return a.real === b.real || (a.inode !== undefined && a.inode === b.inode);
}

/**
 * Refuses any output path that is an input path or another output path, compared by real path
 * (symbolic links resolved) and by device and inode (hard links), so that no input is ever
 * replaced by a result. Call it before reading anything.
 *
 * @param inputs - every file the command reads (tables, records, station tables, the P line)
 * @param outputs - option name and path of every file the command writes
 * @throws InputError naming the option and both paths
 */
export function checkOutputPaths(inputs: string[], outputs: { option: string; path: string | undefined }[]): void {
  const given = outputs.filter((o): o is { option: string; path: string } => o.path !== undefined);
  const inputIds = inputs.map((file) => ({ file, id: identity(file) }));
  const seen: { option: string; path: string; id: { real: string; inode?: string } }[] = [];
  for (const output of given) {
    const id = identity(output.path);
    const input = inputIds.find((i) => same(i.id, id));
    if (input !== undefined) {
      throw new InputError({}, `${output.option} ${output.path} is the input file ${input.file}${input.file === output.path ? '' : ' (the same file through a link)'}; writing it would destroy the input. Expected a new file name for the output; the input was left untouched`);
    }
    const earlier = seen.find((s) => same(s.id, id));
    if (earlier !== undefined) {
      throw new InputError({}, `${output.option} ${output.path} is also the file of ${earlier.option}; expected a different file for each output`);
    }
    seen.push({ ...output, id });
  }
}

export const processIo: CliIo = {
  stdout: (text) => process.stdout.write(text),
  stderr: (text) => process.stderr.write(text),
  readText: (path) => readFileSync(path, 'utf8'),
  readBytes: (path) => new Uint8Array(readFileSync(path)),
  writeText: writeAtomic,
};
