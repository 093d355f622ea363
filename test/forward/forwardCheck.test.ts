import { describe, expect, it } from 'vitest';
import type { BranchFit, FirstBreak, Layer, RefractorPoint } from '../../src/core/types.js';
import { forwardCheck } from '../../src/forward/forwardCheck.js';
import { summary } from '../../src/report/summary.js';
import { firstArrivals, seededNormal, syntheticCsv } from '../reference/layeredTravelTimes.js';
import { csvFrom, interpretCsv, range } from '../helpers.js';

/**
 * Branch fits made by hand from picks (one branch per source and side, every pick with the layer
 * whose arrival it is), so the forward check is tested on its own, apart from the line fits.
 */
function handFits(picks: (FirstBreak & { layer: number })[]): BranchFit[] {
  const groups = new Map<string, (FirstBreak & { layer: number })[]>();
  for (const p of picks) {
    const key = `${p.sourceId}|${p.receiverX >= p.sourceX ? 'forward' : 'reverse'}`;
    groups.set(key, [...(groups.get(key) ?? []), p]);
  }
  return [...groups.entries()].map(([key, list]) => {
    const side = key.endsWith('forward') ? 'forward' : 'reverse';
    list.sort((a, b) => Math.abs(a.receiverX - a.sourceX) - Math.abs(b.receiverX - b.sourceX));
    // Consecutive runs of one layer become segments (only their layer and range are read).
    const segments = [];
    for (let i = 0; i < list.length;) {
      let j = i;
      while (j < list.length && list[j].layer === list[i].layer) j++;
      segments.push({ order: segments.length + 1, layer: list[i].layer, start: i, end: j } as BranchFit['segments'][number]);
      i = j;
    }
    const offsets = list.map((p) => Math.abs(p.receiverX - p.sourceX));
    return {
      branch: { sourceId: list[0].sourceId, sourceX: list[0].sourceX, sourceElev: list[0].sourceElev, side, picks: list, offsets, distances: offsets, times: list.map((p) => p.time) },
      segments, outlierRows: [], residualSd: 0, criterionBySegments: [], chosenBy: 'criterion',
    } as BranchFit;
  });
}

