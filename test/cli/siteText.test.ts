import { readdirSync, readFileSync } from 'node:fs';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { syntheticCsv } from '../reference/layeredTravelTimes.js';
import { range } from '../helpers.js';
import { runReport } from '../report/runReport.js';
import { run, WORKING_NOTES } from './run.js';

const FT = 0.3048;

// Dry soil 350 m/s over rock 3500 m/s at 4 m, from the independent forward model (Fermat least
// time), 0.2 ms noise: no layer in the saturated band, so with ν 0.3 the estimate reaches EN 1998-1
// ground type A by velocity ("B or stiffer" as an estimate) and the hidden-saturated caution applies.
const dry = syntheticCsv({ surface: () => 100, interfaces: [() => 96], velocities: [350, 3500] }, [-10, 0, 47, 94, 104], range(48, 2), 0.2, 3);
const dryFeet = dry.split('\n').map((line, i) => {
  if (i === 0 || line === '') return line;
  const [id, sx, se, rx, re, t] = line.split(',');
  return [id, Number(sx) / FT, Number(se) / FT, Number(rx) / FT, Number(re) / FT, t].join(',');
}).join('\n');

/** Lines with a metre figure (or a metre unit in brackets-free text) outside the [SI] brackets. */
function metreFigures(text: string): string[] {
  return text.replace(/\[[^\]]*\]/g, '').split('\n').filter((line) => /(?<![\w.])-?\d+(\.\d+)?\s?(m|m\/s)(?![\w/])|\((m|m\/s)\)|\bmetres?\b/.test(line));
}

describe('the site block in feet (interpret and site --units ft)', () => {
  it('interpret --units ft --poisson 0.3 on a dry line prints no metre figure outside brackets in the site block, its notes and the cautions under the class', () => {
    const { code, stdout } = run(['interpret', 'LINE.csv', '--units', 'ft', '--poisson', '0.3'], { 'LINE.csv': dryFeet });
    expect(code).toBe(0);
    const site = stdout.slice(stdout.indexOf('Site class'));
    // The parts that carry lengths and velocities are there, in feet with SI in brackets:
    // EN 1998-1 ground type A's "5 m of weaker material" and "800 m/s", the hidden layer's thickness.
    expect(site).toMatch(/with at most 16 ft \[5 m\] of weaker material/);
    expect(site).toMatch(/above 2625 ft\/s \[800 m\/s\]/);
    expect(site).toMatch(/a saturated layer of Vp about 4921 ft\/s \[1500 m\/s\] up to [\d.]+ ft \[[\d.]+ m\] thick/);
    expect(metreFigures(site)).toEqual([]);
  });

  it('site --units ft --estimated prints no metre figure outside brackets, the EN 1998-1 "B or stiffer" note included', () => {
    // 3 m @ 300 over 1200 m/s in feet: 9.843 ft @ 984 ft/s over 3937 ft/s (1 ft = 0.3048 m).
    const { code, stdout } = run(['site', '--units', 'ft', '--layer', '9.843:984:30', '--halfspace', '3937:100', '--estimated']);
    expect(code).toBe(0);
    expect(stdout).toMatch(/EN 1998-1:2004 +Table 3\.1 +\d+ +B or stiffer \(estimated\)/);
    expect(metreFigures(stdout)).toEqual([]);
  });
});

describe('no working note reaches the user: the report and the field app too', () => {
  it('report --poisson 0.3 (estimated classes, "B or stiffer", the hidden-saturated caution) has no working note in its text', () => {
    const { code, written } = runReport(['report', 'LINE.csv', '--poisson', '0.3', '-o', 'out.html'], { 'LINE.csv': dry });
    expect(code).toBe(0);
    const text = written['out.html'].replace(/<style[\s\S]*?<\/style>/g, '').replace(/<script[\s\S]*?<\/script>/g, '').replace(/<[^>]+>/g, ' ');
    expect(text).toMatch(/B or stiffer/);
    expect(text).toMatch(/rests on the description of Table 3\.1/);
    expect(text).not.toMatch(WORKING_NOTES);
  });

  it('the field app\'s own strings (web/src and web/index.html, comments left out) hold no working note', () => {
    const files = ['web/index.html', ...['web/src', 'web/src/views'].flatMap((d) => readdirSync(d).filter((f) => f.endsWith('.ts')).map((f) => join(d, f)))];
    expect(files.length).toBeGreaterThan(10);
    for (const file of files) {
      // Comments are for contributors; what is left is what the app can show.
      const code = readFileSync(file, 'utf8').replace(/\/\*[\s\S]*?\*\//g, '').replace(/(^|[^:"'`])\/\/.*$/gm, '$1').replace(/<!--[\s\S]*?-->/g, '');
      expect(code, file).not.toMatch(WORKING_NOTES);
    }
  });
});
