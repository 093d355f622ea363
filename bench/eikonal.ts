/**
 * Benchmark: the fast-marching solver against scikit-fmm (Debian python3-scikit-fmm, run with
 * /usr/bin/python3) on the same 1200 × 300 node grid at 0.1 m: 10 m of 600 m/s over 3000 m/s
 * (a 5 : 1 contrast), one surface source. Both times are measured in the same run, with their
 * ratio, and both errors against the analytic direct and head-wave times (Telford, Geldart &
 * Sheriff 1990 §4.2; node speeds change between the rows at 9.9 and 10.0 m, so the interface is at
 * mid-cell, 9.95 m). Target (issue 13): ratio ≤ 1.0 at equal or better accuracy. Run: npm run bench:eikonal
 */
import { eikonalTimes } from '../src/forward/eikonal.js';
import { gridFromModel, sampleGrid } from '../src/forward/eikonalGrid.js';
import { skfmmAvailable, skfmmSurfaceTimes } from '../test/reference/skfmm.js';
import { medianTime } from './timing.js';

const h = 0.1;
const grid = gridFromModel({ x0: 0, x1: 119.9, top: 0, bottom: -29.9, h }, () => 0, (_x, elev) => (-elev < 10 ? 600 : 3000));
const sourceX = 20;
const receivers = Array.from({ length: 48 }, (_, i) => 22 + 2 * i).filter((x) => x <= 119);
const depth = 10 - h / 2;
const exact = receivers.map((x) => Math.min((x - sourceX) / 600, (x - sourceX) / 3000 + 2 * depth * Math.sqrt(1 / 600 ** 2 - 1 / 3000 ** 2)));
const worst = (times: number[]) => Math.max(...times.map((t, i) => Math.abs(t - exact[i]) / exact[i]));

process.stdout.write(`grid ${grid.nx} × ${grid.nz} nodes at ${h} m\n`);
let ours: number[] = [];
const oursMs = medianTime('hammerline fast marching (second order)', () => {
  const { times } = eikonalTimes(grid, { x: sourceX, elev: 0 });
  ours = receivers.map((x) => sampleGrid(grid, times, x, 0));
}, 5);
const missing = skfmmAvailable();
if (missing !== undefined) {
  process.stdout.write(`scikit-fmm not measured: ${missing}\n`);
} else {
  const speed = grid.slowness.map((s) => 1 / s);
  const runs = [0, 1, 2].map(() => skfmmSurfaceTimes(grid.nx, grid.nz, h, 0, speed, sourceX, receivers));
  const seconds = runs.map((r) => r.seconds).sort((a, b) => a - b)[1];
  process.stdout.write(`scikit-fmm travel_time(order=2): ${(seconds * 1e3).toFixed(1)} ms (median of 3, solver only)\n`);
  process.stdout.write(`ratio ours / scikit-fmm: ${(oursMs / (seconds * 1e3)).toFixed(2)} (target ≤ 1.0)\n`);
  process.stdout.write(`worst error against the analytic times: ours ${(worst(ours) * 100).toFixed(3)} %, scikit-fmm ${(worst(runs[0].times) * 100).toFixed(3)} %\n`);
}
