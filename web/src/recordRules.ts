import { InputError } from '../../src/core/errors.js';
import type { Wave } from '../../src/core/types.js';
import { recordVelocityProblem } from '../../src/io/apparentVelocity.js';
import type { Seg2Record } from '../../src/io/seg2/types.js';
import type { PickRow } from '../../src/picking/recordPicks.js';

// Two rules of `hammerline interpret` on records, kept here because src/cli/records.ts (their
// home) also loads Node's file system; test/web/compute.test.ts holds the two to the same output.

/**
 * Rewrites "row N" and "rows N, M" of the table made from picked records (pickTableCsv: header on
 * line 1, one line per picked trace) as the record and trace they came from.
 */
export function traceLabeller(rows: PickRow[]): (text: string) => string {
  const picked = rows.filter((r) => r.time !== undefined);
  const label = (line: string) => {
    const row = picked[Number(line) - 2];
    return row === undefined ? `row ${line}` : `${row.file} trace ${row.trace}`;
  };
  return (text) => text
    .replace(/\brows (\d+(?:, \d+)*)/g, (_, list: string) => list.split(', ').map(label).join(', '))
    .replace(/\brow (\d+)/g, (_, line: string) => label(line));
}

/**
 * Judges a record's time and length units from its picks (src/io/apparentVelocity.ts): a median
 * apparent velocity no ground has stops with the likely header fault named.
 *
 * @throws InputError naming the record and the header value at fault
 */
export function checkRecordVelocities(record: Seg2Record, picked: PickRow[], wave: Wave | 'any'): void {
  const problem = recordVelocityProblem(record, picked, wave);
  if (problem !== undefined) throw new InputError({ file: record.file }, problem.replace(/\. If the values are right, give --accept-velocities$/, ''));
}
