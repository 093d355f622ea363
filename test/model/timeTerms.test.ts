import { describe, expect, it } from 'vitest';
import { SMOOTHING_WEIGHT, TIE_WEIGHT, interpolationWeights, solveTimeTerms, type ModelPick, type TimeTermModel } from '../../src/model/timeTerms.js';
import { seededNormal } from '../reference/layeredTravelTimes.js';
import { range } from '../helpers.js';

// The textbook case of the time-term method (Willmore & Bancroft 1960, Geophys. J. R. astr. Soc.
// 3, 419-432; Scheidegger & Willmore 1957): a flat refractor under rolling ground. For a
// horizontal refractor the head-wave time from a source at thickness hₛ above it to a receiver at
// thickness hᵣ is exactly
//   t = |xᵣ − xₛ| / V₂ + aₛ + bᵣ,   with the time terms a = hₛ cos i / V₁, b = hᵣ cos i / V₁,
// sin i = V₁ / V₂ (Telford, Geldart & Sheriff 1990, §4.2.2, the intercept split between the two
// ends). Worked here: V₁ = 600 m/s, V₂ = 2400 m/s, cos i = √(1 − 0.25²) = 0.9682; the refractor at
// elevation 90 m, the ground at 100 + 1.5 sin(2πx / 40) m, so the thickness runs 8.5 to 11.5 m and
// the time terms 13.7 to 18.6 ms. The direct wave is d / V₁ over the slope distance d.
const v1 = 600;
const v2 = 2400;
const cosI = Math.sqrt(1 - (v1 / v2) ** 2);
const ground = (x: number) => 100 + 1.5 * Math.sin((2 * Math.PI * x) / 40);
const timeTerm = (x: number) => ((ground(x) - 90) * cosI) / v1;
const receivers = range(48, 2);
// Sources at both ends, in the middle, and 20 m off each end.
const sources = [-20, 0, 46, 94, 114];
const noise = 0.25e-3;

function textbookPicks(seed: number) {
  const normal = seededNormal(seed);
  const picks: ModelPick[] = [];
  const arrivals: number[] = [];
  sources.forEach((sx, s) => {
    receivers.forEach((rx, r) => {
      if (rx === sx) return;
      const offset = Math.abs(rx - sx);
      const distance = Math.hypot(rx - sx, ground(rx) - ground(sx));
      const direct = distance / v1;
      const head = offset / v2 + timeTerm(sx) + timeTerm(rx);
      const first = Math.min(direct, head);
      picks.push({ source: s, receiver: r, offset, distance, time: first + noise * normal() });
      arrivals.push(head < direct ? 1 : 0);
    });
  });
  return { picks, arrival: Int8Array.from(arrivals) };
}

const geometry = { sourceXs: sources, receiverXs: receivers, spacing: 2 };

