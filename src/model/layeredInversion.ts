import { linearAt } from '../core/interpolate.js';
import { choleskyFactor, choleskyInverse, choleskySolve } from './cholesky.js';
import { elevationIndex, gradientIndex, packParameters, parameterCount, sampleNodeSection, unpackParameters, velocityIndex, type NodeSection } from './nodeSection.js';
import { sectionPaths, type Shot, type SparseRow } from './sectionPaths.js';
import { minOf, maxOf } from '../core/extent.js';

/** One first-break pick for the inversion, in SI units (metres, elevations up, seconds). */
export interface InversionPick {
  sourceX: number;
  sourceZ: number;
  receiverX: number;
  receiverZ: number;
  time: number;
}

/** Options of the layered inversion. */
export interface LayeredInversionOptions {
  /**
   * Weight of the smoothness of each refractor, dimensionless; default DEFAULT_SMOOTHING (3). The penalty is the
   * second difference of the refractor's elevation from node to node, turned into a delay time by
   * the vertical slowness of the layer above (√(1/V₁² − 1/V₂²)) and weighted like one pick:
   * with weight 1, a bend worth 1 ms of delay costs as much as a 1 ms misfit of one pick. 0 lets
   * the refractor follow every pick; larger values give a smoother refractor.
   */
  smoothing?: number;
  /** Spacing of the refractor nodes, in metres; default the geophone spacing (a node under every geophone). */
  nodeSpacing?: number;
  /** Let each layer's velocity change linearly along the line; default false. */
  lateralGradient?: boolean;
  /** Largest number of accepted Levenberg-Marquardt steps; default 30. */
  maxIterations?: number;
  /**
   * Fit one time shift common to every pick (a trigger delay), in seconds; default false. For
   * lines whose direct-wave lines do not pass through the origin.
   */
  timeShift?: boolean;
  /**
   * Prior velocities by layer (top down; undefined for none), in m/s with standard errors: each
   * adds ((v − velocity) · priorNoise / se)² to the objective, as a pick of noise priorNoise would
   * (damped least squares with a priori data, Jackson 1979, Geophys. J. R. astr. Soc. 57, 137-157).
   * For a layer whose head waves are seen from one direction only, where the picks leave its
   * velocity free to trade with the refractor's shape (refineByInversion).
   */
  velocityPriors?: ({ velocity: number; se: number } | undefined)[];
  /** Pick noise, in seconds, that weights the velocity priors; needed with velocityPriors. */
  priorNoise?: number;
  /**
   * Stop early while the fit stays far from a bound: once a step lowers the objective by less
   * than `relativeStop` while the sum of squared residuals (s²) is still above `misfitAbove`.
   * For a section only compared against another (interpret's refractor check): at 3 % a step,
   * closing a gap of four times takes ln 4 / 0.03 ≈ 46 steps, more than the iteration limit, so
   * continuing could not change which section fits better.
   */
  settle?: { misfitAbove: number; relativeStop: number };
}

/** Where the inversion starts: the ground, a depth profile per refractor, layer velocities. */
export interface InversionStart {
  ground: (x: number) => number;
  /** Start refractor elevations, top down, each as points along x (ascending). */
  refractors: { x: number; elev: number }[][];
  /** Start layer velocities, top down, in m/s (one more than the refractors). */
  velocities: number[];
  /** Receiver positions, ascending, in metres: depths are reported there. */
  receiverXs: number[];
  /** Geophone spacing, in metres. */
  spacing: number;
}

/** A refractor of the inverted section at one receiver. */
export interface InvertedPoint {
  x: number;
  depth: number;
  elev: number;
  depthSe: number;
  /** True where a least-time path crosses the refractor within a node of this receiver (so the picks, not only the smoothness, fix it). */
  covered: boolean;
}

