import { describe, expect, it } from 'vitest';
import { WarningLog } from '../../src/core/warnings.js';
import { readFirstBreaks } from '../../src/io/firstBreaksCsv.js';
import { interpret } from '../../src/interpret.js';
import { syntheticCsv } from '../reference/layeredTravelTimes.js';

describe('refractorProfiles', () => {
  it('refractorProfiles does not recommend a delay-time profile that the intercept-time depth under a source contradicts', () => {
    // Independent forward model (test/reference, exact times): 150 m/s to 5 m, 250 m/s to 15 m,
    // 500 m/s below; 48 geophones at 1.5 m, sources at -4.5, 0, 35.25, 70.5 and 75 m. The second
    // refractor's head wave is recorded from one side over most of the line, and its delay-time
    // solution came out at 33 m against the true 15 m. The intercept-time depth under a source
    // (Telford et al. 1990 §4.3) is 15 m; the recommended profile must follow the truth within 5 %.
    const receivers = Array.from({ length: 48 }, (_, i) => 1.5 * i);
    const csv = syntheticCsv({ surface: () => 100, interfaces: [() => 95, () => 85], velocities: [150, 250, 500] }, [-4.5, 0, 35.25, 70.5, 75], receivers, 0, 1);
    const log = new WarningLog();
    const result = interpret(readFirstBreaks(csv, 'line.csv', log, { wave: 'S' }), { wave: 'S' }, log);
    const deeper = result.refractors[1];
    expect(deeper.points.length).toBeGreaterThan(0);
    for (const p of deeper.points) expect(Math.abs(p.depth - 15) / 15).toBeLessThan(0.05);
    expect(result.warnings.some((w) => w.code === 'method-unconfirmed' && /refractor 2: the delay-time/.test(w.message))).toBe(true);
  });
});
