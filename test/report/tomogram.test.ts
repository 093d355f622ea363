import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { WarningLog } from '../../src/core/warnings.js';
import { readFirstBreaks } from '../../src/io/firstBreaksCsv.js';
import { interpretationJson } from '../../src/io/interpretationJson.js';
import { TOMOGRAM_CAUTIONS, tomogramJson } from '../../src/io/tomogramJson.js';
import { interpret, receiverGround } from '../../src/interpret.js';
import { tomography } from '../../src/tomography/tomography.js';
import { compareWithDocument, markedNumbers, runReport, section } from './runReport.js';

const SH = 'survey-examples/alluvial-terrace/sh-first-breaks.csv';

describe('hammerline report --tomography', () => {
  it('report --tomography draws the tomogram beside the layered section, with its numbers, references and cautions', () => {
    const run = runReport(['report', SH, '-o', 'r.html', '--tomography']);
    expect(run.code, run.error?.message).toBe(0);
    const html = run.written['r.html'];
    const figure = section(html, 'depth-section');
    expect(figure).toMatch(/<figure class="tomogram"><svg/);
    expect((figure.match(/<rect x=/g) ?? []).length).toBeGreaterThan(50);
    expect(section(html, 'method')).toMatch(/Sethian, J\. A\. \(1996\)/);
    for (const caution of TOMOGRAM_CAUTIONS) expect(section(html, 'cautions')).toContain(caution.replace(/'/g, '&#39;'));
    expect(section(html, 'history')).toMatch(/<td>tomography<\/td>/);
    // The same numbers as interpret() and tomography() run directly, with contours at the
    // geometric mean of consecutive layer velocities (the report's stated choice).
    const log = new WarningLog();
    const table = readFirstBreaks(readFileSync(SH, 'utf8'), SH, log, {});
    const result = interpret(table, {}, log);
    const v = result.layers.map((l) => l.velocity);
    const tomogram = tomogramJson(tomography(table, { contours: [Math.round(Math.sqrt(v[0] * v[1])), Math.round(Math.sqrt(v[1] * v[2]))] }, new WarningLog(), result), []);
    const document = { ...interpretationJson(result), tomogram } as Record<string, unknown>;
    compareWithDocument(html, document, receiverGround(table));
    const tomogramNumbers = markedNumbers(html).filter((n) => n.path?.startsWith('tomogram.'));
    expect(tomogramNumbers.length).toBeGreaterThanOrEqual(8);
    // The 224 m/s contour (between 167 and 300 m/s) lies near the first refractor: its depth range
    // overlaps the layered one within 1 m (a smooth image spreads the boundary; common practice).
    const contourMin = tomogramNumbers.find((n) => n.path === 'tomogram.contours.0.points.*.depth_m' && n.agg === 'min')!.value!;
    expect(Math.abs(contourMin - 2.1)).toBeLessThan(1); // true depth 2.0 m (survey-examples/README.md)
  });
});