export interface LayeredInversion {
  start: NodeSection;
  section: NodeSection;
  /** RMS of pick minus computed time over every pick, in seconds, for the start and the final section. */
  rmsBefore: number;
  rmsAfter: number;
  /** Accepted steps. */
  iterations: number;
  stopReason: 'misfit stopped falling' | 'iteration limit' | 'no step lowers the misfit' | 'settled far from the section compared';
  picks: number;
  unknowns: number;
  /** Effective number of unknowns the picks resolve (trace of the resolution matrix). */
  effectiveUnknowns: number;
  /** The common time shift fitted (seconds, added to every computed time) and its standard error; 0 without timeShift. */
  timeShift: number;
  timeShiftSe: number;
  /** Standard errors of the layer velocities (m/s) and gradients ((m/s)/m), from the model covariance scaled by the misfit. */
  velocitySe: number[];
  gradientSe: number[];
  /** Each refractor at each receiver. */
  profiles: InvertedPoint[][];
  /** Residuals (pick minus computed), in seconds, in the order of the picks. */
  residuals: Float64Array;
}

/**
 * Default smoothness weight. Chosen on 20 forward-model lines of our own (undulating, channelled
 * and dipping rock, water tables, 0.2-0.5 ms noise; DEVELOPERS.md): 3 gave a mean depth error of
 * 0.21 m against 0.29 m at 1 and 0.18 m at 10, where 10 already rounds off 3 m channels (their
 * worst error 1.8 m, and misfits up to twice the pick noise).
 */
export const DEFAULT_SMOOTHING = 3;

const MIN_NODE_THICKNESS = 0.2;
// Marquardt's update of the damping: divided by 10 after a step that lowers the misfit, multiplied
// by 10 after one that does not (Marquardt 1963, §4, with ν = 10).
const DAMPING_FACTOR = 10;
const RELATIVE_STOP = 1e-3;

/**
 * Layered-model inversion of first breaks: refractor elevations at nodes along the line and layer
 * velocities (optionally a lateral gradient per layer) adjusted by damped least squares
 * (Levenberg 1944; Marquardt 1963, with Marquardt's diagonal scaling) so that first arrivals
 * computed through the section (model/sectionPaths: direct, refracted and head waves by least
 * time over the sampled refractors, derivatives along the least-time paths) fit every pick, those
 * of sources off the ends included. A smoothness penalty on each refractor (second differences at
 * the nodes) keeps the relief to what the picks demand. Steps stop when the misfit falls by less
 * than 0.1 %. Standard errors from the model covariance s²(JᵀJ + RᵀR)⁻¹, s² the residual variance
 * over the picks less the effective number of unknowns.
 *
 * @param picks - every pick to fit, in seconds
 * @param start - the start section (usually the recommended depth profiles)
 * @throws RangeError for fewer than two picks, no refractor, or velocities not one more than the refractors
 */
