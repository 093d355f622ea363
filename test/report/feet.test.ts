import { describe, expect, it } from 'vitest';
import { syntheticCsv } from '../reference/layeredTravelTimes.js';
import { runReport } from './runReport.js';

describe('report --units ft', () => {
  it('report of a line given in feet says that its lengths are in metres, on the page and on stderr, and gives the metric depths', () => {
    // 1 ft = 0.3048 m exactly (international foot). A flat 2-layer line, refractor 6 m deep,
    // written in feet; the report must not present metres as if they were the input's feet.
    const metres = syntheticCsv({ surface: () => 100, interfaces: [() => 94], velocities: [500, 2500] }, [-1, 47, 95], Array.from({ length: 48 }, (_, i) => 2 * i), 0.2, 5);
    const feet = metres.split('\n').map((line, i) => {
      if (i === 0 || line === '') return line;
      const [id, sx, se, rx, re, t] = line.split(',');
      return [id, Number(sx) / 0.3048, Number(se) / 0.3048, Number(rx) / 0.3048, Number(re) / 0.3048, t].join(',');
    }).join('\n');
    const { code, stderr, written } = runReport(['report', 'line-ft.csv', '--units', 'ft', '-o', 'out.html'], { 'line-ft.csv': feet });
    expect(code).toBe(0);
    expect(stderr).toMatch(/given in feet and were converted to metres \(1 ft = 0\.3048 m exactly\)/);
    expect(written['out.html']).toMatch(/given in feet and were converted to metres/);
    // The summary's depth range is the metric one: about 6 m, not 6 / 0.3048 = 19.7.
    const range = /Refractor 1[^:]*: ([\d.]+) to ([\d.]+) m below ground/.exec(written['out.html'].replace(/<[^>]+>/g, ''));
    expect(range).not.toBeNull();
    expect(Math.abs(Number(range![1]) - 6)).toBeLessThan(0.3);
    expect(Math.abs(Number(range![2]) - 6)).toBeLessThan(0.3);
  });
});
