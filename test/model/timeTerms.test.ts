import { describe, expect, it } from 'vitest';
import { solveTimeTerms, type ModelPick } from '../../src/model/timeTerms.js';
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
