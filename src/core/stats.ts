/** Median of a list of numbers; undefined for an empty list. */
export function median(values: number[]): number | undefined {
  if (values.length === 0) return undefined;
  const sorted = [...values].sort((a, b) => a - b);
  const half = sorted.length >> 1;
  return sorted.length % 2 ? sorted[half] : (sorted[half - 1] + sorted[half]) / 2;
}

/** Theil-Sen slope (Sen 1968): the median of the pairwise slopes (pairs at one x left out); undefined with none. */
export function theilSenSlope(x: number[], y: number[]): number | undefined {
  const slopes: number[] = [];
  for (let a = 0; a < x.length; a++) for (let b = a + 1; b < x.length; b++) if (x[b] !== x[a]) slopes.push((y[b] - y[a]) / (x[b] - x[a]));
  return median(slopes);
}

/**
 * Inverse-variance weighted mean of estimates with standard errors, with a standard error that
 * is never smaller than the scatter of the estimates allows (so disagreeing branches are not
 * reported as more precise than they are).
 *
 * @returns { mean, se }, or undefined for an empty list
 */
export function weightedMean(values: number[], ses: number[]): { mean: number; se: number } | undefined {
  if (values.length === 0) return undefined;
  const weights = ses.map((s) => (s > 0 && Number.isFinite(s) ? 1 / (s * s) : 0));
  const totalWeight = weights.reduce((a, b) => a + b, 0);
  if (totalWeight === 0) {
    const mean = values.reduce((a, b) => a + b, 0) / values.length;
    return { mean, se: scatterSe(values, mean) };
  }
  const mean = values.reduce((a, v, i) => a + v * weights[i], 0) / totalWeight;
  const formal = Math.sqrt(1 / totalWeight);
  return { mean, se: Math.max(formal, scatterSe(values, mean)) };
}

function scatterSe(values: number[], mean: number): number {
  if (values.length < 2) return 0;
  const variance = values.reduce((a, v) => a + (v - mean) ** 2, 0) / (values.length - 1);
  return Math.sqrt(variance / values.length);
}