describe('solveTimeTerms on the textbook flat refractor under rolling ground', () => {
  it('solveTimeTerms(planted time terms, 0.25 ms noise) recovers every receiver and source time term within the pick noise and V2 within 0.5 %', () => {
    const { picks, arrival } = textbookPicks(3);
    const model = solveTimeTerms(geometry, picks, arrival, 1)!;
    expect(Math.abs(1 / model.slowness[1] / v2 - 1)).toBeLessThan(0.005);
    expect(Math.abs(1 / model.slowness[0] / v1 - 1)).toBeLessThan(0.01);
    const errors: number[] = [];
    receivers.forEach((x, r) => {
      const delay = model.receiverDelays[0][r];
      if (Number.isNaN(delay)) return;
      errors.push(delay - timeTerm(x));
      // A receiver seen by two picks has a time term good to about σ/√2; 2σ bounds it.
      expect(Math.abs(delay - timeTerm(x)), `receiver at ${x} m`).toBeLessThan(2 * noise);
    });
    // Every receiver is beyond the crossover of the off-end sources, so every one has a time term.
    expect(errors.length).toBe(48);
    // Taken together the receiver time terms are within the pick noise: RMS error below 0.25 ms.
    expect(Math.sqrt(errors.reduce((a, e) => a + e * e, 0) / errors.length)).toBeLessThan(noise);
    sources.forEach((x, s) => {
      expect(Math.abs(model.sourceDelays[0][s] - timeTerm(x)), `source at ${x} m`).toBeLessThan(noise);
    });
    // The residuals are the pick noise: σ within 20 % of 0.25 ms.
    expect(Math.abs(model.sigma / noise - 1)).toBeLessThan(0.2);
  });

  it('solveTimeTerms standard error of V2 matches its scatter over 24 noise draws within a factor of 1.6, and σ the pick noise within 3 %', () => {
    const velocities: number[] = [];
    const ses: number[] = [];
    const sigmas: number[] = [];
    for (let seed = 100; seed < 124; seed++) {
      const { picks, arrival } = textbookPicks(seed);
      const model = solveTimeTerms(geometry, picks, arrival, 1)!;
      velocities.push(1 / model.slowness[1]);
      ses.push(model.slownessSe[1] / model.slowness[1] ** 2);
      sigmas.push(model.sigma);
    }
    const mean = velocities.reduce((a, b) => a + b, 0) / velocities.length;
    const scatter = Math.sqrt(velocities.reduce((a, v) => a + (v - mean) ** 2, 0) / (velocities.length - 1));
    const meanSe = ses.reduce((a, b) => a + b, 0) / ses.length;
    // The covariance σ²(AᵀA)⁻¹ is exact for a linear model with Gaussian noise; with 24 draws the
    // sample deviation is within about ±30 % of the true one (χ² with 23 degrees of freedom).
    expect(meanSe / scatter).toBeGreaterThan(1 / 1.6);
    expect(meanSe / scatter).toBeLessThan(1.6);
    expect(Math.abs(mean / v2 - 1)).toBeLessThan(3 * scatter / v2 + 1e-3);
    // σ = √(rss / (n − p)) estimates the pick noise without bias: over 24 draws of about 180
    // degrees of freedom each, its mean is within 3 % of 0.25 ms (the sample error is about 1 %).
    const meanSigma = sigmas.reduce((a, b) => a + b, 0) / sigmas.length;
    expect(Math.abs(meanSigma / noise - 1)).toBeLessThan(0.03);
  });
});