export function layeredInversion(picks: InversionPick[], start: InversionStart, options: LayeredInversionOptions = {}): LayeredInversion {
  const refractors = start.refractors.length;
  if (refractors === 0) throw new RangeError('layeredInversion needs at least one refractor');
  if (start.velocities.length !== refractors + 1) throw new RangeError(`layeredInversion needs ${refractors + 1} layer velocities, got ${start.velocities.length}`);
  if (picks.length < 2) throw new RangeError(`layeredInversion needs at least two picks, got ${picks.length}`);
  const smoothing = options.smoothing ?? DEFAULT_SMOOTHING;
  if (!(smoothing >= 0)) throw new RangeError(`layeredInversion smoothing must be 0 or more, got ${smoothing}`);
  const lateral = options.lateralGradient ?? false;
  const maxIterations = options.maxIterations ?? 30;
  const spacing = start.spacing;
  const nodeSpacing = options.nodeSpacing ?? spacing;
  if (!(nodeSpacing > 0)) throw new RangeError(`layeredInversion node spacing must be positive, got ${nodeSpacing}`);

  const { shots, order } = groupShots(picks);
  const allX = picks.flatMap((p) => [p.sourceX, p.receiverX]);
  const first = start.receiverXs[0];
  const last = start.receiverXs[start.receiverXs.length - 1];
  const nodeXs = nodePositions(first, last, minOf(allX), maxOf(allX), nodeSpacing);
  const span: [number, number] = [minOf(allX) - 2 * spacing, maxOf(allX) + 2 * spacing];
  const step = Math.max(spacing / 2, (span[1] - span[0]) / 600);
  const initial: NodeSection = {
    ground: start.ground,
    nodeXs,
    xRef: (first + last) / 2,
    elevations: start.refractors.map((points) => Float64Array.from(nodeXs, (x) => linearAt(points.map((p) => p.x), points.map((p) => p.elev), x))),
    velocities: Float64Array.from(start.velocities),
    gradients: new Float64Array(refractors + 1),
  };
  const nodes = nodeXs.length;
  // The time shift, when fitted, is the last unknown (the section's unknowns come first).
  const withShift = options.timeShift ?? false;
  const sectionUnknowns = parameterCount(refractors, nodes, lateral);
  const unknowns = sectionUnknowns + (withShift ? 1 : 0);
  const shiftIndex = withShift ? sectionUnknowns : -1;
  const halfSpan = (span[1] - span[0]) / 2;
  const project = (p: Float64Array) => projectParameters(p, initial, lateral, halfSpan);
  const packed = packParameters(initial, lateral);
  const p0 = project(withShift ? Float64Array.from([...packed, 0]) : packed);
  const startSection = unpackParameters(initial, p0, lateral);

  // The smoothness rows R (constant): RᵀR, dense.
  const rtr = smoothnessNormal(start.velocities, refractors, nodes, unknowns, smoothing);
  // The velocity priors: unknown index, prior value and weight (seconds per m/s).
  const priors = (options.velocityPriors ?? []).flatMap((prior, m) => {
    if (prior === undefined || m > refractors) return [];
    const weight = (options.priorNoise ?? NaN) / prior.se;
    if (!(weight > 0 && Number.isFinite(weight))) throw new RangeError(`layeredInversion velocity prior of layer ${m + 1} needs a positive pick noise and standard error`);
    return [{ index: velocityIndex(refractors, nodes, m), value: prior.velocity, weight2: weight * weight }];
  });
  const regularisation = (p: Float64Array) => quadratic(rtr, p, unknowns) + priors.reduce((sum, q) => sum + q.weight2 * (p[q.index] - q.value) ** 2, 0);
  const normalOf = (rows: SparseRow[], residuals: Float64Array, p: Float64Array) => {
    const system = normalEquations(rows, residuals, rtr, p, unknowns, refractors * nodes, shiftIndex);
    for (const q of priors) {
      system.normal[q.index * unknowns + q.index] += q.weight2;
      system.gradient[q.index] -= q.weight2 * (p[q.index] - q.value);
    }
    return system;
  };

  // Two workspaces for the Jacobian rows, the current section's and a trial's: a trial step is
  // evaluated with its derivatives (the times are the same with or without them), so an accepted
  // step needs no second evaluation; each evaluation replaces the rows last made in its workspace.
  const workspaces = [{ index: new Int32Array(0), value: new Float64Array(0) }, { index: new Int32Array(0), value: new Float64Array(0) }];
  const evaluate = (p: Float64Array, derivatives: boolean, workspace = workspaces[0]) => {
    const section = unpackParameters(initial, p, lateral);
    const paths = sectionPaths(sampleNodeSection(section, span, step), shots, derivatives, lateral, workspace);
    const residuals = new Float64Array(picks.length);
    let sum = 0;
    const shift = withShift ? p[shiftIndex] : 0;
    order.forEach(([s, r], i) => {
      residuals[i] = picks[i].time - paths.times[s][r] - shift;
      sum += residuals[i] * residuals[i];
    });
    const rows = derivatives ? order.map(([s, r]) => paths.rows![s][r]) : undefined;
    return { residuals, dataMisfit: sum, rows, crossings: paths.crossings };
  };

  let p = p0;
  let current = evaluate(p, true);
  let objective = current.dataMisfit + regularisation(p);
  const rmsBefore = Math.sqrt(current.dataMisfit / picks.length);
  let lambda = 1e-2;
  let spare = 1;
  let iterations = 0;
  let stopReason: LayeredInversion['stopReason'] = 'iteration limit';
  while (iterations < maxIterations) {
    const { normal, gradient } = normalOf(current.rows!, current.residuals, p);
    let accepted: { p: Float64Array; objective: number; evaluation: typeof current } | undefined;
    while (lambda < 1e8) {
      const trial = dampedStep(normal, gradient, lambda, unknowns);
      if (trial !== undefined) {
        const next = project(p.map((v, i) => v + trial[i]));
        const evaluation = evaluate(next, true, workspaces[spare]);
        const misfit = evaluation.dataMisfit + regularisation(next);
        if (misfit < objective) {
          accepted = { p: next, objective: misfit, evaluation };
          lambda = Math.max(lambda / DAMPING_FACTOR, 1e-7);
          break;
        }
      }
      lambda *= DAMPING_FACTOR;
    }
    if (accepted === undefined) { stopReason = 'no step lowers the misfit'; break; }
    const decrease = (objective - accepted.objective) / objective;
    p = accepted.p;
    objective = accepted.objective;
    current = accepted.evaluation;
    spare = 1 - spare;
    iterations++;
    if (decrease < RELATIVE_STOP) { stopReason = 'misfit stopped falling'; break; }
    if (options.settle !== undefined && decrease < options.settle.relativeStop && current.dataMisfit > options.settle.misfitAbove) { stopReason = 'settled far from the section compared'; break; }
  }

  // Covariance at the final section.
  const { normal } = normalOf(current.rows!, current.residuals, p);
  const jtj = normal.map((v, i) => v - rtr[i]);
  for (const q of priors) jtj[q.index * unknowns + q.index] -= q.weight2;
  const ridge = 1e-12 * maxDiagonal(normal, unknowns);
  for (let i = 0; i < unknowns; i++) normal[i * unknowns + i] += ridge;
  const factor = choleskyFactor(normal, unknowns);
  const covariance = factor === undefined ? undefined : choleskyInverse(factor, unknowns);
  let effective = unknowns;
  if (covariance !== undefined) {
    effective = 0;
    for (let i = 0; i < unknowns; i++) for (let k = 0; k < unknowns; k++) effective += covariance[i * unknowns + k] * jtj[k * unknowns + i];
  }
  const freedom = picks.length - effective;
  const variance = freedom > 1 ? current.dataMisfit / freedom : NaN;
  const cov = (i: number, j: number) => (covariance === undefined ? NaN : variance * covariance[i * unknowns + j]);

  const section = unpackParameters(initial, p, lateral);
  const profiles = section.elevations.map((elev, k) => start.receiverXs.map((x) => {
    const { a, t } = bracket(nodeXs, x);
    const b = Math.min(a + 1, nodes - 1);
    const e = (1 - t) * elev[a] + t * elev[b];
    const ia = elevationIndex(nodes, k, a);
    const ib = elevationIndex(nodes, k, b);
    const varianceAt = (1 - t) ** 2 * cov(ia, ia) + 2 * t * (1 - t) * cov(ia, ib) + t * t * cov(ib, ib);
    const crossing = current.crossings![k];
    // Covered: some least-time path crosses the refractor within a node of the receiver.
    let near = 0;
    for (let j = Math.max(0, a - 1); j <= Math.min(nodes - 1, b + 1); j++) near += crossing[j];
    const covered = near >= 1;
    const ground = start.ground(x);
    return { x, depth: ground - e, elev: e, depthSe: Math.sqrt(Math.max(0, varianceAt)), covered };
  }));
  return {
    start: startSection,
    section,
    rmsBefore,
    rmsAfter: Math.sqrt(current.dataMisfit / picks.length),
    iterations,
    stopReason,
    picks: picks.length,
    unknowns,
    effectiveUnknowns: effective,
    velocitySe: Array.from({ length: refractors + 1 }, (_, m) => Math.sqrt(cov(velocityIndex(refractors, nodes, m), velocityIndex(refractors, nodes, m)))),
    gradientSe: Array.from({ length: refractors + 1 }, (_, m) => (lateral ? Math.sqrt(cov(gradientIndex(refractors, nodes, m), gradientIndex(refractors, nodes, m))) : 0)),
    profiles,
    residuals: current.residuals,
    timeShift: withShift ? p[shiftIndex] : 0,
    timeShiftSe: withShift ? Math.sqrt(cov(shiftIndex, shiftIndex)) : 0,
  };
}

