import { spawnSync } from 'node:child_process';
import { existsSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { lsqr } from '../../src/core/lsqr.js';
import { SparseRows } from '../../src/core/sparseRows.js';
import { seededNormal } from '../reference/layeredTravelTimes.js';

const python = '/usr/bin/python3';
const hasScipy = existsSync(python) && spawnSync(python, ['-c', 'import scipy.sparse.linalg'], { encoding: 'utf8' }).status === 0;

function randomSparse(rows: number, cols: number, seed: number) {
  const normal = seededNormal(seed);
  const matrix = new SparseRows(cols);
  const triplets: [number, number, number][] = [];
  for (let i = 0; i < rows; i++) {
    const entries: [number, number][] = [];
    for (let k = 0; k < 3; k++) {
      const j = Math.floor(((normal() + 4) / 8) * cols + cols) % cols;
      const v = normal();
      entries.push([j, v]);
      triplets.push([i, j, v]);
    }
    matrix.add(entries, normal());
  }
  return { matrix, triplets };
}

describe('lsqr', () => {
  it('lsqr(A = [[1, 0], [0, 2], [1, 1]], b = [1, 2, 2]) gives x = [1, 1] (a consistent system, solved by hand)', () => {
    const m = new SparseRows(2);
    m.add([[0, 1]], 1);
    m.add([[1, 2]], 2);
    m.add([[0, 1], [1, 1]], 2);
    const { operator, scales, b } = m.freeze();
    const { x } = lsqr(operator, b);
    expect(x[0] * scales[0]).toBeCloseTo(1, 10);
    expect(x[1] * scales[1]).toBeCloseTo(1, 10);
  });

  it('lsqr(A = [[1], [1], [1]], b = [1, 2, 6]) gives the mean 3 (least squares of a constant, by hand)', () => {
    const m = new SparseRows(1);
    for (const v of [1, 2, 6]) m.add([[0, 1]], v);
    const { operator, b } = m.freeze();
    const result = lsqr(operator, b);
    expect(result.x[0] / Math.sqrt(3)).toBeCloseTo(3, 10);
    // Residual norm √((1−3)² + (2−3)² + (6−3)²) = √14.
    expect(result.residualNorm).toBeCloseTo(Math.sqrt(14), 8);
  });

  it.skipIf(!hasScipy)('lsqr(random sparse 300 × 60, damp 0 and 0.5) agrees with scipy.sparse.linalg.lsqr to 1e-8', () => {
    const { matrix, triplets } = randomSparse(300, 60, 11);
    for (const damp of [0, 0.5]) {
      // The problem is posed on the column-scaled matrix here and in scipy alike.
      const { operator, scales, b } = matrix.freeze();
      const ours = lsqr(operator, b, { damp, atol: 1e-14, btol: 1e-14 });
      const script = `
import json, sys
import numpy as np
from scipy.sparse import coo_matrix
from scipy.sparse.linalg import lsqr
d = json.load(sys.stdin)
t = np.array(d['t'])
A = coo_matrix((t[:, 2] * np.array(d['s'])[t[:, 1].astype(int)], (t[:, 0].astype(int), t[:, 1].astype(int))), shape=(300, 60)).tocsr()
x = lsqr(A, np.array(d['b']), damp=d['damp'], atol=1e-14, btol=1e-14, iter_lim=10000)[0]
print(json.dumps(list(x)))
`;
      const run = spawnSync(python, ['-c', script], { input: JSON.stringify({ t: triplets, s: Array.from(scales), b: Array.from(b), damp }), encoding: 'utf8' });
      expect(run.status, run.stderr).toBe(0);
      const reference = JSON.parse(run.stdout) as number[];
      reference.forEach((v, j) => expect(Math.abs(ours.x[j] - v)).toBeLessThan(1e-8 * Math.max(1, Math.abs(v))));
    }
  });
});
