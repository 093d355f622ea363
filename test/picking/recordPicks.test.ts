import { describe, expect, it } from 'vitest';
import { InputError } from '../../src/core/errors.js';
import { readSeg2 } from '../../src/io/seg2/read.js';
import { readStations } from '../../src/io/stationsCsv.js';
import { fileStem, pickSeg2 } from '../../src/picking/recordPicks.js';
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
