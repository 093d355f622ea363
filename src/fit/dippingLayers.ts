/**
 * Plane dipping layers that need not be parallel: the recursive solution of Johnson (1976),
 * "Interpretation of split-spread refraction data in terms of plane dipping layers",
 * Geophysics 41, 418-424.
 *
 * Layer 1 lies under a horizontal ground surface; interface k (the top of layer k+1) is a plane
 * of dip δₖ, positive when it deepens towards +x. The head wave from interface m reaches the
 * ground as a plane wave; its up-going ray makes the angle φⱼ (forward branch, travelling +x) or
 * ψⱼ (reverse branch, travelling −x) with the vertical in layer j. Snell's law holds for the
 * components along each interface, so, going down through interface j,
 *   sin(φⱼ − δⱼ) / Vⱼ = sin(φⱼ₊₁ − δⱼ) / Vⱼ₊₁,   sin(ψⱼ + δⱼ) / Vⱼ = sin(ψⱼ₊₁ + δⱼ) / Vⱼ₊₁,
 * and at interface m the rays leave at the critical angle θ = asin(Vₘ / Vₘ₊₁) to its normal:
 *   φₘ = θ + δₘ,  ψₘ = θ − δₘ  ⇒  θ = ½(φₘ + ψₘ), δₘ = ½(φₘ − ψₘ), Vₘ₊₁ = Vₘ / sin θ.
 * At the ground sin φ₁ = V₁·sf and sin ψ₁ = V₁·sr, sf and sr the forward and reverse apparent
 * slownesses (time against horizontal offset). Solving interface 1, then 2 with 1 known, and so on,
 * gives every true velocity and dip. The intercept time under a source is the same on both sides
 * of it and, in vertical thicknesses zⱼ under the source,
 *   tₘ = Σⱼ₌₁ᵐ zⱼ (cos φⱼ + cos ψⱼ) / Vⱼ
 * (the two rays' vertical slownesses; for one interface this is 2 h cos θ / V₁ with the
 * perpendicular thickness h = z cos δ, Telford, Geldart & Sheriff 1990, §4.3). For parallel layers
 * the recursion reduces to the textbook up-dip/down-dip formulas with V₁ in place of Vₘ.
 */

/** One plane interface: the velocity of the layer beneath it and its dip. */
export interface PlaneInterface {
  /** Velocity of the layer beneath the interface, in m/s. */
  velocity: number;
  /** Dip, in radians, positive when the interface deepens towards +x. */
  dip: number;
}

/** Angles with the vertical, in radians, of the up-going rays of one interface's head waves. */
export interface HeadWaveAngles {
  /** φ₁ … φₘ: forward branch (head wave travelling +x), layer 1 first. */
  forward: number[];
  /** ψ₁ … ψₘ: reverse branch (head wave travelling −x), layer 1 first. */
  reverse: number[];
}

const velocityOf = (topVelocity: number, interfaces: PlaneInterface[], layer: number) =>
  (layer === 1 ? topVelocity : interfaces[layer - 2].velocity);

/**
 * True velocity and dip of interface m from the apparent slownesses of its head waves on forward
 * and reverse branches, given the interfaces above it (Johnson 1976, the recursion step).
 *
 * @param topVelocity - V₁, velocity of the top layer, in m/s
 * @param above - interfaces 1 … m−1, already solved
 * @param forwardSlowness - sf, slope of the forward (+x) head-wave branch against offset, in s/m
 * @param reverseSlowness - sr, slope of the reverse (−x) branch against offset, in s/m (positive)
 * @returns interface m, or undefined where no ray fits (an apparent velocity below a layer's above
 *   it, or a refractor no faster than the layer above)
 * @example
 * // One interface, V1 = 500, V2 = 2000 m/s, dip 10°: sf = sin(14.48° + 10°)/500, sr = sin(4.48°)/500
 * solveInterface(500, [], 8.288e-4, 1.563e-4) // { velocity: ≈2000, dip: ≈0.1745 }
 */
export function solveInterface(topVelocity: number, above: PlaneInterface[], forwardSlowness: number, reverseSlowness: number): PlaneInterface | undefined {
  const sinForward = topVelocity * forwardSlowness;
  const sinReverse = topVelocity * reverseSlowness;
  if (!(Math.abs(sinForward) <= 1 && Math.abs(sinReverse) <= 1)) return undefined;
  let forward = Math.asin(sinForward);
  let reverse = Math.asin(sinReverse);
  for (let j = 1; j <= above.length; j++) {
    const dip = above[j - 1].dip;
    const ratio = velocityOf(topVelocity, above, j + 1) / velocityOf(topVelocity, above, j);
    const nextForward = ratio * Math.sin(forward - dip);
    const nextReverse = ratio * Math.sin(reverse + dip);
    if (!(Math.abs(nextForward) <= 1 && Math.abs(nextReverse) <= 1)) return undefined;
    forward = dip + Math.asin(nextForward);
    reverse = Math.asin(nextReverse) - dip;
  }
  const critical = (forward + reverse) / 2;
  if (!(critical > 0)) return undefined;
  const overlying = velocityOf(topVelocity, above, above.length + 1);
  return { velocity: overlying / Math.sin(critical), dip: (forward - reverse) / 2 };
}