/** Picks grouped into shots (one per source position and elevation), and each pick's (shot, receiver). */
function groupShots(picks: InversionPick[]): { shots: Shot[]; order: [number, number][] } {
  const byKey = new Map<string, number>();
  const shots: Shot[] = [];
  const order: [number, number][] = picks.map((p) => {
    const key = `${p.sourceX}|${p.sourceZ}`;
    let s = byKey.get(key);
    if (s === undefined) {
      s = shots.length;
      byKey.set(key, s);
      shots.push({ x: p.sourceX, z: p.sourceZ, receivers: [] });
    }
    shots[s].receivers.push({ x: p.receiverX, z: p.receiverZ });
    return [s, shots[s].receivers.length - 1];
  });
  return { shots, order };
}

/**
 * Node positions: from the first to the last receiver at about `spacing`, continued at the same
 * spacing beyond them to cover the sources off the ends (their rays go down there).
 */
export function nodePositions(first: number, last: number, lowest: number, highest: number, spacing: number): Float64Array {
  const inside = Math.max(1, Math.round((last - first) / spacing));
  const step = (last - first) / inside || spacing;
  const xs: number[] = [];
  for (let x = first - step; x > lowest - step; x -= step) xs.unshift(x);
  for (let i = 0; i <= inside; i++) xs.push(first + i * step);
  for (let x = last + step; x < highest + step; x += step) xs.push(x);
  return Float64Array.from(last === first ? [first] : xs);
}

