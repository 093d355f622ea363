import type { DelayProfile } from './delayProfile.js';
import type { HeadCurve } from './headWaves.js';

/** Weight of the rows tying a source's delay to the receiver delays at its position. */
const TIE_WEIGHT = 30;

/**
 * Delay-time method for all sources together (Gardner 1939, Geophysics 4, 247-259; Barry 1967,
 * Geophys. Prospect. 15, 49-59): every head-wave first break from the refractor, from every source
 * including those off the ends, is t = aₛ + bᵣ + |xᵣ − xₛ| / V, with a delay time aₛ per source,
 * bᵣ per receiver and one refractor velocity V, solved by least squares. The constant
 * that could pass between source and receiver delays is fixed by tying each source inside the
 * spread to the receiver delay at its position (interpolated); with no source inside, by equal
 * mean source and receiver delays; solved by Cholesky factorisation. Standard errors come from
 * the covariance σ²(AᵀA)⁻¹. Only
 * receivers recorded from both directions get a delay: from one direction its delay and the
 * velocity trade off.
 *
 * @param refractorVelocity - when given (m/s, with its standard error), the velocity is held at it
 * @param errors - compute standard errors (the diagonal of the inverse normal matrix); default true
 * @returns receiver delays and the refractor velocity, or undefined with fewer observations than unknowns
 */
