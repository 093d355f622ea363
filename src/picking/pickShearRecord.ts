import { checkRecord, localSpikes, pickNear, pickRecord, pickTrace, travelTimeFit, windows, type PickOptions, type PickTrace, type TracePick } from './autoPick.js';
import { SHEAR_AFTER_P, shearAfter, shearOnset } from './shearOnset.js';
import { minOf } from '../core/extent.js';

/**
 * The P arrival expected at each trace from the P first breaks of the record: per side, the
 * first breaks confirmed as the weaker P ahead of an S (spikes removed as in the record check)
 * fitted by the segmented regression against offset (`travelTimeFit`) and read on the lower
 * envelope of its lines, so that traces whose P is lost in the noise still get a P time. Beyond
 * the farthest confirmed first break the P may be faster (a deeper refractor) than the fit knows,
 * so the time the S search starts from there is the smaller of the extended fit and the trace's
 * own first break. Sides with fewer than six confirmed first breaks keep each trace's own.
 *
 * @param confirmed - first breaks taken as P (others with no time); raw - every first break
 * @returns per trace, in seconds after the shot: `curve`, the P time expected (for the check that
 *   an S pick is not on the P), and `search`, the P time the S search starts after; undefined
 *   where there is none (and at zero offset, where P and S leave together)
 */
export function pMoveout(traces: PickTrace[], confirmed: TracePick[], raw: TracePick[] = confirmed): { curve: (number | undefined)[]; search: (number | undefined)[] } {
  const timeOf = (p: TracePick, i: number) => (traces[i].offset !== 0 && (p.status === 'picked' || p.status === 'repicked') ? p.time : undefined);
  const curve: (number | undefined)[] = confirmed.map(timeOf);
  const search = [...curve];
  for (const side of [-1, 1]) {
    const members = traces.map((t, i) => ({ x: Math.abs(t.offset), i })).filter(({ i }) => Math.sign(traces[i].offset) === side && curve[i] !== undefined)
      .sort((a, b) => a.x - b.x);
    if (members.length < 6) continue;
    // The concave run from the source first, then early spikes (noise taken for a weak P) as in
    // the record check of the first breaks: where the P fades out with offset the first breaks
    // beyond are the S, and they would outnumber the P as neighbours in the spike test.
    const dt = traces[members[0].i].sampleInterval;
    const run = outwardConcave(members.map((m) => ({ ...m, time: curve[m.i]! })), dt);
    const spikes = new Set(localSpikes(run.map((m) => m.x), run.map((m) => m.time), dt));
    const clean = run.filter((_, k) => !spikes.has(k));
    if (clean.length < 6) continue;
    const fit = travelTimeFit(clean.map((m) => m.x), clean.map((m) => curve[m.i]!));
    if (fit === undefined) continue;
    const reach = clean[clean.length - 1].x;
    const predict = (x: number) => Math.max(0, minOf(fit.segments.map((segment) => segment.intercept + segment.slope * x)));
    // Nearer the source than the first P kept, the first breaks not taken as P are the S (the P
    // missed) or noise, later than the P moveout or on it: where half of them (three at least)
    // come well before it, the moveout is not that of the first arrival, and the first breaks it
    // rests on are S ahead of a surface wave. The side then has no P.
    const nearer = traces.map((t, i) => ({ t, i })).filter(({ t, i }) => Math.sign(t.offset) === side && Math.abs(t.offset) < clean[0].x && confirmed[i].time === undefined && timeOf(raw[i], i) !== undefined);
    const early = nearer.filter(({ t, i }) => {
      const expected = predict(Math.abs(t.offset));
      return raw[i].time! < expected - Math.max(2e-3, 4 * dt);
    }).length;
    if (early >= 3 && 2 * early >= nearer.length) {
      traces.forEach((t, i) => {
        if (Math.sign(t.offset) === side) curve[i] = search[i] = undefined;
      });
      continue;
    }
    traces.forEach((t, i) => {
      if (Math.sign(t.offset) !== side) return;
      const x = Math.abs(t.offset);
      curve[i] = predict(x);
      const own = timeOf(raw[i], i);
      search[i] = x <= reach || own === undefined ? curve[i] : Math.min(curve[i]!, own);
    });
  }
  return { curve, search };
}

