import { describe, expect, it } from 'vitest';
import { readSeg2 } from '../../src/io/seg2/read.js';
import { pickSeg2 } from '../../src/picking/recordPicks.js';
import { shearShotSeg2, type ShearLine } from './shearRecord.js';

// Synthetic SH records (test/picking/shearRecord.ts) written by the test SEG-2 writer
// (test/io/seg2/writeSeg2.ts): at every geophone the P arrival at a quarter of the S amplitude
// (90 Hz), the S (50 Hz), a ringing surface wave twice the S at 0.85 of the top-layer Vs (22 Hz)
// behind it, and unit Gaussian noise; the S peak signal-to-noise 30 near the source, falling with
// offset to about 7. Onsets from the independent forward model of test/reference (least time by
// Fermat's principle), run on the P and on the S velocities of one layered section.
// 0.5 ms sampling, 10 ms pre-trigger, 0.49 s record. Targets from issue 14: S picks within 1 ms median, none on the P arrival.
const line: ShearLine = { surface: () => 100, interfaces: [() => 96.5, () => 89], vp: [330, 640, 1900], vs: [165, 310, 880] };
const receivers = Array.from({ length: 48 }, (_, i) => i * 1.5);
const sources = [-3, 0, 35.25, 70.5, 73.5];

let shots: ReturnType<typeof shearShotSeg2>[] | undefined;

function picked(wave: 'P' | 'S') {
  const errors: number[] = [];
  let onP = 0;
  let traces = 0;
  shots ??= sources.map((sx, s) => shearShotSeg2(line, sx, receivers, { pRatio: 0.25, snr: 30, seed: 40 + s, sampleInterval: 0.0005, samples: 1000, step: 0.25 }));
  sources.forEach((sx, s) => {
    const shot = shots![s];
    const rows = pickSeg2(readSeg2(shot.bytes, `SH${s + 1}.seg2`), { wave });
    rows.forEach((row, r) => {
      if (row.receiverX === sx) return;
      traces++;
      if (row.time === undefined) return;
      errors.push(Math.abs(row.time - (wave === 'S' ? shot.sTimes[r] : shot.pTimes[r])));
      // On the P arrival: nearer the P onset than the S onset.
      if (Math.abs(row.time - shot.pTimes[r]) < Math.abs(row.time - shot.sTimes[r])) onP++;
    });
  });
  errors.sort((a, b) => a - b);
  return { median: errors[errors.length >> 1], p90: errors[Math.floor(0.9 * (errors.length - 1))], onP, picked: errors.length, traces };
}

describe('pickSeg2 with wave S on SH records', () => {
  it('pickSeg2 { wave: S } picks the S onsets within 1 ms (median), 2 ms (90th percentile), none on the P arrival', () => {
    const s = picked('S');
    expect(s.median).toBeLessThanOrEqual(1e-3);
    expect(s.p90).toBeLessThanOrEqual(2e-3);
    expect(s.onP).toBe(0);
    // At most a tenth of the traces left unpicked.
    expect(s.picked).toBeGreaterThanOrEqual(0.9 * s.traces);
  });

  it('pickSeg2 (first breaks) on the same records picks the P: the records do carry a P ahead of the S', () => {
    const p = picked('P');
    // First breaks within 1 ms of the P onsets (median): the S picker above had a P to pass over.
    expect(p.median).toBeLessThanOrEqual(1e-3);
    expect(p.onP).toBeGreaterThanOrEqual(0.8 * p.traces);
  });
});

