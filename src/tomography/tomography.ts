import { linearAt } from '../core/interpolate.js';
import { median } from '../core/stats.js';
import type { FirstBreakTable } from '../core/types.js';
import type { WarningLog } from '../core/warnings.js';
import { gridFromModel, sampleGrid, type EikonalGrid } from '../forward/eikonalGrid.js';
import type { InterpretationResult } from '../interpret.js';
import { gradientStart, type GradientStart } from './gradientStart.js';
import { invertGrid, type GridIteration, type ShotPicks } from './invertGrid.js';
import { secondDifferenceNoise } from './pickNoise.js';

/** Options of a tomography run. */
export interface TomographyOptions {
  /** Node spacing, in metres; default half the median geophone spacing. */
  cell?: number;
  /** Depth of the grid below the lowest ground, in metres; default a third of the longest offset (at least 10 m). */
  depth?: number;
  /** Lowest and highest velocity the inversion may use, in m/s; default 100 to 6000. */
  velocityRange?: [number, number];
  /** Weights of horizontal and vertical roughness; default 1 and 1. */
  smoothing?: { horizontal: number; vertical: number };
  /** Velocities whose contour depth is reported at every geophone, in m/s. */
  contours?: number[];
  /** Pick noise, in seconds; default estimated from second differences of neighbouring picks. */
  noise?: number;
  /** Largest number of iterations per starting model; default 60. */
  maxIterations?: number;
}

/** The depth of one velocity contour at one geophone. */
export interface ContourPoint {
  x: number;
  /** Depth below the ground where the velocity first reaches the contour, in metres (undefined: not reached). */
  depth?: number;
  elev?: number;
  /** True when the picks sample the grid there (coverage above the threshold). */
  covered: boolean;
  /** Depth of the layered interpretation's refractor whose velocity first reaches the contour, in metres. */
  layeredDepth?: number;
}

/** One inverted model, from one starting model. */
export interface TomogramResult {
  start: 'gradient' | 'layered';
  startDescription: string;
  /** Velocity at each node, in m/s (NaN above the ground). */
  velocity: Float64Array;
  coverage: Float64Array;
  iterations: GridIteration[];
  stopped: string;
  contours: { velocity: number; points: ContourPoint[] }[];
}

/** A tomogram: the grid, each start's result, the pick noise aimed at, and the coverage threshold. */
export interface Tomogram {
  file: string;
  grid: EikonalGrid;
  picks: number;
  noise: number;
  noiseSource: string;
  /** Coverage below which a node counts as unsampled, in metres of ray path. */
  coverageThreshold: number;
  results: TomogramResult[];
  receivers: { x: number; elev: number }[];
  /** Ground elevation along the line (receivers and sources), in metres. */
  ground: (x: number) => number;
}

/** Coverage below this fraction of a cell counts as unsampled (about a tenth of one ray crossing the cell). */
const COVERAGE_FRACTION = 0.1;

/**
 * First-arrival traveltime tomography of a line (see invertGrid), from two starting models: a 1-D
 * velocity increasing linearly with depth fitted to the travel-time curves (assumes no layers),
 * and, when given, the layered interpretation. Both are reported; where their contour depths
 * differ by more than max(1 m, 15 %) at covered geophones, a warning says where.
 *
 * @param table - first breaks in SI units
 * @param layered - the layered interpretation of the same picks, if one was made
 * @throws RangeError for impossible options (empty velocity range, non-positive cell)
 */
