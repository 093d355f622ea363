import type { BranchFit, Layer, RefractorPoint } from '../core/types.js';
import { linearAt } from '../core/interpolate.js';
import { maxOf, minOf } from '../core/extent.js';
import { groundAlongLine, sampleNodeSection, type NodeSection } from '../model/nodeSection.js';
import { sectionPaths, type Shot } from '../model/sectionPaths.js';

/** The forward check of one source. */
export interface SourceMisfit {
  sourceId: string;
  /** Source position along the line, in metres. */
  sourceX: number;
  /** True when the source lies off the ends of the geophones. */
  offEnd: boolean;
  picks: number;
  /** RMS of pick minus computed first arrival, in seconds. */
  rms: number;
  /** Mean of pick minus computed first arrival, in seconds, before any correction (a constant lead or lag of the whole shot). */
  mean: number;
  /**
   * Sources off the ends: for each refractor whose head wave the source's picks are assigned to,
   * the delay under the source that the picks give (their mean difference from the section), in
   * seconds, taken out before the RMS.
   */
  corrections: { layer: number; correction: number; picks: number }[];
}

export interface ForwardCheck {
  /** RMS of pick minus computed first arrival, in seconds, over every pick the fits used (each once). */
  rms: number;
  /** Largest absolute difference, in seconds, and where. */
  worst: { difference: number; sourceId: string; receiverX: number };
  picks: number;
  /** The same per source, in the order of the line. */
  sources: SourceMisfit[];
  /** Pick minus computed first arrival of every pick checked (after the corrections of sources off the ends), in seconds, source by source; row is the pick's row in its table. */
  residuals: { sourceId: string; receiverX: number; row: number; difference: number }[];
  /** Time shift common to every pick that the section carries (a trigger delay fitted by the layered inversion), in seconds; 0 when none. */
  timeShift: number;
}

/** What the forward check is run on. */
export interface ForwardCheckInput {
  fits: BranchFit[];
  /** Layers down to the deepest refractor with depths (one more than the refractors). */
  layers: Layer[];
  /** Recommended profile of each refractor, top down. */
  refractors: { points: RefractorPoint[] }[];
  /** Receiver positions and ground elevations, ascending in x, in metres. */
  receivers: { x: number; elev: number }[];
  /** Geophone spacing, in metres. */
  spacing: number;
  /** Time shift common to every pick, in seconds, added to every computed time (default 0). */
  timeShift?: number;
  /**
   * The section to check, when there is one already (the kept layered inversion's, whose nodes
   * beyond the geophones were fitted to the off-end picks); otherwise it is built from `refractors`.
   */
  section?: Omit<NodeSection, 'ground'>;
}

/**
 * The forward check of an interpretation: first-arrival times computed through the interpreted
 * section (the recommended refractor depths under the geophones, the layer velocities) for every
 * source, those off the ends of the spread included, compared with every pick the line fits used
 * (outliers left out, a zero-offset pick once). A misfit well above the pick noise means the
 * section does not explain the data (a missed layer, a wrong layer assignment, a lateral change).
 *
 * The section is the one the layered inversion works on (model/nodeSection, model/sectionPaths):
 * refractor elevations at nodes under the geophones, continued at the same spacing out to the
 * sources off the ends and held at the end values there; the ground runs straight between the
 * receivers and the sources. When the inversion fitted a common time shift (a trigger delay) and
 * was kept, that shift belongs to the section and is added to every computed time.
 *
 * @returns undefined when there is no refractor to build a section from
 */
