/**
 * The ratio Vp/Vs of an isotropic elastic solid with Poisson's ratio ν:
 * Vp/Vs = sqrt((2 − 2ν) / (1 − 2ν)) (elasticity; SEG Wiki, "VS/VP").
 *
 * @param poisson - Poisson's ratio, 0 ≤ ν < 0.5 (rock and soil; ν → 0.5 is a fluid, with no Vs)
 * @throws RangeError outside 0 ≤ ν < 0.5
 * @example
 * vpVsRatio(0.25) // 1.7321 (= sqrt 3)
 */
export function vpVsRatio(poisson: number): number {
  if (!(poisson >= 0 && poisson < 0.5)) throw new RangeError(`Poisson's ratio must be at least 0 and below 0.5; got ${poisson}`);
  return Math.sqrt((2 - 2 * poisson) / (1 - 2 * poisson));
}

/**
 * Poisson's ratio from Vp/Vs, the inverse of vpVsRatio: ν = (r² − 2) / (2 (r² − 1)).
 * @throws RangeError for a ratio at or below sqrt 2 (ν < 0 is not a soil or rock)
 */
export function poissonFromRatio(ratio: number): number {
  if (!(ratio > Math.SQRT2)) throw new RangeError(`Vp/Vs must be above sqrt(2) = 1.414 for a Poisson's ratio of 0 or more; got ${ratio}`);
  const square = ratio * ratio;
  return (square - 2) / (2 * (square - 1));
}
