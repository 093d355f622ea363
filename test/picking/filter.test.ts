import { existsSync } from 'node:fs';
import { spawnSync } from 'node:child_process';
import { describe, expect, it } from 'vitest';
import { bandPass } from '../../src/picking/filter.js';
import { seededNormal } from '../reference/layeredTravelTimes.js';

// The band-pass is a 4th-order Butterworth high-pass and low-pass made by the bilinear transform
// with pre-warped corners, run forward and backward. Its gain at frequency f is then, per edge,
// the squared Butterworth magnitude |H|² = 1 / (1 + (ω/ωc)^(2n)) with n = 4 and the pre-warped
// ω = tan(π f Δt) (Butterworth 1930; the bilinear transform, Oppenheim & Schafer, Discrete-Time
// Signal Processing, §7.1), and zero phase.
const dt = 0.00025;
const low = 20;
const high = 200;
const warped = (f: number) => Math.tan(Math.PI * f * dt);
const edge = (ratio: number, order: number) => 1 / (1 + ratio ** (2 * order));
const expectedGain = (f: number) => edge(warped(low) / warped(f), 4) * edge(warped(f) / warped(high), 4);

/** Gain and phase of a steady tone through the filter: least-squares sine and cosine fit over the middle half. */
function toneResponse(f: number) {
  const n = 16000;
  const x = Float32Array.from({ length: n }, (_, i) => Math.sin(2 * Math.PI * f * i * dt));
  const y = bandPass(x, dt, low, high);
  let ss = 0, sc = 0, cc = 0, ys = 0, yc = 0;
  for (let i = n / 4; i < (3 * n) / 4; i++) {
    const s = Math.sin(2 * Math.PI * f * i * dt);
    const c = Math.cos(2 * Math.PI * f * i * dt);
    ss += s * s; sc += s * c; cc += c * c; ys += y[i] * s; yc += y[i] * c;
  }
  const det = ss * cc - sc * sc;
  const a = (ys * cc - yc * sc) / det;
  const b = (yc * ss - ys * sc) / det;
  return { gain: Math.hypot(a, b), phase: Math.atan2(b, a) };
}

describe('bandPass magnitude response (Butterworth, closed form)', () => {
  for (const f of [5, 10, 20, 30, 63, 120, 200, 300, 600]) {
    it(`bandPass(20-200 Hz) passes a ${f} Hz tone with gain 1/(1+(ωl/ω)^8) · 1/(1+(ω/ωh)^8) within 1 % (or 2e-5) and zero phase`, () => {
      const { gain, phase } = toneResponse(f);
      const expected = expectedGain(f);
      expect(Math.abs(gain - expected)).toBeLessThan(Math.max(0.01 * expected, 2e-5));
      if (expected > 0.01) expect(Math.abs(phase)).toBeLessThan(1e-3);
    });
  }

  it('bandPass gives half the amplitude at each corner (−6 dB after the forward and backward passes)', () => {
    // At the corner (ω/ωc)^8 = 1, so each edge gives 1/2; the other edge adds 0.1 % or less here.
    expect(toneResponse(low).gain).toBeCloseTo(0.5, 2);
    expect(toneResponse(high).gain).toBeCloseTo(0.5, 2);
  });
});

// scipy.signal (Debian python3-scipy, run with /usr/bin/python3) as an independent
// implementation: butter(4, corner, btype, fs, output='sos') for each edge, applied by
// sosfiltfilt. Its start-up differs (initial conditions from the first sample), so only the middle
// of the trace, several time constants from either end, is compared.
const python = '/usr/bin/python3';
const scipyMissing = !existsSync(python)
  ? '/usr/bin/python3 is missing'
  : spawnSync(python, ['-c', 'import scipy.signal, numpy'], { encoding: 'utf8' }).status === 0 ? undefined : 'scipy is not installed (apt-get install python3-scipy)';

describe(`bandPass against scipy.signal.butter and sosfiltfilt${scipyMissing ? ` (skipped: ${scipyMissing})` : ''}`, () => {
  it.skipIf(scipyMissing !== undefined)('bandPass(20-200 Hz) of seeded noise matches scipy within 5e-4 of its RMS over the middle half', () => {
    const normal = seededNormal(11);
    const n = 8000;
    const x = Float32Array.from({ length: n }, () => normal());
    const ours = bandPass(x, dt, low, high);
    const script = `
import sys, json, numpy as np
from scipy.signal import butter, sosfiltfilt
d = json.loads(sys.stdin.read())
fs = 1 / d['dt']
sos = np.vstack([butter(4, d['low'], btype='highpass', fs=fs, output='sos'), butter(4, d['high'], btype='lowpass', fs=fs, output='sos')])
print(json.dumps(sosfiltfilt(sos, np.array(d['x'], dtype=float)).tolist()))
`;
    const run = spawnSync(python, ['-c', script], { input: JSON.stringify({ dt, low, high, x: Array.from(x) }), encoding: 'utf8', maxBuffer: 1 << 26 });
    expect(run.status, run.stderr).toBe(0);
    const theirs = JSON.parse(run.stdout) as number[];
    let rms = 0, worst = 0;
    for (let i = n / 4; i < (3 * n) / 4; i++) {
      rms += theirs[i] ** 2;
      worst = Math.max(worst, Math.abs(ours[i] - theirs[i]));
    }
    rms = Math.sqrt(rms / (n / 2));
    expect(rms).toBeGreaterThan(0.1);
    // The filter's Q values are rounded to four digits (0.5412 and 1.3066 for 1/(2 cos(π/8)) =
    // 0.541196 and 1/(2 cos(3π/8)) = 1.306563) and its output is single precision: measured 1.4e-4.
    // A filter of the wrong order differs by tens of percent.
    expect(worst / rms).toBeLessThan(5e-4);
  });
});
