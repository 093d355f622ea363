import { writeSeg2 } from '../io/seg2/writeSeg2.js';
import { firstArrivals, seededNormal, type LayeredSection } from '../reference/layeredTravelTimes.js';

/** One arrival on a synthetic trace: a causal damped sine from its onset. */
export interface Arrival {
  /** Onset, in seconds after the shot. */
  time: number;
  /** Peak amplitude, in units of the noise standard deviation (signed: the sign is the polarity). */
  amplitude: number;
  /** Frequency, in Hz. */
  frequency: number;
  /** Decay time, in periods (1 for a short pulse, more for a ringing surface wave). */
  periods?: number;
}

/** Samples of a trace with the given arrivals over seeded unit Gaussian noise (noise 0: none). */
export function arrivalsTrace(samples: number, dt: number, delay: number, arrivals: Arrival[], seed: number, noise = 1): Float32Array {
  const normal = seededNormal(seed);
  const out = new Float32Array(samples);
  const shapes = arrivals.map((a) => {
    const decay = (a.periods ?? 1) / a.frequency;
    const wavelet = (tau: number) => (tau < 0 ? 0 : Math.sin(2 * Math.PI * a.frequency * tau) * Math.exp(-tau / decay));
    let peak = 0;
    for (let k = 0; k < 4000; k++) peak = Math.max(peak, Math.abs(wavelet((k / 4000) * 2 * decay)));
    return { a, wavelet, peak };
  });
  for (let k = 0; k < samples; k++) {
    const t = delay + k * dt;
    let v = 0;
    for (const { a, wavelet, peak } of shapes) v += (a.amplitude * wavelet(t - a.time)) / peak;
    out[k] = v + noise * normal();
  }
  return out;
}

/** A line over the same layers seen by P and by S: interfaces shared, two velocity sets. */
export interface ShearLine {
  surface: (x: number) => number;
  interfaces: ((x: number) => number)[];
  /** P-wave and S-wave velocity of each layer, top down, in m/s. */
  vp: number[];
  vs: number[];
}

export interface ShearShotOptions {
  /** P peak amplitude as a fraction of the S peak amplitude at the same trace (0.15 to 0.4 on SH records). */
  pRatio: number;
  /** S peak signal-to-noise ratio at the nearest trace; it falls with offset. */
  snr: number;
  /** Polarity of the S and surface waves (a beam struck from the other side reverses them; P stays). */
  polarity?: 1 | -1;
  /** Surface wave: velocity as a fraction of the top-layer Vs, amplitude as a multiple of the S; default 0.85 and 2. */
  surfaceVelocity?: number;
  surfaceAmplitude?: number;
  /** Dominant frequencies of P, S and the surface wave, in Hz; default 90, 50 and 22. */
  frequencies?: [number, number, number];
  sampleInterval?: number;
  delay?: number;
  samples?: number;
  /** Sampling of the interfaces in the forward model, in metres; default 0.1. */
  step?: number;
  seed: number;
}

/**
 * A synthetic SH shot record: for every receiver the P arrival (weaker, first), the S arrival and a
 * slower ringing surface wave behind it, over noise. Onsets from the independent forward model of
 * test/reference (least time by Fermat's principle) run separately on the P and the S velocities;
 * amplitudes fall with offset as exp(-offset / 40 m) plus a floor of a fifth.
 */
export function shearShot(line: ShearLine, sourceX: number, receivers: number[], options: ShearShotOptions) {
  const dt = options.sampleInterval ?? 0.00025;
  const delay = options.delay ?? -0.01;
  const samples = options.samples ?? 2400;
  const span: [number, number] = [Math.min(sourceX, ...receivers) - 5, Math.max(sourceX, ...receivers) + 5];
  const pTimes = firstArrivals({ surface: line.surface, interfaces: line.interfaces, velocities: line.vp }, sourceX, receivers, span, options.step);
  const sTimes = firstArrivals({ surface: line.surface, interfaces: line.interfaces, velocities: line.vs }, sourceX, receivers, span, options.step);
  const [fp, fs, fr] = options.frequencies ?? [90, 50, 22];
  const polarity = options.polarity ?? 1;
  const traces = receivers.map((rx, r) => {
    const offset = Math.abs(rx - sourceX);
    const s = options.snr * (0.8 * Math.exp(-offset / 40) + 0.2);
    const surfaceTime = offset / ((options.surfaceVelocity ?? 0.85) * line.vs[0]);
    const arrivals: Arrival[] = [
      { time: pTimes[r], amplitude: options.pRatio * s, frequency: fp },
      { time: sTimes[r], amplitude: polarity * s, frequency: fs },
      { time: surfaceTime, amplitude: polarity * (options.surfaceAmplitude ?? 2) * s, frequency: fr, periods: 3 },
    ];
    return { data: arrivalsTrace(samples, dt, delay, arrivals, options.seed * 1000 + r), sampleInterval: dt, delay, offset: rx - sourceX, receiverX: rx };
  });
  return { traces, pTimes, sTimes };
}

export type { LayeredSection };

/** The bytes of an SH shot record as SEG-2 (32-bit float samples, positions in the headers), with its true onsets. */
export function shearShotSeg2(line: ShearLine, sourceX: number, receivers: number[], options: ShearShotOptions, fileKeywords: [string, string][] = [['UNITS', 'METERS']]) {
  const shot = shearShot(line, sourceX, receivers, options);
  const dt = shot.traces[0].sampleInterval;
  const delay = shot.traces[0].delay;
  const traces = shot.traces.map((t, r) => ({
    code: 4 as const,
    samples: Array.from(t.data),
    keywords: [
      ['CHANNEL_NUMBER', String(r + 1)], ['SAMPLE_INTERVAL', String(dt)], ['DELAY', String(delay)],
      ['SOURCE_LOCATION', `${sourceX} 0 ${line.surface(sourceX).toFixed(3)}`], ['RECEIVER_LOCATION', `${t.receiverX} 0 ${line.surface(t.receiverX).toFixed(3)}`],
    ] as [string, string][],
  }));
  return { bytes: writeSeg2(traces, { fileKeywords }), pTimes: shot.pTimes, sTimes: shot.sTimes };
}