// The least-squares system of the time-term method written out row by row, as documented in
// solveTimeTerms (Willmore & Bancroft 1960: t = aₛ + bᵣ + x / V₂ per head-wave pick, d / V₁ per
// direct-wave pick; our constraint rows: the second divided difference of neighbouring receiver
// time terms at weight SMOOTHING_WEIGHT, scaled to (1, −2, 1) for equal gaps and skipped across gaps
// over three spacings; a source inside the spread tied to the interpolated receiver time term at
// weight TIE_WEIGHT, or equal mean source and receiver time terms when no source is tied), and
// solved here densely by the normal equations with Gauss-Jordan elimination (a reference sharing
// no code with src/). Its solution, σ = √(rss / (n − p)) and σ √((AᵀA)⁻¹ⱼⱼ) are those of any least
// squares solver; the tolerances are round-off of a system of some 30 unknowns.
function referenceTimeTerms(geometry: { sourceXs: number[]; receiverXs: number[]; spacing: number }, picks: ModelPick[], arrival: Int8Array, held?: { slowness: number; se: number }, smoothing = SMOOTHING_WEIGHT) {
  const columns = new Map<string, number>([['u0', 0], ['u1', 1]]);
  const column = (key: string) => { if (!columns.has(key)) columns.set(key, columns.size); return columns.get(key)!; };
  const rows: { entries: [number, number][]; target: number }[] = [];
  picks.forEach((p, i) => {
    if (arrival[i] === 0) rows.push({ entries: [[0, p.distance]], target: p.time });
    if (arrival[i] === 1) {
      const entries: [number, number][] = [[column(`s${p.source}`), 1], [column(`r${p.receiver}`), 1]];
      if (held) rows.push({ entries, target: p.time - p.offset * held.slowness });
      else rows.push({ entries: [[1, p.offset], ...entries], target: p.time });
    }
  });
  const pickRows = rows.length;
  const estimated = geometry.receiverXs.map((_, r) => r).filter((r) => columns.has(`r${r}`));
  const xs = geometry.receiverXs;
  for (let j = 1; j + 1 < estimated.length; j++) {
    const [a, b, c] = [estimated[j - 1], estimated[j], estimated[j + 1]];
    const h1 = xs[b] - xs[a];
    const h2 = xs[c] - xs[b];
    if (h1 > 3 * geometry.spacing || h2 > 3 * geometry.spacing) continue;
    const m = (h1 + h2) / 2;
    rows.push({ entries: [[column(`r${a}`), (smoothing * m) / h1], [column(`r${b}`), -smoothing * (m / h1 + m / h2)], [column(`r${c}`), (smoothing * m) / h2]], target: 0 });
  }
  let constraints = 0;
  geometry.sourceXs.forEach((x, s) => {
    if (!columns.has(`s${s}`)) return;
    const at = estimated.map((r) => xs[r]);
    let weights: [number, number][] | undefined;
    if (x <= at[0]) weights = at[0] - x <= 1.5 * geometry.spacing ? [[estimated[0], 1]] : undefined;
    else if (x >= at[at.length - 1]) weights = x - at[at.length - 1] <= 1.5 * geometry.spacing ? [[estimated[at.length - 1], 1]] : undefined;
    else {
      const j = at.findIndex((v, i) => v <= x && at[i + 1] > x);
      const t = (x - at[j]) / (at[j + 1] - at[j]);
      weights = [[estimated[j], 1 - t], [estimated[j + 1], t]];
    }
    if (weights === undefined) return;
    rows.push({ entries: [[column(`s${s}`), TIE_WEIGHT], ...weights.map(([r, w]) => [column(`r${r}`), -TIE_WEIGHT * w] as [number, number])], target: 0 });
    constraints++;
  });
  if (constraints === 0) {
    const sources = geometry.sourceXs.map((_, s) => s).filter((s) => columns.has(`s${s}`));
    rows.push({ entries: [...sources.map((s) => [column(`s${s}`), TIE_WEIGHT / sources.length] as [number, number]), ...estimated.map((r) => [column(`r${r}`), -TIE_WEIGHT / estimated.length] as [number, number])], target: 0 });
    constraints = 1;
  }
  // Normal equations without the held slowness's (empty) column.
  const free = [...columns.values()].filter((c) => !(held && c === 1));
  const n = free.length;
  const index = new Map(free.map((c, i) => [c, i]));
  const normal = Array.from({ length: n }, () => new Array<number>(2 * n + 1).fill(0));
  for (const row of rows) {
    for (const [ca, va] of row.entries) {
      const ia = index.get(ca)!;
      for (const [cb, vb] of row.entries) normal[ia][index.get(cb)!] += va * vb;
      normal[ia][2 * n] += va * row.target;
    }
  }
  for (let i = 0; i < n; i++) normal[i][n + i] = 1;
  for (let col = 0; col < n; col++) {
    let pivot = col;
    for (let i = col + 1; i < n; i++) if (Math.abs(normal[i][col]) > Math.abs(normal[pivot][col])) pivot = i;
    [normal[col], normal[pivot]] = [normal[pivot], normal[col]];
    const p = normal[col][col];
    for (let k = 0; k <= 2 * n; k++) normal[col][k] /= p;
    for (let i = 0; i < n; i++) {
      if (i === col) continue;
      const f = normal[i][col];
      if (f !== 0) for (let k = 0; k <= 2 * n; k++) normal[i][k] -= f * normal[col][k];
    }
  }
  const value = (c: number) => normal[index.get(c)!][2 * n];
  let rss = 0;
  for (let r = 0; r < pickRows; r++) rss += (rows[r].target - rows[r].entries.reduce((sum, [c, v]) => sum + v * value(c), 0)) ** 2;
  const used = pickRows;
  const parameters = columns.size - constraints - (held ? 1 : 0);
  const sigma = Math.sqrt(rss / (used - parameters));
  return {
    slowness: [value(0), held ? held.slowness : value(1)],
    se: [sigma * Math.sqrt(normal[index.get(0)!][n + index.get(0)!]), held ? held.se : sigma * Math.sqrt(normal[index.get(1)!][n + index.get(1)!])],
    receiver: (r: number) => (columns.has(`r${r}`) ? value(columns.get(`r${r}`)!) : NaN),
    source: (s: number) => (columns.has(`s${s}`) ? value(columns.get(`s${s}`)!) : NaN),
    rss, used, parameters, sigma,
  };
}