describe('pickShearRecord where the P is lost in the noise', () => {
  it('pickShearRecord takes the first breaks as the S, not as a P ahead of the surface wave, when no weaker P precedes them', async () => {
    const { pickShearRecord } = await import('../../src/picking/pickShearRecord.js');
    const { shearShot } = await import('./shearRecord.js');
    // P at a tenth of the S (peak signal-to-noise about 1: not seen), a surface wave three times the S.
    const errors: number[] = [];
    for (const [sx, seed] of [[0, 61], [70.5, 62]] as const) {
      const shot = shearShot(line, sx, receivers, { pRatio: 0.1, snr: 12, surfaceAmplitude: 3, seed, sampleInterval: 0.0005, samples: 1000, step: 0.25 });
      pickShearRecord(shot.traces).picks.forEach((p, r) => {
        if (shot.traces[r].offset !== 0) errors.push(p.time === undefined ? 1 : Math.abs(p.time - shot.sTimes[r]));
      });
    }
    errors.sort((a, b) => a - b);
    // Median within 1 ms of the S onsets (issue 14), and three quarters of the traces within 2 ms.
    expect(errors[errors.length >> 1]).toBeLessThanOrEqual(1e-3);
    expect(errors[Math.floor(0.75 * (errors.length - 1))]).toBeLessThanOrEqual(2e-3);
  });
});

describe('pickShearRecord where the P fades out with offset and the surface wave is strong', () => {
  // A line like those of the failing case: the P at a quarter of the S and S
  // signal-to-noise 12 near the source (falling with offset to about 3), so the P (peak
  // signal-to-noise under 2 beyond some 25 m) is lost in the noise on the far traces, where the
  // first breaks are the S; a surface wave 2.5 times the S at 0.85 of the top-layer Vs behind it.
  // 0.5 ms sampling, 48 geophones at 1.5 m, shots off both ends, at the ends and inside. Onsets
  // from the independent forward model of test/reference.
  const fading: ShearLine = { surface: () => 50, interfaces: [() => 45, () => 36], vp: [360, 640, 1500], vs: [180, 340, 760] };
  const sources = [-6, 0, 23.25, 47.25, 70.5, 76.5];
  const options = (s: number) => ({ pRatio: 0.25, snr: 12, seed: 500 + s, sampleInterval: 0.0005, samples: 1000, step: 0.25, surfaceAmplitude: 2.5, surfaceVelocity: 0.85, frequencies: [90, 45, 20] as [number, number, number] });

  it('pickSeg2 { wave: S } keeps the S picks off the surface wave: none over 5 ms late, median within 1 ms, none on the P', () => {
    const errors: number[] = [];
    let late = 0;
    let onP = 0;
    let traces = 0;
    sources.forEach((sx, s) => {
      const shot = shearShotSeg2(fading, sx, receivers, options(s));
      pickSeg2(readSeg2(shot.bytes, `F${s + 1}.seg2`), { wave: 'S' }).forEach((row, r) => {
        if (row.receiverX === sx) return;
        traces++;
        if (row.time === undefined) return;
        const error = row.time - shot.sTimes[r];
        errors.push(Math.abs(error));
        // The surface wave comes at 1/0.85 of the direct S time and later: over 5 ms late is on it.
        if (error > 5e-3) late++;
        if (Math.abs(row.time - shot.pTimes[r]) < Math.abs(error)) onP++;
      });
    });
    errors.sort((a, b) => a - b);
    expect(late).toBe(0);
    expect(onP).toBe(0);
    // Issue 14: median within 1 ms; 90th percentile within 2 ms; at most a tenth unpicked.
    expect(errors[errors.length >> 1]).toBeLessThanOrEqual(1e-3);
    expect(errors[Math.floor(0.9 * (errors.length - 1))]).toBeLessThanOrEqual(2e-3);
    expect(errors.length).toBeGreaterThanOrEqual(0.9 * traces);
  });
});