export interface ShearPickResult {
  /** The S picks, one per trace. */
  picks: TracePick[];
  /** The P time expected at each trace, in seconds after the shot (undefined: none). */
  pTimes: (number | undefined)[];
  /** The first breaks of the record (or the P picks given), one per trace. */
  firstBreaks: TracePick[];
}

/**
 * Picks the S-wave onset on every trace of an SH record (horizontal geophones, beam source):
 * the P first breaks are picked first (`pickRecord`; kept as P by `confirmedP` where `precedesShear` confirms a
 * stronger arrival after them; or given: for a polarity pair, from the sum of the two records,
 * where the S cancels), their moveout fitted across the record (`pMoveout`), each trace's S onset
 * searched after its P (`shearOnset`), and the S picks then checked across the record like first
 * breaks (`checkRecord`: the S moveout by segmented regression, re-picks near it by AIC never
 * earlier than SHEAR_AFTER_P × the P time). A pick within max(3 samples, 1 ms) of the P moveout
 * is on the P arrival, not the S: it is tried again near the S moveout, and left unpicked with
 * that status if it is still there. Last, the traces next to the source, where the S lags the P by
 * only a few samples, are checked against the direct S expected from the picks beyond them
 * (`nearSourceShear`).
 *
 * @param pFirstBreaks - P picks per trace to use instead of picking the record's first breaks
 * @param sGuide - per trace, the S time expected where the first break is the S and no P is seen
 *   (`shearGuides`, from the shots of the line); such a trace has no P time, and its S is picked
 *   near that time (`nearGuide`)
 */
export function pickShearRecord(traces: PickTrace[], options: PickOptions = {}, pFirstBreaks?: TracePick[], sGuide: (number | undefined)[] = []): ShearPickResult {
  const raw = pFirstBreaks ?? pickRecord(traces, options);
  // First breaks of this record count as P only where a stronger arrival follows them.
  const confirmed = (pFirstBreaks ?? confirmedP(traces, raw, options)).map((p, i) => (sGuide[i] === undefined ? p : { ...p, time: undefined, status: 'no clear onset' as const }));
  const { curve, search } = pMoveout(traces, confirmed, raw);
  traces.forEach((_, i) => {
    if (sGuide[i] !== undefined) curve[i] = search[i] = undefined;
  });
  const onP = (pick: TracePick, i: number) => pick.time !== undefined && curve[i] !== undefined && Math.abs(pick.time - curve[i]!) <= Math.max(3 * traces[i].sampleInterval, 1e-3);
  const initial = traces.map((t, i) => {
    // At zero offset the P and the S leave together: the first energy is the onset.
    if (t.offset === 0) return pickTrace(t, options);
    if (sGuide[i] !== undefined) return nearGuide(t, sGuide[i]!, raw[i], options);
    const pick = shearOnset(t, search[i], options);
    return onP(pick, i) ? { confidence: 0, status: 'no clear onset' as const, snr: pick.snr } : pick;
  });
  const bounded = shearMoveoutBound(traces, initial, raw, curve, search, options);
  const picks = checkRecord(traces, bounded, (i, predicted, halfWidth) => {
    const p = search[i];
    return pickNear(traces[i], predicted, halfWidth, options, p === undefined ? -Infinity : SHEAR_AFTER_P * p);
  });
  picks.forEach((pick, i) => {
    if (onP(pick, i)) picks[i] = { confidence: 0, status: 'on the P arrival', snr: pick.snr };
  });
  return { picks: nearSourceShear(traces, picks, curve, options), pTimes: curve, firstBreaks: raw };
}

/**
 * The S pick of a trace whose first break is the S, near the time expected for it: the
 * trace's own first break where it lies within max(2 ms, 4 samples, SHEAR_LATE of the time) of
 * that time, else an AIC re-pick around it within the same tolerance, else none.
 */
