import { lbfgs } from '../core/lbfgs.js';
import { eikonalTimes } from '../forward/eikonal.js';
import { eikonalAdjoint } from '../forward/eikonalAdjoint.js';
import { sampleGrid, type EikonalGrid } from '../forward/eikonalGrid.js';

/** One source with the receivers that picked it: positions in metres, times in seconds. */
export interface ShotPicks {
  source: { x: number; elev: number };
  receivers: { x: number; elev: number; time: number }[];
}

/** Settings of the grid inversion. */
export interface GridInversionOptions {
  /** Pick noise, in seconds: the misfit the iteration aims at (discrepancy principle). */
  noise: number;
  /** Lowest and highest velocity allowed, in m/s. */
  velocityRange: [number, number];
  /** Weights of the horizontal and vertical roughness (Zelt & Barton 1998); default 1 and 1. */
  smoothing?: { horizontal: number; vertical: number };
  /** Largest number of quasi-Newton iterations over all smoothing levels; default 60. */
  maxIterations?: number;
}

/** One iteration of the inversion. */
export interface GridIteration {
  iteration: number;
  /** RMS of the time residuals, in seconds. */
  rms: number;
  /** Mean squared residual over the noise variance (1 at the discrepancy target). */
  chi2: number;
  /** Weight of the roughness term in use. */
  smoothing: number;
}

/** The result of a grid inversion: slowness on the grid, the misfit history and the coverage. */
export interface GridInversion {
  slowness: Float64Array;
  iterations: GridIteration[];
  /** Summed sensitivity of all picks to each node, in metres of ray path (0 where no ray samples). */
  coverage: Float64Array;
  /** Why the iteration stopped. */
  stopped: 'noise-reached' | 'misfit-stalled' | 'iteration-limit';
}

/**
 * First-arrival traveltime tomography on a node grid: the slowness at every live node is found by
 * minimising χ² + λ·R, where χ² is the mean squared time residual over the noise variance and R
 * the roughness of the log-slowness (squared second differences along x and along depth, weighted
 * separately, after Zelt & Barton 1998, JGR 103, 7187-7210). The gradient of χ² comes from the
 * adjoint state of the fast-marching times (Leung & Qian 2006); the update is bounded L-BFGS
 * (Nocedal 1980). λ starts large (a smooth model) and is halved whenever the misfit stalls, and the
 * iteration stops as soon as χ² reaches 1 (the discrepancy principle: fit the picks to their
 * noise, no closer).
 *
 * @param grid - the starting model (slowness, s/m) and the live mask; not modified
 * @param shots - picks per source
 * @throws RangeError for a noise that is not positive or an empty velocity range
 */