export function tomography(table: FirstBreakTable, options: TomographyOptions, log: WarningLog, layered?: InterpretationResult): Tomogram {
  const receivers = groundPoints(table);
  const spacing = median(receivers.slice(1).map((r, i) => r.x - receivers[i].x)) ?? 1;
  const cell = options.cell ?? spacing / 2;
  const xs = receivers.map((r) => r.x);
  const es = receivers.map((r) => r.elev);
  const sources = new Map<string, { x: number; elev: number }>();
  for (const p of table.picks) sources.set(p.sourceId, { x: p.sourceX, elev: p.sourceElev });
  const groundXs = [...xs];
  const groundEs = [...es];
  for (const s of sources.values()) {
    if (s.x < groundXs[0] || s.x > groundXs[groundXs.length - 1]) {
      const at = s.x < groundXs[0] ? 0 : groundXs.length;
      groundXs.splice(at, 0, s.x);
      groundEs.splice(at, 0, s.elev);
    }
  }
  const ground = (x: number) => linearAt(groundXs, groundEs, x);
  let longest = 0;
  for (const p of table.picks) longest = Math.max(longest, Math.abs(p.receiverX - p.sourceX));
  const depth = options.depth ?? Math.max(10, longest / 3);
  if (!(cell > 0)) throw new RangeError(`tomography: the cell size must be positive; got ${cell} m`);
  const x0 = groundXs[0] - 2 * cell;
  const x1 = groundXs[groundXs.length - 1] + 2 * cell;
  const top = groundEs.reduce((m, v) => Math.max(m, v), -Infinity) + cell;
  const bottom = groundEs.reduce((m, v) => Math.min(m, v), Infinity) - depth;
  const velocityRange = options.velocityRange ?? [100, 6000];

  const shots: ShotPicks[] = [...sources.entries()].map(([id, source]) => ({
    source: { x: source.x, elev: ground(source.x) },
    receivers: table.picks.filter((p) => p.sourceId === id).map((p) => ({ x: p.receiverX, elev: ground(p.receiverX), time: p.time })),
  }));
  const estimated = secondDifferenceNoise(table.picks);
  const noise = options.noise ?? estimated.noise;
  const noiseSource = options.noise !== undefined ? 'given' : estimated.source;

  const spec = { x0, x1, top, bottom, h: cell };
  const starts: { start: TomogramResult['start']; description: string; velocity: (x: number, elev: number) => number }[] = [];
  const fitted: GradientStart = gradientStart(table.picks, velocityRange);
  starts.push({ start: 'gradient', description: `velocity ${Math.round(fitted.v0)} m/s at the ground increasing by ${fitted.gradient.toFixed(1)} m/s per metre of depth, fitted to the first breaks`, velocity: (x, elev) => fitted.v0 + fitted.gradient * Math.max(0, ground(x) - elev) });
  if (layered !== undefined && layered.layers.length > 0) {
    const velocities = layered.layers.map((l) => l.velocity);
    const profiles = layered.refractors.map((r) => r.points.filter((p) => Number.isFinite(p.elev)).sort((a, b) => a.x - b.x));
    if (profiles.length === velocities.length - 1 && profiles.every((p) => p.length > 0)) {
      starts.push({
        start: 'layered',
        description: `the layered interpretation (${velocities.map((v) => Math.round(v)).join(', ')} m/s)`,
        velocity: (x, elev) => {
          let k = 0;
          while (k < profiles.length && elev <= linearAt(profiles[k].map((p) => p.x), profiles[k].map((p) => p.elev), x)) k++;
          return velocities[k];
        },
      });
    } else {
      log.add('tomography-layered-start', 'the layered interpretation has a refractor without depths, so the tomogram was started from the velocity-depth gradient only');
    }
  }
  const grid = gridFromModel(spec, ground, (x, elev) => Math.min(velocityRange[1], Math.max(velocityRange[0], starts[0].velocity(x, elev))));
  const threshold = COVERAGE_FRACTION * cell;
  const results: TomogramResult[] = [];
  for (const start of starts) {
    const startGrid = gridFromModel(spec, ground, (x, elev) => Math.min(velocityRange[1], Math.max(velocityRange[0], start.velocity(x, elev))));
    const inversion = invertGrid(startGrid, shots, { noise, velocityRange, smoothing: options.smoothing, maxIterations: options.maxIterations });
    const velocity = Float64Array.from(inversion.slowness, (s, k) => (startGrid.active[k] ? 1 / s : NaN));
    const result: TomogramResult = { start: start.start, startDescription: start.description, velocity, coverage: inversion.coverage, iterations: inversion.iterations, stopped: inversion.stopped, contours: [] };
    for (const v of options.contours ?? []) result.contours.push({ velocity: v, points: contourPoints(startGrid, result, v, receivers, ground, threshold, layered) });
    results.push(result);
    const last = inversion.iterations[inversion.iterations.length - 1];
    if (inversion.stopped !== 'noise-reached') {
      log.add('tomography-misfit', `the tomogram from the ${start.start === 'gradient' ? 'velocity-depth gradient' : 'layered'} start stopped at ${(last.rms * 1e3).toFixed(2)} ms RMS, above the pick noise of ${(noise * 1e3).toFixed(2)} ms (${inversion.stopped === 'misfit-stalled' ? 'the misfit stopped falling' : 'iteration limit'}): parts of the picks are not explained by a smooth model`);
    }
  }
  if (results.length === 2) compareStarts(results, log);
  return { file: table.file, grid, picks: table.picks.length, noise, noiseSource, coverageThreshold: threshold, results, receivers, ground };
}