describe('pickShearRecord where the P refracts at a shallow water table', () => {
  // Below a water table the P speeds up to about 1500 m/s while the S does not notice it (common
  // practice): the P first breaks then lie on a refracted line whose intercept exceeds the S time
  // on the geophones nearest the source, where the P is missed and the first breaks are the S.
  // Those S first breaks must not be taken as a sign that the P moveout is not the P.
  const wet: ShearLine = { surface: () => 40, interfaces: [() => 37, () => 28], vp: [380, 1520, 2300], vs: [170, 290, 760] };
  const sources = [-6, 0, 23.25, 47.25, 70.5, 76.5];

  it('pickShearRecord picks the S, none on the P, median within 1 ms, on shots struck from either side', async () => {
    const { pickShearRecord } = await import('../../src/picking/pickShearRecord.js');
    const { shearShot } = await import('./shearRecord.js');
    const errors: number[] = [];
    let onP = 0;
    sources.forEach((sx, s) => {
      const shot = shearShot(wet, sx, receivers, { pRatio: 0.25, snr: 25, seed: 900 + s, polarity: s % 2 === 0 ? 1 : -1, sampleInterval: 0.0005, samples: 1000, step: 0.25 });
      pickShearRecord(shot.traces).picks.forEach((p, r) => {
        if (shot.traces[r].offset === 0 || p.time === undefined) return;
        errors.push(Math.abs(p.time - shot.sTimes[r]));
        if (Math.abs(p.time - shot.pTimes[r]) < Math.abs(p.time - shot.sTimes[r])) onP++;
      });
    });
    errors.sort((a, b) => a - b);
    expect(onP).toBe(0);
    // Issue 14: median within 1 ms; at least nine tenths of the 282 traces off the shot picked.
    expect(errors[errors.length >> 1]).toBeLessThanOrEqual(1e-3);
    expect(errors.length).toBeGreaterThanOrEqual(0.9 * 282);
  });
});

describe('pickShearRecord where the P is half the S', () => {
  // P at 0.48 of the S (SH records show 0.1 to 0.5, common practice): the S onset is then only
  // about twice the P and its coda, and the first breaks are still the P.
  const strongP: ShearLine = { surface: () => 50, interfaces: [() => 46, () => 35], vp: [380, 510, 1450], vs: [155, 270, 740] };
  const near = Array.from({ length: 64 }, (_, i) => i);
  const sources = [-7, 0, 31.5, 63, 67];

  it('pickShearRecord picks the S after a P half as strong: none on the P, median within 1 ms, nine tenths picked', async () => {
    const { pickShearRecord } = await import('../../src/picking/pickShearRecord.js');
    const { shearShot } = await import('./shearRecord.js');
    const errors: number[] = [];
    let onP = 0;
    let traces = 0;
    sources.forEach((sx, s) => {
      const shot = shearShot(strongP, sx, near, { pRatio: 0.48, snr: 15, seed: 950 + s, polarity: -1, sampleInterval: 0.000125, samples: 4000, step: 0.25, surfaceAmplitude: 1.8, surfaceVelocity: 0.92 });
      pickShearRecord(shot.traces).picks.forEach((p, r) => {
        if (shot.traces[r].offset === 0) return;
        traces++;
        if (p.time === undefined) return;
        errors.push(Math.abs(p.time - shot.sTimes[r]));
        if (Math.abs(p.time - shot.pTimes[r]) < Math.abs(p.time - shot.sTimes[r])) onP++;
      });
    });
    errors.sort((a, b) => a - b);
    expect(onP).toBe(0);
    // Issue 14: median within 1 ms; at most a tenth unpicked.
    expect(errors[errors.length >> 1]).toBeLessThanOrEqual(1e-3);
    expect(errors.length).toBeGreaterThanOrEqual(0.9 * traces);
  });
});