function nearGuide(t: PickTrace, guide: number, firstBreak: TracePick, options: PickOptions): TracePick {
  const tolerance = Math.max(2e-3, 4 * t.sampleInterval, SHEAR_LATE * guide);
  const own = firstBreak.status === 'picked' || firstBreak.status === 'repicked' ? firstBreak.time : undefined;
  if (own !== undefined && Math.abs(own - guide) <= tolerance) return firstBreak;
  const again = pickNear(t, guide, Math.max(3 * tolerance, 4e-3), options);
  return again !== undefined && Math.abs(again.time! - guide) <= tolerance ? { ...again, status: 'repicked', confidence: again.confidence / 2 } : { confidence: 0, status: 'no clear onset' };
}

/**
 * Least median ratio of the S time to the first-break time, on the traces nearest the source,
 * for the first breaks to be taken as P: Vp/Vs ≥ √2 in any ground with Poisson's ratio ≥ 0, and
 * soils show 1.7 to 3 or more (common practice), while a surface wave behind the S (slower than
 * the top layer's S) follows a first break that is itself the S at only 1.1 to 1.3 times its time.
 */
export const SHEAR_TO_P_NEAR = 1.5;

/**
 * The first breaks of an SH record that are P (`precedesShear`: an S twice as strong follows
 * them); none at all when, on the six traces nearest the source on each side, the median ratio
 * of that S to the first break is under SHEAR_TO_P_NEAR: the first breaks are then the S itself
 * and what follows them the surface wave. The others lose their time.
 */
export function confirmedP(traces: PickTrace[], firstBreaks: TracePick[], options: PickOptions = {}): TracePick[] {
  const after = traces.map((t, i) => {
    const time = firstBreaks[i].time;
    if (time === undefined || t.offset === 0 || time <= 0) return undefined;
    const s = shearAfter(t, time, options);
    // The first S comes at least √2 times as late as the first P (SHEAR_AFTER_P): a stronger
    // arrival sooner than SHEAR_TO_P_LEAST times the first break is not the S after a P.
    return s !== undefined && s >= SHEAR_TO_P_LEAST * time ? s : undefined;
  });
  // Near the source the ratio of a trace whose first break is not confirmed is that of the onset
  // found after it, stronger or not (a P with its S blurred by noise still has the S well after
  // it), and 1 where no onset at all follows it: a first break with nothing after it but a
  // surface wave too close to trigger on is the S itself. Such a trace counts only where an S at
  // SHEAR_TO_P_NEAR times its time would lag it by two STA windows or more (nearer, the trigger
  // cannot tell the two apart).
  const nearRatio = (i: number): number | undefined => {
    const time = firstBreaks[i].time;
    if (after[i] !== undefined) return after[i]! / time!;
    const t = traces[i];
    if (t.offset === 0 || time === undefined || time <= 0 || (SHEAR_TO_P_NEAR - 1) * time < 2 * windows(t, options).short * t.sampleInterval) return undefined;
    const onset = shearOnset(t, time, options).time;
    return onset === undefined ? 1 : onset / time;
  };
  const ratios: number[] = [];
  // Confirmed first breaks among those nearest the source whose S comes SHEAR_TO_P_NEAR times as
  // late or more: a surface wave behind a direct S does not lag that much, so they stay P.
  const nearP = new Set<number>();
  for (const side of [-1, 1]) {
    let count = 0;
    for (const { i } of traces.map((t, k) => ({ x: Math.abs(t.offset), i: k })).filter(({ i }) => Math.sign(traces[i].offset) === side).sort((a, b) => a.x - b.x)) {
      if (count >= 6) break;
      const ratio = nearRatio(i);
      if (ratio === undefined) continue;
      count++;
      ratios.push(ratio);
      if (after[i] !== undefined && ratio >= SHEAR_TO_P_NEAR) nearP.add(i);
    }
  }
  ratios.sort((a, b) => a - b);
  const none = ratios.length > 0 && ratios[ratios.length >> 1] < SHEAR_TO_P_NEAR;
  return firstBreaks.map((p, i) => ((none && !nearP.has(i)) || after[i] === undefined ? { ...p, time: undefined, status: 'no clear onset' as const } : p));
}

/**
 * Least ratio of an S onset to the first break for the first break to be taken as its P: √2
 * (Vp/Vs ≥ √2 for Poisson's ratio ≥ 0) less 5 % for the error of the two picks. A surface wave
 * behind a first break that is itself the S comes at 1.05 to 1.25 times its time where the S
 * is the direct wave (surface waves at 0.8 to 0.95 of the top-layer Vs, common practice).
 */
