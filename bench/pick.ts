/**
 * Benchmark: automatic picking throughput on a 96-trace × 4000-sample record, in samples per
 * second, against the memory floor: a plain pass summing the same Float32Array traces, measured in
 * the same run. Target (issue 5): at least 0.2 of the floor. Run: npm run bench:pick
 */
import { medianTime } from './timing.js';
import { pickRecord } from '../src/picking/autoPick.js';
import { causalTrace } from '../test/picking/syntheticRecord.js';

const dt = 0.00025;
const delay = -0.005;
const samples = 4000;
const traces = Array.from({ length: 96 }, (_, i) => {
  const offset = -47.5 + i;
  const onset = Math.min(Math.abs(offset) / 450, Math.abs(offset) / 2400 + 0.02);
  return { data: causalTrace(samples, dt, delay, onset, 20 * Math.exp(-Math.abs(offset) / 30) + 5, i), sampleInterval: dt, delay, offset };
});
const total = traces.length * samples;

function floor(): number {
  let sum = 0;
  for (const t of traces) {
    const d = t.data;
    for (let k = 0; k < d.length; k++) sum += d[k];
  }
  return sum;
}

const pick = medianTime(`pickRecord on ${traces.length} traces × ${samples} samples`, () => pickRecord(traces), 40, (ms) => `${((total / ms) * 1e3 / 1e6).toFixed(1)} million samples/s`);
const base = medianTime('floor: summing the same Float32Array traces', floor, 400, (ms) => `${((total / ms) * 1e3 / 1e6).toFixed(1)} million samples/s`);
const ratio = base / pick;
process.stdout.write(`throughput ratio picking / floor: ${ratio.toFixed(3)} (target at least 0.2: ${ratio >= 0.2 ? 'met' : 'NOT met'})\n`);
