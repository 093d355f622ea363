import { copyFileSync, mkdtempSync, readFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import XLSX from 'xlsx';
import { describe, expect, it } from 'vitest';
import { main } from '../../src/cli/main.js';
import { processIo, type CliIo } from '../../src/cli/io.js';
import { csvComment, csvText } from '../../src/io/csvCell.js';
import { depthsCsv } from '../../src/io/depthsCsv.js';
import { receiverGround } from '../../src/interpret.js';
import { interpretCsv } from '../helpers.js';

// What a spreadsheet runs: a cell whose text begins with =, +, -, @, tab or carriage return
// (OWASP, "CSV Injection"). The reader is SheetJS (the `xlsx` package from the npm registry), which
// marks the cells it would evaluate with a formula (`f`); the other starting characters it keeps as
// text but other spreadsheets evaluate, so no text cell may begin with any of them.
const FORMULA_START = /^[=+\-@\t\r]/;

/**
 * Every cell of a CSV text as SheetJS reads it, comma-separated as the program writes (left to
 * guess, SheetJS takes the semicolons of the comment lines for the separator).
 */
function spreadsheetCells(csv: string): { address: string; cell: XLSX.CellObject }[] {
  const book = XLSX.read(csv, { type: 'string', raw: false, FS: ',' });
  const sheet = book.Sheets[book.SheetNames[0]];
  return Object.keys(sheet).filter((k) => !k.startsWith('!')).map((address) => ({ address, cell: sheet[address] as XLSX.CellObject }));
}

function expectNoFormula(csv: string): void {
  const cells = spreadsheetCells(csv);
  expect(cells.length).toBeGreaterThan(0);
  for (const { address, cell } of cells) {
    expect(cell.f, `${address} is a formula`).toBeUndefined();
    if (cell.t === 's') expect(String(cell.v), address).not.toMatch(FORMULA_START);
  }
}

const hostile = ['=1+1', '+cmd|\' /C calc\'!A0', '@SUM(A1)', '-2+3', '\t=1', '\r=1', 'a,=1+1', '"=1"'];

describe('csvText', () => {
  it('csvText neutralises formula starts with a single quote and keeps plain numbers and text as they are', () => {
    // The OWASP prefix: a single quote before the cell; quoting per RFC 4180 afterwards.
    expect(csvText('=1+1')).toBe("'=1+1");
    expect(csvText('@SUM(A1)')).toBe("'@SUM(A1)");
    expect(csvText('a,=1+1')).toBe('"a,=1+1"');
    expect(csvText('-6')).toBe('-6');
    expect(csvText('S1')).toBe('S1');
    expect(csvText('=1', false)).toBe('=1');
  });

  it('csvText cells read by a spreadsheet reader (SheetJS) are never formulas', () => {
    expectNoFormula(['id', ...hostile.map((h) => csvText(h)), csvComment('warning: source a,=1+1 "b" @x')].join('\n') + '\n');
    // The planted fault this guards against: without the prefix SheetJS reads a formula.
    expect(spreadsheetCells('id\n=1+1\n').some(({ cell }) => cell.f !== undefined)).toBe(true);
  });
});

describe('every CSV the program writes, read by a spreadsheet reader', () => {
  it('pick -o of records named =1+1.seg2, +cmd|x.seg2, @SUM(A1).seg2 and -2+3.seg2 writes no formula cell', () => {
    const dir = mkdtempSync(join(tmpdir(), 'hammerline-csv-'));
    const names = ['=1+1', '+cmd|x', '@SUM(A1)', '-2+3'].map((n, i) => {
      const file = join(dir, `${n}.seg2`);
      copyFileSync(`survey-examples/pump-station/records/S${i + 1}.seg2`, file);
      return file;
    });
    let stderr = '';
    const io: CliIo = { ...processIo, stdout: () => {}, stderr: (t) => { stderr += t; } };
    const out = join(dir, 'picks.csv');
    expect(main(['pick', ...names, '-q', '-o', out], io), stderr).toBe(0);
    const csv = readFileSync(out, 'utf8');
    expectNoFormula(csv);
    // The ids are still there, after the quote.
    expect(csv).toMatch(/^'=1\+1,/m);
    expect(csv).toMatch(/^'@SUM\(A1\),/m);
  });

  it('depthsCsv writes ids such as a,=1+1 in its comment lines without a formula cell', () => {
    const csv = readFileSync('survey-examples/pump-station/first-breaks.csv', 'utf8').replace(/^S1,/gm, '"a,=1+1",').replace(/^S2,/gm, '@x,');
    const { result, table } = interpretCsv(csv);
    // A warning naming the sources, as the one-sided and reciprocal warnings do.
    result.warnings.push({ code: 'reciprocal-time', message: 'sources a,=1+1 and @x differ\nby 1 ms' });
    const written = depthsCsv(result, receiverGround(table));
    expect(written).toContain('a,=1+1');
    expectNoFormula(written);
  });
});