export function delayTime(curves: HeadCurve[], refractor: number, refractorVelocity?: { velocity: number; se: number }, errors = true): DelayProfile | undefined {
  const sources = [...new Set(curves.map((c) => c.sourceId))];
  const receivers = [...new Set(curves.flatMap((c) => c.xs))].sort((a, b) => a - b);
  const sourceIndex = new Map(sources.map((s, i) => [s, i]));
  const receiverIndex = new Map(receivers.map((x, i) => [x, sources.length + i]));
  // With the refractor velocity given, the slowness is not an unknown: each receiver's delay then
  // follows from its own picks even where it is recorded from one direction only.
  const fixed = refractorVelocity !== undefined;
  const unknowns = sources.length + receivers.length + (fixed ? 0 : 1);
  const slownessIndex = fixed ? -1 : unknowns - 1;
  const rows: { entries: [number, number][]; value: number; weight: number }[] = [];
  for (const c of curves) {
    c.xs.forEach((x, i) => {
      const distance = Math.abs(x - c.sourceX);
      rows.push(fixed
        ? { entries: [[sourceIndex.get(c.sourceId)!, 1], [receiverIndex.get(x)!, 1]], value: c.times[i] - distance / refractorVelocity.velocity, weight: 1 }
        : { entries: [[sourceIndex.get(c.sourceId)!, 1], [receiverIndex.get(x)!, 1], [slownessIndex, distance]], value: c.times[i], weight: 1 });
    });
  }
  const observations = rows.length;
  if (observations < unknowns + 2) return undefined;
  const sourceXs = new Map(curves.map((c) => [c.sourceId, c.sourceX]));
  let tied = 0;
  for (const [id, sx] of sourceXs) {
    if (sx < receivers[0] || sx > receivers[receivers.length - 1]) continue;
    let k = 0;
    while (k < receivers.length - 1 && receivers[k + 1] < sx) k++;
    const a = receivers[k];
    const b = receivers[Math.min(receivers.length - 1, k + 1)];
    const t = b === a ? 0 : (sx - a) / (b - a);
    const entries: [number, number][] = [[sourceIndex.get(id)!, 1], [receiverIndex.get(a)!, -(1 - t)]];
    if (t > 0) entries.push([receiverIndex.get(b)!, -t]);
    rows.push({ entries, value: 0, weight: TIE_WEIGHT });
    tied++;
  }
  if (tied === 0) {
    const entries: [number, number][] = [
      ...sources.map((_, i) => [i, 1 / sources.length] as [number, number]),
      ...receivers.map((_, i) => [sources.length + i, -1 / receivers.length] as [number, number]),
    ];
    rows.push({ entries, value: 0, weight: TIE_WEIGHT });
  }
  // Normal equations in plain arrays (each pick touches three unknowns).
  const plain = new Float64Array(unknowns * unknowns);
  const rhsPlain = new Float64Array(unknowns);
  for (const row of rows) {
    const w = row.weight * row.weight;
    for (const [i, a] of row.entries) {
      rhsPlain[i] += w * a * row.value;
      for (const [j, b] of row.entries) plain[i * unknowns + j] += w * a * b;
    }
  }
  // Sums taken in different orders leave the two triangles a rounding apart; make them equal.
  for (let i = 0; i < unknowns; i++) {
    for (let j = 0; j < i; j++) {
      const mean = (plain[i * unknowns + j] + plain[j * unknowns + i]) / 2;
      plain[i * unknowns + j] = mean;
      plain[j * unknowns + i] = mean;
    }
  }
  let lower = choleskyFactor(plain, unknowns);
  if (lower === undefined) {
    // A part of the line tied to no source: a faint pull of every delay towards zero fixes its constant.
    let trace = 0;
    for (let i = 0; i < unknowns; i++) trace += plain[i * unknowns + i];
    for (let i = 0; i < unknowns; i++) plain[i * unknowns + i] += (1e-9 * trace) / unknowns;
    lower = choleskyFactor(plain, unknowns);
    if (lower === undefined) return undefined;
  }
  const solution = choleskySolve(lower, unknowns, rhsPlain);
  let rss = 0;
  for (let r = 0; r < observations; r++) {
    const row = rows[r];
    const fitted = row.entries.reduce((a, [i, v]) => a + v * solution[i], 0);
    rss += (row.value - fitted) ** 2;
  }
  const variance = rss / Math.max(1, observations - unknowns + tied);
  const inverseDiagonal = errors ? choleskyInverseDiagonal(lower, unknowns) : new Array(unknowns).fill(NaN);
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

/**
 * Cholesky factor L of a symmetric positive-definite matrix A = L Lᵀ (row-major, n × n), by the
 * Cholesky-Banachiewicz recurrence; undefined when A is not positive definite. Written out on
 * typed arrays: the normal matrix of a line has a hundred or more unknowns and is factored for
 * every refractor of every interpretation.
 */
function choleskyFactor(a: Float64Array, n: number): Float64Array | undefined {
  const l = new Float64Array(n * n);
  for (let i = 0; i < n; i++) {
    for (let j = 0; j <= i; j++) {
      let sum = a[i * n + j];
      for (let k = 0; k < j; k++) sum -= l[i * n + k] * l[j * n + k];
      if (i === j) {
        if (!(sum > 0)) return undefined;
        l[i * n + i] = Math.sqrt(sum);
      } else {
        l[i * n + j] = sum / l[j * n + j];
      }
    }
  }
  return l;
}

/** Solves L Lᵀ x = b by forward and back substitution. */
function choleskySolve(l: Float64Array, n: number, b: Float64Array): number[] {
  const y = new Float64Array(n);
  for (let i = 0; i < n; i++) {
    let sum = b[i];
    for (let k = 0; k < i; k++) sum -= l[i * n + k] * y[k];
    y[i] = sum / l[i * n + i];
  }
  const x = new Array(n).fill(0);
  for (let i = n - 1; i >= 0; i--) {
    let sum = y[i];
    for (let k = i + 1; k < n; k++) sum -= l[k * n + i] * x[k];
    x[i] = sum / l[i * n + i];
  }
  return x;
}

/**
 * Diagonal of (L Lᵀ)⁻¹ from the Cholesky factor L: (A⁻¹)ᵢᵢ = Σₖ ((L⁻¹)ₖᵢ)², with L⁻¹ by forward
 * substitution, column by column.
 */
function choleskyInverseDiagonal(l: Float64Array, n: number): number[] {
  const diagonal = new Array(n).fill(0);
  const column = new Float64Array(n);
  for (let j = 0; j < n; j++) {
    column.fill(0);
    column[j] = 1 / l[j * n + j];
    diagonal[j] += column[j] * column[j];
    for (let k = j + 1; k < n; k++) {
      let sum = 0;
      for (let m = j; m < k; m++) sum -= l[k * n + m] * column[m];
      column[k] = sum / l[k * n + k];
      diagonal[j] += column[k] * column[k];
    }
  }
  return diagonal;
}
