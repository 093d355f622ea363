import type { Seg2Record } from '../io/seg2/types.js';
import type { PickTrace } from './autoPick.js';
import { pickPolarityPair, type PairCheck } from './polarityPairs.js';
import { pickShearRecord } from './pickShearRecord.js';
import { shearGuides, type ShotPicks } from './parallelShots.js';
import { pickSeg2, placedRows, placeRecord, type PickRow, type PlacedRecord, type RecordPickOptions } from './recordPicks.js';
import { pushAll } from '../core/extent.js';

/** P left in the difference of a pair, as a fraction of the P of the sum, above which it is not cancelled. */
export const P_RESIDUAL_LIMIT = 0.5;

/** Records of one SH shot position combined before picking. */
export interface RecordGroup {
  /** Record files, the reversed ones after the others. */
  files: string[];
  /** Files of the records whose S has the other polarity (subtracted). */
  reversed: string[];
  sourceX: number;
  check: PairCheck;
}

export interface RecordsPicks {
  rows: PickRow[];
  groups: RecordGroup[];
  /** Warnings for the interpretation (code and sentence). */
  notes: { code: string; message: string }[];
}

export interface RecordsPickOptions extends RecordPickOptions {
  /** For S records: combine records that share a source position and receivers (default true). */
  pairs?: boolean;
}

/** Same source position, receivers, sample count, interval and delay, trace for trace. */
function sameShot(a: PlacedRecord, b: PlacedRecord): boolean {
  return a.traces.length === b.traces.length && a.geometry.every((g, i) => g.sourceX === b.geometry[i].sourceX && g.receiverX === b.geometry[i].receiverX)
    && a.traces.every((t, i) => t.data.length === b.traces[i].data.length && t.sampleInterval === b.traces[i].sampleInterval && t.delay === b.traces[i].delay);
}

function mean(records: PlacedRecord[]): PickTrace[] {
  return records[0].traces.map((t, i) => {
    const data = new Float32Array(t.data.length);
    for (const r of records) for (let k = 0; k < data.length; k++) data[k] += r.traces[i].data[k] / records.length;
    return { ...t, data, dead: records.some((r) => r.traces[i].dead) };
  });
}

/** Sum of a·b over the samples after the shot: its sign tells whether two records share the S polarity. */
function correlation(a: PlacedRecord, b: PlacedRecord): number {
  let sum = 0;
  a.traces.forEach((t, i) => {
    const shot = Math.max(0, Math.ceil(-t.delay / t.sampleInterval));
    for (let k = shot; k < t.data.length; k++) sum += t.data[k] * b.traces[i].data[k];
  });
  return sum;
}

/**
 * Picks the records of one line. P records: each on its own (`pickSeg2`). S records: records that
 * share a source position and receivers are one shot position; those whose S has the opposite
 * polarity to the first (negative correlation: their difference is stronger than their sum) are
 * its other side, and the two sides, each averaged, are subtracted (`pickPolarityPair`); records
 * all of one polarity are stacked and warned about, as is a pair whose difference keeps the P.
 * Lone records are picked by `pickShearRecord`.
 */
export function pickRecords(records: Seg2Record[], options: RecordsPickOptions = {}): RecordsPicks {
  if (options.wave !== 'S') return { rows: records.flatMap((r) => pickSeg2(r, options)), groups: [], notes: [] };
  const placed = records.map((r) => placeRecord(r, options));
  const groups: PlacedRecord[][] = [];
  for (const p of placed) {
    const group = options.pairs === false ? undefined : groups.find((g) => sameShot(g[0], p));
    if (group) group.push(p);
    else groups.push([p]);
  }
  const rows: PickRow[] = [];
  const out: RecordGroup[] = [];
  const notes: RecordsPicks['notes'] = [];
  // Lone records first, then checked against each other (`shearGuides`: a shot off an end
  // whose first breaks run parallel to the S of the end shot has them as its S) and picked again.
  const lone = groups.filter((g) => g.length === 1).map((g) => g[0]);
  const lonePicks = new Map(lone.map((p) => [p, pickShearRecord(p.traces, options)]));
  const shots: ShotPicks[] = lone.map((p) => {
    const { picks, pTimes, firstBreaks } = lonePicks.get(p)!;
    // The P moveout fitted to the first breaks where there is one (it passes over their scatter).
    const arrivals = pTimes.map((time, i) => (time === undefined ? firstBreaks[i] : { time, confidence: 1, status: 'picked' as const }));
    return { sourceX: p.geometry[0].sourceX, receiverX: p.geometry.map((g) => g.receiverX), picks, firstBreaks: arrivals };
  });
  shearGuides(shots).forEach((guide, k) => {
    if (guide.every((time) => time === undefined)) return;
    const again = pickShearRecord(lone[k].traces, options, undefined, guide);
    // Kept only where the new S picks run parallel to the nearer shot's S, as the first breaks do.
    if (shearGuides(shots.map((shot, j) => (j === k ? { ...shot, picks: again.picks } : shot)))[k].every((time) => time === undefined)) lonePicks.set(lone[k], again);
  });
  for (const group of groups) {
    if (group.length === 1) {
      pushAll(rows, placedRows(group[0], lonePicks.get(group[0])!.picks, 'S'));
      continue;
    }
    const same = group.filter((r, k) => k === 0 || correlation(group[0], r) >= 0);
    const other = group.filter((r) => !same.includes(r));
    const sourceX = group[0].geometry[0].sourceX;
    const names = (list: PlacedRecord[]) => list.map((r) => r.record.file).join(', ');
    if (other.length === 0) {
      const result = pickShearRecord(mean(group), options);
      const check: PairCheck = { combined: 'stack', differenceToSum: 0 };
      out.push({ files: group.map((r) => r.record.file), reversed: [], sourceX, check });
      notes.push({ code: 'polarity-pair-same', message: `records ${names(group)} share the source position x = ${sourceX} m and the receivers but have the same S polarity (their difference is weaker than their sum), so the P is not cancelled: they were stacked and picked as one record; if the beam was struck on both sides, check which record is which and the geophone orientation` });
      pushAll(rows, placedRows(group[0], result.picks, 'S', group.map((r) => r.sourceId).join('+'), group.map((r) => r.record.file).join(' + ')));
      continue;
    }
    const result = pickPolarityPair(mean(same), mean(other), options);
    out.push({ files: [...same, ...other].map((r) => r.record.file), reversed: other.map((r) => r.record.file), sourceX, check: result.check });
    if (result.check.pResidual !== undefined && result.check.pResidual > P_RESIDUAL_LIMIT) {
      notes.push({ code: 'polarity-pair-p-kept', message: `the difference of records ${names(same)} and ${names(other)} (source at x = ${sourceX} m) keeps ${Math.round(result.check.pResidual * 100)} % of the P of their sum: the P is not cancelled, as it is when only the S is reversed (the beam struck on its other side); check the records and the geophone orientation. The S picks were made after the P times of the records` });
    }
    pushAll(rows, placedRows(group[0], result.picks, 'S', [...same, ...other].map((r) => r.sourceId).join('-'), `${names(same)} - ${names(other)}`));
  }
  return { rows, groups: out, notes };
}