/**
 * Every interface in turn from the apparent slownesses of its head waves (Johnson 1976), stopping
 * at the first that cannot be solved.
 *
 * @param topVelocity - V₁, in m/s
 * @param slownesses - [sf, sr] of interface 1, 2, … in s/m
 * @returns the interfaces solved, top down (possibly fewer than given)
 */
export function solveInterfaces(topVelocity: number, slownesses: [number, number][]): PlaneInterface[] {
  const solved: PlaneInterface[] = [];
  for (const [sf, sr] of slownesses) {
    const next = solveInterface(topVelocity, solved, sf, sr);
    if (next === undefined) break;
    solved.push(next);
  }
  return solved;
}

/**
 * The angles with the vertical of the up-going rays of the head waves from interface m in layers
 * 1 … m, traced up from the critical angle at interface m (Snell's law along each interface).
 *
 * @param topVelocity - V₁, in m/s
 * @param interfaces - interfaces 1 … m (at least m)
 * @param m - the refracting interface, 1-based
 * @returns the angles, or undefined when interface m is no faster than the layer above or a ray
 *   cannot reach the ground
 */
export function headWaveAngles(topVelocity: number, interfaces: PlaneInterface[], m: number): HeadWaveAngles | undefined {
  const sine = velocityOf(topVelocity, interfaces, m) / interfaces[m - 1].velocity;
  if (!(sine < 1)) return undefined;
  const critical = Math.asin(sine);
  const forward: number[] = new Array(m);
  const reverse: number[] = new Array(m);
  forward[m - 1] = critical + interfaces[m - 1].dip;
  reverse[m - 1] = critical - interfaces[m - 1].dip;
  for (let j = m - 1; j >= 1; j--) {
    const dip = interfaces[j - 1].dip;
    const ratio = velocityOf(topVelocity, interfaces, j) / velocityOf(topVelocity, interfaces, j + 1);
    const sinForward = ratio * Math.sin(forward[j] - dip);
    const sinReverse = ratio * Math.sin(reverse[j] + dip);
    if (!(Math.abs(sinForward) < 1 && Math.abs(sinReverse) < 1)) return undefined;
    forward[j - 1] = dip + Math.asin(sinForward);
    reverse[j - 1] = Math.asin(sinReverse) - dip;
  }
  return { forward, reverse };
}

/**
 * Vertical thickness under a source of layer m, from the intercept time of the head wave from
 * interface m at that source (Johnson 1976): zₘ = (tₘ − Σⱼ₌₁ᵐ⁻¹ zⱼ (cos φⱼ + cos ψⱼ)/Vⱼ) · Vₘ /
 * (cos φₘ + cos ψₘ). With every dip zero this is the flat-layer formula of Telford et al. (1990),
 * eq. 4.30; with one interface it is z = h / cos δ, h = t V₁ / (2 cos θ).
 *
 * @param interceptTime - tₘ, in seconds
 * @param upper - z₁ … zₘ₋₁ under the same source, in metres
 * @param topVelocity - V₁, in m/s
 * @param interfaces - interfaces 1 … m
 * @returns zₘ in metres, or undefined when the head wave cannot exist or the thickness would be
 *   negative
 * @example
 * // One interface, V1 = 500, V2 = 2000 m/s, dip 10°, 5 m deep under the source:
 * // t = 5 (cos 24.48° + cos 4.48°)/500 = 19.07 ms
 * verticalThickness(0.019071, [], 500, [{ velocity: 2000, dip: 0.17453 }]) // 5.000
 */
export function verticalThickness(interceptTime: number, upper: number[], topVelocity: number, interfaces: PlaneInterface[]): number | undefined {
  const m = upper.length + 1;
  const angles = headWaveAngles(topVelocity, interfaces, m);
  if (angles === undefined) return undefined;
  const verticalSlowness = (j: number) => (Math.cos(angles.forward[j - 1]) + Math.cos(angles.reverse[j - 1])) / velocityOf(topVelocity, interfaces, j);
  let remaining = interceptTime;
  for (let j = 1; j < m; j++) remaining -= upper[j - 1] * verticalSlowness(j);
  const thickness = remaining / verticalSlowness(m);
  return thickness >= 0 ? thickness : undefined;
}
