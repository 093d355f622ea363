import { seededNormal } from '../reference/layeredTravelTimes.js';

/**
 * Synthetic shot-record traces with known onsets, for picking tests: a causal wavelet (a damped
 * sine starting at zero at the onset, 60 Hz, decay time one period) scaled to a given peak
 * signal-to-noise ratio over seeded Gaussian noise of unit standard deviation.
 */
export function causalTrace(samples: number, dt: number, delay: number, onset: number, snr: number, seed: number, options: { polarity?: 1 | -1; frequency?: number; laterArrival?: { time: number; amplitude: number } } = {}): Float32Array {
  const normal = seededNormal(seed);
  const f = options.frequency ?? 60;
  const wavelet = (tau: number) => (tau < 0 ? 0 : Math.sin(2 * Math.PI * f * tau) * Math.exp(-tau * f));
  // Peak of the wavelet, for scaling to the requested signal-to-noise ratio.
  let peak = 0;
  for (let k = 0; k < 2000; k++) peak = Math.max(peak, Math.abs(wavelet(k / (f * 2000))));
  const out = new Float32Array(samples);
  for (let k = 0; k < samples; k++) {
    const t = delay + k * dt;
    let v = ((options.polarity ?? 1) * snr * wavelet(t - onset)) / peak;
    if (options.laterArrival) v += (options.laterArrival.amplitude * snr * wavelet(t - options.laterArrival.time)) / peak;
    out[k] = v + normal();
  }
  return out;
}
