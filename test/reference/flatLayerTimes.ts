/**
 * First-arrival time over flat layers under flat ground, written out from Telford, Geldart &
 * Sheriff (1990) Applied Geophysics, 2nd ed., §4.2 (eqs. 4.24 to 4.30): the least of the direct
 * wave x / V1 and every head wave t = x / Vₙ + Σⱼ₌₁ⁿ⁻¹ 2 hⱼ cos θⱼ,ₙ / Vⱼ with sin θⱼ,ₙ = Vⱼ / Vₙ.
 * (A head wave exists only beyond its critical distance, but where it would be first it always
 * lies beyond it, so the least of the lines is the first arrival.)
 *
 * @param thicknesses - h₁ … hₙ₋₁, in metres
 * @param velocities - V₁ … Vₙ, in m/s, increasing
 * @returns the time in seconds at horizontal offset x (metres) from the source
 */
export function flatFirstArrival(thicknesses: number[], velocities: number[], x: number): number {
  const offset = Math.abs(x);
  let best = offset / velocities[0];
  for (let n = 1; n < velocities.length; n++) {
    let t = offset / velocities[n];
    for (let j = 0; j < n; j++) t += (2 * thicknesses[j] * Math.sqrt(1 - (velocities[j] / velocities[n]) ** 2)) / velocities[j];
    best = Math.min(best, t);
  }
  return best;
}
