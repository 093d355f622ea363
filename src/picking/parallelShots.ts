import { median, theilSenSlope } from '../core/stats.js';
import { nearSourceArrivals, type TracePick } from './autoPick.js';
import { SHEAR_LATE } from './pickShearRecord.js';

/** One S record of a line, for the comparison of shots on one side. */
export interface ShotPicks {
  sourceX: number;
  /** Receiver position of each trace, in metres along the line. */
  receiverX: number[];
  /** The S picks, one per trace. */
  picks: TracePick[];
  /** The record's own first breaks (the P, or the S where the P is lost in the noise). */
  firstBreaks: TracePick[];
}

/**
 * Least slope of the first breaks of one shot against the S times of a shot nearer the receivers
 * for the two to be the same S head wave. Travel-time branches of one refractor from shots on
 * the same side of the receivers are parallel beyond their crossovers (their difference is the
 * constant time between the two shot points along the refractor; Redpath 1973, USAE WES Technical
 * Report E-73-4, ch. 3; Lankston 1990, in Ward (ed.) Geotechnical and Environmental Geophysics I,
 * SEG, pp. 45-73: the parallelism of overlapping branches ties arrivals to one refractor). A P
 * branch against an S branch has the slope Vs/Vp of the refractor, at most 1/√2 ≈ 0.71 for
 * Poisson's ratio ≥ 0 and 1/1.35 with picking error (the SHEAR_TO_P_LEAST of the picker): 0.85
 * lies between, with room for the picks' scatter.
 */
export const PARALLEL_LEAST = 0.85;

/**
 * Slope above which the S picks of the farther shot are not parallel to the S of the nearer one:
 * the surface wave (Rayleigh or Love, at 0.8 to 0.95 of the top-layer Vs; it does not refract, so
 * its moveout stays that of the slowest layer, common practice) against a head wave that is at
 * least 1.5 times as fast (the layer below is stiffer by that or more where a refractor is seen).
 */
export const PARALLEL_MOST = 1.3;

const timed = (p: TracePick | undefined) => (p !== undefined && (p.status === 'picked' || p.status === 'repicked') ? p.time : undefined);

/**
 * Where the first breaks of each record are the S, found against a shot whose source stands at
 * one of its receivers (an end shot, for a shot off that end). On the receivers beyond that shot,
 * the farther half of them from it (beyond its crossover), the farther shot's first breaks run
 * parallel to the nearer shot's S picks (ratio of their Theil-Sen slopes against position from
 * PARALLEL_LEAST to 1/PARALLEL_LEAST) while its own S picks do not (ratio over PARALLEL_MOST, or
 * fewer than half of those traces picked): the first breaks there are the S head wave, the P is
 * lost in the noise, and the S picks made after them follow the surface wave. At least six
 * traces are compared. The S expected at each receiver beyond is then the nearer shot's S plus the
 * median difference of the two over that farther half (the constant of parallel branches; the
 * nearer shot's S as a running median over five receivers). Inwards from the farthest receiver
 * whose first break lies within max(2 ms, SHEAR_LATE of the time) of it, each receiver is guided
 * to its own first break where that lies within the tolerance, else to that time, but not where
 * its first break comes earlier (a P still seen there); three first breaks in a row off that time
 * end the run (nearer the nearer shot its S is its direct wave, no longer parallel). Nearer the
 * farther shot than the run, first breaks that continue it inwards with the shape of a
 * first-arrival curve are guided to themselves (`nearSourceArrivals`).
 *
 * @param arrivals - per record, its first breaks (or the P moveout fitted to them)
 * @returns per record and trace, the S time expected where the first break is the S; undefined
 *   elsewhere (all undefined for a record with nothing found)
 */
