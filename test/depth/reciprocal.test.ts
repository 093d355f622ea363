import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { WarningLog } from '../../src/core/warnings.js';
import { intervalIndex } from '../../src/depth/headWaves.js';
import { reciprocalChecks } from '../../src/depth/reciprocal.js';
import { interpretCsv, range } from '../helpers.js';

describe('reciprocalChecks', () => {
  it('reciprocalChecks on a rolling-spread line finds every pair a brute-force search over all pairs finds, with equal times', () => {
    // Head waves over a flat refractor, 500 over 2000 m/s at 5 m (Telford et al. 1990 Eq. 4.17).
    const t = (sx: number, rx: number) => {
      const x = Math.abs(rx - sx);
      return Math.min(x / 500, x / 2000 + (2 * 5 * Math.sqrt(2000 ** 2 - 500 ** 2)) / (500 * 2000));
    };
    const receivers = range(120, 2);
    const lines = ['source_id,source_x,receiver_x,time_ms'];
    [5, 41, 81, 121, 161, 201, 233].forEach((sx, s) => {
      for (const rx of receivers) if (Math.abs(rx - sx) <= 60 && rx !== sx) lines.push(`S${s + 1},${sx},${rx},${(t(sx, rx) * 1e3).toFixed(4)}`);
    });
    const { result } = interpretCsv(lines.join('\n') + '\n');
    const checks = reciprocalChecks(result.fits, 0.0002, new WarningLog());
    // Brute force: every forward branch against every reverse branch of a source east of it, the
    // times read off each branch's own picks at the other source (linear interpolation).
    const at = (picks: { receiverX: number; time: number }[], x: number) => {
      const sorted = [...picks].sort((a, b) => a.receiverX - b.receiverX);
      for (let i = 0; i + 1 < sorted.length; i++) {
        const [a, b] = [sorted[i], sorted[i + 1]];
        if (x >= a.receiverX && x <= b.receiverX) return a.time + ((x - a.receiverX) / (b.receiverX - a.receiverX)) * (b.time - a.time);
      }
      return undefined;
    };
    const expected: string[] = [];
    for (const a of result.fits.filter((f) => f.branch.side === 'forward')) {
      for (const b of result.fits.filter((f) => f.branch.side === 'reverse')) {
        if (!(b.branch.sourceX > a.branch.sourceX)) continue;
        const ab = at(a.branch.picks, b.branch.sourceX);
        const ba = at(b.branch.picks, a.branch.sourceX);
        if (ab !== undefined && ba !== undefined) expected.push(`${a.branch.sourceId}-${b.branch.sourceId} ${(ab * 1e3).toFixed(6)} ${(ba * 1e3).toFixed(6)}`);
      }
    }
    expect(expected.length).toBeGreaterThan(5);
    expect(checks.map((c) => `${c.sourceA}-${c.sourceB} ${(c.timeAB * 1e3).toFixed(6)} ${(c.timeBA * 1e3).toFixed(6)}`)).toEqual(expected);
    // Reciprocity on exact times: every pair agrees (common practice tolerance 1 ms).
    expect(checks.every((c) => c.ok)).toBe(true);
  });

  it('intervalIndex equals the linear scan it replaces on ascending positions (fast-check)', () => {
    fc.assert(fc.property(fc.array(fc.integer({ min: -50, max: 50 }), { maxLength: 30 }), fc.integer({ min: -60, max: 60 }), (raw, x) => {
      const xs = [...new Set(raw)].sort((a, b) => a - b);
      let i = 0;
      while (i < xs.length - 1 && xs[i + 1] < x) i++;
      expect(intervalIndex(xs, x)).toBe(i);
    }), { numRuns: 500, seed: 2 });
  });
});