describe('forwardCheck over a plane dipping refractor (closed-form head-wave times)', () => {
  // Flat ground at 100 m; a plane refractor dipping δ = 4° towards +x, 10 m down at x = 0;
  // V1 = 600 m/s, V2 = 2400 m/s; 48 geophones at 2 m; sources off both ends and inside.
  // Head-wave time over a plane dipping refractor (Telford, Geldart & Sheriff 1990, §4.2.3;
  // Palmer 1980): t = x cos δ / V2 + (h_s + h_r) cos θc / V1, h the perpendicular depths under
  // source and receiver, θc = asin(V1/V2); the first arrival is the smaller of it and x / V1.
  const v1 = 600;
  const v2 = 2400;
  const dip = (4 * Math.PI) / 180;
  const ground = 100;
  const elevation = (x: number) => ground - 10 - Math.tan(dip) * x;
  const perpendicular = (x: number) => (ground - elevation(x)) * Math.cos(dip);
  const cosCritical = Math.cos(Math.asin(v1 / v2));
  const head = (sx: number, rx: number) => (Math.abs(rx - sx) * Math.cos(dip)) / v2 + ((perpendicular(sx) + perpendicular(rx)) * cosCritical) / v1;
  const receivers = range(48, 2);
  const sources = [-60, 0, 47, 94, 160];
  let row = 2;
  const picks = sources.flatMap((sx, s) => receivers.filter((rx) => rx !== sx).map((rx) => {
    const direct = Math.abs(rx - sx) / v1;
    const refracted = head(sx, rx);
    return { sourceId: `S${s + 1}`, sourceX: sx, sourceElev: ground, receiverX: rx, receiverElev: ground, time: Math.min(direct, refracted), row: row++, layer: refracted < direct ? 2 : 1 };
  }));
  const fits = handFits(picks);
  const layers = [{ index: 1, velocity: v1, velocitySe: 0 }, { index: 2, velocity: v2, velocitySe: 0 }] as Layer[];
  // The true refractor under every geophone, as a recommended profile would give it.
  const points: RefractorPoint[] = receivers.map((x) => ({ x, depth: ground - elevation(x), elev: elevation(x), depthSe: 0 }));
  const check = forwardCheck({ fits, layers, refractors: [{ points }], receivers: receivers.map((x) => ({ x, elev: ground })), spacing: 2 })!;

  it('forwardCheck(true section) explains every pick of every source, those off the ends included, within 0.05 ms RMS', () => {
    expect(check.sources.map((s) => s.sourceId)).toEqual(['S1', 'S2', 'S3', 'S4', 'S5']);
    expect(check.sources.map((s) => s.offEnd)).toEqual([true, false, false, false, true]);
    expect(check.picks).toBe(picks.length);
    // Inside the spread the section is the plane, sampled every metre: 0.005-0.011 ms measured.
    for (const s of check.sources.filter((q) => !q.offEnd)) expect(s.rms).toBeLessThan(0.02e-3);
    // Off the ends the section is held flat, not the plane: after the delay under the source is
    // taken out, the bend at the end of the spread leaves 0.05-0.07 ms (measured).
    for (const s of check.sources.filter((q) => q.offEnd)) expect(s.rms).toBeLessThan(0.1e-3);
    expect(check.rms).toBeLessThan(0.05e-3);
  });

  it('forwardCheck takes the delay under an off-end source from its picks: the closed-form difference within 0.05 ms', () => {
    // Beyond the geophones the section is held flat at the end K (x_K, depth z_K). Through it, the
    // head wave reaches K at z_K cos θc / V1 + D / V2 (flat refractor, D = |x_s − x_K|), then runs
    // along the plane to the foot of the receiver's perpendicular, (x_r − x_K) cos δ ∓ z_K sin δ
    // from K (− down the dip, + up it), and climbs h_r cos θc / V1. Against the plane's own time
    // above, the picks lead the section by
    //   (h_s − z_K) cos θc / V1 + (D (cos δ − 1) ± z_K sin δ) / V2.
    const expected = (sx: number, end: number, downDip: boolean) => {
      const zK = ground - elevation(end);
      return ((perpendicular(sx) - zK) * cosCritical) / v1 + (Math.abs(sx - end) * (Math.cos(dip) - 1) + (downDip ? 1 : -1) * zK * Math.sin(dip)) / v2;
    };
    const [left, , , , right] = check.sources;
    expect(left.corrections).toHaveLength(1);
    expect(left.corrections[0].layer).toBe(2);
    expect(Math.abs(left.corrections[0].correction - expected(-60, 0, true))).toBeLessThan(0.05e-3);
    expect(Math.abs(right.corrections[0].correction - expected(160, 94, false))).toBeLessThan(0.05e-3);
    // Several milliseconds: without the correction these sources would be misfit by that much.
    expect(Math.abs(left.mean)).toBeGreaterThan(5e-3);
    expect(Math.abs(right.mean)).toBeGreaterThan(3e-3);
    // Sources inside the spread take no correction.
    expect(check.sources.slice(1, 4).every((s) => s.corrections.length === 0)).toBe(true);
  });

  it('forwardCheck(section 1 m too deep under x ≥ 48 m) shows it in the per-source RMS of the sources whose rays cross there', () => {
    const deeper = points.map((p) => (p.x >= 48 ? { ...p, depth: p.depth + 1, elev: p.elev - 1 } : p));
    const wrong = forwardCheck({ fits, layers, refractors: [{ points: deeper }], receivers: receivers.map((x) => ({ x, elev: ground })), spacing: 2 })!;
    // 1 m more depth delays a head wave by cos θc / V1 = 1.61 ms at each end of its path under it.
    expect(wrong.rms).toBeGreaterThan(0.5e-3);
    for (const s of wrong.sources) expect(s.rms).toBeGreaterThan(0.3e-3);
  });
});

