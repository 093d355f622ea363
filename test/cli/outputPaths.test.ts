import { chmodSync, copyFileSync, linkSync, mkdirSync, mkdtempSync, readFileSync, symlinkSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { main } from '../../src/cli/main.js';
import { processIo, type CliIo } from '../../src/cli/io.js';

const example = 'survey-examples/pump-station/first-breaks.csv';
const record = 'survey-examples/pump-station/records/S3.seg2';

/** The real file system, with stdout and stderr captured. */
function runOnDisk(argv: string[]) {
  let stdout = '';
  let stderr = '';
  const io: CliIo = { ...processIo, stdout: (t) => { stdout += t; }, stderr: (t) => { stderr += t; } };
  return { code: main(argv, io), stdout, stderr };
}

function scratch(): string {
  return mkdtempSync(join(tmpdir(), 'hammerline-out-'));
}

describe('checkOutputPaths through the command line', () => {
  it('interpret L.csv -o L.csv and --depths L.csv exit 2 and leave the table byte for byte', () => {
    const dir = scratch();
    const table = join(dir, 'L.csv');
    copyFileSync(example, table);
    const before = readFileSync(table);
    for (const argv of [['interpret', table, '-o', table], ['interpret', table, '--depths', table], ['interpret', table, '--json', '--output', table]]) {
      const { code, stderr } = runOnDisk(argv);
      expect(code).toBe(2);
      expect(stderr).toMatch(/is the input file .*L\.csv; writing it would destroy the input/);
      expect(readFileSync(table).equals(before)).toBe(true);
    }
  });

  it('pick S3.seg2 -o S3.seg2 exits 2 and keeps the shot record', () => {
    const dir = scratch();
    const shot = join(dir, 'S3.seg2');
    copyFileSync(record, shot);
    const before = readFileSync(shot);
    const { code, stderr } = runOnDisk(['pick', shot, '-o', shot]);
    expect(code).toBe(2);
    expect(stderr).toMatch(/-o .*S3\.seg2 is the input file/);
    expect(readFileSync(shot).equals(before)).toBe(true);
  });

  it('an output reached through a symbolic link, a linked folder or a hard link is the input too', () => {
    const dir = scratch();
    const table = join(dir, 'L.csv');
    copyFileSync(example, table);
    const before = readFileSync(table);
    symlinkSync(table, join(dir, 'link.csv'));
    linkSync(table, join(dir, 'hard.csv'));
    symlinkSync(dir, join(dir, 'folder-link'));
    for (const output of [join(dir, 'link.csv'), join(dir, 'hard.csv'), join(dir, 'folder-link', 'L.csv'), join(dir, '.', 'L.csv')]) {
      const { code, stderr } = runOnDisk(['interpret', table, '-o', output]);
      expect(code, output).toBe(2);
      expect(stderr).toMatch(/writing it would destroy the input/);
    }
    // The station table and the P line are inputs as well.
    const stations = join(dir, 'stations.csv');
    writeFileSync(stations, 'x,elev\n0,100\n94,100\n');
    expect(runOnDisk(['pick', record, '--stations', stations, '-o', stations]).code).toBe(2);
    expect(runOnDisk(['interpret', table, '--wave', 'S', '--p-line', table, '-o', join(dir, 'folder-link', 'L.csv')]).code).toBe(2);
    expect(readFileSync(table).equals(before)).toBe(true);
  });

  it('-o and --depths naming one file exit 2', () => {
    const dir = scratch();
    const { code, stderr } = runOnDisk(['interpret', example, '-o', join(dir, 'a.txt'), '--depths', join(dir, 'a.txt')]);
    expect(code).toBe(2);
    expect(stderr).toMatch(/is also the file of -o/);
  });

  it('-o into a missing folder, a read-only folder or onto a folder exits 2 with a message and no stack trace', () => {
    const dir = scratch();
    const missing = runOnDisk(['interpret', example, '-o', join(dir, 'no', 'such', 'out.txt')]);
    expect(missing.code).toBe(2);
    expect(missing.stderr).toMatch(/out\.txt: cannot be written \(ENOENT: its folder does not exist\)/);
    expect(missing.stderr).not.toMatch(/\n\s+at /);
    const folder = runOnDisk(['interpret', example, '--depths', dir]);
    expect(folder.code).toBe(2);
    expect(folder.stderr).toMatch(/cannot be written \((EISDIR|ENOTDIR|EEXIST|ENOTEMPTY)?/);
    const locked = join(dir, 'locked');
    mkdirSync(locked);
    chmodSync(locked, 0o500);
    const readOnly = runOnDisk(['interpret', example, '-o', join(locked, 'out.txt')]);
    chmodSync(locked, 0o700);
    // Root may write anywhere; the check is then only that nothing broke.
    if (process.getuid?.() !== 0) {
      expect(readOnly.code).toBe(2);
      expect(readOnly.stderr).toMatch(/cannot be written \(EACCES: permission denied\)/);
    } else expect(readOnly.code).toBe(0);
  });

  it('a good -o next to the input is written whole and the input is untouched', () => {
    const dir = scratch();
    const table = join(dir, 'L.csv');
    copyFileSync(example, table);
    const { code } = runOnDisk(['interpret', table, '--json', '-o', join(dir, 'L.json')]);
    expect(code).toBe(0);
    expect(JSON.parse(readFileSync(join(dir, 'L.json'), 'utf8')).schema).toBe('hammerline/interpretation@1');
  });
});