export function forwardCheck(input: ForwardCheckInput): ForwardCheck | undefined {
  const { fits, layers, refractors, receivers, spacing } = input;
  const timeShift = input.timeShift ?? 0;
  if (refractors.length === 0 || refractors.some((r) => r.points.length === 0) || layers.length < refractors.length + 1 || receivers.length === 0) return undefined;
  const picks = checkedPicks(fits);
  if (picks.length === 0) return undefined;
  const ground = groundAlongLine(receivers, fits.map((f) => ({ x: f.branch.sourceX, elev: f.branch.sourceElev })));
  const allX = picks.flatMap((p) => [p.sourceX, p.receiverX]);
  const nodeXs = nodesAlong(receivers.map((r) => r.x), minOf(allX), maxOf(allX), spacing);
  const section: NodeSection = input.section !== undefined ? { ...input.section, ground } : {
    ground,
    nodeXs,
    xRef: (nodeXs[0] + nodeXs[nodeXs.length - 1]) / 2,
    elevations: refractors.map((r) => {
      const xs = r.points.map((p) => p.x);
      const elevs = r.points.map((p) => p.elev);
      return Float64Array.from(nodeXs, (x) => linearAt(xs, elevs, x));
    }),
    velocities: Float64Array.from(layers.slice(0, refractors.length + 1), (l) => l.velocity),
    gradients: new Float64Array(refractors.length + 1),
  };
  // Samples every half geophone spacing (at most 600, as the inversion): the check is against
  // picks a tenth of a millisecond apart, and the least time over samples errs far less.
  const span: [number, number] = [minOf(allX) - 2 * spacing, maxOf(allX) + 2 * spacing];
  const step = Math.max(spacing / 2, (span[1] - span[0]) / 600);
  const sampled = sampleNodeSection(section, span, step);

  const bySource = new Map<string, CheckedPick[]>();
  for (const p of picks) {
    const list = bySource.get(p.sourceId);
    if (list === undefined) bySource.set(p.sourceId, [p]);
    else list.push(p);
  }
  const groups = [...bySource.values()].sort((a, b) => a[0].sourceX - b[0].sourceX);
  const shots: Shot[] = groups.map((g) => ({ x: g[0].sourceX, z: g[0].sourceElev, receivers: g.map((p) => ({ x: p.receiverX, z: p.receiverElev })) }));
  const { times } = sectionPaths(sampled, shots);
  const first = receivers[0].x;
  const last = receivers[receivers.length - 1].x;
  let sum = 0;
  let count = 0;
  const residuals: ForwardCheck['residuals'] = [];
  let worst = { difference: 0, sourceId: '', receiverX: 0 };
  const sources: SourceMisfit[] = groups.map((g, s) => {
    const sx = g[0].sourceX;
    const offEnd = sx < first - spacing / 2 || sx > last + spacing / 2;
    const differences = g.map((p, r) => p.time - times[s][r] - timeShift);
    const mean = differences.reduce((a, d) => a + d, 0) / g.length;
    // Off the ends, the rays of a head wave go down beyond the geophones, where no depth is known:
    // the delay there is taken from the picks (one per refractor, as a time term).
    const corrections: SourceMisfit['corrections'] = [];
    if (offEnd) {
      const byLayer = new Map<number, number[]>();
      g.forEach((p, r) => {
        if (p.layer < 2) return;
        const list = byLayer.get(p.layer);
        if (list === undefined) byLayer.set(p.layer, [r]);
        else list.push(r);
      });
      for (const [layer, members] of [...byLayer.entries()].sort((a, b) => a[0] - b[0])) {
        const correction = members.reduce((a, r) => a + differences[r], 0) / members.length;
        for (const r of members) differences[r] -= correction;
        corrections.push({ layer, correction, picks: members.length });
      }
    }
    let squares = 0;
    differences.forEach((difference, r) => {
      squares += difference * difference;
      if (Math.abs(difference) > Math.abs(worst.difference)) worst = { difference, sourceId: g[r].sourceId, receiverX: g[r].receiverX };
    });
    sum += squares;
    count += g.length;
    differences.forEach((difference, r) => residuals.push({ sourceId: g[r].sourceId, receiverX: g[r].receiverX, row: g[r].row, difference }));
    const rms = Math.sqrt(squares / g.length);
    return { sourceId: g[0].sourceId, sourceX: sx, offEnd, picks: g.length, rms, mean, corrections };
  });
  return { rms: Math.sqrt(sum / count), worst, picks: count, sources, timeShift, residuals };
}

interface CheckedPick {
  sourceId: string;
  sourceX: number;
  sourceElev: number;
  receiverX: number;
  receiverElev: number;
  time: number;
  row: number;
  /** Layer whose arrival the line fits assign the pick to (1 = direct wave). */
  layer: number;
}

/**
 * Every pick the line fits used, once each: outliers left out, and a zero-offset pick, which
 * joins every branch of its source, counted once.
 */
export function checkedPicks(fits: BranchFit[]): CheckedPick[] {
  const seen = new Set<string>();
  const picks: CheckedPick[] = [];
  for (const f of fits) {
    const outliers = new Set(f.outlierRows);
    f.branch.picks.forEach((p, i) => {
      const key = `${p.row}|${p.sourceId}|${p.receiverX}`;
      if (outliers.has(p.row) || seen.has(key)) return;
      seen.add(key);
      const layer = f.segments.find((s) => i >= s.start && i < s.end)?.layer ?? 1;
      picks.push({ sourceId: p.sourceId, sourceX: p.sourceX, sourceElev: p.sourceElev, receiverX: p.receiverX, receiverElev: p.receiverElev, time: p.time, row: p.row, layer });
    });
  }
  return picks;
}

/**
 * Node positions: every receiver, then continued at the geophone spacing beyond the first and
 * the last out to `lowest` and `highest` (the sources off the ends), as the layered inversion's
 * nodes are.
 */
function nodesAlong(receiverXs: number[], lowest: number, highest: number, spacing: number): Float64Array {
  const xs = [...new Set(receiverXs)].sort((a, b) => a - b);
  const before: number[] = [];
  for (let x = xs[0] - spacing; x > lowest - spacing; x -= spacing) before.unshift(x);
  const after: number[] = [];
  for (let x = xs[xs.length - 1] + spacing; x < highest + spacing; x += spacing) after.push(x);
  return Float64Array.from([...before, ...xs, ...after]);
}

/**
 * Floor of the forward-misfit threshold, in seconds: the interpreted section is built from depths
 * at the geophones joined by straight lines and velocities with their own errors, so even a sound
 * interpretation leaves a few tenths of a millisecond over the pick noise (measured on
 * forward-model lines, test/reference/sweep).
 */
export const MISFIT_FLOOR = 0.3e-3;
/** The RMS may reach this multiple of the pick noise on a sound interpretation (same sweep). */
export const MISFIT_RATIO = 2;

/**
 * Whether the forward check shows a misfit: its RMS above max(MISFIT_RATIO σ, σ + MISFIT_FLOOR),
 * σ the pick noise measured from the picks themselves (model/pickNoise.ts), never from a model's
 * residuals, which relief or a wrong layer inflate.
 *
 * @param rms - forward-check RMS, in seconds
 * @param noise - pick noise σ, in seconds
 */
export function isForwardMisfit(rms: number, noise: number): boolean {
  return rms > Math.max(MISFIT_RATIO * noise, noise + MISFIT_FLOOR);
}
