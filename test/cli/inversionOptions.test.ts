import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { main } from '../../src/cli/main.js';
import type { CliIo } from '../../src/cli/io.js';
import { range } from '../helpers.js';
import { syntheticCsv } from '../reference/layeredTravelTimes.js';

// A line over rock undulating 7 ± 1.5 m under 500 m/s soil, sources off both ends; picks from the
// independent forward model (test/reference/layeredTravelTimes.ts), seeded noise 0.25 ms.
const line = syntheticCsv({ surface: () => 30, interfaces: [(x) => 23 - 1.5 * Math.sin(x / 9)], velocities: [500, 2800] }, [-20, 0, 35, 70, 90], range(36, 2), 0.25, 9);

function run(argv: string[]) {
  let stdout = '';
  let stderr = '';
  const io: CliIo = {
    stdout: (t) => { stdout += t; },
    stderr: (t) => { stderr += t; },
    readText: (path) => (path === 'line.csv' ? line : readFileSync(path, 'utf8')),
    readBytes: (path) => (path === 'line.csv' ? new TextEncoder().encode(line) : new Uint8Array(readFileSync(path))),
    writeText: () => undefined,
  };
  return { code: main(argv, io), stdout, stderr };
}

describe('interpret inversion options', () => {
  it('interpret --json reports qc.inversion and recommends the inverted profile; --no-inversion leaves it out', () => {
    const on = JSON.parse(run(['interpret', 'line.csv', '--json']).stdout);
    expect(on.qc.inversion.kept).toBe(true);
    expect(on.qc.inversion.rms_after_ms).toBeLessThan(on.qc.inversion.rms_before_ms);
    expect(on.refractors[0].method).toBe('inversion');
    expect(on.refractors[0].by_method.inversion).toHaveLength(36);
    expect(on.refractors[0].points.every((p: { method: string }) => p.method === 'inversion')).toBe(true);
    const off = JSON.parse(run(['interpret', 'line.csv', '--json', '--no-inversion']).stdout);
    expect(off.qc.inversion).toBeUndefined();
    expect(off.refractors[0].method).not.toMatch(/inversion/);
  });

  it('interpret --inversion-smoothing and --inversion-nodes reach the inversion (a larger weight leaves a smoother refractor)', () => {
    const bend = (doc: { refractors: { points: { depth_m: number }[] }[] }) => {
      const d = doc.refractors[0].points.map((p) => p.depth_m);
      return d.slice(2).reduce((sum, v, i) => sum + Math.abs(v - 2 * d[i + 1] + d[i]), 0);
    };
    const loose = JSON.parse(run(['interpret', 'line.csv', '--json', '--inversion-smoothing', '0.1']).stdout);
    const stiff = JSON.parse(run(['interpret', 'line.csv', '--json', '--inversion-smoothing', '30', '--inversion-nodes', '4']).stdout);
    expect(loose.qc.inversion.smoothing).toBe(0.1);
    expect(stiff.qc.inversion.node_spacing_m).toBe(4);
    expect(bend(stiff)).toBeLessThan(bend(loose));
  });

  it('interpret rejects a negative --inversion-smoothing, a zero --inversion-nodes and --no-inversion with tuning, naming the option', () => {
    const negative = run(['interpret', 'line.csv', '--inversion-smoothing=-1']);
    expect(negative.code).toBe(2);
    expect(negative.stderr).toMatch(/--inversion-smoothing -1: expected a smoothing weight of 0 or more/);
    expect(run(['interpret', 'line.csv', '--inversion-nodes', '0']).stderr).toMatch(/--inversion-nodes 0: expected a node spacing/);
    expect(run(['interpret', 'line.csv', '--no-inversion', '--inversion-smoothing', '2']).stderr).toMatch(/--no-inversion .* --inversion-smoothing cannot be given with it/);
  });
});
