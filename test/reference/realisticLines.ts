import { firstArrivals, seededNormal, type LayeredSection } from './layeredTravelTimes.js';

/**
 * Random realistic refraction lines for tests and sweeps, over the independent forward model of
 * layeredTravelTimes.ts: two or three layers (dry soil, saturated soil, weathered and sound rock),
 * refractors flat, dipping, undulating, stepped or channelled, ground flat, sloping or rolling,
 * 24 to 96 geophones at 1 to 5 m, sources at the ends, in the middle and off the ends. The
 * velocity ranges are facts of the trade (common practice): dry soil 250-700 m/s, saturated soil
 * near the speed of sound in water (1480-1550 m/s), weathered rock 1000-2200 m/s, sound rock
 * 2500-5000 m/s. Lines that no first-break method can interpret are drawn again: a middle or
 * deepest layer that arrives first at fewer than four geophones from two sources (a hidden layer,
 * or rock too deep for the spread), or a direct wave first at fewer than three geophones from the
 * end sources (no top-layer velocity).
 */
export interface RealisticLine {
  name: string;
  section: LayeredSection;
  sources: number[];
  receivers: number[];
  /** True depth of each refractor below the ground at x, in metres. */
  depth: ((x: number) => number)[];
  noiseMs: number;
  /** Sample step of the forward model, in metres. */
  step?: number;
  kind: { layers: 'two' | 'water-table' | 'weathered'; shape: Shape; ground: Ground; offEnd: boolean };
}

export type Shape = 'flat' | 'dipping' | 'undulating' | 'stepped' | 'channel';
export type Ground = 'flat' | 'sloping' | 'rolling';

export interface LineChoices {
  layers?: RealisticLine['kind']['layers'];
  shape?: Shape;
  ground?: Ground;
  offEnd?: boolean;
  noiseMs?: number;
  geophones?: number;
  spacing?: number;
  /** Sources inside the spread: 3 (ends and middle) or 5 (and the quarter points). */
  inside?: 3 | 5;
  /** Depth of the deepest refractor, in metres. */
  deepest?: number;
  /** Sample step of the forward model, in metres (default: 0.1 m, coarser on long spans). */
  step?: number;
}

