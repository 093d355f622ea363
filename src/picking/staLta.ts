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

/**
 * The same trigger computed on the samples with running window sums: no pass over the trace
 * beyond the trigger, no allocation (the fast path for picking whole records). Near the start of a
 * record, where fewer than `long` samples measure the noise, the threshold is raised by
 * √(long / samples), at most threefold.
 */
export function staLtaTriggerOn(data: Float32Array, short: number, long: number, threshold: number, minimumNoise: number, from = 0): number | undefined {
  const n = data.length;
  const start = Math.max(from, minimumNoise);
  if (start + short > n) return undefined;
  let noiseSum = 0;
  const lo0 = Math.max(0, start - long);
  for (let j = lo0; j < start; j++) noiseSum += data[j] * data[j];
  let signalSum = 0;
  for (let j = start; j < start + short; j++) signalSum += data[j] * data[j];
  for (let k = start; k + short <= n; k++) {
    const lo = Math.max(0, k - long);
    const noise = noiseSum / (k - lo);
    const signal = signalSum / short;
    // A noise level measured on fewer samples than the LTA is less sure, so more is asked of the
    // signal: the threshold grows as √(LTA / samples measured), up to three times.
    const demand = threshold * Math.min(3, Math.sqrt(long / (k - lo)));
    if (signal > demand * noise && signal > 0) return k;
    // Slide: sample k joins the noise window (and the oldest leaves it once the window is full);
    // sample k + short joins the signal window and sample k leaves it.
    const v = data[k];
    noiseSum += v * v;
    if (k - long >= 0) noiseSum -= data[k - long] * data[k - long];
    signalSum -= v * v;
    if (k + short < n) signalSum += data[k + short] * data[k + short];
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
