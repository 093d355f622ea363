/**
 * STA/LTA trigger (Allen 1978, BSSA 68, 1521-1532) on the squared amplitude: the first sample
 * where the mean energy of the next `short` samples exceeds `threshold` times the mean energy of
 * the (up to) `long` samples before it, with at least `minimumNoise` samples behind it. Energy is
 * sign-blind, so reversed-polarity traces trigger alike. Scans forward and stops at the trigger.
 *
 * @param energy - prefix sums of squared samples: energy[k] = Σ_{j<k} x_j² (length n + 1)
 * @returns the sample index of the trigger, or undefined when the ratio never reaches the threshold
 */
export function staLtaTrigger(energy: Float64Array, short: number, long: number, threshold: number, minimumNoise: number, from = 0): number | undefined {
  const n = energy.length - 1;
  for (let k = Math.max(from, minimumNoise); k + short <= n; k++) {
    const lo = Math.max(0, k - long);
    const noise = (energy[k] - energy[lo]) / (k - lo);
    const signal = (energy[k + short] - energy[k]) / short;
    if (signal > threshold * noise && signal > 0) return k;
  }
  return undefined;
}

/** Prefix sums of squared samples, over the first `count` samples. */
export function energyPrefix(data: Float32Array, count = data.length): Float64Array {
  const out = new Float64Array(count + 1);
  let sum = 0;
  for (let k = 0; k < count; k++) {
    const v = data[k];
    sum += v * v;
    out[k + 1] = sum;
  }
  return out;
}