export const SHEAR_TO_P_LEAST = 1.35;

/**
 * The first breaks of one side (sorted by offset) that continue a concave first-arrival curve
 * outwards from the source: each is kept when it is no later, within max(1 ms, 3 samples, a fifth
 * of the time), than the line through the last four kept ones (Theil-Sen) extended to it, nor
 * than 1.2 times the median time over offset of those four (a concave curve through the shot has
 * a time over offset that only falls outwards), and no earlier than the last kept one. A P
 * curve only bends towards faster slopes (deeper, faster refractors); first breaks that jump later
 * than the extension are not the P but the S (1.4 to 3 times as late) where the P is lost in the
 * noise: a single one is passed over, and after three in a row the rest are left out.
 */
function outwardConcave<T extends { x: number; time: number }>(members: T[], dt: number): T[] {
  const kept: T[] = [];
  const tolerance = Math.max(1e-3, 3 * dt);
  let late = 0;
  for (const m of members) {
    // A first-arrival curve does not come earlier at a farther geophone (apparent velocities are
    // positive): a first break earlier than the last kept one is noise taken for a weak P.
    if (kept.length > 0 && m.time < kept[kept.length - 1].time - tolerance) continue;
    if (kept.length >= 2) {
      const last = kept.slice(-4);
      const slopes: number[] = [];
      for (let a = 0; a < last.length; a++) for (let b = a + 1; b < last.length; b++) if (last[b].x > last[a].x) slopes.push((last[b].time - last[a].time) / (last[b].x - last[a].x));
      slopes.sort((p, q) => p - q);
      const slope = slopes.length > 0 ? slopes[slopes.length >> 1] : 0;
      const end = kept[kept.length - 1];
      const extended = end.time + slope * (m.x - end.x);
      // Through the shot (t = 0 at offset 0) a concave curve's time over offset only falls outwards.
      const slowness = last.map((k) => k.time / k.x).sort((p, q) => p - q)[last.length >> 1];
      if (m.time > extended + Math.max(tolerance, 0.2 * extended) || m.time > 1.2 * slowness * m.x + tolerance) {
        if (++late >= 3) break;
        continue;
      }
    }
    late = 0;
    kept.push(m);
  }
  return kept;
}

/**
 * Share of its own extended time by which an S pick may come later than the S line of the picks
 * nearer the source: a first-arrival curve is concave (the lower envelope of direct and head-wave
 * lines; Telford et al. 1990, ch. 4), so it never rises above the extension of a chord nearer the
 * source but by the picking error, while a surface wave slower than the top layer's S (0.8 to
 * 0.95 of it, common practice) comes 5 to 25 % later than the direct S, more beyond the crossover
 * where the S bends earlier.
 */
export const SHEAR_LATE = 0.03;

/**
 * Share of its extended time by which an S onset may come earlier than the S line of the picks
 * nearer the source (the curve bends towards faster slopes at a crossover) when a late pick is
 * replaced; a P comes at most 1/√2 ≈ 0.71 of the S time, so a replacement is never the P.
 */
export const SHEAR_BEND = 0.15;

/**
 * The S picks bounded by the record's own S moveout. First, a pick later than the trace's first
 * break by more than max(2 ms, 4 samples) but sooner than SHEAR_TO_P_LEAST times it is not the S
 * after a P: the first break is the S there (replaced as below). Then per side, outwards from the
 * shot, each pick beyond the fourth is bounded by the median time over offset of the last five
 * kept picks times its offset (a concave curve through the shot has a time over offset that only
 * falls outwards; spikes against their neighbours, `localSpikes`, are judged but not kept). A
 * pick later than that bound by more than the tolerance, max(2 ms, 4 samples, SHEAR_LATE of the
 * time), has passed the S onset and stopped on the slower surface wave. It is replaced by the
 * trace's first break where that lies between SHEAR_BEND of the time before the lower of the bound
 * and the Theil-Sen line of those five extended, and the bound plus the tolerance (the first break is then the S and the P is lost in the noise: a P comes at
 * most 1/√2 of the S time, outside that span; the trace loses its P time), else by an AIC re-pick
 * in that span (never earlier than SHEAR_AFTER_P times the P time; such a re-pick does not extend
 * the line), else it is left `inconsistent`. Traces with no S onset of their own are tried the
 * same way. `curve` and `search` are updated in place for the traces whose first break became
 * the S.
 */
