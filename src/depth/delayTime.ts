import type { DelayProfile } from './delayProfile.js';
import type { HeadCurve } from './headWaves.js';
import { skyline, skylineAdd, skylineCholesky, skylineInverseDiagonal, skylineSolve } from './skylineCholesky.js';

/** Weight of the rows tying a source's delay to the receiver delays at its position. */
const TIE_WEIGHT = 30;

/**
 * Delay-time method for all sources together (Gardner 1939, Geophysics 4, 247-259; Barry 1967,
 * Geophys. Prospect. 15, 49-59): every head-wave first break from the refractor, from every source
 * including those off the ends, is t = aₛ + bᵣ + |xᵣ − xₛ| / V, with a delay time aₛ per source,
 * bᵣ per receiver and one refractor velocity V, solved by least squares. The constant
 * that could pass between source and receiver delays is fixed by tying each source inside the
 * spread to the receiver delay at its position (interpolated); with no source inside, by equal
 * mean source and receiver delays; solved by a Cholesky factorisation in skyline storage (the
 * unknowns in order along the line make the normal matrix banded: time and memory grow with the
 * line length, not its square or cube). Standard errors come from the covariance σ²(AᵀA)⁻¹, its
 * diagonal by Takahashi's recurrence on the same envelope. Only
 * receivers recorded from both directions get a delay: from one direction its delay and the
 * velocity trade off.
 *
 * @param refractorVelocity - when given (m/s, with its standard error), the velocity is held at it
 * @param errors - compute standard errors (the diagonal of the inverse normal matrix); default true
 * @returns receiver delays and the refractor velocity, or undefined with fewer observations than unknowns
 */
