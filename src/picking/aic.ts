let sumBuffer = new Float64Array(0);
let squareBuffer = new Float64Array(0);

/**
 * AIC picker (Maeda 1985, Zisin 38, 365-379; Sleeman & van Eck 1999, PEPI 113, 265-275): within
 * samples [start, end) of a trace, the split k minimising
 * AIC(k) = k·ln var(x[start..k]) + (end − k − 1)·ln var(x[k+1..end]) separates noise from signal;
 * the onset is the first sample after the split. Variances from running sums.
 *
 * @returns the onset sample index and the AIC drop (how much lower the minimum is than the
 *   window's ends, per sample: a measure of how sharp the onset is), or undefined for a window
 *   shorter than 8 samples
 */
export function aicOnset(data: Float32Array, start: number, end: number): { onset: number; sharpness: number } | undefined {
  const n = end - start;
  if (n < 8) return undefined;
  // Running-sum buffers reused from call to call (every trace of every record comes through here).
  if (sumBuffer.length < n + 1) {
    sumBuffer = new Float64Array(2 * (n + 1));
    squareBuffer = new Float64Array(2 * (n + 1));
  }
  const s1 = sumBuffer;
  const s2 = squareBuffer;
  s1[0] = 0;
  s2[0] = 0;
  for (let i = 0; i < n; i++) {
    const v = data[start + i];
    s1[i + 1] = s1[i] + v;
    s2[i + 1] = s2[i] + v * v;
  }
  const variance = (a: number, b: number) => {
    const count = b - a;
    const mean = (s1[b] - s1[a]) / count;
    return Math.max((s2[b] - s2[a]) / count - mean * mean, 1e-30);
  };
  let best = Infinity;
  let at = -1;
  let edge = -Infinity;
  for (let k = 2; k <= n - 3; k++) {
    const value = k * Math.log(variance(0, k)) + (n - k) * Math.log(variance(k, n));
    if (k === 2 || k === n - 3) edge = Math.max(edge, value);
    if (value < best) { best = value; at = k; }
  }
  if (at < 0) return undefined;
  return { onset: start + at, sharpness: (edge - best) / n };
}
