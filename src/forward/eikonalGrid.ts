/**
 * A regular grid of nodes for first-arrival times: node (i, j) at x = x0 + i·h and elevation
 * top − j·h, stored row by row (index j·nx + i), slowness in seconds per metre at each node.
 * Nodes above the ground carry no wave (`active` = 0), except the one node directly above the
 * ground in each column, kept at the ground's slowness so that a receiver on the ground can be
 * interpolated between four live nodes; a wave can gain at most a fraction of one cell there.
 */
export interface EikonalGrid {
  /** Number of columns (along x) and rows (downwards). */
  nx: number;
  nz: number;
  /** Node spacing, in metres, the same along x and elevation. */
  h: number;
  /** x of column 0, in metres. */
  x0: number;
  /** Elevation of row 0 (the top row), in metres. */
  top: number;
  /** Slowness at each node, in seconds per metre. */
  slowness: Float64Array;
  /** 1 where the node carries waves, 0 above the ground. */
  active: Uint8Array;
}

/** Extent and spacing of a grid: x from x0 to x1 and elevation from `top` down to `bottom`, in metres. */
export interface GridSpec {
  x0: number;
  x1: number;
  top: number;
  bottom: number;
  /** Node spacing, in metres. */
  h: number;
}

/**
 * A grid over a velocity model: `velocity(x, elev)` in m/s at each node at or below the ground,
 * `ground(x)` the ground elevation in metres.
 *
 * @throws RangeError for a spacing that is not positive or an empty extent
 */
export function gridFromModel(spec: GridSpec, ground: (x: number) => number, velocity: (x: number, elev: number) => number): EikonalGrid {
  const { x0, x1, top, bottom, h } = spec;
  if (!(h > 0) || !(x1 > x0) || !(top > bottom)) throw new RangeError(`grid: needs h > 0, x1 > x0 and top > bottom; got h = ${h}, x ${x0} to ${x1}, elevation ${bottom} to ${top}`);
  const nx = Math.round((x1 - x0) / h) + 1;
  const nz = Math.round((top - bottom) / h) + 1;
  const slowness = new Float64Array(nx * nz);
  const active = new Uint8Array(nx * nz);
  for (let i = 0; i < nx; i++) {
    const x = x0 + i * h;
    const g = ground(x);
    // Row of the lowest node above the ground (kept live for interpolation).
    const firstBelow = Math.max(0, Math.ceil((top - g) / h - 1e-9));
    const pad = Math.max(0, firstBelow - 1);
    for (let j = pad; j < nz; j++) {
      const elev = top - j * h;
      const at = Math.min(elev, g);
      slowness[j * nx + i] = 1 / velocity(x, at);
      active[j * nx + i] = 1;
    }
  }
  return { nx, nz, h, x0, top, slowness, active };
}

/**
 * Bilinear weights of the four nodes around (x, elev), renormalised over the live nodes.
 * @returns node indices and weights (same length), or undefined outside the grid or with no live node
 */
export function nodeWeights(grid: EikonalGrid, x: number, elev: number): { nodes: number[]; weights: number[] } | undefined {
  const fi = (x - grid.x0) / grid.h;
  const fj = (grid.top - elev) / grid.h;
  if (fi < -1e-9 || fj < -1e-9 || fi > grid.nx - 1 + 1e-9 || fj > grid.nz - 1 + 1e-9) return undefined;
  const i = Math.min(grid.nx - 2, Math.max(0, Math.floor(fi)));
  const j = Math.min(grid.nz - 2, Math.max(0, Math.floor(fj)));
  const u = Math.min(1, Math.max(0, fi - i));
  const w = Math.min(1, Math.max(0, fj - j));
  const corners = [j * grid.nx + i, j * grid.nx + i + 1, (j + 1) * grid.nx + i, (j + 1) * grid.nx + i + 1];
  const raw = [(1 - u) * (1 - w), u * (1 - w), (1 - u) * w, u * w];
  const nodes: number[] = [];
  const weights: number[] = [];
  let total = 0;
  for (let k = 0; k < 4; k++) {
    if (grid.active[corners[k]] === 0 || raw[k] === 0) continue;
    nodes.push(corners[k]);
    weights.push(raw[k]);
    total += raw[k];
  }
  if (total === 0) return undefined;
  for (let k = 0; k < weights.length; k++) weights[k] /= total;
  return { nodes, weights };
}

/** A value of a node field (times, slowness) at (x, elev) by bilinear interpolation over live nodes. */
export function sampleGrid(grid: EikonalGrid, field: Float64Array, x: number, elev: number): number {
  const at = nodeWeights(grid, x, elev);
  if (at === undefined) return NaN;
  let value = 0;
  for (let k = 0; k < at.nodes.length; k++) value += at.weights[k] * field[at.nodes[k]];
  return value;
}