export function invertGrid(grid: EikonalGrid, shots: ShotPicks[], options: GridInversionOptions): GridInversion {
  const { noise } = options;
  const [vMin, vMax] = options.velocityRange;
  if (!(noise > 0)) throw new RangeError(`invertGrid: the pick noise must be positive; got ${noise} s`);
  if (!(vMin > 0 && vMax > vMin)) throw new RangeError(`invertGrid: velocity range ${vMin} to ${vMax} m/s is empty`);
  const weights = options.smoothing ?? { horizontal: 1, vertical: 1 };
  const maxIterations = options.maxIterations ?? 60;
  const live: number[] = [];
  for (let k = 0; k < grid.active.length; k++) if (grid.active[k] === 1) live.push(k);
  const picks = shots.reduce((n, s) => n + s.receivers.length, 0);
  const work: EikonalGrid = { ...grid, slowness: Float64Array.from(grid.slowness) };
  const full = new Float64Array(grid.slowness.length);
  const { nx } = grid;
  const lambda = 1;

  // Roughness pairs: (left, centre, right) triples of live nodes along x and along depth.
  const triples: { a: number; b: number; c: number; w: number }[] = [];
  for (const k of live) {
    const i = k % nx;
    if (i > 0 && i < nx - 1 && grid.active[k - 1] && grid.active[k + 1]) triples.push({ a: k - 1, b: k, c: k + 1, w: weights.horizontal });
    if (k - nx >= 0 && k + nx < grid.active.length && grid.active[k - nx] && grid.active[k + nx]) triples.push({ a: k - nx, b: k, c: k + nx, w: weights.vertical });
  }
  const roughnessScale = 1 / Math.max(1, triples.length);

  function misfit(logSlowness: Float64Array, gradient: Float64Array | undefined): { chi2: number; rms: number } {
    for (let q = 0; q < live.length; q++) work.slowness[live[q]] = Math.exp(logSlowness[q]);
    full.fill(0);
    let sumSquares = 0;
    for (const shot of shots) {
      const result = eikonalTimes(work, shot.source, { record: gradient !== undefined });
      const adjoint: { x: number; elev: number; weight: number }[] = [];
      for (const r of shot.receivers) {
        const residual = sampleGrid(work, result.times, r.x, r.elev) - r.time;
        sumSquares += residual * residual;
        adjoint.push({ x: r.x, elev: r.elev, weight: (2 * residual) / (noise * noise * picks) });
      }
      if (gradient !== undefined) eikonalAdjoint(work, result, adjoint, full);
    }
    if (gradient !== undefined) for (let q = 0; q < live.length; q++) gradient[q] = full[live[q]] * work.slowness[live[q]];
    return { chi2: sumSquares / (noise * noise * picks), rms: Math.sqrt(sumSquares / picks) };
  }

  const index = new Int32Array(grid.active.length).fill(-1);
  live.forEach((k, q) => (index[k] = q));
  function objective(logSlowness: Float64Array, gradient: Float64Array): number {
    const { chi2 } = misfit(logSlowness, gradient);
    let rough = 0;
    for (const t of triples) {
      const a = index[t.a];
      const b = index[t.b];
      const c = index[t.c];
      const second = logSlowness[a] - 2 * logSlowness[b] + logSlowness[c];
      rough += t.w * second * second;
      const g = 2 * lambda * roughnessScale * t.w * second;
      gradient[a] += g;
      gradient[b] -= 2 * g;
      gradient[c] += g;
    }
    return chi2 + lambda * roughnessScale * rough;
  }

  let model: Float64Array = Float64Array.from(live, (k) => Math.log(grid.slowness[k]));
  const iterations: GridIteration[] = [];
  const first = misfit(model, undefined);
  iterations.push({ iteration: 0, rms: first.rms, chi2: first.chi2, smoothing: lambda });
  let stopped: GridInversion['stopped'] = first.chi2 <= 1 ? 'noise-reached' : 'iteration-limit';
  const lowest = Math.log(1 / vMax);
  const highest = Math.log(1 / vMin);
  // Coarse to fine: first a 1-D profile, then blocks of 16, 8, 4 and 2 nodes, then every node,
  // so the long wavelengths the picks demand are found before the detail (a common multiscale
  // practice); each level stops as soon as the picks are fitted to their noise.
  const levels: [number, number][] = [[Infinity, 1], [16, 2], [8, 2], [4, 1], [2, 1], [1, 1]];
  const nodeGradient = new Float64Array(live.length);
  for (const [bx, bz] of levels) {
    if (stopped === 'noise-reached' || iterations.length > maxIterations) break;
    const map = coarseMap(grid, live, bx, bz);
    const base = model;
    const mapped = new Float64Array(live.length);
    const apply = (delta: Float64Array) => {
      for (let q = 0; q < live.length; q++) {
        let v = base[q];
        for (let c = map.start[q]; c < map.start[q + 1]; c++) v += map.weight[c] * delta[map.param[c]];
        mapped[q] = Math.min(highest, Math.max(lowest, v));
      }
      return mapped;
    };
    let reached = false;
    let stalls = 0;
    let previous = iterations[iterations.length - 1].chi2;
    const result = lbfgs((delta, gradient) => {
      nodeGradient.fill(0);
      const value = objective(apply(delta), nodeGradient);
      gradient.fill(0);
      for (let q = 0; q < live.length; q++) for (let c = map.start[q]; c < map.start[q + 1]; c++) gradient[map.param[c]] += map.weight[c] * nodeGradient[q];
      return value;
    }, new Float64Array(map.count), {
      maxIterations: Math.min(12, maxIterations + 1 - iterations.length),
      relativeTolerance: 1e-3,
      onIteration: (_iteration, _value, delta) => {
        const m = misfit(apply(delta), undefined);
        iterations.push({ iteration: iterations.length, rms: m.rms, chi2: m.chi2, smoothing: lambda });
        if (m.chi2 <= 1) {
          reached = true;
          return false;
        }
        stalls = m.chi2 > previous * 0.99 ? stalls + 1 : 0;
        previous = m.chi2;
        return stalls < 2 && iterations.length <= maxIterations;
      },
    });
    model = Float64Array.from(apply(result.x));
    if (reached) stopped = 'noise-reached';
    else if (bx === 1 && bz === 1) stopped = stalls >= 2 ? 'misfit-stalled' : 'iteration-limit';
  }
  for (let q = 0; q < live.length; q++) work.slowness[live[q]] = Math.exp(model[q]);
  return { slowness: work.slowness, iterations, coverage: coverageOf(work, shots), stopped };
}

/** Summed sensitivity ∂t/∂s of all picks at each node, in metres of ray path (the discrete ray density). */
export function coverageOf(grid: EikonalGrid, shots: ShotPicks[]): Float64Array {
  const coverage = new Float64Array(grid.slowness.length);
  for (const shot of shots) {
    const result = eikonalTimes(grid, shot.source, { record: true });
    eikonalAdjoint(grid, result, shot.receivers.map((r) => ({ x: r.x, elev: r.elev, weight: 1 })), coverage);
  }
  return coverage;
}

/**
 * Bilinear weights from coarse parameters (every bx columns and bz rows; bx = Infinity: one per
 * row band, a 1-D profile) to each live node, in compressed rows.
 */
function coarseMap(grid: EikonalGrid, live: number[], bx: number, bz: number): { count: number; start: Int32Array; param: Int32Array; weight: Float64Array } {
  const columns = Number.isFinite(bx) ? Math.ceil((grid.nx - 1) / bx) + 1 : 1;
  const rows = Math.ceil((grid.nz - 1) / bz) + 1;
  const start = new Int32Array(live.length + 1);
  const param: number[] = [];
  const weight: number[] = [];
  live.forEach((k, q) => {
    const i = k % grid.nx;
    const j = (k - i) / grid.nx;
    const fz = j / bz;
    const jz = Math.min(rows - 2, Math.floor(fz));
    const wz = fz - jz;
    const xs: [number, number][] = [];
    if (columns === 1) xs.push([0, 1]);
    else {
      const fx = i / bx;
      const ix = Math.min(columns - 2, Math.floor(fx));
      xs.push([ix, 1 - (fx - ix)], [ix + 1, fx - ix]);
    }
    const zs: [number, number][] = rows === 1 ? [[0, 1]] : [[jz, 1 - wz], [jz + 1, wz]];
    for (const [cx, wx] of xs) for (const [cz, w] of zs) {
      if (wx * w === 0) continue;
      param.push(cz * columns + cx);
      weight.push(wx * w);
    }
    start[q + 1] = param.length;
  });
  return { count: columns * rows, start, param: Int32Array.from(param), weight: Float64Array.from(weight) };
}