describe('solveTimeTerms against the time-term system solved densely', () => {
  // Receivers every 2 m from 0 to 40 m. Head-wave picks reach the receivers 0-12 m and 22-40 m
  // but not 6, 28 or 30 m: the 4 m gap 4 -> 8 m tests the divided-difference scaling, the 10 m gap
  // 12 -> 22 m (over three spacings) the skipped rows, the 6 m gap 26 -> 32 m (three spacings
  // exactly) rows kept. Sources at −12 m (off end, untied), 5 m
  // (inside, tied halfway between the 4 m and 8 m receivers) and 47 m (7 m past the last, untied).
  // Direct-wave picks near each source over a slope distance 1 % longer than the offset; some
  // picks left out (−1). Time terms 8-14 ms, V₁ = 500, V₂ = 2200 m/s, 0.3 ms of noise.
  const receiverXs = range(21, 2);
  const sourceXs = [-12, 5, 47];
  const geometry = { sourceXs, receiverXs, spacing: 2 };
  const tt = (x: number) => 0.011 + 0.003 * Math.sin(x / 7);
  function line(seed: number, sources: number[]) {
    const normal = seededNormal(seed);
    const picks: ModelPick[] = [];
    const arrivals: number[] = [];
    sources.forEach((s) => {
      const sx = sourceXs[s];
      receiverXs.forEach((rx, r) => {
        const offset = Math.abs(rx - sx);
        if (offset === 0) return;
        const reached = rx !== 6 && rx !== 28 && rx !== 30 && !(rx > 12 && rx < 22);
        const direct = offset < 9;
        if (!reached && !direct) return;
        const time = direct ? (offset * 1.01) / 500 : tt(sx) + tt(rx) + offset / 2200;
        picks.push({ source: s, receiver: r, offset, distance: offset * 1.01, time: time + 0.3e-3 * normal() });
        arrivals.push(direct ? 0 : picks.length % 11 === 0 ? -1 : 1);
      });
    });
    return { picks, arrival: Int8Array.from(arrivals) };
  }

  const compare = (model: TimeTermModel, reference: ReturnType<typeof referenceTimeTerms>, picks: ModelPick[]) => {
    expect(model.slowness[0] / reference.slowness[0]).toBeCloseTo(1, 9);
    expect(model.slowness[1] / reference.slowness[1]).toBeCloseTo(1, 9);
    receiverXs.forEach((_, r) => {
      const expected = reference.receiver(r);
      if (Number.isNaN(expected)) expect(model.receiverDelays[0][r]).toBeNaN();
      else expect(model.receiverDelays[0][r]).toBeCloseTo(expected, 9);
    });
    sourceXs.forEach((_, s) => {
      const expected = reference.source(s);
      if (Number.isNaN(expected)) expect(model.sourceDelays[0][s]).toBeNaN();
      else expect(model.sourceDelays[0][s]).toBeCloseTo(expected, 9);
    });
    expect(model.used).toBe(reference.used);
    expect(model.parameters).toBe(reference.parameters);
    expect(model.rss / reference.rss).toBeCloseTo(1, 6);
    expect(model.sigma / reference.sigma).toBeCloseTo(1, 6);
    expect(model.slownessSe[0] / reference.se[0]).toBeCloseTo(1, 6);
    expect(model.slownessSe[1] / reference.se[1]).toBeCloseTo(1, 6);
    expect([...model.residuals].filter((r) => !Number.isNaN(r)).length).toBe(reference.used);
    expect(picks.length).toBeGreaterThan(reference.used);
  };

  it('matches the dense solution with one source tied inside the spread (time terms to 1e-9 s, σ and standard errors to 1e-6)', () => {
    const { picks, arrival } = line(11, [0, 1, 2]);
    compare(solveTimeTerms(geometry, picks, arrival, 1)!, referenceTimeTerms(geometry, picks, arrival), picks);
  });

  it('matches the dense solution with another smoothing weight (30, the first stage of the joint model)', () => {
    const { picks, arrival } = line(15, [0, 1, 2]);
    compare(solveTimeTerms(geometry, picks, arrival, 1, { smoothing: 30 })!, referenceTimeTerms(geometry, picks, arrival, undefined, 30), picks);
  });

  it('matches the dense solution with only off-end sources (equal mean source and receiver time terms)', () => {
    const { picks, arrival } = line(12, [0, 2]);
    compare(solveTimeTerms(geometry, picks, arrival, 1)!, referenceTimeTerms(geometry, picks, arrival), picks);
  });

  it('matches the dense solution with the refractor slowness held, and returns the held standard error', () => {
    const { picks, arrival } = line(13, [0, 1, 2]);
    const held = { slowness: 1 / 2150, se: 2e-6 };
    const model = solveTimeTerms(geometry, picks, arrival, 1, { held: [undefined, held] })!;
    compare(model, referenceTimeTerms(geometry, picks, arrival, held), picks);
    expect(model.slowness[1]).toBe(held.slowness);
    expect(solveTimeTerms(geometry, picks, arrival, 1, { errors: false })!.slownessSe.every(Number.isNaN)).toBe(true);
  });

  it('uses no pick left out, and refuses an arrival above the refractors', () => {
    const { picks } = line(14, [0]);
    expect(solveTimeTerms(geometry, picks, new Int8Array(picks.length).fill(-1), 1)).toBeUndefined();
    expect(() => solveTimeTerms(geometry, picks, new Int8Array(picks.length).fill(2), 1)).toThrow(/arrivals up to 1/);
  });
});