/** Ground points of the line: each receiver position with its elevation, sorted along x. */
function groundPoints(table: FirstBreakTable): { x: number; elev: number }[] {
  const byX = new Map<number, number>();
  for (const p of table.picks) byX.set(p.receiverX, p.receiverElev);
  return [...byX.entries()].sort((a, b) => a[0] - b[0]).map(([x, elev]) => ({ x, elev }));
}

/** The depth at each geophone where the velocity, going down from the ground, first reaches `velocity`. */
function contourPoints(grid: EikonalGrid, result: TomogramResult, velocity: number, receivers: { x: number; elev: number }[], ground: (x: number) => number, threshold: number, layered?: InterpretationResult): ContourPoint[] {
  const slowness = Float64Array.from(result.velocity, (v) => (Number.isFinite(v) ? 1 / v : 0));
  const step = grid.h / 4;
  const bottom = grid.top - (grid.nz - 1) * grid.h;
  const layeredIndex = layered?.layers.findIndex((l) => l.velocity >= velocity) ?? -1;
  const refractor = layeredIndex > 0 ? layered!.refractors[layeredIndex - 1] : undefined;
  return receivers.map(({ x }) => {
    const g = ground(x);
    let previous = 1 / sampleGrid(grid, slowness, x, g);
    let found: number | undefined;
    for (let d = step; g - d >= bottom; d += step) {
      const v = 1 / sampleGrid(grid, slowness, x, g - d);
      if (v >= velocity) {
        found = d - step + (step * (velocity - previous)) / (v - previous || 1);
        break;
      }
      previous = v;
    }
    if (previous >= velocity) found = 0;
    const point: ContourPoint = { x, covered: false };
    if (found !== undefined) {
      point.depth = found;
      point.elev = g - found;
      point.covered = sampleGrid(grid, result.coverage, x, g - found) >= threshold;
    }
    if (refractor !== undefined) {
      const near = refractor.points.find((p) => Math.abs(p.x - x) < 1e-6);
      if (near !== undefined && Number.isFinite(near.depth)) point.layeredDepth = near.depth;
    }
    return point;
  });
}

/** Warns where the two starting models lead to contour depths more than max(1 m, 15 %) apart. */
function compareStarts(results: TomogramResult[], log: WarningLog): void {
  const [a, b] = results;
  a.contours.forEach((contour, c) => {
    const other = b.contours[c];
    const apart: number[] = [];
    contour.points.forEach((p, i) => {
      const q = other.points[i];
      if (!p.covered || !q.covered || p.depth === undefined || q.depth === undefined) return;
      if (Math.abs(p.depth - q.depth) > Math.max(1, 0.15 * Math.max(p.depth, q.depth))) apart.push(p.x);
    });
    if (apart.length > 0) {
      log.add('tomography-start-dependence', `the ${Math.round(contour.velocity)} m/s contour differs by more than max(1 m, 15 %) between the two starting models at ${apart.length} covered geophone${apart.length > 1 ? 's' : ''} between x = ${apart[0]} and ${apart[apart.length - 1]} m: the picks do not constrain the velocity there; rely on neither without a boring`);
    }
  });
}
