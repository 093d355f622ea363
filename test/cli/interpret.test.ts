import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { run } from './run.js';

const records = [1, 2, 3, 4, 5, 6, 7].map((n) => `survey-examples/pump-station/records/S${n}.seg2`);

describe('hammerline interpret, smaller points of the summary', () => {
  it('interpret of SEG-2 records lists the unpicked traces on stderr, as pick does (README)', () => {
    // S3 trace 17 is dead by construction (survey-examples/pump-station/README.md).
    const { code, stderr } = run(['interpret', ...records, '-q']);
    expect(code).toBe(0);
    expect(stderr).toMatch(/S3\.seg2: 1 trace not picked \(dead: 17\)/);
    expect(stderr).toBe(run(['pick', ...records, '-q']).stderr);
  });

  it('the README\'s --breakpoint example raises no warning on the bundled line', () => {
    const line = readFileSync('README.md', 'utf8').split('\n').find((l) => l.includes('--breakpoint') && l.startsWith('npx hammerline interpret'))!;
    const args = line.replace(/#.*$/, '').trim().split(/\s+/).slice(2);
    expect(args).toContain('survey-examples/pump-station/first-breaks.csv');
    const { code, stdout } = run(args);
    expect(code).toBe(0);
    expect(stdout).toMatch(/^Warnings: none$/m);
  });

  it('interpret says "1 branch from 1 source" in the singular', () => {
    // One source at x = 0, six receivers at 2 m, 400 m/s direct wave only.
    const csv = 'source_x,receiver_x,time_ms\n' + [2, 4, 6, 8, 10, 12].map((x) => `0,${x},${(x / 0.4).toFixed(3)}`).join('\n') + '\n';
    const { stdout } = run(['interpret', 'ONE.csv'], { 'ONE.csv': csv });
    expect(stdout).toMatch(/P-wave line, 1 branch from 1 source, 6 of 6 picks used \(0 outliers left out\)/);
  });

  it('interpret --json history uses snake_case keys and rounded numbers', () => {
    const doc = JSON.parse(run(['interpret', 'survey-examples/pump-station/first-breaks.csv', '--breakpoint', 'S1:forward=11', '--json']).stdout);
    const keys: string[] = [];
    const numbers: number[] = [];
    const walk = (v: unknown) => {
      if (typeof v === 'number') numbers.push(v);
      else if (Array.isArray(v)) v.forEach(walk);
      else if (v && typeof v === 'object') for (const [k, w] of Object.entries(v)) { keys.push(k); walk(w); }
    };
    for (const step of doc.history) { expect(step.step).toMatch(/^[a-z0-9_]+$/); walk(step.parameters); }
    for (const k of keys) if (!k.includes(':') && k !== '*') expect(k).toMatch(/^[a-z0-9_]+$/);
    for (const n of numbers) expect(String(n).replace(/^-?\d+\.?/, '').length).toBeLessThanOrEqual(4);
  });
});

describe('warnings on SEG-2 input', () => {
  it('traceLabeller turns the rows of the internal pick table into record and trace', async () => {
    const { traceLabeller } = await import('../../src/cli/records.js');
    // Row 1 is the header; picked rows follow in order, unpicked traces are not rows.
    const row = (file: string, trace: number, time?: number) => ({ sourceId: 'S1', sourceX: 0, receiverX: trace, confidence: 1, status: 'picked', file, trace, time }) as never;
    const relabel = traceLabeller([row('S1.seg2', 1, 0.01), row('S1.seg2', 2), row('S1.seg2', 3, 0.02), row('S2.seg2', 1, 0.03)]);
    expect(relabel('S1:forward branch: pick on row 3 lies far off')).toBe('S1:forward branch: pick on S1.seg2 trace 3 lies far off');
    expect(relabel('picks on rows 2, 4 lie far off')).toBe('picks on S1.seg2 trace 1, S2.seg2 trace 1 lie far off');
  });
});