export function shearMoveoutBound(traces: PickTrace[], initial: TracePick[], firstBreaks: TracePick[], curve: (number | undefined)[], search: (number | undefined)[], options: PickOptions = {}): TracePick[] {
  const picks = [...initial];
  const asShear = (i: number) => {
    picks[i] = { ...firstBreaks[i], status: 'repicked', confidence: firstBreaks[i].confidence / 2 };
    curve[i] = undefined;
    search[i] = undefined;
  };
  // An onset after the first break but sooner than SHEAR_TO_P_LEAST times it cannot be the S
  // after a P there: the first break is the S, and the later onset the surface wave.
  traces.forEach((t, i) => {
    const own = firstBreaks[i].time;
    const time = picks[i].time;
    if (t.offset !== 0 && own !== undefined && own > 0 && time !== undefined && time > own + Math.max(2e-3, 4 * t.sampleInterval) && time < SHEAR_TO_P_LEAST * own) asShear(i);
  });
  for (const side of [-1, 1]) {
    const members = traces.map((t, i) => ({ x: Math.abs(t.offset), i })).filter(({ i }) => Math.sign(traces[i].offset) === side && picks[i].status !== 'dead')
      .sort((a, b) => a.x - b.x);
    const kept: { x: number; time: number }[] = [];
    const replaced = new Set<number>();
    // Spikes (as in the record check) do not shape the line that judges the others.
    const timed = members.filter(({ i }) => picks[i].time !== undefined);
    const spikes = new Set(localSpikes(timed.map((m) => m.x), timed.map(({ i }) => picks[i].time!), traces[members[0]?.i ?? 0].sampleInterval).map((k) => timed[k].i));
    for (const { x, i } of members) {
      // A trace with no onset of its own is looked at near the extension too.
      const time = picks[i].time ?? Infinity;
      if (kept.length >= 4 && x > kept[kept.length - 1].x) {
        const last = kept.slice(-5);
        const slopes: number[] = [];
        for (let a = 0; a < last.length; a++) for (let b = a + 1; b < last.length; b++) if (last[b].x > last[a].x) slopes.push((last[b].time - last[a].time) / (last[b].x - last[a].x));
        slopes.sort((p, q) => p - q);
        const end = kept[kept.length - 1];
        const extended = end.time + slopes[slopes.length >> 1] * (x - end.x);
        // A concave curve through the shot has a time over offset that only falls outwards: the
        // median of the last five, times this offset, bounds the S from above.
        const bound = last.map((k) => k.time / k.x).sort((p, q) => p - q)[last.length >> 1] * x;
        const tolerance = Math.max(2e-3, 4 * traces[i].sampleInterval, SHEAR_LATE * bound);
        // The S may come earlier than the line (it bends at a crossover), never as early as its P
        // (at most 1/√2 of the S time).
        const line = Math.min(extended, bound);
        const earliest = line - Math.max(tolerance, SHEAR_BEND * line);
        const latest = bound + tolerance;
        const within = (t: number) => t >= earliest && t <= latest;
        if (time > latest) {
          const own = firstBreaks[i].time;
          if (own !== undefined && within(own)) asShear(i);
          else {
            const p = search[i];
            const again = pickNear(traces[i], (earliest + latest) / 2, Math.max((latest - earliest) / 2, 4e-3), options, p === undefined ? -Infinity : SHEAR_AFTER_P * p);
            replaced.add(i);
            picks[i] = again !== undefined && within(again.time!)
              ? { ...again, status: 'repicked', confidence: again.confidence / 2 }
              : picks[i].time === undefined ? picks[i] : { confidence: 0, status: 'inconsistent', snr: picks[i].snr };
          }
        }
      }
      // Re-picks made near the line do not extend it (they would only carry it on).
      if (picks[i].time !== undefined && !spikes.has(i) && !replaced.has(i)) kept.push({ x, time: picks[i].time! });
    }
  }
  return picks;
}

