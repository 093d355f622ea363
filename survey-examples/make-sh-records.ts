/**
 * Writes the invented SH shot records of survey-examples/culvert-sh/ from their true model with
 * the generator of the tests (test/picking/shearRecord.ts: at every geophone the P arrival, weaker
 * and first, the S arrival and a ringing surface wave behind it, over seeded Gaussian noise; onsets
 * from the independent forward model of test/reference, least time by Fermat's principle, run on
 * the P and on the S velocities). Three shot positions are recorded twice, the beam struck from
 * each side (S and surface wave reversed, P not). Run: npx tsx survey-examples/make-sh-records.ts
 */
import { mkdirSync, writeFileSync } from 'node:fs';
import { writeSeg2 } from '../test/io/seg2/writeSeg2.js';
import { shearShot, type ShearLine } from '../test/picking/shearRecord.js';

const line: ShearLine = {
  surface: (x) => 31.2 - 0.01 * x,
  interfaces: [(x) => 31.2 - 0.01 * x - 3.0, (x) => 31.2 - 0.01 * x - 12.0],
  // Vp: 380 m/s damp silty clay, 1520 m/s saturated sandy clay below the water table at 3.0 m,
  // 2300 m/s siltstone; Vs: 170, 290 and 760 m/s (the water table does not show in the S).
  vp: [380, 1520, 2300],
  vs: [170, 290, 760],
};
const receivers = Array.from({ length: 48 }, (_, i) => i * 1.5);
const shots: { name: string; x: number; polarity: 1 | -1 }[] = [
  { name: 'R1', x: -6, polarity: 1 },
  { name: 'R2a', x: 0, polarity: 1 }, { name: 'R2b', x: 0, polarity: -1 },
  { name: 'R3', x: 23.25, polarity: 1 },
  { name: 'R4a', x: 47.25, polarity: 1 }, { name: 'R4b', x: 47.25, polarity: -1 },
  { name: 'R5', x: 70.5, polarity: -1 },
  { name: 'R6a', x: 76.5, polarity: 1 }, { name: 'R6b', x: 76.5, polarity: -1 },
];
const folder = new URL('./culvert-sh/records/', import.meta.url);
mkdirSync(folder, { recursive: true });
const dt = 0.0005;
const delay = -0.01;
const scale = 100;
shots.forEach((shot, s) => {
  const record = shearShot(line, shot.x, receivers, { pRatio: 0.25, snr: 25, polarity: shot.polarity, seed: 500 + s, sampleInterval: dt, delay, samples: 1000 });
  const traces = record.traces.map((t, r) => ({
    code: 1 as const,
    samples: Array.from(t.data, (v) => Math.max(-32767, Math.min(32767, Math.round(v * scale)))),
    keywords: [
      ['CHANNEL_NUMBER', String(r + 1)], ['SAMPLE_INTERVAL', String(dt)], ['DELAY', String(delay)], ['DESCALING_FACTOR', String(1 / scale)],
      ['SOURCE_LOCATION', `${shot.x} 0 ${line.surface(shot.x).toFixed(3)}`], ['RECEIVER_LOCATION', `${receivers[r]} 0 ${line.surface(receivers[r]).toFixed(3)}`],
      ['STACK', '6'],
    ] as [string, string][],
  }));
  const side = shot.name.endsWith('b') ? 'beam struck from the -y side' : 'beam struck from the +y side';
  const bytes = writeSeg2(traces, { fileKeywords: [['UNITS', 'METERS'], ['NOTE', `Invented example: SH line CV-2S, Sallow Reach overflow culvert (fictional). Synthetic record, ${side}.`]] });
  writeFileSync(new URL(`${shot.name}.seg2`, folder), bytes);
});
process.stdout.write(`wrote ${shots.length} records in ${folder.pathname}\n`);
