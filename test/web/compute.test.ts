import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { main } from '../../src/cli/main.js';
import type { CliIo } from '../../src/cli/io.js';
import type { ProjectChoices, ProjectInput } from '../../src/io/projectFile.js';
import { computeLine, LineCache, type LineView } from '../../web/src/compute.js';

const records = 'survey-examples/pump-station/records';
const names = ['S1.seg2', 'S2.seg2', 'S3.seg2', 'S4.seg2', 'S5.seg2', 'S6.seg2', 'S7.seg2'];
const noChoices: ProjectChoices = { segments: {}, breakpoints: {}, directThroughOrigin: false };

/** `hammerline interpret ARGS --json` with the files found by their bare names, as the app gets them. */
function cliJson(args: string[], folder: string, files: Record<string, string> = {}): Record<string, unknown> {
  let stdout = '';
  const path = (name: string) => (name.includes('/') ? name : join(folder, name));
  const io: CliIo = {
    stdout: (t) => { stdout += t; }, stderr: () => {}, writeText: () => {},
    readText: (p) => files[p] ?? readFileSync(path(p), 'utf8'), readBytes: (p) => (p in files ? new TextEncoder().encode(files[p]) : new Uint8Array(readFileSync(path(p)))),
  };
  expect(main(['interpret', ...args, '--json'], io)).toBe(0);
  return JSON.parse(stdout);
}

function line(inputs: ProjectInput[], choices = noChoices, picks = [] as Parameters<typeof computeLine>[1]): LineView {
  const cache = new LineCache();
  cache.setInputs(inputs);
  const view = computeLine(cache, picks, choices, 'm');
  if (!view.ok) throw new Error(view.message);
  return view;
}

const recordInputs = names.map((name): ProjectInput => ({ name, kind: 'seg2', lengthUnit: 'm', bytes: new Uint8Array(readFileSync(join(records, name))) }));

describe('computeLine (the web worker\'s interpretation)', () => {
  it('computeLine on the seven pump-station records gives the document hammerline interpret --json gives', () => {
    // Reference: the command line on the same files (the contract the app must match exactly).
    const view = line(recordInputs);
    expect(view.document).toEqual(cliJson(names, records));
    expect(view.kind).toBe('records');
    // 7 records × 48 traces; the one dead trace (S3 channel 17, survey-examples README) unpicked.
    expect(view.picks).toHaveLength(336);
    expect(view.picks.filter((p) => p.time === undefined).map((p) => p.key)).toContain('S3.seg2#t17');
    // Every pick in the fits has the layer of its segment: S4 at x = 47 m (README) sees the direct
    // wave (layer 1) at its nearest geophones and the rock refractor (layer 2) at the ends.
    expect(view.picks.filter((p) => p.time !== undefined && p.layer === undefined)).toEqual([]);
    const s4 = view.picks.filter((p) => p.sourceId === 'S4');
    expect(s4.find((p) => p.receiverX === 46)?.layer).toBe(1);
    expect(s4.find((p) => p.receiverX === 0)?.layer).toBe(2);
    expect(s4.find((p) => p.receiverX === 94)?.layer).toBe(2);
  });

  it('computeLine with a Poisson\'s ratio and a fixed segment count equals interpret --poisson --segments', () => {
    const view = line(recordInputs, { ...noChoices, poisson: 0.3, segments: { 'S1:forward': 2 } });
    expect(view.document).toEqual(cliJson([...names, '--poisson', '0.3', '--segments', 'S1:forward=2'], records));
    expect((view.document.site as { classes: unknown[] }).classes).toHaveLength(3);
  });

  it('computeLine on a first-break table equals interpret --json on it, and its per-pick residuals give the forward RMS', () => {
    const file = 'survey-examples/alluvial-terrace/sh-first-breaks.csv';
    const view = line([{ name: 'sh-first-breaks.csv', kind: 'first-breaks', lengthUnit: 'm', bytes: new Uint8Array(readFileSync(file)) }]);
    expect(view.document).toEqual(cliJson(['sh-first-breaks.csv'], 'survey-examples/alluvial-terrace'));
    // The residuals repeat src/forward/forwardCheck.ts per pick: their RMS is its forward_rms (to 1e-9 s).
    const rms = Math.sqrt(view.residuals.reduce((s, r) => s + r.difference ** 2, 0) / view.residuals.length);
    expect(view.result.forward).toBeDefined();
    expect(Math.abs(rms - view.result.forward!.rms)).toBeLessThan(1e-9);
    expect(view.residuals.length).toBe(view.result.forward!.picks);
    // Every pick of a fitted branch has a layer.
    expect(view.picks.every((p) => p.layer !== undefined)).toBe(true);
  });

  it('computeLine with a moved pick equals interpret on the table with that time changed', () => {
    const file = 'survey-examples/pump-station/first-breaks.csv';
    const text = readFileSync(file, 'utf8');
    const lines = text.split('\n');
    // File row 20 (1-based, header and comments included): move its time by +3 ms.
    const cells = lines[19].split(',');
    const moved = Number(cells[5]) + 3;
    const view = line([{ name: 'first-breaks.csv', kind: 'first-breaks', lengthUnit: 'm', bytes: new TextEncoder().encode(text) }], noChoices, [{ file: 'first-breaks.csv', row: 20, time: moved / 1e3 }]);
    lines[19] = [...cells.slice(0, 5), String(moved)].join(',');
    const expected = cliJson(['first-breaks.csv'], '/nonexistent', { 'first-breaks.csv': lines.join('\n') });
    const warnings = (view.document.warnings as { code: string }[]);
    expect(warnings.filter((w) => w.code === 'picks-edited')).toHaveLength(1);
    expect({ ...view.document, warnings: warnings.filter((w) => w.code !== 'picks-edited') }).toEqual(expected);
    // And it differs from the unedited line (the edit reached the interpretation).
    expect(expected).not.toEqual(cliJson([file], '.'));
  });
});
