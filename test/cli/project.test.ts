import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { main } from '../../src/cli/main.js';
import type { CliIo } from '../../src/cli/io.js';
import { syntheticCsv } from '../reference/layeredTravelTimes.js';
import { markedNumbers, runReport, section } from '../report/runReport.js';

/** Runs the command line in memory; files by name from `files`, else from disk. */
function cli(args: string[], files: Record<string, string | Uint8Array> = {}) {
  let stdout = '';
  let stderr = '';
  const written: Record<string, string> = {};
  const bytes = (p: string) => (p in files ? (typeof files[p] === 'string' ? new TextEncoder().encode(files[p] as string) : files[p] as Uint8Array) : new Uint8Array(readFileSync(p)));
  const io: CliIo = {
    stdout: (t) => { stdout += t; }, stderr: (t) => { stderr += t; }, writeText: (p, t) => { written[p] = t; },
    readText: (p) => new TextDecoder().decode(bytes(p)), readBytes: bytes,
  };
  const code = main(args, io);
  return { code, stdout, stderr, written };
}

/**
 * A project document (schema hammerline/project@1) written out field by field as the field app
 * saves it (src/io/projectFile.ts documents the fields), not with the program's own writer.
 */
function projectDocument(inputs: { name: string; kind: string; data: string | Uint8Array }[], picks: Record<string, unknown>[], units = 'm'): string {
  return JSON.stringify({
    schema: 'hammerline/project@1',
    program: { name: 'hammerline', version: '0.0.0-test' },
    units,
    inputs: inputs.map((i) => ({ name: i.name, kind: i.kind, length_unit: 'm', ...(typeof i.data === 'string' ? { encoding: 'utf-8', data: i.data } : { encoding: 'base64', data: Buffer.from(i.data).toString('base64') }) })),
    picks,
    choices: { wave: null, segments: {}, breakpoints_m: {}, through_origin: false, poisson: null },
  });
}

// An invented line: flat ground at 100 m, a refractor at 92 m (8 m deep), 500 and 2200 m/s, 48
// geophones 2 m apart, shots at both ends and the middle, 0.2 ms noise (seed 11), from the
// independent forward model test/reference/layeredTravelTimes.ts.
const table = syntheticCsv({ surface: () => 100, interfaces: [() => 92], velocities: [500, 2200] }, [-1, 47, 95], Array.from({ length: 48 }, (_, i) => 2 * i), 0.2, 11);
const lines = table.split('\n');
// File row 40 (header = row 1): source S1, a refracted arrival far from the source; moved by +4 ms.
const ROW = 40;
const cells = lines[ROW - 1].split(',');
const before = Number(cells[5]);
const moved = before + 4;
const editedTable = [...lines.slice(0, ROW - 1), [...cells.slice(0, 5), moved.toFixed(3)].join(','), ...lines.slice(ROW)].join('\n');
const project = projectDocument([{ name: 'line.csv', kind: 'first-breaks', data: table }], [{ file: 'line.csv', row: ROW, time_ms: moved }]);

