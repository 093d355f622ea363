/** The largest layer of an assumed velocity that a refractor's observed times could hide. */
export interface HiddenLayerLimit {
  refractor: number;
  /** Assumed velocity of the hidden layer, in m/s (between the layers above and below). */
  hiddenVelocity: number;
  /** Largest thickness it could have without its head wave ever arriving first, in metres. */
  maxThickness: number;
  /** How much deeper the refractor would then be than computed without it, in metres. */
  depthUnderestimate: number;
}

/**
 * Hidden layer (Soske 1959, Geophysics 24, 359-365). Between a layer of velocity V₁ (its line
 * t = t₀ + x/V₁) and a refractor of velocity V₃ (t = t₃ + x/V₃), which cross at
 * x* = (t₃ − t₀) / (1/V₁ − 1/V₃), a layer of
 * velocity V₂ (V₁ < V₂ < V₃) stays hidden as long as its head wave is nowhere first, i.e. reaches
 * x* no earlier than the layer above. The thickest hidden layer is the one that just touches: the
 * layer above is then h₁ = x*(1/V₁ − 1/V₂) V₁ / (2 cos θ₁₂), and the rest of the intercept
 * t₃ − t₀ − 2h₁ cos θ₁₃ / V₁ = 2h₂ cos θ₂₃ / V₂ gives h₂. Exact for one layer over the refractor;
 * for deeper refractors the layers above are lumped into t₀ (an approximation).
 *
 * @returns undefined when no positive hidden thickness fits the observed times
 * @example
 * // 400 m/s over 2000 m/s, t3 = 23.5 ms (x* = 11.75 m), hidden layer at 894 m/s:
 * hiddenLayerLimit(1, 400, 2000, 0, 0.0235, 894).maxThickness // 2.857 m
 */
export function hiddenLayerLimit(
  refractor: number, upperVelocity: number, refractorVelocity: number,
  upperIntercept: number, refractorIntercept: number, hiddenVelocity: number,
): HiddenLayerLimit | undefined {
  const v1 = upperVelocity;
  const v2 = hiddenVelocity;
  const v3 = refractorVelocity;
  const crossover = (refractorIntercept - upperIntercept) / (1 / v1 - 1 / v3);
  if (!(v1 < v2 && v2 < v3) || !(crossover > 0)) return undefined;
  const cos = (a: number, b: number) => Math.sqrt(1 - (a / b) ** 2);
  const h1 = (crossover * (1 / v1 - 1 / v2) * v1) / (2 * cos(v1, v2));
  const remaining = refractorIntercept - upperIntercept - (2 * h1 * cos(v1, v3)) / v1;
  const h2 = (remaining * v2) / (2 * cos(v2, v3));
  if (!(h2 > 0)) return undefined;
  const computed = ((refractorIntercept - upperIntercept) * v1) / (2 * cos(v1, v3));
  return { refractor, hiddenVelocity: v2, maxThickness: h2, depthUnderestimate: h1 + h2 - computed };
}