/**
 * Least S-minus-P lag, as a share of the S time, for an S pick to be one the near-source check
 * leans on: an S pick 1.4 times its P time or later (Vp/Vs ≥ √2, SHEAR_AFTER_P) lags the P by 30 %
 * of its own time or more, well clear of the P wavelet.
 */
export const NEAR_SOURCE_LAG = 0.3;

/**
 * Number of S picks beyond the near-source traces whose time over offset gives the direct S
 * slowness there (their median).
 */
export const NEAR_SOURCE_REFERENCES = 5;

/**
 * Near the source the S comes only a few samples after the P (the lag grows with offset: a fact
 * of the trade), so the S search can stop in the P coda, between the two. The direct S slowness
 * near the source is the median time over offset of the NEAR_SOURCE_REFERENCES S picks nearest the
 * source on the side (on both sides together where one side has too few) whose lag behind the
 * expected P is NEAR_SOURCE_LAG of their time and max(2 ms, 8 samples) or more. Every trace nearer
 * the source than the first of them expects its S at that slowness times its offset: the direct
 * wave leaves the source at the top layer's Vs, and a delay at the source or a bend to a head wave
 * farther out only lowers that time over offset at the references, so the expected time is never
 * too late. A pick earlier than the larger of the midpoint between the P time and that expected S
 * and (1 − SHEAR_BEND) of the expected S is not the S (a P comes at most 1/√2 of the S time). It
 * is tried again by AIC around the expected S and kept, as a re-pick, only within max(4 samples,
 * SHEAR_BEND of the time) of it; otherwise the trace is left unpicked ('on the P arrival').
 */
export function nearSourceShear(traces: PickTrace[], picks: TracePick[], curve: (number | undefined)[], options: PickOptions = {}): TracePick[] {
  const out = [...picks];
  const timed = (i: number) => (picks[i].status === 'picked' || picks[i].status === 'repicked' ? picks[i].time : undefined);
  const sides = [-1, 1].map((side) => {
    const members = traces.map((t, i) => ({ x: Math.abs(t.offset), i })).filter(({ x, i }) => x > 0 && Math.sign(traces[i].offset) === side).sort((a, b) => a.x - b.x);
    const references = members.filter(({ i }) => {
      const time = timed(i);
      const p = curve[i];
      return time !== undefined && (p === undefined || time - p >= Math.max(NEAR_SOURCE_LAG * time, 2e-3, 8 * traces[i].sampleInterval));
    });
    return { members, references };
  });
  const slownessOf = (references: { x: number; i: number }[]) => references.slice(0, NEAR_SOURCE_REFERENCES).map(({ x, i }) => timed(i)! / x).sort((a, b) => a - b)[Math.min(references.length, NEAR_SOURCE_REFERENCES) >> 1];
  const both = [...sides[0].references, ...sides[1].references].sort((a, b) => a.x - b.x);
  for (const { members, references } of sides) {
    const own = references.length >= NEAR_SOURCE_REFERENCES;
    if (!own && both.length < NEAR_SOURCE_REFERENCES) continue;
    const slowness = slownessOf(own ? references : both);
    // Traces nearer than the median reference are judged (a first reference with a pick in the
    // P coda would otherwise shield the traces nearer the source).
    const reach = (own ? references : both)[NEAR_SOURCE_REFERENCES >> 1].x;
    for (const { x, i } of members) {
      if (x >= reach) break;
      const time = timed(i);
      if (time === undefined) continue;
      const expected = slowness * x;
      const p = curve[i] ?? 0;
      const lower = Math.max((p + expected) / 2, (1 - SHEAR_BEND) * expected);
      if (time >= lower) continue;
      const tolerance = Math.max(4 * traces[i].sampleInterval, SHEAR_BEND * expected);
      const again = pickNear(traces[i], expected, tolerance, options, lower);
      out[i] = again !== undefined && Math.abs(again.time! - expected) <= tolerance && again.time! >= lower
        ? { ...again, status: 'repicked', confidence: again.confidence / 2 }
        : { confidence: 0, status: 'on the P arrival', snr: picks[i].snr };
    }
  }
  return out;
}
