import { describe, expect, it } from 'vitest';
import { InputError } from '../../src/core/errors.js';
import { readSeg2 } from '../../src/io/seg2/read.js';
import { readStations } from '../../src/io/stationsCsv.js';
import { pickTableCsv } from '../../src/io/pickTable.js';
import { fileStem, geometryNotes, pickSeg2 } from '../../src/picking/recordPicks.js';
import { writeSeg2 } from '../io/seg2/writeSeg2.js';
import { causalTrace } from './syntheticRecord.js';

// A record whose headers give station numbers only (SOURCE_STATION_NUMBER, RECEIVER_STATION_NUMBER):
// positions and elevations must come from the station table.
function stationRecord() {
  const traces = Array.from({ length: 12 }, (_, i) => ({
    code: 2 as const,
    samples: Array.from(causalTrace(400, 0.00025, -0.005, (2 * (i + 1)) / 500, 20, i), (v) => Math.round(v * 100)),
    keywords: [['SAMPLE_INTERVAL', '0.00025'], ['DELAY', '-0.005'], ['SOURCE_STATION_NUMBER', '100'], ['RECEIVER_STATION_NUMBER', String(101 + i)]] as [string, string][],
  }));
  return readSeg2(writeSeg2(traces), 'stations.seg2');
}

describe('pickSeg2 geometry', () => {
  it('pickSeg2 places traces given by station number through the station table, with its elevations', () => {
    const stations = readStations('station,x,elev\n' + Array.from({ length: 13 }, (_, i) => `${100 + i},${2 * i},${(50 + 0.1 * i).toFixed(1)}`).join('\n') + '\n', 'stations.csv');
    const rows = pickSeg2(stationRecord(), { stations });
    expect(rows[0]).toMatchObject({ sourceX: 0, sourceElev: 50, receiverX: 2, receiverElev: 50.1 });
    expect(rows[11]).toMatchObject({ receiverX: 24 });
    // Onsets at offset / 500 m/s (the record's construction): within two samples.
    rows.forEach((row, i) => expect(Math.abs(row.time! - (2 * (i + 1)) / 500)).toBeLessThanOrEqual(2 * 0.00025));
  });

  it('pickSeg2 names file, trace and field when a station number is not in the table', () => {
    const stations = readStations('station,x,elev\n100,0,50\n', 'short.csv');
    expect(() => pickSeg2(stationRecord(), { stations })).toThrow(InputError);
    expect(() => pickSeg2(stationRecord(), { stations })).toThrow(/stations\.seg2, trace 1, column RECEIVER_LOCATION/);
  });

  it('readStations names the row and column of a bad value and a missing column', () => {
    expect(() => readStations('station,x,elev\n1,zero,3\n', 'st.csv')).toThrow(/st\.csv, row 2, column x: "zero" is not a number/);
    expect(() => readStations('station,x\n1,0\n', 'st.csv')).toThrow(/missing required column elev/);
  });
});

describe('fileStem', () => {
  it('fileStem gives the source id node:path gives (basename without its last extension)', async () => {
    // Reference: Node's path.posix.basename(file, extname(file)), the rule the command line used.
    const { posix } = await import('node:path');
    for (const file of ['S1.seg2', 'records/S1.seg2', '/a/b/shot 7.SEG2', 'two.dots.sg2', 'noext', '.hidden', 'dir/.hidden', 'a/b.c/d']) {
      expect(fileStem(file)).toBe(posix.basename(file, posix.extname(file)));
    }
    // Windows folders, as a browser may give them in a dropped path.
    expect(fileStem('C:\\line\\S3.seg2')).toBe('S3');
  });
});

