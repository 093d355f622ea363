import { describe, expect, it } from 'vitest';
import { readSeg2 } from '../../src/io/seg2/read.js';
import { pickShearRecord } from '../../src/picking/pickShearRecord.js';
import { pickPolarityPair } from '../../src/picking/polarityPairs.js';
import { pickRecords } from '../../src/picking/pickRecords.js';
import { shearShot, shearShotSeg2, type ShearLine } from './shearRecord.js';

// Polarity pairs: the same SH shot recorded twice, the beam struck from opposite sides, which
// reverses the S and the SH surface wave and leaves the P (common practice for SH refraction).
// Records from test/picking/shearRecord.ts (P at 0.3 of the S, surface wave twice the S behind it,
// unit Gaussian noise, each record its own noise); onsets from the independent forward model of
// test/reference. 0.5 ms sampling, 10 ms pre-trigger.
const line: ShearLine = { surface: () => 100, interfaces: [() => 96, () => 88], vp: [340, 700, 2100], vs: [170, 320, 950] };
const receivers = Array.from({ length: 48 }, (_, i) => i * 1.5);
const common = { sampleInterval: 0.0005, samples: 1000, step: 0.25 };
const median = (v: number[]) => [...v].sort((a, b) => a - b)[v.length >> 1];

function errors(picks: { time?: number }[], sTimes: number[], offsets: number[]) {
  // Unpicked traces count as a 1 s error: fewer picks is worse, never better.
  return picks.flatMap((p, r) => (offsets[r] === 0 ? [] : [p.time === undefined ? 1 : Math.abs(p.time - sTimes[r])]));
}

describe('pickPolarityPair on records of opposite S polarity', () => {
  const sx = 35.25;
  const a = shearShot(line, sx, receivers, { ...common, pRatio: 0.3, snr: 12, polarity: 1, seed: 71 });
  const b = shearShot(line, sx, receivers, { ...common, pRatio: 0.3, snr: 12, polarity: -1, seed: 72 });

  it('pickPolarityPair: the difference cancels the P to within the noise (P windows RMS within 15 % of √2 × the noise)', () => {
    // In the P window (from the P onset to halfway to the S, at most 12 ms) record a carries its P;
    // the difference carries only the noise of the two records, √2 times one record's (unit) noise.
    let single = 0, difference = 0, count = 0;
    a.traces.forEach((t, r) => {
      const from = Math.round((a.pTimes[r] - t.delay) / t.sampleInterval);
      const to = Math.min(from + 24, Math.round(((a.pTimes[r] + a.sTimes[r]) / 2 - t.delay) / t.sampleInterval));
      for (let k = from; k < to; k++) {
        single += t.data[k] ** 2;
        difference += (t.data[k] - b.traces[r].data[k]) ** 2;
        count++;
      }
    });
    expect(count).toBeGreaterThan(300);
    // The P raises record a's RMS in those windows half as much again above its unit noise.
    expect(Math.sqrt(single / count)).toBeGreaterThan(1.5);
    expect(Math.sqrt(difference / count) / Math.SQRT2).toBeGreaterThan(0.85);
    expect(Math.sqrt(difference / count) / Math.SQRT2).toBeLessThan(1.15);
    // The program's own measure agrees: little P left in the difference.
    expect(pickPolarityPair(a.traces, b.traces).check.pResidual!).toBeLessThan(0.3);
  });

  it('pickPolarityPair picks from the difference at least as well as from either record (median error, picks within 1 ms)', () => {
    const offsets = a.traces.map((t) => t.offset);
    const pair = errors(pickPolarityPair(a.traces, b.traces).picks, a.sTimes, offsets);
    const alone = [a, b].map((r) => errors(pickShearRecord(r.traces).picks, r.sTimes, offsets));
    // A quarter sample of slack: the ramp fit resolves quarter samples.
    for (const e of alone) {
      expect(median(pair)).toBeLessThanOrEqual(median(e) + 0.25 * common.sampleInterval);
      expect(pair.filter((v) => v <= 1e-3).length).toBeGreaterThanOrEqual(e.filter((v) => v <= 1e-3).length);
    }
    expect(median(pair)).toBeLessThanOrEqual(1e-3);
  });
});

describe('pickRecords on SH records that share a source position', () => {
  const sx = 0;
  const write = (polarity: 1 | -1, seed: number, pSign = 1) => shearShotSeg2(line, sx, receivers, { ...common, pRatio: 0.3 * pSign, snr: 15, polarity, seed });
  const records = (shots: ReturnType<typeof write>[]) => shots.map((s, k) => readSeg2(s.bytes, `SH1${'abc'[k]}.seg2`));

  it('pickRecords subtracts a pair of opposite S polarity, picks the S from the difference and warns of nothing', () => {
    const shots = [write(1, 81), write(-1, 82)];
    const result = pickRecords(records(shots), { wave: 'S' });
    expect(result.groups).toHaveLength(1);
    expect(result.groups[0]).toMatchObject({ files: ['SH1a.seg2', 'SH1b.seg2'], reversed: ['SH1b.seg2'], check: { combined: 'pair' } });
    expect(result.notes).toEqual([]);
    // One row per receiver, not two: the pair is one shot.
    expect(result.rows).toHaveLength(receivers.length);
    expect(median(errors(result.rows, shots[0].sTimes, result.rows.map((r) => r.receiverX - sx)))).toBeLessThanOrEqual(1e-3);
  });

  it('pickRecords warns when the two records have the same S polarity (the difference is weak) and stacks them', () => {
    const shots = [write(1, 83), write(1, 84)];
    const result = pickRecords(records(shots), { wave: 'S' });
    expect(result.groups[0].check.combined).toBe('stack');
    expect(result.notes.map((n) => n.code)).toEqual(['polarity-pair-same']);
    expect(result.notes[0].message).toMatch(/SH1a\.seg2, SH1b\.seg2.*same S polarity/);
    // Stacked, the S is still picked after the P.
    expect(median(errors(result.rows, shots[0].sTimes, result.rows.map((r) => r.receiverX - sx)))).toBeLessThanOrEqual(1e-3);
  });

  it('pickRecords warns when the difference keeps the P (P reversed with the S) and still picks the S', () => {
    const shots = [write(1, 85), write(-1, 86, -1)];
    const result = pickRecords(records(shots), { wave: 'S' });
    expect(result.notes.map((n) => n.code)).toEqual(['polarity-pair-p-kept']);
    expect(result.groups[0].check.pResidual!).toBeGreaterThan(1);
    const rows = result.rows;
    const e = errors(rows, shots[0].sTimes, rows.map((r) => r.receiverX - sx));
    expect(median(e)).toBeLessThanOrEqual(1e-3);
    // None on the P arrival: nearer the P onset than the S onset.
    expect(rows.filter((row, r) => row.time !== undefined && row.receiverX !== sx && Math.abs(row.time - shots[0].pTimes[r]) < Math.abs(row.time - shots[0].sTimes[r]))).toHaveLength(0);
  });
});