/** Node interval a and the weight t of node a + 1 at x (end values held beyond the nodes). */
function bracket(nodeXs: Float64Array, x: number): { a: number; t: number } {
  const last = nodeXs.length - 1;
  if (last === 0 || x <= nodeXs[0]) return { a: 0, t: 0 };
  if (x >= nodeXs[last]) return { a: last - 1, t: 1 };
  let a = 0;
  while (nodeXs[a + 1] < x) a++;
  return { a, t: (x - nodeXs[a]) / (nodeXs[a + 1] - nodeXs[a]) };
}

/**
 * Keeps a trial section physical: each refractor at least MIN_NODE_THICKNESS below the ground and
 * the refractor above at every node, velocities increasing downwards by at least 1 %, and a
 * lateral gradient that keeps every velocity above half its value at the centre of the line.
 */
function projectParameters(p: Float64Array, like: NodeSection, lateral: boolean, halfSpan: number): Float64Array {
  const refractors = like.elevations.length;
  const nodes = like.nodeXs.length;
  const out = Float64Array.from(p);
  for (let j = 0; j < nodes; j++) {
    let ceiling = like.ground(like.nodeXs[j]);
    for (let k = 0; k < refractors; k++) {
      const i = elevationIndex(nodes, k, j);
      out[i] = Math.min(out[i], ceiling - MIN_NODE_THICKNESS);
      ceiling = out[i];
    }
  }
  for (let m = 0; m <= refractors; m++) {
    const i = velocityIndex(refractors, nodes, m);
    out[i] = Math.max(out[i], m === 0 ? 30 : 1.01 * out[velocityIndex(refractors, nodes, m - 1)]);
    if (lateral) {
      const gi = gradientIndex(refractors, nodes, m);
      const limit = (0.5 * out[i]) / halfSpan;
      out[gi] = Math.max(-limit, Math.min(limit, out[gi]));
    }
  }
  return out;
}

/**
 * RᵀR of the smoothness rows: for every refractor k and inner node j, the row
 * w·qₖ·(z[j−1] − 2z[j] + z[j+1]), qₖ = √(1/Vₖ² − 1/Vₖ₊₁²) the vertical slowness that turns
 * elevation into delay time (1/Vₖ where the layer below is not faster).
 */
function smoothnessNormal(velocities: number[], refractors: number, nodes: number, unknowns: number, weight: number): Float64Array {
  const rtr = new Float64Array(unknowns * unknowns);
  for (let k = 0; k < refractors; k++) {
    const above = velocities[k];
    const below = velocities[k + 1];
    const q = below > above ? Math.sqrt(1 / above ** 2 - 1 / below ** 2) : 1 / above;
    const scale = (weight * q) ** 2;
    for (let j = 1; j + 1 < nodes; j++) {
      const idx = [elevationIndex(nodes, k, j - 1), elevationIndex(nodes, k, j), elevationIndex(nodes, k, j + 1)];
      const coef = [1, -2, 1];
      for (let a = 0; a < 3; a++) for (let b = 0; b < 3; b++) rtr[idx[a] * unknowns + idx[b]] += scale * coef[a] * coef[b];
    }
  }
  return rtr;
}

/** pᵀ M p for a dense symmetric M. */
function quadratic(m: Float64Array, p: Float64Array, n: number): number {
  let sum = 0;
  for (let i = 0; i < n; i++) {
    if (p[i] === 0) continue;
    let row = 0;
    for (let j = 0; j < n; j++) row += m[i * n + j] * p[j];
    sum += p[i] * row;
  }
  return sum;
}