describe('pickShearRecord next to the source, where the S lags the P by a few samples', () => {
  // Shots between geophones 1 m apart put the nearest geophones 0.5 m from the source, where the
  // S (240 m/s) comes about 1 ms after the P (480 m/s): the S search there can stop in the P coda.
  // Onsets from the independent forward model of test/reference; P at half the S (SH records show
  // 0.1 to 0.5, common practice); 0.125 ms sampling.
  const close: ShearLine = { surface: () => 50, interfaces: [() => 45, () => 35.5], vp: [480, 770, 2040], vs: [240, 445, 1035] };
  const receivers = Array.from({ length: 48 }, (_, i) => i);
  const sources = [-5, 0, 15.5, 30.5, 47, 49];

  it('pickShearRecord puts no pick on the P within 3 m of the source; the picks there within 1 ms (median), three fifths of the traces picked', async () => {
    const { pickShearRecord } = await import('../../src/picking/pickShearRecord.js');
    const { shearShot } = await import('./shearRecord.js');
    let near = 0;
    let onP = 0;
    const errors: number[] = [];
    for (const seed of [4802, 4902, 5002]) {
      sources.forEach((sx, s) => {
        const shot = shearShot(close, sx, receivers, { pRatio: 0.5, snr: 35, seed: seed + s, polarity: s % 2 === 0 ? 1 : -1, sampleInterval: 0.000125, samples: 4000, step: 0.25, surfaceAmplitude: 1.2, surfaceVelocity: 0.86, frequencies: [110, 49, 24] });
        pickShearRecord(shot.traces).picks.forEach((p, r) => {
          const x = Math.abs(shot.traces[r].offset);
          if (x === 0 || x > 3) return;
          near++;
          if (p.time === undefined) return;
          // On the P arrival: nearer the P onset than the S onset (issue 14).
          if (Math.abs(p.time - shot.pTimes[r]) < Math.abs(p.time - shot.sTimes[r])) onP++;
          errors.push(Math.abs(p.time - shot.sTimes[r]));
        });
      });
    }
    errors.sort((a, b) => a - b);
    // 20 traces within 3 m of the six sources, three seeds.
    expect(near).toBe(60);
    // Issue 14: none on the P arrival, median within 1 ms. Without the near-source check three of
    // these picks sit nearer the P than the S.
    expect(onP).toBe(0);
    expect(errors[errors.length >> 1]).toBeLessThanOrEqual(1e-3);
    // Left unpicked rather than on the P where the re-pick fails: at least three fifths picked.
    expect(errors.length).toBeGreaterThanOrEqual(0.6 * near);
  });

  // A noisy record (S signal-to-noise 6, 0.5 ms sampling) where the P is not seen far enough to fit
  // its moveout: the near-source check then leans on S picks that have no P time beside them.
  const faint: ShearLine = { surface: () => 50, interfaces: [() => 47.5, () => 38], vp: [505, 920, 2110], vs: [250, 490, 1060] };
  const spread = Array.from({ length: 96 }, (_, i) => 1.5 * i);
  const shots = [-4.5, 0, 71.25, 142.5, 144];

  it('pickShearRecord puts no pick on the P within 3 m of the source on a noisy record with no P moveout; median within 1 ms there', async () => {
    const { pickShearRecord } = await import('../../src/picking/pickShearRecord.js');
    const { shearShot } = await import('./shearRecord.js');
    let near = 0;
    let onP = 0;
    const errors: number[] = [];
    for (const seed of [5202, 5302, 5402]) {
      shots.forEach((sx, s) => {
        const shot = shearShot(faint, sx, spread, { pRatio: 0.42, snr: 6, seed: seed + s, polarity: s % 2 === 0 ? 1 : -1, sampleInterval: 0.0005, samples: 1000, step: 0.25, surfaceAmplitude: 2.5, surfaceVelocity: 0.93, frequencies: [89, 45, 25] });
        pickShearRecord(shot.traces).picks.forEach((p, r) => {
          const x = Math.abs(shot.traces[r].offset);
          if (x === 0 || x > 3) return;
          near++;
          if (p.time === undefined) return;
          if (Math.abs(p.time - shot.pTimes[r]) < Math.abs(p.time - shot.sTimes[r])) onP++;
          errors.push(Math.abs(p.time - shot.sTimes[r]));
        });
      });
    }
    errors.sort((a, b) => a - b);
    // 10 traces within 3 m of the five sources (1.5 m apart), three seeds. Without the check, 4
    // picks are on the P; with the S slowness taken only where a P time stands beside it, 2.
    expect(near).toBe(30);
    expect(onP).toBe(0);
    expect(errors[errors.length >> 1]).toBeLessThanOrEqual(1e-3);
    expect(errors.length).toBeGreaterThanOrEqual(0.6 * near);
  });
});
