import { describe, expect, it } from 'vitest';
import { WarningLog } from '../../src/core/warnings.js';
import { readFirstBreaks } from '../../src/io/firstBreaksCsv.js';
import { interpretationJson } from '../../src/io/interpretationJson.js';
import { interpret, receiverGround, type InterpretOptions } from '../../src/interpret.js';
import { REPORT_SECTIONS } from '../../src/report/html/reportHtml.js';
import { range } from '../helpers.js';
import { syntheticCsv, type LayeredSection } from '../reference/layeredTravelTimes.js';
import { compareWithDocument, markedNumbers, runReport, section } from './runReport.js';

// Lines none of the bundled examples resemble, made by the independent forward model of
// test/reference/layeredTravelTimes.ts (Fermat least time, no refraction formula) with seeded
// 0.3 ms pick noise: the report must hold every section, its numbers must be interpret()'s, and
// nothing may be loaded from elsewhere, whatever the line.
const tan5 = Math.tan((5 * Math.PI) / 180);
const lines: { name: string; section: LayeredSection; sources: number[]; receivers: number[]; args: string[]; options: InterpretOptions; trueDepth?: (x: number) => number }[] = [
  {
    name: 'rock dipping 5 degrees under 2.5 m spacing, P with Poisson 0.33',
    section: { surface: () => 120, interfaces: [(x) => 115 - x * tan5], velocities: [550, 2400] },
    sources: [-7.5, 0, 58.75, 117.5, 125], receivers: range(48, 2.5), args: ['--poisson', '0.33'], options: { vsFromVp: { poisson: [0.33] } },
    trueDepth: (x) => 5 + x * tan5,
  },
  {
    name: 'three layers on ground sloping 6 %, 24 geophones at 3 m',
    section: { surface: (x) => 60 - 0.06 * x, interfaces: [(x) => 57 - 0.06 * x, (x) => 48 - 0.05 * x], velocities: [320, 1100, 2900] },
    sources: [-9, 0, 34.5, 69, 78], receivers: range(24, 3), args: [], options: {},
  },
  {
    name: 'one layer only (no refractor within reach)',
    section: { surface: () => 10, interfaces: [() => -190], velocities: [700, 3000] }, // its head wave never arrives first within 23 m
    sources: [0, 23], receivers: range(24, 1), args: [], options: {},
  },
];

describe('hammerline report on held-out forward-model lines', () => {
  for (const line of lines) {
    it(`report(${line.name}) holds every section, shows interpret()'s numbers and loads nothing`, () => {
      const csv = syntheticCsv(line.section, line.sources, line.receivers, 0.3, 5);
      const run = runReport(['report', 'line.csv', '-o', 'r.html', ...line.args], { 'line.csv': csv });
      expect(run.code, run.error?.message).toBe(0);
      const html = run.written['r.html'];
      for (const id of REPORT_SECTIONS) expect(html).toContain(`<section id="${id}">`);
      expect(html).not.toMatch(/https?:|\b(src|href)\s*=|url\s*\(|@import|<script/i);
      const log = new WarningLog();
      const table = readFirstBreaks(csv, 'line.csv', log, {});
      const document = interpretationJson(interpret(table, line.options, log)) as Record<string, unknown>;
      const compared = compareWithDocument(html, document, receiverGround(table));
      expect(compared).toBeGreaterThan(line.name.startsWith('one layer') ? 10 : 60);
      expect(html).not.toMatch(/NaN|undefined|Infinity|\[object/);
      if (line.trueDepth) {
        // The summary's depth range brackets the true rock head within 0.5 m at each end.
        const depthRange = markedNumbers(section(html, 'summary')).filter((n) => n.path === 'refractors.0.points.*.depth_m').map((n) => n.value!);
        const xs = receiverGround(table).map((r) => r.x);
        expect(Math.abs(depthRange[0] - line.trueDepth(xs[0]))).toBeLessThan(0.5);
        expect(Math.abs(depthRange[1] - line.trueDepth(xs[xs.length - 1]))).toBeLessThan(0.5);
        expect(section(html, 'site')).toMatch(/ESTIMATED, not measured/);
      }
      if (line.name.startsWith('one layer')) expect(section(html, 'summary')).toMatch(/No refractor was found/);
    });
  }
});
