/**
 * Band-pass filter for shot records: a 4th-order Butterworth high-pass and a 4th-order
 * Butterworth low-pass, each two biquad sections designed by the bilinear transform with
 * pre-warped corners (Q = 0.5412 and 1.3066, the poles of a 4th-order Butterworth filter;
 * biquad coefficients as in R. Bristow-Johnson's "Audio EQ cookbook"), applied forward and then
 * backward so that the phase is zero and the onset is not delayed (the magnitude response is then
 * that of an 8th-order filter). A zero-phase filter spreads a little energy before a sharp onset;
 * picks on filtered traces can be early by about a quarter of the high corner's period.
 *
 * @param data - samples (not modified)
 * @param sampleInterval - in seconds
 * @param low - low corner, in Hz (0 for none)
 * @param high - high corner, in Hz (0 for none); must be below the Nyquist frequency
 * @throws RangeError for corners that are negative, not increasing, or at or above Nyquist
 */
export function bandPass(data: Float32Array, sampleInterval: number, low: number, high: number): Float32Array {
  const nyquist = 0.5 / sampleInterval;
  if (low < 0 || high < 0 || (high > 0 && high >= nyquist) || (low > 0 && high > 0 && low >= high)) {
    throw new RangeError(`band-pass corners ${low} and ${high} Hz must satisfy 0 ≤ low < high < ${nyquist} Hz (the Nyquist frequency)`);
  }
  const sections: number[][] = [];
  for (const q of [0.5412, 1.3066]) {
    if (low > 0) sections.push(biquad('high', low, q, sampleInterval));
    if (high > 0) sections.push(biquad('low', high, q, sampleInterval));
  }
  let out: Float64Array = Float64Array.from(data);
  for (const s of sections) out = run(out, s, false);
  for (const s of sections) out = run(out, s, true);
  return Float32Array.from(out);
}

function biquad(kind: 'low' | 'high', corner: number, q: number, dt: number): number[] {
  const w0 = 2 * Math.PI * corner * dt;
  const alpha = Math.sin(w0) / (2 * q);
  const cos = Math.cos(w0);
  const a0 = 1 + alpha;
  const b = kind === 'low' ? [(1 - cos) / 2, 1 - cos, (1 - cos) / 2] : [(1 + cos) / 2, -(1 + cos), (1 + cos) / 2];
  return [b[0] / a0, b[1] / a0, b[2] / a0, (-2 * cos) / a0, (1 - alpha) / a0];
}

function run(x: Float64Array, [b0, b1, b2, a1, a2]: number[], backward: boolean): Float64Array {
  const y = new Float64Array(x.length);
  let x1 = 0, x2 = 0, y1 = 0, y2 = 0;
  for (let n = 0; n < x.length; n++) {
    const i = backward ? x.length - 1 - n : n;
    const v = b0 * x[i] + b1 * x1 + b2 * x2 - a1 * y1 - a2 * y2;
    x2 = x1; x1 = x[i]; y2 = y1; y1 = v;
    y[i] = v;
  }
  return y;
}