export function delayTime(curves: HeadCurve[], refractor: number, refractorVelocity?: { velocity: number; se: number }, errors = true): DelayProfile | undefined {
  const sourceXs = new Map<string, number>();
  for (const c of curves) if (!sourceXs.has(c.sourceId)) sourceXs.set(c.sourceId, c.sourceX);
  const sources = [...sourceXs.keys()];
  const receiverSet = new Set<number>();
  for (const c of curves) for (const x of c.xs) receiverSet.add(x);
  const receivers = [...receiverSet].sort((a, b) => a - b);
  // Unknowns in order along the line (sources among the receivers, the slowness last): each pick
  // ties a source to receivers within its spread, so the normal matrix is banded (plus one full
  // last row and column for a free slowness) and its skyline factor costs O(n b²), not O(n³).
  const order = [
    ...sources.map((id, i) => ({ x: sourceXs.get(id)!, source: i })),
    ...receivers.map((x, i) => ({ x, source: -1 - i })),
  ].sort((a, b) => a.x - b.x || a.source - b.source);
  const sourceIndex = new Map<string, number>();
  const receiverIndex = new Map<number, number>();
  order.forEach((u, k) => {
    if (u.source >= 0) sourceIndex.set(sources[u.source], k);
    else receiverIndex.set(receivers[-1 - u.source], k);
  });
  // With the refractor velocity given, the slowness is not an unknown: each receiver's delay then
  // follows from its own picks even where it is recorded from one direction only.
  const fixed = refractorVelocity !== undefined;
  const unknowns = sources.length + receivers.length + (fixed ? 0 : 1);
  const slownessIndex = fixed ? -1 : unknowns - 1;
  const rows: { entries: [number, number][]; value: number; weight: number }[] = [];
  for (const c of curves) {
    const s = sourceIndex.get(c.sourceId)!;
    for (let i = 0; i < c.xs.length; i++) {
      const x = c.xs[i];
      const distance = Math.abs(x - c.sourceX);
      rows.push(fixed
        ? { entries: [[s, 1], [receiverIndex.get(x)!, 1]], value: c.times[i] - distance / refractorVelocity.velocity, weight: 1 }
        : { entries: [[s, 1], [receiverIndex.get(x)!, 1], [slownessIndex, distance]], value: c.times[i], weight: 1 });
    }
  }
  const observations = rows.length;
  if (observations < unknowns + 2) return undefined;
  let tied = 0;
  for (const [id, sx] of sourceXs) {
    if (sx < receivers[0] || sx > receivers[receivers.length - 1]) continue;
    // The receivers either side of the source (binary search: the last one west of it).
    let below = 0;
    let above = receivers.length;
    while (below < above) {
      const mid = (below + above) >> 1;
      if (receivers[mid] < sx) below = mid + 1;
      else above = mid;
    }
    const k = Math.max(0, below - 1);
    const a = receivers[k];
    const b = receivers[Math.min(receivers.length - 1, k + 1)];
    const t = b === a ? 0 : (sx - a) / (b - a);
    const entries: [number, number][] = [[sourceIndex.get(id)!, 1], [receiverIndex.get(a)!, -(1 - t)]];
    if (t > 0) entries.push([receiverIndex.get(b)!, -t]);
    rows.push({ entries, value: 0, weight: TIE_WEIGHT });
    tied++;
  }
  // With no source inside the spread the gauge is equal mean source and receiver delays. That
  // constraint touches every unknown (a full row), so it is imposed afterwards: the picks leave
  // exactly one direction free (every source delay +c, every receiver delay −c), pinned here by
  // the first receiver's delay and then moved along to meet the gauge.
  const pinned = tied === 0 ? receiverIndex.get(receivers[0])! : -1;
  if (pinned >= 0) rows.push({ entries: [[pinned, 1]], value: 0, weight: 1 });

  // Normal equations in skyline storage.
  const first = new Int32Array(unknowns);
  for (let i = 0; i < unknowns; i++) first[i] = i;
  for (const row of rows) {
    let low = unknowns;
    for (const [i] of row.entries) low = Math.min(low, i);
    for (const [i] of row.entries) if (low < first[i]) first[i] = low;
  }
  const normal = skyline(first);
  const rhs = new Float64Array(unknowns);
  for (const row of rows) {
    const w = row.weight * row.weight;
    for (const [i, a] of row.entries) {
      rhs[i] += w * a * row.value;
      for (const [j, b] of row.entries) if (j <= i) skylineAdd(normal, i, j, w * a * b);
    }
  }
  let lower = skylineCholesky(normal);
  if (lower === undefined) {
    // A part of the line tied to no source: a faint pull of every delay towards zero fixes its constant.
    let trace = 0;
    for (let i = 0; i < unknowns; i++) trace += normal.values[normal.start[i] + i - first[i]];
    for (let i = 0; i < unknowns; i++) normal.values[normal.start[i] + i - first[i]] += (1e-9 * trace) / unknowns;
    lower = skylineCholesky(normal);
    if (lower === undefined) return undefined;
  }
  const solution = skylineSolve(lower, rhs);
  let inverseDiagonal: Float64Array | number[] = errors ? skylineInverseDiagonal(lower) : new Array(unknowns).fill(NaN);
  if (pinned >= 0) {
    // g·x = mean source delay − mean receiver delay; v = (+1 sources, −1 receivers): g·v = 2.
    const g = new Float64Array(unknowns);
    const v = new Float64Array(unknowns);
    for (const k of sourceIndex.values()) { g[k] = 1 / sources.length; v[k] = 1; }
    for (const k of receiverIndex.values()) { g[k] = -1 / receivers.length; v[k] = -1; }
    let gx = 0;
    for (let i = 0; i < unknowns; i++) gx += g[i] * solution[i];
    for (let i = 0; i < unknowns; i++) solution[i] -= (gx / 2) * v[i];
    if (errors) {
      // Covariance in the gauge: P C Pᵀ with P = I − v gᵀ / (g·v), C that of the pinned system.
      const cg = skylineSolve(lower, g);
      let gcg = 0;
      for (let i = 0; i < unknowns; i++) gcg += g[i] * cg[i];
      const projected = new Float64Array(unknowns);
      for (let i = 0; i < unknowns; i++) projected[i] = inverseDiagonal[i] - v[i] * cg[i] + (v[i] * v[i] * gcg) / 4;
      inverseDiagonal = projected;
    }
  }
  let rss = 0;
  for (let r = 0; r < observations; r++) {
    const row = rows[r];
    let fitted = 0;
    for (const [i, v] of row.entries) fitted += v * solution[i];
    rss += (row.value - fitted) ** 2;
  }
  const variance = rss / Math.max(1, observations - unknowns + tied);
  const slowness = fixed ? 1 / refractorVelocity.velocity : solution[slownessIndex];
  const slownessSe = fixed ? refractorVelocity.se / refractorVelocity.velocity ** 2 : Math.sqrt(Math.max(0, inverseDiagonal[slownessIndex] * variance));
  const counts = new Map<number, number>();
  const directions = new Map<number, Set<string>>();
  for (const c of curves) {
    for (const x of c.xs) {
      counts.set(x, (counts.get(x) ?? 0) + 1);
      if (!directions.has(x)) directions.set(x, new Set());
      directions.get(x)!.add(c.side);
    }
  }
  // With the velocity free, a receiver recorded from one direction only leaves its delay free to
  // trade a trend with the velocity (the method needs reversed coverage; Barry 1967): such
  // receivers get no depth unless the velocity is given.
  const reversedReceivers = receivers.filter((x) => fixed || directions.get(x)!.size === 2);
  return {
    method: 'delay-time',
    refractor,
    stations: reversedReceivers.flatMap((x) => {
      const i = receiverIndex.get(x)!;
      const v = inverseDiagonal[i] * variance;
      if (!errors) return [{ x, delay: solution[i], delaySe: NaN }];
      return v >= 0 && Number.isFinite(v) ? [{ x, delay: solution[i], delaySe: Math.sqrt(v) }] : [];
    }),
    velocity: { velocity: 1 / slowness, se: slownessSe / (slowness * slowness) },
    info: {
      sources: sources.length,
      observations,
      residual_rms_ms: Number((Math.sqrt(rss / observations) * 1e3).toFixed(3)),
      gauge: tied > 0 ? `${tied} source${tied > 1 ? 's' : ''} tied to the receiver delay at their position` : 'equal mean source and receiver delays (no source inside the spread)',
      single_observation_receivers: [...counts.values()].filter((n) => n === 1).length,
      one_direction_receivers: receivers.length - reversedReceivers.length,
    },
  };
}
