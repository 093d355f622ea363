import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { WarningLog } from '../../src/core/warnings.js';
import { readFirstBreaks } from '../../src/io/firstBreaksCsv.js';
import { interpretationJson } from '../../src/io/interpretationJson.js';
import { interpret, receiverGround } from '../../src/interpret.js';
import { REPORT_SECTIONS } from '../../src/report/html/reportHtml.js';
import { compareWithDocument, markedNumbers, runReport, section } from './runReport.js';

const SH = 'survey-examples/alluvial-terrace/sh-first-breaks.csv';
const P = 'survey-examples/pump-station/first-breaks.csv';
const JOB = ['--client', 'Example Holdings (invented)', '--site', 'Orrin valley terrace, school block (invented)', '--line', 'T-2S', '--date', '2026-05-14',
  '--operator', 'A. Field (invented)', '--equipment', '24-channel seismograph, 10 Hz horizontal geophones', '--source-type', 'beam struck at both ends, 8 blows stacked',
  '--line-start', '7.4312,46.9487', '--line-end', '7.4321,46.9487'];

/** The JSON interpretation document made directly by interpret(), independently of the report command. */
function interpretationOf(file: string, options: Parameters<typeof interpret>[1] = {}) {
  const log = new WarningLog();
  const table = readFirstBreaks(readFileSync(file, 'utf8'), file, log, {});
  return { document: interpretationJson(interpret(table, options, log)) as Record<string, unknown>, receivers: receiverGround(table) };
}

