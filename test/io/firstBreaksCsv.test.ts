import { describe, expect, it } from 'vitest';
import { InputError } from '../../src/core/errors.js';
import { WarningLog } from '../../src/core/warnings.js';
import { readFirstBreaks } from '../../src/io/firstBreaksCsv.js';
import { splitBranches } from '../../src/fit/branches.js';

const read = (text: string, options = {}) => {
  const log = new WarningLog();
  return { table: readFirstBreaks(text, 'line.csv', log, options), log };
};
const error = (text: string, options = {}) => {
  try {
    read(text, options);
  } catch (e) {
    expect(e).toBeInstanceOf(InputError);
    return (e as Error).message;
  }
  throw new Error('expected an InputError');
};

describe('readFirstBreaks', () => {
  it('readFirstBreaks converts milliseconds to seconds and feet to metres (1 ft = 0.3048 m exactly)', () => {
    const { table } = read('source_x,receiver_x,time_ms\n0,10,5\n', { lengthUnit: 'ft' });
    expect(table.picks[0].time).toBeCloseTo(0.005, 12);
    expect(table.picks[0].receiverX).toBeCloseTo(3.048, 12);
    expect(table.picks[0].sourceId).toBe('x=0');
  });

  it('readFirstBreaks reads time_s, quoted fields, comments and a byte-order mark', () => {
    const { table } = read('\uFEFF# made up\nsource_id,source_x,receiver_x,time_s\n"A",0,10,0.005\n');
    expect(table.picks[0]).toMatchObject({ sourceId: 'A', time: 0.005, row: 3 });
  });

  it('readFirstBreaks names the missing required column', () => {
    expect(error('source_x,time_ms\n0,5\n')).toMatch(/line\.csv, row 1: missing required column receiver_x/);
    expect(error('source_x,receiver_x\n0,5\n')).toMatch(/missing required column time_ms \(or time_s\)/);
  });

  it('readFirstBreaks names file, row and column of an empty or non-numeric value', () => {
    expect(error('source_x,receiver_x,time_ms\n0,5,4\n0,6,\n')).toMatch(/line\.csv, row 3, column time_ms: is empty; expected a number/);
    expect(error('source_x,receiver_x,time_ms\n0,5,4\n0,six,5\n')).toMatch(/row 3, column receiver_x: "six" is not a number; expected a number in metres/);
  });

  it('readFirstBreaks rejects a negative time with its row', () => {
    expect(error('source_x,receiver_x,time_ms\n0,5,-4\n')).toMatch(/row 2, column time_ms: negative time -4/);
  });

  it('readFirstBreaks rejects a duplicate pick for one source and receiver, naming both rows', () => {
    expect(error('source_x,receiver_x,time_ms\n0,5,4\n0,5,4.1\n')).toMatch(/row 3, column receiver_x: duplicate pick for source x=0 at receiver 5 m \(also on row 2\)/);
  });

  it('readFirstBreaks rejects a row with the wrong number of fields', () => {
    expect(error('source_x,receiver_x,time_ms\n0,5\n')).toMatch(/row 2: has 2 fields; expected 3/);
  });

  it('readFirstBreaks rejects one source id at two positions', () => {
    expect(error('source_id,source_x,receiver_x,time_ms\nA,0,5,4\nA,1,6,5\n')).toMatch(/source A is at 1 m here but at 0 m on row 2/);
  });

  it('readFirstBreaks rejects a file mixing P and S picks', () => {
    expect(error('source_x,receiver_x,time_ms,wave\n0,5,4,P\n0,6,9,S\n')).toMatch(/mixes P and S picks/);
  });

  it('readFirstBreaks stops when millisecond times look like seconds, naming time_s as the fix', () => {
    // 10 m in 0.005 "ms" is 2,000,000 m/s: no ground is faster than 8000 m/s for P (common practice).
    expect(error('source_x,receiver_x,time_ms\n0,10,0.005\n0,20,0.009\n0,30,0.012\n')).toMatch(/column time_ms: the median apparent velocity .* is 2222222 m\/s, .*the times look like seconds: put them in a time_s column .*that would make it 2222 m\/s/);
  });

  it('readFirstBreaks stops when second times look like milliseconds', () => {
    expect(error('source_x,receiver_x,time_s\n0,10,5\n0,20,9\n0,30,12\n')).toMatch(/the times look like milliseconds: put them in a time_ms column \(that would make it 2222 m\/s\)/);
  });

  it('readFirstBreaks keeps and reports unknown columns and warns of zero-offset picks', () => {
    const { table, log } = read('source_x,receiver_x,time_ms,geophone_id\n0,0,0,G1\n0,5,10,G2\n');
    expect(table.extraColumns).toEqual(['geophone_id']);
    expect(table.extraValues[1]).toEqual({ geophone_id: 'G2' });
    expect(log.withCode('unknown-columns')[0].message).toMatch(/geophone_id/);
    expect(log.withCode('zero-offset')[0].message).toMatch(/rows 2/);
  });

  it('readFirstBreaks takes a missing source elevation from the receivers and says so', () => {
    const { table, log } = read('source_x,receiver_x,receiver_elev,time_ms\n5,0,100,4\n5,10,102,4\n');
    expect(table.picks[0].sourceElev).toBeCloseTo(101, 9);
    expect(log.withCode('source-elevation-interpolated')).toHaveLength(1);
  });
});

describe('splitBranches', () => {
  const picks = (text: string) => read(text).table.picks;

  it('splitBranches rejects a source with fewer than three picks on a side, naming source and rows', () => {
    const p = picks('source_id,source_x,receiver_x,time_ms\nA,10,0,20\nA,10,9,2\nA,10,11,2\nA,10,12,4\nA,10,13,6\n');
    expect(() => splitBranches(p, new WarningLog(), { file: 'line.csv' })).toThrow(/line\.csv, row 2, source A: has 2 picks on its reverse \(-x\) side \(rows 2, 3\); expected at least 3/);
  });

  it('splitBranches with allowShortBranches leaves the short side out with a warning', () => {
    const p = picks('source_id,source_x,receiver_x,time_ms\nA,10,0,20\nA,10,9,2\nA,10,11,2\nA,10,12,4\nA,10,13,6\n');
    const log = new WarningLog();
    const branches = splitBranches(p, log, { file: 'line.csv', allowShortBranches: true });
    expect(branches.map((b) => b.side)).toEqual(['forward']);
    expect(log.withCode('short-branch')).toHaveLength(1);
  });

  it('splitBranches gives an off-end source a single branch sorted by offset', () => {
    const p = picks('source_x,receiver_x,time_ms\n-5,10,30\n-5,0,10\n-5,5,20\n');
    const [branch] = splitBranches(p, new WarningLog(), { file: 'line.csv' });
    expect(branch.side).toBe('forward');
    expect(branch.offsets).toEqual([5, 10, 15]);
  });
});
