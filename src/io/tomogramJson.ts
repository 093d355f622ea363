import type { Warning } from '../core/warnings.js';
import type { Tomogram, TomogramResult } from '../tomography/tomography.js';
import { csvNumber } from './csvCell.js';

export const TOMOGRAM_SCHEMA = 'hammerline/tomogram@1';

/** Cautions that go with every tomogram, wherever its velocities or contour depths are shown. */
export const TOMOGRAM_CAUTIONS = [
  'A tomogram is a smooth image: it spreads a sharp boundary (the rock head, the water table) over several metres, so a velocity contour is only an estimate of where a boundary lies.',
  'The deep part of the grid and its ends are sampled by few picks; velocities there depend on the starting model. Cells no pick samples are masked (coverage 0).',
  'No velocity contour is rock, nor any other material, without a boring or a test pit to confirm it.',
  'Like any first-arrival method, a tomogram cannot see a layer slower than the one above it.',
];

const round = (v: number, digits: number) => Number(v.toFixed(digits));

function resultJson(t: Tomogram, r: TomogramResult) {
  return {
    start: r.start,
    start_model: r.startDescription,
    stopped: r.stopped,
    grid_velocity_mps: Array.from(r.velocity, (v, k) => (Number.isFinite(v) && r.coverage[k] >= t.coverageThreshold ? Math.round(v) : null)),
    iterations: r.iterations.map((i) => ({ iteration: i.iteration, rms_ms: round(i.rms * 1e3, 3), chi2: round(i.chi2, 3) })),
    contours: r.contours.map((c) => ({
      velocity_mps: c.velocity,
      points: c.points.map((p) => ({
        x_m: round(p.x, 3),
        depth_m: p.depth === undefined ? null : round(p.depth, 2),
        elev_m: p.elev === undefined ? null : round(p.elev, 2),
        covered: p.covered,
        layered_depth_m: p.layeredDepth === undefined ? null : round(p.layeredDepth, 2),
      })),
    })),
  };
}

/**
 * The JSON document of a tomogram (schema hammerline/tomogram@1): the grid (origin, cell, counts,
 * velocity in m/s row by row from the top row, null above the ground and where no pick samples the
 * node, and the coverage in metres of ray path), the iterations' RMS, the contours at every
 * geophone, and the same for the second starting model under `starts[]`. Always SI.
 */
export function tomogramJson(t: Tomogram, warnings: Warning[], extra: Record<string, unknown> = {}): Record<string, unknown> {
  const main = t.results[0];
  const first = resultJson(t, main);
  return {
    schema: TOMOGRAM_SCHEMA,
    file: t.file,
    picks: t.picks,
    pick_noise_ms: round(t.noise * 1e3, 3),
    pick_noise_source: t.noiseSource,
    grid: {
      x0_m: round(t.grid.x0, 3),
      top_elev_m: round(t.grid.top, 3),
      cell_m: round(t.grid.h, 4),
      nx: t.grid.nx,
      nz: t.grid.nz,
      order: 'row by row from the top row (elevation top_elev_m), x increasing within a row',
      velocity_mps: first.grid_velocity_mps,
      coverage_m: Array.from(main.coverage, (c, k) => (t.grid.active[k] ? round(c, 3) : 0)),
      coverage_threshold_m: round(t.coverageThreshold, 4),
    },
    start_model: first.start_model,
    stopped: first.stopped,
    iterations: first.iterations,
    contours: first.contours,
    starts: t.results.map((r) => resultJson(t, r)),
    warnings: warnings.map((w) => ({ code: w.code, message: w.message })),
    cautions: TOMOGRAM_CAUTIONS,
    ...extra,
  };
}

/** The grid as CSV: one row per live node (x, depth below the ground, elevation, velocity, coverage). */
export function tomogramCsv(t: Tomogram, ground: (x: number) => number): string {
  const r = t.results[0];
  const lines = ['x_m,depth_m,elev_m,velocity_mps,coverage_m,covered'];
  for (let j = 0; j < t.grid.nz; j++) {
    for (let i = 0; i < t.grid.nx; i++) {
      const k = j * t.grid.nx + i;
      if (!t.grid.active[k]) continue;
      const x = t.grid.x0 + i * t.grid.h;
      const elev = t.grid.top - j * t.grid.h;
      const depth = ground(x) - elev;
      if (depth < -1e-9) continue;
      lines.push([csvNumber(x, 3), csvNumber(depth, 3), csvNumber(elev, 3), csvNumber(r.velocity[k], 0), csvNumber(r.coverage[k], 3), r.coverage[k] >= t.coverageThreshold ? '1' : '0'].join(','));
    }
  }
  return lines.join('\n') + '\n';
}