describe('hammerline report (HTML)', () => {
  const sh = runReport(['report', SH, '-o', 'report.html', ...JOB]);
  const html = sh.written['report.html'];

  it('report of the bundled SH example is deterministic and matches its reviewed snapshot', async () => {
    expect(sh.code).toBe(0);
    // Determinism: the same input and command give the same bytes (fixed issue date and version).
    expect(runReport(['report', SH, '-o', 'report.html', ...JOB]).written['report.html']).toBe(html);
    // A changed snapshot is reviewed by a person; update it with `npx vitest run test/report -u`
    // when computed numbers change on purpose.
    await expect(html).toMatchFileSnapshot('__snapshots__/alluvial-terrace-sh.report.html');
  });

  it('report holds every section, in the order a reviewer reads them', () => {
    const positions = REPORT_SECTIONS.map((id) => html.indexOf(`<section id="${id}">`));
    expect(positions.every((p) => p > 0)).toBe(true);
    expect([...positions].sort((a, b) => a - b)).toEqual(positions);
    expect(section(html, 'summary')).toMatch(/probable rock head/);
    expect(section(html, 'summary')).toMatch(/Vs30 <span/);
    expect(section(html, 'summary')).toMatch(/Main limitations[\s\S]*<ol><li>.*<\/li><li>.*<\/li><li>.*<\/li><\/ol>/);
    // The method statement names the published reference of each depth method that gave depths here.
    expect(section(html, 'method')).toMatch(/Gardner, L\. W\. \(1939\)/);
    expect(section(html, 'method')).toMatch(/Soske, J\. L\. \(1959\)/);
    expect(section(html, 'method')).toMatch(/ASCE\/SEI 7-16/);
    expect(section(html, 'method')).toMatch(/Schwarz, G\. \(1978\)/);
    // Every step of the pipeline is a method the statement knows, with a reference.
    expect(section(html, 'method')).not.toMatch(/as recorded in the processing history/);
    expect(section(html, 'method')).not.toMatch(/<td>—<\/td><\/tr>/);
    expect(section(html, 'time-distance')).toMatch(/<svg class="figure-svg"/);
    expect(section(html, 'depth-section')).toMatch(/<path class="band"/);
    expect(section(html, 'depth-section')).toMatch(/<path class="recommended"/);
    expect(section(html, 'site')).toMatch(/ASCE 7-22/);
    expect(section(html, 'qc')).toMatch(/Reciprocal times/);
    expect(section(html, 'cautions')).toMatch(/Conditions that need borings/);
    expect(section(html, 'cautions')).toMatch(/local codes/i);
    expect(section(html, 'history')).toMatch(/[0-9a-f]{64}/);
    expect(section(html, 'signatures')).toMatch(/Prepared by[\s\S]*Reviewed by[\s\S]*Licence \/ registration number/);
  });

  it('report loads nothing from elsewhere: no URL, no src or href, no url() or @import, and a policy that forbids loading', () => {
    for (const report of [html, runReport(['report', P, '-o', 'p.html', '--poisson', '0.3']).written['p.html']]) {
      expect(report).not.toMatch(/https?:/i);
      expect(report).not.toMatch(/\b(src|href|xlink:href|srcset|action|poster|data)\s*=/i);
      expect(report).not.toMatch(/url\s*\(/i);
      expect(report).not.toMatch(/@import/i);
      expect(report).not.toMatch(/<(script|link|img|iframe|object|embed|audio|video|base)\b/i);
      expect(report).not.toMatch(/["'(]\s*\/\/[\w.-]/); // protocol-relative
      expect(report).toContain(`content="default-src 'none'`);
    }
  });

  it('report shows every number as interpret() computes it (parsed back from the HTML)', () => {
    const { document, receivers } = interpretationOf(SH);
    const marked = markedNumbers(html);
    const compared = compareWithDocument(html, document, receivers);
    expect(compared).toBeGreaterThan(300);
    // Every depth the JSON holds for the recommended profile appears in the report.
    const shown = new Set(marked.map((n) => n.path));
    (document.refractors as { points: unknown[] }[]).forEach((r, k) => r.points.forEach((_, i) => expect(shown.has(`refractors.${k}.points.${i}.depth_m`)).toBe(true)));
    // Every warning of the interpretation is in the warnings section, word for word (HTML-escaped).
    const escape = (t: string) => t.replace(/&/g, '&amp;').replace(/</g, '&lt;').replace(/>/g, '&gt;').replace(/"/g, '&quot;').replace(/'/g, '&#39;');
    for (const w of document.warnings as { message: string }[]) expect(section(html, 'warnings')).toContain(escape(w.message));
  });

  it('report tables of layers, depths and site carry no number that is not traced to the JSON document', () => {
    for (const id of ['layers', 'depths', 'site']) {
      for (const cell of section(html, id).matchAll(/<td class="n[^"]*">([\s\S]*?)<\/td>/g)) {
        const untraced = cell[1].replace(/<span class="num"[^>]*>[^<]*<\/span>/g, '');
        expect(untraced, `${id}: ${cell[1]}`).not.toMatch(/\d/);
      }
    }
  });

  it('report of a P line with --poisson labels Vs30 and every class as estimated, never as measured', () => {
    const p = runReport(['report', P, '-o', 'p.html', '--poisson', '0.3']).written['p.html'];
    expect(section(p, 'site')).toMatch(/ESTIMATED, not measured/);
    const classCells = [...section(p, 'site').matchAll(/<td class="cls">([^<]*)<\/td>/g)].map((m) => m[1]);
    expect(classCells.length).toBe(3);
    for (const c of classCells) expect(c).toMatch(/\(estimated\)$/);
    expect(section(p, 'summary')).toMatch(/ESTIMATED from Vp, not measured/);
    expect(p).not.toMatch(/from measured shear-wave velocities/);
  });

  it('report of a P line without a Poisson ratio says why there is no site class', () => {
    const p = runReport(['report', P, '-o', 'p.html']).written['p.html'];
    expect(section(p, 'site')).toMatch(/Not assessed\. A P-wave line does not give shear-wave velocities/);
  });

  it('report escapes text the user gave (job details, file names) so it cannot add markup', () => {
    const r = runReport(['report', SH, '-o', 'x.html', '--client', '<script>alert(1)</script>', '--site', '"><img onerror=x>']).written['x.html'];
    expect(r).not.toMatch(/<script>alert/);
    expect(r).toContain('&lt;script&gt;alert(1)&lt;/script&gt;');
    expect(r).not.toMatch(/<img/);
  });
});

describe('hammerline report from SEG-2 records', () => {
  it('report of the seven pump-station records names the picking methods and counts every trace, the dead one too', () => {
    const records = [1, 2, 3, 4, 5, 6, 7].map((i) => `survey-examples/pump-station/records/S${i}.seg2`);
    const run = runReport(['report', ...records, '-o', 'r.html', '-q']);
    expect(run.code, run.error?.message).toBe(0);
    const html = run.written['r.html'];
    expect(section(html, 'method')).toMatch(/Allen, R\. V\. \(1978\)/);
    expect(section(html, 'method')).toMatch(/Maeda, N\. \(1985\)/);
    // survey-examples/README.md: 7 records of 48 traces, one dead trace (S3, channel 17).
    const counts = Object.fromEntries(markedNumbers(section(html, 'qc')).filter((n) => n.path?.startsWith('picking.status_counts.')).map((n) => [n.path!.split('.').pop()!, n.value!]));
    expect(Object.values(counts).reduce((a, b) => a + b, 0)).toBe(7 * 48);
    expect(counts.dead).toBe(1);
    // Every record is checksummed in the processing history.
    expect((section(html, 'history').match(/<td>SEG-2 shot record<\/td>/g) ?? []).length).toBe(7);
  });
});

describe('hammerline report with --p-line', () => {
  it('report --p-line shows the S layers checked against the P line, every number as interpret() gives it', () => {
    const P_LINE = 'survey-examples/alluvial-terrace/first-breaks.csv';
    const run = runReport(['report', SH, '--p-line', P_LINE, '-o', 'r.html']);
    expect(run.code, run.error?.message).toBe(0);
    const html = run.written['r.html'];
    expect(section(html, 'site')).toMatch(/Shear-wave velocities checked against the P-wave line/);
    const paths = markedNumbers(section(html, 'site')).map((n) => n.path);
    // Three S layers over the terrace (survey-examples/README.md), each with Vs, Vp and their ratio.
    for (const i of [0, 1, 2]) for (const f of ['vs_mps', 'vp_mps', 'vp_vs']) expect(paths).toContain(`p_line_check.layers.${i}.${f}`);
    const values = Object.fromEntries(markedNumbers(section(html, 'site')).filter((n) => n.path?.startsWith('p_line_check.')).map((n) => [n.path!, n.value!]));
    // Fact of the trade (common practice): Vs < Vp in the same material, so every ratio is above 1.
    for (const i of [0, 1, 2]) expect(values[`p_line_check.layers.${i}.vp_vs`]).toBeGreaterThan(1.414);
  });
});