/** Uniform random numbers in [0, 1), seeded (mulberry32). */
export function seededUniform(seed: number): () => number {
  let a = seed >>> 0;
  return () => {
    a = (a + 0x6d2b79f5) >>> 0;
    let t = a;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
}

/** A smoothed step of height h at x0 over a width w (a scarp in the rock head). */
const smoothStep = (x: number, x0: number, w: number) => 0.5 * (1 + Math.tanh((x - x0) / (w / 2)));

/** Draws one realistic line; `choices` fix any of the random choices. */
export function realisticLine(seed: number, choices: LineChoices = {}): RealisticLine {
  for (let attempt = 0; ; attempt++) {
    const line = drawLine(seed * 1009 + attempt, choices);
    if (attempt >= 20 || interpretable(line)) return line;
  }
}

function drawLine(seed: number, choices: LineChoices): RealisticLine {
  const u = seededUniform(seed);
  const pick = <T>(options: readonly T[]) => options[Math.floor(u() * options.length)];
  const between = (a: number, b: number) => a + (b - a) * u();
  const layers = choices.layers ?? pick(['two', 'water-table', 'weathered'] as const);
  const shape = choices.shape ?? pick(['flat', 'dipping', 'undulating', 'stepped', 'channel'] as const);
  const ground = choices.ground ?? pick(['flat', 'sloping', 'rolling'] as const);
  const offEnd = choices.offEnd ?? u() < 0.6;
  const geophones = choices.geophones ?? pick([24, 48, 48, 72, 96]);
  const spacing = choices.spacing ?? pick([1, 2, 2, 2.5, 3, 4, 5].filter((s) => s * (geophones - 1) >= 45 && s * (geophones - 1) <= 300));
  const noiseMs = choices.noiseMs ?? between(0.2, 0.5);
  const length = spacing * (geophones - 1);
  const receivers = Array.from({ length: geophones }, (_, i) => i * spacing);
  const sources = [0, Math.round(geophones / 2 - 0.5) * spacing, length];
  if ((choices.inside ?? (geophones >= 72 ? 5 : 3)) === 5) sources.push(Math.round(geophones / 4) * spacing, Math.round((3 * geophones) / 4) * spacing);
  if (offEnd) {
    const far = between(0.5, 1) * length;
    sources.push(-Math.round(far), length + Math.round(between(0.5, 1) * length));
  }
  sources.sort((a, b) => a - b);

  const slope = ground === 'sloping' ? (u() < 0.5 ? -1 : 1) * between(0.03, 0.1) : 0;
  const rollAmplitude = ground === 'rolling' ? between(0.5, 2) : 0;
  const rollWave = between(40, 120);
  const rollPhase = between(0, 2 * Math.PI);
  const surface = (x: number) => 100 + slope * x + rollAmplitude * Math.sin((2 * Math.PI * x) / rollWave + rollPhase);

  // Depth scale grows with the spread a little: a line is laid to see what lies down to about a
  // third of its length (common practice).
  const deepest = choices.deepest ?? Math.min(25, between(0.08, 0.2) * length + 3);
  let velocities: number[];
  let depths: number[];
  if (layers === 'two') {
    velocities = [between(250, 700), u() < 0.4 ? between(1700, 2400) : between(2500, 5000)];
    depths = [Math.max(2, deepest)];
  } else if (layers === 'water-table') {
    velocities = [between(250, 700), between(1480, 1550), between(2500, 5000)];
    const water = between(1.5, 5);
    depths = [water, Math.max(water + 4, deepest)];
  } else {
    const v1 = between(250, 700);
    velocities = [v1, between(Math.max(1000, 2.2 * v1), 2200), between(3000, 5000)];
    const top = between(2, 6);
    depths = [top, Math.max(top + 4, deepest)];
  }
  // The shape is given to the deepest refractor; the shallower ones follow the ground.
  const base = depths[depths.length - 1];
  const above = depths.length > 1 ? depths[depths.length - 2] : 0;
  const dipTan = shape === 'dipping' ? (u() < 0.5 ? -1 : 1) * Math.tan((between(3, 8) * Math.PI) / 180) : 0;
  const amplitude = shape === 'undulating' ? between(0.15, 0.25) * base : 0;
  const wave = between(30, 100);
  const phase = between(0, 2 * Math.PI);
  const stepAt = between(0.3, 0.7) * length;
  const stepSign = u() < 0.5 ? -1 : 1;
  const channelAt = between(0.3, 0.7) * length;
  const channelWidth = between(10, 20);
  const room = base - above - 2;
  const relief = (x: number) => {
    const middle = length / 2;
    switch (shape) {
      case 'dipping': return Math.max(-room, Math.min(room * 2, dipTan * (x - middle)));
      case 'undulating': return Math.max(-room, amplitude * Math.sin((2 * Math.PI * x) / wave + phase));
      case 'stepped': return Math.max(-room, stepSign * 3 * (smoothStep(x, stepAt, 2) - 0.5));
      case 'channel': return 3 * (smoothStep(x, channelAt - channelWidth / 2, 2) - smoothStep(x, channelAt + channelWidth / 2, 2));
      default: return 0;
    }
  };
  const depthFunctions = depths.map((d, k) => (k === depths.length - 1 ? (x: number) => d + relief(x) : () => d));
  // Shallow refractors follow the ground a little less than fully (a smoother surface).
  const interfaces = depthFunctions.map((f) => (x: number) => surface(x) - f(x));
  const name = `${layers}/${shape}/${ground}${offEnd ? '/off-end' : ''} ${geophones}×${spacing} m, v=${velocities.map(Math.round).join('/')}, z=${depths.map((d) => d.toFixed(1)).join('/')}, noise ${noiseMs.toFixed(2)} ms`;
  return {
    name,
    section: { surface, interfaces, velocities },
    sources,
    receivers,
    depth: depthFunctions,
    noiseMs,
    step: choices.step,
    kind: { layers, shape, ground, offEnd },
  };
}

/** Sample step of the forward model, in metres: 0.1 m on short spans, coarser on long ones. */
function stepFor(span: [number, number], step?: number): number {
  return step ?? Math.max(0.1, (span[1] - span[0]) / 2500);
}

function spanOf(line: RealisticLine): [number, number] {
  return [Math.min(...line.sources, ...line.receivers) - 5, Math.max(...line.sources, ...line.receivers) + 5];
}

/**
 * True when every layer below the top arrives first at four or more geophones for at least two
 * sources (comparing the section with the same section without its deeper refractors), and the
 * direct wave is first at three or more geophones beside each end source.
 */
function interpretable(line: RealisticLine): boolean {
  const span = spanOf(line);
  const step = stepFor(span, line.step);
  const { section } = line;
  const direct = (sx: number) => line.receivers.map((rx) => Math.hypot(rx - sx, section.surface(rx) - section.surface(sx)) / section.velocities[0]);
  const upTo = (k: number) => (k === 0 ? undefined : { ...section, interfaces: section.interfaces.slice(0, k), velocities: section.velocities.slice(0, k + 1) });
  const times = line.sources.map((sx) => {
    const byDepth = [direct(sx)];
    for (let k = 1; k <= section.interfaces.length; k++) byDepth.push(firstArrivals(upTo(k)!, sx, line.receivers, span, step));
    return byDepth;
  });
  for (let k = 1; k <= section.interfaces.length; k++) {
    let seenBy = 0;
    for (const byDepth of times) {
      let count = 0;
      byDepth[k].forEach((t, r) => {
        const deeper = byDepth.slice(k + 1).every((d) => d[r] >= t - 2e-5);
        if (deeper && t < byDepth[k - 1][r] - 2e-5) count++;
      });
      if (count >= 4) seenBy++;
    }
    if (seenBy < 2) return false;
  }
  const ends = [line.receivers[0], line.receivers[line.receivers.length - 1]];
  return ends.every((x) => {
    const s = line.sources.indexOf(x);
    const byDepth = times[s];
    const last = byDepth[byDepth.length - 1];
    return byDepth[0].filter((t, r) => line.receivers[r] !== x && t <= last[r] + 2e-5).length >= 3;
  });
}

/** The first-break CSV of a line, with its seeded noise (one row per source and receiver). */
export function realisticCsv(line: RealisticLine, seed: number): string {
  const normal = seededNormal(seed);
  const span = spanOf(line);
  const step = stepFor(span, line.step);
  const rows = ['source_id,source_x,source_elev,receiver_x,receiver_elev,time_ms'];
  line.sources.forEach((sx, s) => {
    const times = firstArrivals(line.section, sx, line.receivers, span, step);
    line.receivers.forEach((rx, r) => {
      if (rx === sx) return;
      const t = times[r] * 1e3 + line.noiseMs * normal();
      rows.push(`S${s + 1},${sx},${line.section.surface(sx).toFixed(3)},${rx},${line.section.surface(rx).toFixed(3)},${Math.max(0, t).toFixed(3)}`);
    });
  });
  return rows.join('\n') + '\n';
}
