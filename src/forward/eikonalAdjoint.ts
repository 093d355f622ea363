import { straightRayPieces, type EikonalResult } from './eikonal.js';
import { nodeWeights, type EikonalGrid } from './eikonalGrid.js';

/**
 * The gradient of a function of receiver times with respect to the slowness at every node, by the
 * adjoint state of the discrete fast-marching solution (Leung & Qian 2006, Comm. Math. Sci. 4,
 * 249-266; Taillandier, Noble, Chauris & Calandra 2009, Geophysics 74(6), WCB1-WCB10): each node's
 * time solves Σ_d α_d (T − τ_d)² = s² over its upwind neighbours, so ∂T/∂s = s / D and
 * ∂T/∂τ_d = α_d (T − τ_d) / D with D = Σ_d α_d (T − τ_d); the adjoint variable is carried from the
 * receivers back to the source in the reverse order of acceptance. The result is the exact
 * derivative of the solver's own times (checked against finite differences in the tests).
 *
 * @param grid - the grid the times were computed on
 * @param result - eikonalTimes(..., { record: true })
 * @param receivers - receiver positions and ∂J/∂t at each (for a misfit, the weighted residual)
 * @param into - gradient accumulated into this array (length nx·nz), in ∂J per (s/m)
 * @throws Error when the result carries no stencil
 */
export function eikonalAdjoint(grid: EikonalGrid, result: EikonalResult, receivers: { x: number; elev: number; weight: number }[], into: Float64Array): void {
  const stencil = result.stencil;
  if (stencil === undefined) throw new Error('eikonalAdjoint: the times were computed without record: true');
  const { times } = result;
  const { slowness } = grid;
  const lambda = new Float64Array(times.length);
  for (const r of receivers) {
    const at = nodeWeights(grid, r.x, r.elev);
    if (at === undefined) continue;
    for (let q = 0; q < at.nodes.length; q++) lambda[at.nodes[q]] += r.weight * at.weights[q];
  }
  const { order, neighbours, alphas } = stencil;
  const seededCount = stencil.seeded.length;
  for (let p = stencil.accepted - 1; p >= seededCount; p--) {
    const k = order[p];
    const l = lambda[k];
    if (l === 0) continue;
    const t = times[k];
    let denominator = 0;
    const taus = [0, 0];
    for (let d = 0; d < 2; d++) {
      const a = alphas[2 * k + d];
      const near = neighbours[4 * k + 2 * d];
      if (a === 0 || near < 0) continue;
      const beyond = neighbours[4 * k + 2 * d + 1];
      taus[d] = beyond >= 0 ? (4 * times[near] - times[beyond]) / 3 : times[near];
      denominator += a * (t - taus[d]);
    }
    if (!(denominator > 0)) continue;
    into[k] += (l * slowness[k]) / denominator;
    for (let d = 0; d < 2; d++) {
      const a = alphas[2 * k + d];
      const near = neighbours[4 * k + 2 * d];
      if (a === 0 || near < 0) continue;
      const w = (l * a * (t - taus[d])) / denominator;
      const beyond = neighbours[4 * k + 2 * d + 1];
      if (beyond >= 0) {
        lambda[near] += (4 / 3) * w;
        lambda[beyond] -= w / 3;
      } else {
        lambda[near] += w;
      }
    }
  }
  // The straight-ray start: each seeded time is Σ s(piece) · length.
  for (let q = 0; q < seededCount; q++) {
    const k = stencil.seeded[q];
    const l = lambda[k];
    if (l === 0) continue;
    for (const piece of straightRayPieces(grid, stencil.source, k)) {
      const at = nodeWeights(grid, piece.x, piece.elev);
      if (at === undefined) {
        into[k] += l * piece.length;
        continue;
      }
      for (let c = 0; c < at.nodes.length; c++) into[at.nodes[c]] += l * at.weights[c] * piece.length;
    }
  }
}
