import { copyFileSync, mkdtempSync, readFileSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { main } from '../../src/cli/main.js';
import { processIo, type CliIo } from '../../src/cli/io.js';

const table = 'survey-examples/pump-station/first-breaks.csv';
const records = [1, 2, 3, 4, 5, 6, 7].map((k) => `survey-examples/pump-station/records/S${k}.seg2`);

function run(argv: string[]) {
  let stdout = '';
  let stderr = '';
  const io: CliIo = { ...processIo, stdout: (t) => { stdout += t; }, stderr: (t) => { stderr += t; } };
  return { code: main(argv, io), stdout, stderr };
}

const dir = mkdtempSync(join(tmpdir(), 'hammerline-bad-'));

/** A copy of a record with header text replaced byte for byte (same length, so every pointer stays valid). */
function editedRecord(name: string, from: string, to: string, all = false, source = records[2]): string {
  expect(to.length).toBe(from.length);
  const text = readFileSync(source).toString('latin1');
  const file = join(dir, name);
  writeFileSync(file, Buffer.from(all ? text.split(from).join(to) : text.replace(from, to), 'latin1'));
  return file;
}

function editedTable(name: string, change: (cells: string[]) => void): string {
  const lines = readFileSync(table, 'utf8').split('\n').map((l) => {
    if (!/^S\d/.test(l)) return l;
    const cells = l.split(',');
    change(cells);
    return cells.join(',');
  });
  const file = join(dir, name);
  writeFileSync(file, lines.join('\n'));
  return file;
}

const noStack = (stderr: string) => expect(stderr).not.toMatch(/\n\s+at |internal error/);

describe('bad SEG-2 headers stop with status 2, naming record, trace and field', () => {
  it('pick of a record whose DELAY is NaN, a decimal comma or 1e300 names the record, trace 1 and DELAY', () => {
    for (const [value, hint] of [['   NaN', /\(not a value\)/], ['-0,005', /\(a decimal comma; write a decimal point\)/], ['1e+300', /puts the first sample after the shot/]] as const) {
      const file = editedRecord(`delay${value.trim()}.seg2`, 'DELAY -0.005', `DELAY ${value}`);
      const { code, stderr } = run(['pick', file]);
      expect(code, value).toBe(2);
      expect(stderr).toMatch(new RegExp(`delay${value.trim().replace('+', '\\+')}\\.seg2, trace 1, column DELAY: `));
      expect(stderr).toMatch(hint);
      noStack(stderr);
    }
  });

  it('pick of a record with SAMPLE_INTERVAL in milliseconds stops with the likely unit; 0x10 is not read as a number', () => {
    // 0.25 ms written as 0.25: picks 1000 times too late, apparent velocities of a few m/s.
    const ms = run(['pick', editedRecord('ms.seg2', 'SAMPLE_INTERVAL 0.00025', 'SAMPLE_INTERVAL    0.25', true)]);
    expect(ms.code).toBe(2);
    expect(ms.stderr).toMatch(/ms\.seg2: the median apparent velocity .* m\/s, outside the 30 to 8000 m\/s .*SAMPLE_INTERVAL 0\.25 looks like milliseconds, but SEG-2 gives seconds/);
    const hex = run(['pick', editedRecord('hex.seg2', 'SAMPLE_INTERVAL 0.00025', 'SAMPLE_INTERVAL    0x10')]);
    expect(hex.code).toBe(2);
    expect(hex.stderr).toMatch(/hex\.seg2, trace 1, column SAMPLE_INTERVAL: "0x10" is not a number \(hexadecimal/);
    const accepted = run(['pick', editedRecord('ms2.seg2', 'SAMPLE_INTERVAL 0.00025', 'SAMPLE_INTERVAL    0.25', true), '--accept-velocities']);
    expect(accepted.code).toBe(0);
    expect(accepted.stderr).toMatch(/accepted as given \(--accept-velocities\)/);
  });

  it('records and pick of a record with a trace count of 0 exit 2 with a message', () => {
    const bytes = readFileSync(records[2]);
    bytes[6] = 0;
    bytes[7] = 0;
    const file = join(dir, 'empty.seg2');
    writeFileSync(file, bytes);
    for (const command of ['records', 'pick']) {
      const { code, stderr } = run([command, file]);
      expect(code).toBe(2);
      expect(stderr).toMatch(/empty\.seg2, column number of traces: is 0: the record holds no traces/);
    }
  });

  it('interpret of the seven records with one named #3.seg2 keeps that shot: 7 sources, every picked trace used', () => {
    const renamed = join(dir, '#3.seg2');
    copyFileSync(records[2], renamed);
    const { code, stdout } = run(['interpret', records[0], records[1], renamed, ...records.slice(3), '--json', '-q']);
    expect(code).toBe(0);
    const doc = JSON.parse(stdout);
    const fromShot3 = doc.branches.filter((b: { source_id: string }) => b.source_id === '#3').reduce((n: number, b: { picks: number }) => n + b.picks, 0);
    // S3 has 48 traces, one of them dead (survey-examples/pump-station/README.md; records test above).
    expect(fromShot3).toBeGreaterThanOrEqual(40);
    expect(doc.qc.picks_total).toBe(doc.picking.picked);
  });

  it('a batch of records skips a bad one, reports it, interprets the rest and exits 2', () => {
    const bad = editedRecord('bad-delay.seg2', 'DELAY -0.005', 'DELAY    NaN');
    const { code, stdout, stderr } = run(['interpret', records[0], records[1], bad, ...records.slice(3), '-q']);
    expect(code).toBe(2);
    expect(stderr).toMatch(/bad-delay\.seg2, trace 1, column DELAY: "NaN" is not a number/);
    expect(stderr).toMatch(/bad-delay\.seg2: skipped/);
    expect(stdout).toMatch(/record-skipped|left out of the interpretation/);
    noStack(stderr);
  });

  it('an error found after picking names record and trace, not a row of the internal table', () => {
    // Every trace of S3 given the same receiver position: duplicate picks, reported by trace.
    const file = editedRecord('same.seg2', 'RECEIVER_LOCATION 2 0 211.970', 'RECEIVER_LOCATION 0 0 212.000');
    const { code, stderr } = run(['interpret', records[0], file, '-q']);
    expect(code).toBe(2);
    expect(stderr).toMatch(/same\.seg2 trace 2/);
    expect(stderr).not.toMatch(/\brow \d/);
  });
});

describe('bad tables stop with status 2 and a batch goes on', () => {
  it('constant times, all-zero times, a wrong source_x and seconds in time_ms exit 2 with the fix in the message', () => {
    const cases: [string, (c: string[]) => void, RegExp][] = [
      ['const.csv', (c) => { c[5] = '10'; }, /source S1: every one of the 48 times on the \+x side is 10 ms/],
      ['zero.csv', (c) => { c[5] = '0'; }, /is 0 ms/],
      ['sx.csv', (c) => { if (c[0] === 'S1') c[1] = '1000'; }, /source S1: .*check this source's source_x \(1000 m/],
      // Issue: seconds in a time_ms column once gave V1 = 1 232 951 m/s; now a stop naming time_s.
      ['seconds.csv', (c) => { c[5] = String(Number(c[5]) / 1000); }, /the times look like seconds: put them in a time_s column/],
    ];
    for (const [name, change, message] of cases) {
      const { code, stdout, stderr } = run(['interpret', editedTable(name, change)]);
      expect(code, name).toBe(2);
      expect(stderr).toMatch(message);
      expect(stdout).not.toMatch(/1232951|± NaN/);
      noStack(stderr);
    }
  });

  it('a batch with a bad table reports it, interprets the others and exits 2', () => {
    const bad = editedTable('bad.csv', (c) => { c[5] = '0'; });
    const { code, stdout, stderr } = run(['interpret', table, bad, 'survey-examples/alluvial-terrace/first-breaks.csv', '--json']);
    expect(code).toBe(2);
    const docs = JSON.parse(stdout);
    expect(docs).toHaveLength(3);
    expect(docs[1].error.message).toMatch(/is 0 ms/);
    expect(docs[0].layers.length).toBeGreaterThan(0);
    expect(docs[2].layers.length).toBeGreaterThan(0);
    expect(stderr).toMatch(/1 of 3 files not interpreted/);
  });

  it('a table with ids beginning with # is read whole: the summary counts every row', () => {
    const file = editedTable('hash.csv', (c) => { if (c[0] === 'S3') c[0] = '#S3'; });
    const rows = readFileSync(file, 'utf8').split('\n').filter((l) => /^#?S\d/.test(l)).length;
    const { code, stdout } = run(['interpret', file]);
    expect(code).toBe(0);
    expect(stdout).toMatch(new RegExp(`\\d+ of ${rows} picks used`));
    expect(stdout).toMatch(/7 sources/);
    expect(JSON.parse(run(['interpret', file, '--json']).stdout).qc.picks_total).toBe(rows);
  });
});
