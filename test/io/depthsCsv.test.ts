import { describe, expect, it } from 'vitest';
import { depthsCsv } from '../../src/io/depthsCsv.js';
import { flatFirstArrival } from '../reference/flatLayerTimes.js';
import { interpretCsv } from '../helpers.js';

// Feet output is metres divided by 0.3048 exactly (the international foot, 1959). A line laid out
// in feet (receivers every 10 ft) over 5 m of 500 m/s on 2000 m/s, exact first breaks from the
// flat-layer formulas (Telford et al. 1990 §4.2, test/reference/flatLayerTimes.ts), read as feet.
const FT = 0.3048;

function feetLine() {
  const receiversFt = Array.from({ length: 49 }, (_, i) => 10 * i);
  const sourcesFt = [-1, 240, 481];
  const rows = ['source_id,source_x,receiver_x,time_ms'];
  sourcesFt.forEach((s, k) => {
    for (const r of receiversFt) rows.push(`S${k + 1},${s},${r},${(flatFirstArrival([5], [500, 2000], (r - s) * FT) * 1e3).toFixed(4)}`);
  });
  return interpretCsv(rows.join('\n') + '\n', {}, { lengthUnit: 'ft' });
}

describe('depthsCsv in feet', () => {
  it('depthsCsv(ft) writes positions in feet, 5 m depths as 16.404 ft and velocities in ft/s (1 ft = 0.3048 m exactly)', () => {
    const { result, table } = feetLine();
    const receivers = [...new Set(table.picks.map((p) => p.receiverX))].sort((a, b) => a - b).map((x) => ({ x, elev: 0 }));
    const text = depthsCsv(result, receivers, 'ft');
    // 500 m/s = 1640.42 ft/s and 2000 m/s = 6561.68 ft/s, by hand.
    expect(text).toMatch(/# layers: 1: 1640 ± \d+; 2: 6562 ± \d+/);
    // Comment lines start with # (quoted when they hold a comma); the table follows its header.
    const lines = text.split('\n').filter((l) => l !== '' && !/^"?#/.test(l));
    const header = lines[0].split(',');
    const rows = lines.slice(1).map((l) => l.split(','));
    const column = (name: string) => header.indexOf(name);
    // Receivers every 10 ft: the x column reads 0, 10, 20 ... ft (to the 3 decimals written).
    rows.forEach((row, i) => expect(Number(row[column('x')])).toBeCloseTo(10 * i, 3));
    const depths = rows.map((row) => row[column('depth_1')]).filter((cell) => cell !== '').map(Number);
    expect(depths.length).toBeGreaterThan(40);
    // 5 m / 0.3048 = 16.4042 ft, by hand; the line's own fit error is well under a centimetre.
    for (const d of depths) expect(Math.abs(d - 5 / FT)).toBeLessThan(0.03);
  });
});