/**
 * Elevation entries of a Jacobian row below this fraction of its largest are left out of JᵀJ (not out of
 * the gradient): they are the bends of a head wave's path along a refractor, whose derivatives
 * vanish on a plane refractor and are a few hundredths of the entry and exit points' elsewhere, so
 * JᵀJ changes by less than 1e-6 of its entries while its cost falls several times.
 */
const NORMAL_DROP = 1e-3;

/** JᵀJ + RᵀR and Jᵀr − RᵀR p (the negative half-gradient of the objective). */
function normalEquations(rows: SparseRow[], residuals: Float64Array, rtr: Float64Array, p: Float64Array, n: number, elevations: number, shiftIndex: number): { normal: Float64Array; gradient: Float64Array } {
  const normal = Float64Array.from(rtr);
  const gradient = new Float64Array(n);
  const keptIndex = new Int32Array(n);
  const keptValue = new Float64Array(n);
  const marked = new Uint8Array(n);
  const dense = new Float64Array(n);
  rows.forEach((row, i) => {
    const { index, value } = row;
    const r = residuals[i];
    let largest = 0;
    for (let a = 0; a < index.length; a++) {
      gradient[index[a]] += value[a] * r;
      if (index[a] < elevations) largest = Math.max(largest, Math.abs(value[a]));
    }
    let kept = 0;
    for (let a = 0; a < index.length; a++) {
      if (index[a] < elevations && Math.abs(value[a]) < NORMAL_DROP * largest) continue;
      keptIndex[kept] = index[a];
      keptValue[kept++] = value[a];
    }
    // The upper triangle only (the indices of a row are distinct, so each cell gets one product
    // per row, in row order, as the full square would); mirrored below at the end. The kept
    // entries are put in index order first, through a mark per unknown.
    let low = n;
    let high = -1;
    for (let a = 0; a < kept; a++) {
      const ia = keptIndex[a];
      marked[ia] = 1;
      dense[ia] = keptValue[a];
      if (ia < low) low = ia;
      if (ia > high) high = ia;
    }
    let sorted = 0;
    for (let j = low; j <= high; j++) {
      if (marked[j] === 0) continue;
      marked[j] = 0;
      keptIndex[sorted] = j;
      keptValue[sorted++] = dense[j];
    }
    for (let a = 0; a < kept; a++) {
      const base = keptIndex[a] * n;
      const va = keptValue[a];
      for (let b = a; b < kept; b++) normal[base + keptIndex[b]] += va * keptValue[b];
    }
    if (shiftIndex >= 0) {
      // ∂t/∂shift = 1 for every pick.
      gradient[shiftIndex] += r;
      normal[shiftIndex * n + shiftIndex] += 1;
      // Over the entries JᵀJ keeps, so that the matrix stays a Gram matrix (positive semi-definite).
      for (let a = 0; a < kept; a++) {
        normal[shiftIndex * n + keptIndex[a]] += keptValue[a];
        normal[keptIndex[a] * n + shiftIndex] += keptValue[a];
      }
    }
  });
  for (let i = 0; i < n; i++) for (let j = i + 1; j < n; j++) normal[j * n + i] = normal[i * n + j];
  for (let i = 0; i < n; i++) {
    let row = 0;
    for (let j = 0; j < n; j++) row += rtr[i * n + j] * p[j];
    gradient[i] -= row;
  }
  return { normal, gradient };
}

function maxDiagonal(m: Float64Array, n: number): number {
  let max = 0;
  for (let i = 0; i < n; i++) max = Math.max(max, m[i * n + i]);
  return max;
}

/** The Levenberg-Marquardt step: (A + λ·diag(A)) δ = b, diag(A) floored so unseen unknowns stay damped. */
function dampedStep(normal: Float64Array, gradient: Float64Array, lambda: number, n: number): Float64Array | undefined {
  const damped = Float64Array.from(normal);
  const floor = 1e-9 * maxDiagonal(normal, n);
  for (let i = 0; i < n; i++) damped[i * n + i] += lambda * Math.max(normal[i * n + i], floor);
  const factor = choleskyFactor(damped, n);
  return factor === undefined ? undefined : choleskySolve(factor, n, gradient);
}
