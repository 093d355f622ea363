import { describe, expect, it } from 'vitest';
import { pickRecord } from '../../src/picking/autoPick.js';
import { firstArrivals } from '../reference/layeredTravelTimes.js';
import { causalTrace } from './syntheticRecord.js';

// Off-end shots whose first two or three traces are direct-wave arrivals before an early crossover
// (400 m/s over 2400 m/s, refractor 3.5 m deep: crossover at 2·3.5·√(2800/2000) = 8.3 m, Telford
// et al. 1990 eq. 4.38), onsets from the independent forward model (test/reference, least time by
// Fermat's principle), causal 60 Hz wavelets at signal-to-noise 30 over unit Gaussian noise, 0.25 ms
// sampling, 5 ms pre-trigger. The direct-wave picks are real first breaks and must be kept; a
// near-source pick on a pre-trigger burst or on a late phase must not be.
const dt = 0.00025;
const delay = -0.005;
const section = { surface: () => 100, interfaces: [() => 96.5], velocities: [400, 2400] };
const receivers = Array.from({ length: 48 }, (_, i) => i * 2);

function shot(sourceX: number, seed: number) {
  const onsets = firstArrivals(section, sourceX, receivers, [-20, 115]);
  return receivers.map((rx, r) => ({ data: causalTrace(600, dt, delay, onsets[r], 30, seed * 100 + r), sampleInterval: dt, delay, offset: rx - sourceX, onset: onsets[r] }));
}

describe('pickRecord near the source of an off-end shot', () => {
  it('pickRecord keeps the direct-wave first breaks before an early crossover, within 2 samples', () => {
    let kept = 0;
    let direct = 0;
    for (const [sourceX, seed] of [[-5, 1], [-4, 2], [-3, 3], [99, 4], [98, 5]] as const) {
      const traces = shot(sourceX, seed);
      const picks = pickRecord(traces);
      traces.forEach((t, r) => {
        // Direct wave where offset / 400 m/s is the first arrival (the forward model says which).
        if (Math.abs(Math.abs(t.offset) / 400 - t.onset) > 1e-6) return;
        direct++;
        if (picks[r].time !== undefined && Math.abs(picks[r].time! - t.onset) <= 2 * dt) kept++;
      });
    }
    // Two to three direct-wave traces per shot (offsets 3 to 8 m), every one kept.
    expect(direct).toBeGreaterThanOrEqual(10);
    expect(kept).toBe(direct);
  });

  it('pickRecord does not keep a near-source pick on a pre-trigger burst or on a late phase', () => {
    const traces = shot(-5, 7);
    // Trace 0 (offset 5 m, onset 12.5 ms): a burst at 3 ms before the first break.
    const at = (time: number) => Math.round((time - delay) / dt);
    for (let k = 0; k < 24; k++) traces[0].data[at(0.003) + k] += 200 * Math.sin((2 * Math.PI * k) / 16) * Math.exp(-k / 8);
    // Trace 1 (offset 7 m, onset 17.5 ms): its first break buried in noise, a strong phase at 26 ms.
    traces[1].data = causalTrace(600, dt, delay, traces[1].onset, 0.5, 71, { laterArrival: { time: 0.026, amplitude: 120 } });
    const picks = pickRecord(traces);
    for (const r of [0, 1]) {
      // Either picked again at the first break (within 3 samples) or left unpicked; never the burst or the late phase.
      if (picks[r].time !== undefined) expect(Math.abs(picks[r].time! - traces[r].onset)).toBeLessThanOrEqual(3 * dt);
    }
    // The clean direct-wave trace beside them is kept.
    expect(Math.abs(picks[2].time! - traces[2].onset)).toBeLessThanOrEqual(2 * dt);
  });
});
