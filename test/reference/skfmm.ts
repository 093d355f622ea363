import { execFileSync } from 'node:child_process';
import { existsSync } from 'node:fs';

/**
 * scikit-fmm (Debian package python3-scikit-fmm), run with Debian's /usr/bin/python3: an
 * independent fast-marching implementation used as a reference. Returns undefined when it is
 * missing, with the reason, so tests can say why they skip.
 */
export function skfmmAvailable(): string | undefined {
  if (!existsSync('/usr/bin/python3')) return '/usr/bin/python3 is missing';
  try {
    execFileSync('/usr/bin/python3', ['-c', 'import skfmm, numpy'], { stdio: 'pipe' });
    return undefined;
  } catch {
    return 'scikit-fmm is not installed (apt-get install python3-scikit-fmm)';
  }
}

/**
 * First-arrival times by scikit-fmm's second-order travel_time on a node grid (row j at depth j·h
 * below the top row, column i at x0 + i·h), from a point source, sampled at surface points by
 * linear interpolation along the top row. The source is put in as the zero contour of
 * phi = distance − r0 with r0 = 4h (a larger start circle keeps its start error small), as scikit-fmm expects, and the time r0/v added back.
 *
 * @param speed - node speeds in m/s, row by row (nz rows of nx)
 */
export function skfmmSurfaceTimes(nx: number, nz: number, h: number, x0: number, speed: Float64Array, sourceX: number, receiverXs: number[]): { times: number[]; seconds: number } {
  const script = `
import sys, json, time, numpy as np, skfmm
d = json.loads(sys.stdin.read())
nx, nz, h, x0 = d['nx'], d['nz'], d['h'], d['x0']
speed = np.array(d['speed'], dtype=float).reshape(nz, nx)
X, Z = np.meshgrid(x0 + np.arange(nx) * h, np.arange(nz) * h)
r0 = 4 * h
phi = np.hypot(X - d['sx'], Z) - r0
t0 = time.perf_counter()
T = skfmm.travel_time(phi, speed, dx=h, order=2)
seconds = time.perf_counter() - t0
i0 = int(round((d['sx'] - x0) / h))
T = np.asarray(T) + r0 / speed[0, i0]
out = [float(np.interp(rx, X[0], T[0])) for rx in d['rx']]
print(json.dumps({'times': out, 'seconds': seconds}))
`;
  const input = JSON.stringify({ nx, nz, h, x0, speed: Array.from(speed), sx: sourceX, rx: receiverXs });
  const text = execFileSync('/usr/bin/python3', ['-c', script], { input, maxBuffer: 1 << 28 }).toString();
  return JSON.parse(text) as { times: number[]; seconds: number };
}