describe('interpolationWeights', () => {
  // Linear interpolation between the nearest sorted positions, worked by hand; the end value held
  // up to 1.5 spacings (3 m at 2 m spacing) beyond the ends, none farther.
  const at = [0, 4, 10];
  it('weights the two neighbours by distance, all the weight on a position itself', () => {
    expect(interpolationWeights(at, 1, 2)).toEqual([[0, 0.75], [1, 0.25]]);
    expect(interpolationWeights(at, 7, 2)).toEqual([[1, 0.5], [2, 0.5]]);
    expect(interpolationWeights(at, 4, 2)).toEqual([[0, 0], [1, 1]]);
  });
  it('holds the end values up to 1.5 spacings out, and gives none beyond or without positions', () => {
    expect(interpolationWeights(at, -3, 2)).toEqual([[0, 1]]);
    expect(interpolationWeights(at, -3.01, 2)).toBeUndefined();
    expect(interpolationWeights(at, 13, 2)).toEqual([[2, 1]]);
    expect(interpolationWeights(at, 13.01, 2)).toBeUndefined();
    expect(interpolationWeights(at, 0, 2)).toEqual([[0, 1]]);
    expect(interpolationWeights(at, 10, 2)).toEqual([[2, 1]]);
    expect(interpolationWeights([], 1, 2)).toBeUndefined();
  });
});