describe('project files of the field app on the command line', () => {
  it('report PROJECT.json with a pick moved by +4 ms gives the interpretation of the table with that time changed by hand', () => {
    const fromProject = runReport(['report', 'project.json', '-o', 'r.html', '--json', 'r.json'], { 'project.json': project });
    expect(fromProject.code, fromProject.error?.message).toBe(0);
    // Reference: the same report of the table with row 40 rewritten by hand (no project, no edit code).
    const fromTable = runReport(['report', 'line.csv', '-o', 't.html', '--json', 't.json'], { 'line.csv': editedTable });
    const unedited = runReport(['report', 'line.csv', '-o', 'u.html', '--json', 'u.json'], { 'line.csv': table });
    const doc = JSON.parse(fromProject.written['r.json']);
    const reference = JSON.parse(fromTable.written['t.json']);
    for (const key of ['layers', 'refractors', 'branches', 'qc']) expect(doc[key], key).toEqual(reference[key]);
    // The edit reached the interpretation: the unedited table gives other branch residuals.
    expect(JSON.parse(unedited.written['u.json']).branches).not.toEqual(doc.branches);
    // The report lists the edit: row 40, the table's time and the time used, 4.00 ms apart.
    expect(doc.pick_edits).toEqual([{ file: 'line.csv', row: ROW, source_id: cells[0], receiver_x_m: Number(cells[3]), before_ms: before, time_ms: moved }]);
    const shown = markedNumbers(section(fromProject.written['r.html'], 'qc')).filter((n) => n.path?.startsWith('pick_edits.0.'));
    const at = (field: string) => Number(shown.find((n) => n.path === `pick_edits.0.${field}`)!.text);
    expect(at('row')).toBe(ROW);
    expect(at('time_ms') - at('before_ms')).toBeCloseTo(4, 2);
    expect(section(fromProject.written['r.html'], 'qc')).toMatch(/1 first break was set by hand and 0 cleared in the field app/);
    expect(doc.warnings.map((w: { code: string }) => w.code)).toContain('picks-edited');
    // The project file and the table inside it are both in the processing history with their digests.
    expect(section(fromProject.written['r.html'], 'history')).toMatch(/project file of the field app[\s\S]*first-break table, in the project file/);
  });

  it('interpret PROJECT.json --json gives the same edited interpretation as the report', () => {
    const run = cli(['interpret', 'project.json', '--json'], { 'project.json': project });
    expect(run.code, run.stderr).toBe(0);
    const doc = JSON.parse(run.stdout);
    const reference = JSON.parse(cli(['interpret', 'line.csv', '--json'], { 'line.csv': editedTable }).stdout);
    expect(doc.layers).toEqual(reference.layers);
    expect(doc.refractors).toEqual(reference.refractors);
    expect(doc.pick_edits[0].time_ms).toBeCloseTo(moved, 6);
  });

  it('report PROJECT.json of SEG-2 records with one trace moved by +5 ms equals the report of the picked table with that time changed', () => {
    // Three records of the invented pump-station line (survey-examples/pump-station/README.md).
    const folder = 'survey-examples/pump-station/records';
    const names = ['S1.seg2', 'S4.seg2', 'S7.seg2'];
    const records = Object.fromEntries(names.map((n) => [n, new Uint8Array(readFileSync(join(folder, n)))]));
    // The automatic picks, as `hammerline pick` writes them (trace and source_file columns).
    const picked = cli(['pick', ...names, '-o', 'picks.csv', '-q'], records).written['picks.csv'];
    const rows = picked.split(/\r?\n/);
    const header = rows[0].split(',');
    const col = (name: string) => header.indexOf(name);
    const index = rows.findIndex((r) => { const c = r.split(','); return c[col('source_file')] === 'S4.seg2' && c[col('trace')] === '40'; });
    expect(index).toBeGreaterThan(0);
    const c = rows[index].split(',');
    const automatic = Number(c[col('time_ms')]);
    c[col('time_ms')] = (automatic + 5).toFixed(3);
    const editedPicks = [...rows.slice(0, index), c.join(','), ...rows.slice(index + 1)].join('\n');
    const doc = projectDocument(names.map((n) => ({ name: n, kind: 'seg2', data: records[n] })), [{ file: 'S4.seg2', trace: 40, time_ms: automatic + 5 }]);
    const fromProject = runReport(['report', 'project.json', '-o', 'r.html', '--json', 'r.json', '-q'], { 'project.json': doc });
    expect(fromProject.code, fromProject.error?.message).toBe(0);
    const fromTable = runReport(['report', 'picks.csv', '-o', 't.html', '--json', 't.json'], { 'picks.csv': editedPicks });
    const a = JSON.parse(fromProject.written['r.json']);
    const b = JSON.parse(fromTable.written['t.json']);
    expect(a.layers).toEqual(b.layers);
    expect(a.refractors).toEqual(b.refractors);
    expect(a.pick_edits).toEqual([{ file: 'S4.seg2', trace: 40, source_id: c[col('source_id')], receiver_x_m: Number(c[col('receiver_x')]), before_ms: automatic, time_ms: automatic + 5 }]);
    expect(section(fromProject.written['r.html'], 'qc')).toMatch(/Automatic pick \(ms\)/);
  });

  it('report PROJECT.json names the field of an edit that matches no row of the line', () => {
    const bad = projectDocument([{ name: 'line.csv', kind: 'first-breaks', data: table }], [{ file: 'line.csv', row: 900, time_ms: 12 }]);
    const run = runReport(['report', 'project.json', '-o', 'r.html'], { 'project.json': bad });
    expect(run.code).toBe(2);
    expect(run.error?.message).toMatch(/project\.json: picks\[0\]: line\.csv has no first break on file row 900/);
    const mixed = runReport(['report', 'project.json', 'line.csv', '-o', 'r.html'], { 'project.json': project, 'line.csv': table });
    expect(mixed.error?.message).toMatch(/project\.json: is a project file given with other files/);
  });
});
