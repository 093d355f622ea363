/**
 * The seeded lines of bench/shearSweep.ts (SH shot records by test/picking/shearRecord.ts): the
 * classic set and the wide set described there.
 */
import { firstArrivals, seededNormal } from '../test/reference/layeredTravelTimes.js';
import type { ShearLine, ShearShotOptions } from '../test/picking/shearRecord.js';
import { seededUniform } from '../test/reference/realisticLines.js';

/**
 * A three-layer profile drawn from `uniform` (Vs 130-1300 m/s increasing downwards, Vp/Vs 1.6-2.6,
 * Vp increasing by at least 15 % per layer), flat ground at 50 m. Both sets draw it first, in this order.
 */
function drawProfile(uniform: (low: number, high: number) => number): { line: ShearLine; h1: number; h2: number; vs: number[] } {
  const vs1 = uniform(130, 260);
  const vs2 = Math.min(650, vs1 * uniform(1.5, 2.3));
  const vs3 = Math.min(1300, vs2 * uniform(1.7, 3));
  const h1 = uniform(2, 6);
  const h2 = h1 + uniform(5, 12);
  const vs = [vs1, vs2, vs3];
  const ratios = [uniform(1.8, 2.6), uniform(1.7, 2.4), uniform(1.6, 2.1)];
  const vp = vs.map((v, k) => v * ratios[k]);
  for (let k = 1; k < 3; k++) vp[k] = Math.max(vp[k], 1.15 * vp[k - 1]);
  const line: ShearLine = { surface: () => 50, interfaces: [() => 50 - h1, () => 50 - h2], vp, vs };
  return { line, h1, h2, vs };
}

export interface LineSetup {
  line: ShearLine;
  h: [number, number];
  receivers: number[];
  sources: number[];
  shot: (s: number) => ShearShotOptions;
  summary: string;
}

export function classicSetup(seed: number): LineSetup {
  const normal = seededNormal(9000 + seed);
  const random = () => Math.min(0.999999, Math.max(0, 0.5 + normal() / 6));
  const uniform = (low: number, high: number) => low + (high - low) * random();
  const { line, h1, h2 } = drawProfile(uniform);
  const pRatio = uniform(0.15, 0.4);
  const k = seed - 1;
  const snr = [12, 20, 35][k % 3];
  const dt = k % 2 === 0 ? 0.00025 : 0.0005;
  const spacing = [1.5, 1.5, 2][k % 3];
  const receivers = Array.from({ length: 48 }, (_, i) => i * spacing);
  const end = 47 * spacing;
  const sources = [-4 * spacing, 0, end / 3 - spacing / 2, (2 * end) / 3 + spacing / 2, end, end + 4 * spacing];
  // Drawn shot by shot in this order (the order the sweep first drew them in).
  const shots: ShearShotOptions[] = sources.map((_, s) => ({
    pRatio, snr, seed: seed * 100 + s, sampleInterval: dt, samples: Math.round(0.5 / dt), step: 0.25,
    surfaceAmplitude: uniform(1.5, 3), surfaceVelocity: uniform(0.8, 0.92),
    frequencies: [uniform(70, 110), uniform(35, 60), uniform(15, 25)],
  }));
  return {
    line, h: [h1, h2], receivers, sources,
    shot: (s) => shots[s],
    summary: `P/S ${pRatio.toFixed(2)} snr ${snr} dt ${dt * 1e3} ms 48 ch at ${spacing} m`,
  };
}

export function wideSetup(seed: number): LineSetup {
  const random = seededUniform(77_000 + seed);
  const uniform = (low: number, high: number) => low + (high - low) * random();
  const pick = <T>(list: T[]) => list[Math.floor(random() * list.length)];
  const { line, h1, h2, vs } = drawProfile(uniform);
  const dt = pick([0.000125, 0.00025, 0.0005, 0.001]);
  const snr = Math.exp(uniform(Math.log(5), Math.log(50)));
  const pRatio = uniform(0.1, 0.5);
  const surfaceAmplitude = uniform(1, 4);
  const surfaceVelocity = uniform(0.85, 0.95);
  const spacing = pick([1, 1.5, 2, 2.5, 3]);
  const channels = pick([24, 48, 72, 96]);
  const receivers = Array.from({ length: channels }, (_, i) => i * spacing);
  const end = (channels - 1) * spacing;
  const inside = pick([1, 2, 3]);
  const sources = [
    -Math.round(uniform(1, 10)) * spacing, 0,
    ...Array.from({ length: inside }, (_, k) => Math.round(((k + 1) * (channels - 1)) / (inside + 1)) * spacing - spacing / 2),
    end, end + Math.round(uniform(1, 10)) * spacing,
  ];
  const frequencies: [number, number, number] = [uniform(70, 110), uniform(35, 60), uniform(15, 25)];
  // Record length: 1.3 times the latest S onset and 50 ms, at least 0.5 s (of the line's own onsets).
  const span: [number, number] = [Math.min(...sources, 0) - 5, Math.max(...sources, end) + 5];
  let latest = 0;
  for (const sx of sources) for (const t of firstArrivals({ surface: line.surface, interfaces: line.interfaces, velocities: vs }, sx, [receivers[0], receivers[channels - 1]], span, 0.25)) latest = Math.max(latest, t);
  const samples = Math.round(Math.max(0.5, 1.3 * latest + 0.05) / dt);
  const polarities = sources.map(() => (random() < 0.5 ? -1 : 1) as 1 | -1);
  return {
    line, h: [h1, h2], receivers, sources,
    shot: (s) => ({ pRatio, snr, seed: seed * 100 + s, sampleInterval: dt, samples, step: 0.25, surfaceAmplitude, surfaceVelocity, frequencies, polarity: polarities[s] }),
    summary: `P/S ${pRatio.toFixed(2)} snr ${snr.toFixed(0)} dt ${dt * 1e3} ms ${channels} ch at ${spacing} m, sw ${surfaceAmplitude.toFixed(1)}x at ${surfaceVelocity.toFixed(2)} Vs1`,
  };
}

