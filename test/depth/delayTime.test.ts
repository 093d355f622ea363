import { execFileSync } from 'node:child_process';
import { existsSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { delayTime } from '../../src/depth/delayTime.js';
import type { HeadCurve } from '../../src/depth/headWaves.js';
import { skyline, skylineAdd, skylineCholesky, skylineInverseDiagonal, skylineSolve } from '../../src/depth/skylineCholesky.js';
import { seededNormal } from '../reference/layeredTravelTimes.js';

function numpyMissing(): string | undefined {
  if (!existsSync('/usr/bin/python3')) return '/usr/bin/python3 is missing';
  try {
    execFileSync('/usr/bin/python3', ['-c', 'import numpy'], { stdio: 'pipe' });
    return undefined;
  } catch {
    return 'numpy (Debian python3-numpy) is missing';
  }
}
const missing = numpyMissing();

/**
 * The delay-time least squares written out in numpy from the method's definition (Gardner 1939;
 * Barry 1967), sharing nothing with the program: a row t = a_s + b_r + |x_r − x_s| / V per pick,
 * rows tying each source inside the spread to the receiver delay at its position (weight 30), or,
 * with no source inside, the gauge mean(a) = mean(b) imposed exactly; solved by numpy.linalg.lstsq;
 * the covariance σ² (AᵀA)⁺ projected onto the gauge, σ² = RSS / (picks − unknowns + ties).
 */
const NUMPY_DELAY_TIME = `
import json, sys, numpy as np
d = json.load(sys.stdin)
curves, v = d['curves'], d['velocity']
sources = list(dict.fromkeys(c['sourceId'] for c in curves))
sx = {c['sourceId']: c['sourceX'] for c in curves}
recv = sorted({x for c in curves for x in c['xs']})
ns, nr = len(sources), len(recv)
n = ns + nr
rows, vals, wts = [], [], []
for c in curves:
    for x, t in zip(c['xs'], c['times']):
        r = np.zeros(n); r[sources.index(c['sourceId'])] = 1; r[ns + recv.index(x)] = 1
        rows.append(r); vals.append(t - abs(x - c['sourceX']) / v); wts.append(1.0)
obs = len(rows)
tied = 0
for s in sources:
    p = sx[s]
    if p < recv[0] or p > recv[-1]: continue
    k = max(0, sum(1 for x in recv if x < p) - 1)
    a, b = recv[k], recv[min(nr - 1, k + 1)]
    t = 0 if b == a else (p - a) / (b - a)
    r = np.zeros(n); r[sources.index(s)] = 1; r[ns + k] -= 1 - t
    if t > 0: r[ns + k + 1] -= t
    rows.append(r); vals.append(0.0); wts.append(30.0); tied += 1
A = np.array(rows) * np.array(wts)[:, None]
y = np.array(vals) * np.array(wts)
if tied == 0:
    g = np.concatenate([np.full(ns, 1 / ns), np.full(nr, -1 / nr)])
    A = np.vstack([A, 1e7 * g]); y = np.append(y, 0.0)
x = np.linalg.lstsq(A, y, rcond=None)[0]
res = np.array([r @ x for r in rows[:obs]]) - np.array(vals[:obs])
var = (res @ res) / max(1, obs - n + tied)
N = (np.array(rows) * np.array(wts)[:, None]).T @ (np.array(rows) * np.array(wts)[:, None])
C = np.linalg.pinv(N)
if tied == 0:
    vv = np.concatenate([np.ones(ns), -np.ones(nr)])
    P = np.eye(n) - np.outer(vv, g) / (g @ vv)
    C = P @ C @ P.T
print(json.dumps({'x': recv, 'delay': list(x[ns:]), 'se': list(np.sqrt(np.diag(C)[ns:] * var))}))
`;

/** Head-wave picks: a rolling spread over 40 receivers 2 m apart (or, off the ends only, every receiver from each shot), 0.2 ms noise. */
function rollingCurves(inside: boolean): HeadCurve[] {
  const noise = seededNormal(21);
  const receivers = Array.from({ length: 40 }, (_, i) => 2 * i);
  const delay = (x: number) => 0.006 + 0.001 * Math.sin(x / 9);
  const shots = inside ? [-5, 11, 27, 43, 59, 84] : [-5, -3, 83, 85];
  const curves: HeadCurve[] = [];
  for (const sx of shots) {
    const spread = receivers.filter((x) => Math.abs(x - sx) <= (inside ? 40 : 100) && Math.abs(x - sx) > 4);
    for (const side of ['forward', 'reverse'] as const) {
      const xs = spread.filter((x) => (side === 'forward' ? x > sx : x < sx));
      if (xs.length < 2) continue;
      curves.push({ sourceId: `S${sx}`, sourceX: sx, side, xs, times: xs.map((x) => delay(sx) + delay(x) + Math.abs(x - sx) / 2000 + 0.0002 * noise()) });
    }
  }
  return curves;
}

describe('delayTime against numpy', () => {
  it.skipIf(missing !== undefined)('delayTime with sources inside the spread or only off its ends equals numpy lstsq and its covariance to 1e-9 s and 1e-6 relative', () => {
    for (const inside of [true, false]) {
      const curves = rollingCurves(inside);
      const ours = delayTime(curves, 1, { velocity: 2000, se: 10 })!;
      const reference = JSON.parse(execFileSync('/usr/bin/python3', ['-c', NUMPY_DELAY_TIME], { input: JSON.stringify({ curves, velocity: 2000 }), encoding: 'utf8' }));
      const byX = new Map<number, number>(reference.x.map((x: number, i: number) => [x, i]));
      expect(ours.stations.length).toBe(reference.x.length);
      for (const s of ours.stations) {
        const i = byX.get(s.x)!;
        expect(Math.abs(s.delay - reference.delay[i]), `${inside} x=${s.x}`).toBeLessThan(1e-9);
        expect(Math.abs(s.delaySe / reference.se[i] - 1), `${inside} x=${s.x}`).toBeLessThan(1e-6);
      }
    }
  });
});

describe('skylineCholesky', () => {
  it('skylineCholesky, skylineSolve and skylineInverseDiagonal agree with the dense inverse on an arrow-banded matrix', () => {
    // A banded SPD matrix (half-width 3) with a full last row: A x = b checked by multiplying back,
    // the inverse diagonal by solving for each unit vector (its definition).
    const n = 12;
    const dense = Array.from({ length: n }, (_, i) => Array.from({ length: n }, (_, j) => (i === j ? 10 + i : Math.abs(i - j) <= 3 || i === n - 1 || j === n - 1 ? 1 / (1 + i + j) : 0)));
    const first = Int32Array.from({ length: n }, (_, i) => (i === n - 1 ? 0 : Math.max(0, i - 3)));
    const a = skyline(first);
    for (let i = 0; i < n; i++) for (let j = first[i]; j <= i; j++) skylineAdd(a, i, j, dense[i][j]);
    const l = skylineCholesky(a)!;
    const b = Array.from({ length: n }, (_, i) => Math.cos(i));
    const x = skylineSolve(l, b);
    for (let i = 0; i < n; i++) expect(dense[i].reduce((sum, v, j) => sum + v * x[j], 0)).toBeCloseTo(b[i], 12);
    const diagonal = skylineInverseDiagonal(l);
    for (let i = 0; i < n; i++) {
      const e = new Array(n).fill(0);
      e[i] = 1;
      expect(diagonal[i]).toBeCloseTo(skylineSolve(l, e)[i], 12);
    }
    // Not positive definite: no factor.
    const bad = skyline(Int32Array.from([0, 0]));
    skylineAdd(bad, 0, 0, 1);
    skylineAdd(bad, 1, 0, 2);
    skylineAdd(bad, 1, 1, 1);
    expect(skylineCholesky(bad)).toBeUndefined();
  });
});