// A record whose headers carry positions and elevations: receivers at x = 0, 2, ... 22 m, ground
// falling 0.1 m per metre from 50 m (RECEIVER_LOCATION x, y, z), the source at x = -2 m.
function locatedRecord() {
  const traces = Array.from({ length: 12 }, (_, i) => ({
    code: 2 as const,
    samples: Array.from(causalTrace(400, 0.00025, -0.005, (2 * i + 2) / 500, 20, i), (v) => Math.round(v * 100)),
    keywords: [['SAMPLE_INTERVAL', '0.00025'], ['DELAY', '-0.005'], ['SOURCE_LOCATION', '-2 0 50.2'], ['RECEIVER_LOCATION', `${2 * i} 0 ${(50 - 0.2 * i).toFixed(2)}`]] as [string, string][],
  }));
  return readSeg2(writeSeg2(traces), 'located.seg2');
}

describe('pickSeg2 precedence of geometry', () => {
  it('pickSeg2 with --stations uses the table\'s elevations over the headers\' and geometryNotes names the traces that differ', () => {
    // The table: ground 0.3 m above the headers' from x = 10 m on (traces 6 to 12).
    const table = readStations('x,elev\n' + Array.from({ length: 12 }, (_, i) => `${2 * i},${(50 - 0.2 * i + (2 * i >= 10 ? 0.3 : 0)).toFixed(2)}`).join('\n') + '\n', 'survey.csv');
    const rows = pickSeg2(locatedRecord(), { stations: table });
    expect(rows[6].receiverElev).toBeCloseTo(50 - 1.2 + 0.3, 9);
    const notes = geometryNotes(locatedRecord(), { stations: table });
    const precedence = notes.find((n) => n.code === 'elevation-precedence')!;
    expect(precedence.message).toMatch(/located\.seg2: the receiver elevations in the headers \(RECEIVER_LOCATION\) of 7 traces \(6, 7, 8, 9, 10, 11, 12\) differ from the station table survey\.csv by up to 0\.3 m .*; the station table is used/);
    // Agreement within 0.01 m raises nothing.
    const same = readStations('x,elev\n' + Array.from({ length: 12 }, (_, i) => `${2 * i},${(50 - 0.2 * i).toFixed(2)}`).join('\n') + '\n', 'same.csv');
    expect(geometryNotes(locatedRecord(), { stations: same }).filter((n) => n.code === 'elevation-precedence')).toEqual([]);
  });

  it('geometryNotes names the stations beyond the table\'s ends and the table, rather than clamping silently', () => {
    // The table covers x = 0 to 16 m only: traces 10 to 12 (x = 18, 20, 22 m) and the source (x = -2 m) lie beyond.
    const short = readStations('x,elev\n0,50\n16,48.4\n', 'short.csv');
    const notes = geometryNotes(locatedRecord(), { stations: short });
    expect(notes.map((n) => n.code)).toEqual(['elevation-precedence', 'beyond-station-table', 'beyond-station-table']);
    expect(notes[1].message).toMatch(/receivers of traces 10 \(x = 18 m\), 11 \(x = 20 m\), 12 \(x = 22 m\) lie beyond the station table short\.csv \(x = 0 to 16 m\); their elevations are the table's end value/);
    expect(notes[2].message).toMatch(/the source at x = -2 m lies beyond the station table short\.csv/);
  });

  it('pickSeg2 with --source-x keeps the elevations: the source takes the receivers\' ground at its position', () => {
    // --source-x=-8: beyond the first receiver (x = 0, 50 m), so the end value 50 m (linear inside).
    const rows = pickSeg2(locatedRecord(), { sourceX: -8 });
    expect(rows.every((r) => r.sourceElev === 50)).toBe(true);
    const inside = pickSeg2(locatedRecord(), { sourceX: 3 });
    // Between x = 2 (49.8 m) and 4 m (49.6 m): 49.7 m, by hand.
    expect(inside[0].sourceElev).toBeCloseTo(49.7, 9);
    const csv = pickTableCsv(rows);
    expect(csv.split('\n')[0]).toBe('source_id,source_x,source_elev,receiver_x,receiver_elev,time_ms,confidence,source_file,trace');
    expect(geometryNotes(locatedRecord(), { sourceX: -8 })[0].code).toBe('source-elevation-interpolated');
  });
});
