import { describe, expect, it } from 'vitest';
import { formatLength, formatVelocity } from '../../src/core/units.js';
import { feetInText } from '../../src/report/unitText.js';
import { syntheticCsv } from '../reference/layeredTravelTimes.js';
import { range } from '../helpers.js';
import { run } from '../cli/run.js';

const FT = 0.3048; // international foot, exact by definition (1959)

/** The CSV with every length column converted from metres to feet. */
function inFeet(csv: string): string {
  const [header, ...rows] = csv.trim().split('\n');
  const lengthColumns = header.split(',').map((h, i) => (['source_x', 'source_elev', 'receiver_x', 'receiver_elev'].includes(h) ? i : -1)).filter((i) => i >= 0);
  return [header, ...rows.map((r) => r.split(',').map((c, i) => (lengthColumns.includes(i) ? (Number(c) / FT).toFixed(4) : c)).join(','))].join('\n') + '\n';
}

/** Every "X ft [Y m]" and "X ft/s [Y m/s]" pair (lists and ranges too) of a text. */
function pairs(text: string): { feet: string[]; metres: string[]; unit: string }[] {
  const out: { feet: string[]; metres: string[]; unit: string }[] = [];
  const numbers = (s: string) => s.match(/-?\d+(\.\d+)?/g) ?? [];
  for (const m of text.matchAll(/((?:-?\d+(?:\.\d+)?(?:, | and | or | to |-)?)+) (ft\/s|ft) \[([^\]]+) (m\/s|m)\]/g)) {
    out.push({ feet: numbers(m[1]), metres: numbers(m[3]), unit: m[2] });
  }
  return out;
}

describe('formatLength and formatVelocity', () => {
  it('formatLength(4.7 m, ft) is 15.4 ft [4.7 m]: 4.7 / 0.3048 = 15.42 (1 ft = 0.3048 m exactly)', () => {
    expect(formatLength(4.7, 'ft', 1)).toBe('15.4 ft [4.7 m]');
    expect(formatLength(4.7, 'm', 1)).toBe('4.7 m');
    // A position from a feet input: 1.5 ft = 0.4572 m, printed rounded, never 0.45720000000000005.
    expect(formatLength(1.5 * FT, 'ft', 2)).toBe('1.50 ft [0.46 m]');
    expect(formatVelocity([1450, 1650], 'ft', 0, '-')).toBe('4757-5413 ft/s [1450-1650 m/s]');
  });

  it('feetInText converts lengths, lists and ranges of a plain SI sentence, leaving ms, % and names alone', () => {
    expect(feetInText('no geophone between x = 12 and 14.5 m (a gap of 4.57 m), 3 ms, S2, 10 %'))
      .toBe('no geophone between x = 39.4 and 47.6 ft [12 and 14.5 m] (a gap of 14.99 ft [4.57 m]), 3 ms, S2, 10 %');
    expect(feetInText('bounds (180, 360 or 800 m/s)')).toBe('bounds (591, 1181 or 2625 ft/s [180, 360 or 800 m/s])');
  });
});

describe('interpret --units ft', () => {
  // Dry 360 over saturated 1575 m/s at 2.4 m over 4000 m/s at 10 m, from the independent forward
  // model, written in feet; the saturated layer and the rock given their own values so that every
  // part of the site block is printed.
  const csv = inFeet(syntheticCsv({ surface: () => 100, interfaces: [() => 97.6, () => 90], velocities: [360, 1575, 4000] }, [-6, 0, 47, 94, 100], range(48, 2), 0.2, 3));
  const args = ['interpret', 'LINE.csv', '--units', 'ft', '--poisson', '0.3', '--layer-poisson', '2:0.45', '--layer-vs', '3:4900:300'];
  const { code, stdout } = run(args, { 'LINE.csv': csv });

  it('interpret --units ft prints no metre figure outside brackets anywhere in the summary', () => {
    expect(code).toBe(0);
    const outside = stdout.replace(/\[[^\]]*\]/g, '');
    const offending = outside.split('\n').filter((line) => /(?<![\w.])-?\d+(\.\d+)?\s?(m|m\/s)(?![\w/])|\((m|m\/s)\)|\bmetres?\b/.test(line));
    expect(offending).toEqual([]);
    expect(stdout).toMatch(/Vs30 \d+ ft\/s \[\d+ m\/s\]/);
    expect(stdout).toMatch(/velocity \(ft\/s\)/);
  });

  it('interpret --units ft prints the warnings of the general list in feet too (a gap in the geophones, a one-sided source)', () => {
    // The gap and one-sided-source layout of test/depth/profiles.forward.test.ts, in feet.
    const time = (s: number, r: number) => Math.min(Math.abs(r - s) / 500, Math.abs(r - s) / 2000 + 0.019365);
    const receivers = range(48, 1).filter((x) => x < 20 || x > 25);
    const rows = ['source_id,source_x,receiver_x,time_ms'];
    for (const [id, sx] of [['S1', -0.5], ['S2', 47.5]] as const) for (const x of receivers) rows.push(`${id},${sx / FT},${x / FT},${(time(sx, x) * 1e3).toFixed(4)}`);
    for (const x of receivers.filter((r) => r > 30)) rows.push(`S3,${30 / FT},${x / FT},${(time(30, x) * 1e3).toFixed(4)}`);
    const gap = run(['interpret', 'GAP.csv', '--units', 'ft'], { 'GAP.csv': rows.join('\n') + '\n' }).stdout;
    // 19 m = 62.34 ft and 26 m = 85.30 ft; the source at 30 m = 98.43 ft.
    expect(gap).toMatch(/\[receiver-gap\] .*no geophone between x = 62\.34 and 85\.30 ft \[19\.00 and 26\.00 m\]/);
    expect(gap).toMatch(/\[one-sided-source\] .*source S3 at x = 98\.43 ft \[30\.00 m\]/);
    expect(gap.replace(/\[[^\]]*\]/g, '')).not.toMatch(/(?<![\w.])-?\d+(\.\d+)?\s?(m|m\/s)(?![\w/])/);
  });

  it('interpret --units ft prints every bracketed pair with feet = metres / 0.3048 to the printed precision', () => {
    const found = pairs(stdout);
    expect(found.length).toBeGreaterThan(10);
    for (const { feet, metres, unit } of found) {
      expect(feet.length).toBe(metres.length);
      feet.forEach((f, i) => {
        // Both sides are rounded for print: half a unit of the last printed digit of each.
        const half = (s: string) => 0.5 * 10 ** -((s.split('.')[1] ?? '').length);
        const tolerance = half(metres[i]) / FT + half(f) + 1e-9;
        expect(Math.abs(Number(f) - Number(metres[i]) / FT), `${f} ${unit} [${metres[i]}]`).toBeLessThanOrEqual(tolerance);
      });
      expect(unit === 'ft' || unit === 'ft/s').toBe(true);
    }
  });

  it('interpret --units ft gives layer velocities in ft/s equal to the JSON m/s divided by 0.3048', () => {
    const doc = JSON.parse(run([...args, '--json'], { 'LINE.csv': csv }).stdout);
    const rows = stdout.split('\n').filter((l) => /^ {2}[123] +\d+ ± \d+/.test(l));
    expect(rows).toHaveLength(3);
    rows.forEach((row, i) => {
      const feet = Number(row.trim().split(/\s+/)[1]);
      expect(Math.abs(feet - doc.layers[i].velocity_mps / FT)).toBeLessThanOrEqual(1);
    });
    // JSON stays SI: the refractor near 2.4 m.
    expect(doc.refractors[0].points[10].depth_m).toBeCloseTo(2.4, 0);
  });
});
