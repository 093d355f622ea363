import { describe, expect, it } from 'vitest';
import { InputError } from '../../src/core/errors.js';
import { WarningLog } from '../../src/core/warnings.js';
import { compareWithPLine } from '../../src/site/pLineCheck.js';
import { run } from '../cli/run.js';

/** A line with flat refractors at the given depths (metres) and layer velocities (m/s). */
function line(file: string, velocities: number[], depths: number[]) {
  return {
    file,
    layers: velocities.map((velocity, i) => ({ index: i + 1, velocity, velocitySe: 1, reversed: true, segmentCount: 2 })),
    refractors: depths.map((depth) => ({ points: [0, 1, 2].map(() => ({ depth })) })),
  } as never;
}

describe('compareWithPLine', () => {
  it('compareWithPLine compares each S layer with the Vp at its own depths, not with the P layer of the same index', () => {
    // S: 160 m/s to 2 m, 300 to 11 m, 1050 below. P: 300 m/s to 1.2 m, 600 to 3.2 m, 1550 to 11 m,
    // 3200 below. S layer 2 (2 to 11 m) has its middle at 6.5 m, in P layer 3 (1550 m/s), so
    // Vp/Vs = 1550 / 300 = 5.17, by hand; by index it would be 600 / 300 = 2.
    const check = compareWithPLine(line('S.csv', [160, 300, 1050], [2, 11]), line('P.csv', [300, 600, 1550, 3200], [1.2, 3.2, 11]));
    expect(check.layers.map((c) => c.pLayer)).toEqual([1, 3, 4]);
    expect(check.layers[1].ratio).toBeCloseTo(1550 / 300, 9);
    expect(check.layers[1].slowestVp).toBe(600);
    // In and below the water table (Vp 1450-1650 m/s, common practice) no upper bound applies.
    expect(check.layers[1]).toMatchObject({ range: [Math.SQRT2, undefined], plausible: true });
  });

  it('compareWithPLine stops where a Vs is not below the Vp at the same depth, although the same-index layers would pass', () => {
    // S layer 2 (700 m/s) spans 2 to 12 m; the P line has 600 m/s down to 8 m. By index 700 < 900 would pass.
    const s = line('S.csv', [300, 700, 1500], [2, 12]);
    const p = line('P.csv', [600, 900, 3000], [8, 12]);
    expect(() => compareWithPLine(s, p)).toThrow(InputError);
    expect(() => compareWithPLine(s, p)).toThrow(/layer 2 \(2\.0 to 12\.0 m\) has Vs 700 m\/s, not slower than Vp 600 m\/s at the same depth on the P line P\.csv/);
  });

  it('compareWithPLine warns of a Vp/Vs below sqrt 2 (elasticity, ν ≥ 0) and of one outside 1.7-5 above the water table (common practice)', () => {
    const log = new WarningLog();
    // Dry: Vp/Vs = 400 / 300 = 1.33 < 1.414 in layer 1; 2400 / 400 = 6 > 5 in layer 2 (P 2400 m/s is not in the water band).
    const check = compareWithPLine(line('S.csv', [300, 400], [3]), line('P.csv', [400, 2400], [3]), log);
    expect(check.layers.map((c) => c.plausible)).toEqual([false, false]);
    expect(log.items.map((w) => w.code)).toEqual(['p-line-ratio-impossible', 'p-line-ratio-unusual']);
    expect(log.items[1].message).toMatch(/Vp\/Vs 6\.00, outside 1\.7 to 5/);
    // A plausible pair raises nothing: 1000 / 300 = 3.3.
    const quiet = new WarningLog();
    compareWithPLine(line('S.csv', [300, 1200], [3]), line('P.csv', [1000, 3600], [3]), quiet);
    expect(quiet.items).toEqual([]);
  });
});

describe('interpret --p-line', () => {
  it('interpret --p-line shows the comparison in the summary and the JSON', () => {
    const args = ['interpret', 'survey-examples/alluvial-terrace/sh-first-breaks.csv', '--wave', 'S', '--p-line', 'survey-examples/alluvial-terrace/first-breaks.csv'];
    const { code, stdout } = run(args);
    expect(code).toBe(0);
    expect(stdout).toMatch(/Check against the P line .*first-breaks\.csv/);
    expect(stdout).toMatch(/ 2 +\d\.\d to \d+\.\d +\d+ +\d+ \(P layer 2\) +\d\.\d\d/);
    const doc = JSON.parse(run([...args, '--json']).stdout);
    expect(doc.p_line_check.layers).toHaveLength(3);
    for (const c of doc.p_line_check.layers) expect(c.vs_mps).toBeLessThan(c.slowest_vp_mps);
  });

  it('interpret of SEG-2 records with --p-line runs the check too', () => {
    // The P records read as S against the P table of the same line: Vs = Vp, which the check must refuse.
    const records = [1, 2, 3, 4, 5, 6, 7].map((n) => `survey-examples/pump-station/records/S${n}.seg2`);
    const { code, stderr } = run(['interpret', ...records, '--wave', 'S', '--p-line', 'survey-examples/pump-station/first-breaks.csv']);
    expect(code).toBe(2);
    expect(stderr).toMatch(/not slower than Vp .* at the same depth on the P line/);
  });

  it('interpret --p-line with a SEG-2 record says what to give instead', () => {
    const { code, stderr } = run(['interpret', 'survey-examples/alluvial-terrace/sh-first-breaks.csv', '--wave', 'S', '--p-line', 'survey-examples/pump-station/records/S1.seg2']);
    expect(code).toBe(2);
    expect(stderr).toMatch(/--p-line takes the first-break table of the P line .* hammerline pick P\*\.seg2 -o P\.csv/);
  });
});