export function shearGuides(shots: ShotPicks[]): (number | undefined)[][] {
  return shots.map((a) => {
    const guide: (number | undefined)[] = a.receiverX.map(() => undefined);
    const done = new Set<number>();
    for (const b of shots) {
      if (b === a || b.sourceX === a.sourceX) continue;
      // The nearer shot stands at a receiver of the farther one's record.
      if (!a.receiverX.some((x) => Math.abs(x - b.sourceX) < 1e-6)) continue;
      const side = Math.sign(b.sourceX - a.sourceX);
      if (done.has(side)) continue;
      const beyond = a.receiverX.map((x, i) => ({ x, i, j: b.receiverX.findIndex((bx) => Math.abs(bx - x) < 1e-6) }))
        .filter(({ x, j }) => Math.sign(x - b.sourceX) === side && j >= 0 && timed(b.picks[j]) !== undefined)
        .sort((p, q) => Math.abs(p.x - b.sourceX) - Math.abs(q.x - b.sourceX));
      const far = beyond.slice(beyond.length >> 1);
      // Slopes against the distance from the nearer shot (exact), each by Theil-Sen, so that outliers in either shot's
      // picks do not bend them; the ratio of two is the slope of one branch against the other.
      const slope = (times: (k: { i: number; j: number }) => number | undefined) => {
        const withTimes = far.filter((k) => times(k) !== undefined);
        return withTimes.length >= 6 ? theilSenSlope(withTimes.map(({ x }) => Math.abs(x - b.sourceX)), withTimes.map((k) => times(k)!)) : undefined;
      };
      const nearer = slope(({ j }) => timed(b.picks[j]));
      const breaks = slope(({ i }) => timed(a.firstBreaks[i]));
      if (nearer === undefined || breaks === undefined || nearer <= 0) continue;
      const parallel = breaks / nearer;
      if (parallel < PARALLEL_LEAST || parallel > 1 / PARALLEL_LEAST) continue;
      const picked = far.filter(({ i }) => timed(a.picks[i]) !== undefined).length;
      const own = slope(({ i }) => timed(a.picks[i]));
      if (2 * picked >= far.length && own !== undefined && own / nearer <= PARALLEL_MOST) continue;
      const shift = median(far.filter(({ i }) => timed(a.firstBreaks[i]) !== undefined).map(({ i, j }) => timed(a.firstBreaks[i])! - timed(b.picks[j])!))!;
      // From the far end inwards, while the branches stay parallel: nearer the nearer shot its S
      // is its direct wave, no longer parallel, and three first breaks in a row off the expected
      // time end the run (those three are not guided).
      let matched = false;
      const missed: number[] = [];
      for (let k = beyond.length - 1; k >= 0; k--) {
        const { i } = beyond[k];
        // The nearer shot's S as a running median over five receivers (its outliers passed over).
        const expected = median(beyond.slice(Math.max(0, k - 2), k + 3).map(({ j }) => timed(b.picks[j])!))! + shift;
        const own = timed(a.firstBreaks[i]);
        const tolerance = Math.max(2e-3, SHEAR_LATE * expected);
        if (own !== undefined && Math.abs(own - expected) <= tolerance) {
          matched = true;
          missed.length = 0;
          guide[i] = own;
          continue;
        }
        if (!matched) continue;
        if (own !== undefined) missed.push(i);
        if (missed.length >= 3) {
          for (const m of missed) guide[m] = undefined;
          break;
        }
        // A first break earlier than the S expected is a P still seen there.
        if (own === undefined || own > expected) guide[i] = expected;
      }
      // Between the farther shot and the innermost receiver guided, where the nearer shot's S is
      // still its direct wave and not parallel, the first breaks are kept as the S where they continue
      // the guided S inwards with the shape of a first-arrival curve (`nearSourceArrivals`: above
      // the chord from the shot, below the secant of the next two extended back).
      const first = beyond.findIndex(({ i }) => guide[i] !== undefined);
      if (first > 0) {
        const members = beyond.filter(({ i }, k) => (k < first ? timed(a.firstBreaks[i]) !== undefined : guide[i] !== undefined))
          .map(({ x, i }) => ({ i, x: Math.abs(x - a.sourceX), time: guide[i] ?? timed(a.firstBreaks[i])! }));
        const gap = new Set(beyond.slice(0, first).map(({ i }) => i));
        for (const i of nearSourceArrivals(members, gap, () => Infinity, 2e-3)) guide[i] = timed(a.firstBreaks[i]);
      }
      done.add(side);
    }
    return guide;
  });
}