describe('the forward check of an interpretation', () => {
  const section = { surface: () => 100, interfaces: [(x: number) => 94 - 0.02 * x], velocities: [500, 2200] };
  const csv = syntheticCsv(section, [-10, 0, 35.5, 71, 81], range(72, 1), 0.3, 8);

  it('interpret(forward-model line with 0.3 ms noise) fits its picks to about the pick noise (0.25 to 0.4 ms RMS), off-end sources included', () => {
    const { result, log } = interpretCsv(csv);
    expect(result.forward!.rms).toBeGreaterThan(0.25e-3);
    expect(result.forward!.rms).toBeLessThan(0.4e-3);
    expect(result.forward!.sources.filter((s) => s.offEnd).map((s) => s.sourceX)).toEqual([-10, 81]);
    for (const s of result.forward!.sources) expect(s.rms).toBeLessThan(0.45e-3);
    expect(log.withCode('forward-misfit')).toHaveLength(0);
  });

  it('interpret warns when the interpreted section does not explain the picks (a layer left out)', () => {
    // Three layers (350, 1200, 3500 m/s; 3 m and 10 m), fitted with at most two segments per branch:
    // the section then has no 3500 m/s refractor and cannot explain the far, early arrivals.
    const three = syntheticCsv({ surface: () => 50, interfaces: [() => 47, () => 40], velocities: [350, 1200, 3500] }, [-10, 0, 47.5, 95, 105], range(96, 1), 0.3, 2);
    // The layered inversion is off: the check is of the section the depth methods give.
    const { result, log } = interpretCsv(three, { maxSegments: 2, inversion: false });
    expect(result.layers).toHaveLength(2);
    // Over twice the 0.3 ms pick noise, the threshold of the warning.
    expect(result.forward!.rms).toBeGreaterThan(0.8e-3);
    expect(log.withCode('forward-misfit')[0].message).toMatch(/does not explain the picks well/);
  });

  it('interpret(picks all 1 ms late, a trigger delay) checks the section with the delay the inversion fitted: no misfit', () => {
    // Independent forward model (test/reference/layeredTravelTimes.ts): 450 / 2100 m/s, 4.5 m of
    // soil, 48 geophones at 2 m, sources off both ends; every pick 1 ms late plus 0.25 ms noise.
    const flat = { surface: () => 100, interfaces: [() => 95.5], velocities: [450, 2100] };
    const receivers = range(48, 2);
    const sources = [-40, 0, 47, 94, 134];
    const normal = seededNormal(11);
    const times = new Map(sources.map((sx) => [sx, firstArrivals(flat, sx, receivers, [-45, 139])]));
    const late = csvFrom(sources, receivers, (sx, rx) => times.get(sx)![receivers.indexOf(rx)] + 1e-3 + 0.25e-3 * normal());
    const { result, log } = interpretCsv(late);
    expect(result.inversion?.kept).toBe(true);
    expect(result.forward!.timeShift * 1e3).toBeGreaterThan(0.5);
    expect(result.forward!.timeShift).toBe(result.inversion!.timeShift);
    expect(result.forward!.rms).toBeLessThan(0.4e-3);
    expect(log.withCode('forward-misfit')).toHaveLength(0);
  });
});

describe('the pick count of the summary', () => {
  it('summary of a table of 240 picks, one at zero offset inside the spread (in two branches), says "240 of 240 picks used"', () => {
    // 5 sources × 48 geophones at 2 m; the sources at 0, 46 and 94 m stand on a geophone, whose pick
    // (time 0) joins every branch of its source: both branches of the one at 46 m. Times: Telford's flat two-layer model (§4.2.2),
    // 500 / 2000 m/s under 6 m, t = min(x / V1, x / V2 + 2 h cos θc / V1), exact to 0.1 µs.
    const receivers = range(48, 2);
    const sources = [-20, 0, 46, 94, 114];
    const intercept = (2 * 6 * Math.cos(Math.asin(500 / 2000))) / 500;
    const rows = ['source_id,source_x,receiver_x,time_ms'];
    sources.forEach((sx, s) => {
      for (const rx of receivers) {
        const x = Math.abs(rx - sx);
        rows.push(`S${s + 1},${sx},${rx},${(Math.min(x / 500, x / 2000 + intercept) * 1e3).toFixed(4)}`);
      }
    });
    const { result, table } = interpretCsv(rows.join('\n') + '\n');
    expect(table.picks).toHaveLength(240);
    const text = summary(result, 'm');
    const [, used, total, outliers] = /(\d+) of (\d+) picks used \((\d+) outliers? left out\)/.exec(text)!.map(Number);
    expect(total).toBe(240);
    expect(used + outliers).toBe(240);
    expect(result.picksUsed).toBe(used);
    expect(result.forward!.picks).toBe(used);
  });
});
