import { describe, expect, it } from 'vitest';
import { choleskyFactor, choleskyInverse, choleskySolve } from '../../src/model/cholesky.js';

// The textbook 3 × 3 example of the Cholesky factorisation (worked by hand; e.g. Trefethen & Bau
// 1997, Lecture 23, and the common worked example): A = L Lᵀ with
//   A = [[4, 12, −16], [12, 37, −43], [−16, −43, 98]],  L = [[2, 0, 0], [6, 1, 0], [−8, 5, 3]],
// det A = (2·1·3)² = 36 and A⁻¹ = adj(A) / 36 = [[1777, −488, 76], [−488, 136, −20], [76, −20, 4]] / 36
// (cofactors by hand; numpy.linalg.inv agrees to 1e-15). Integers, so the tolerance is round-off.
const a3 = Float64Array.from([4, 12, -16, 12, 37, -43, -16, -43, 98]);
const l3 = [2, 0, 0, 6, 1, 0, -8, 5, 3];
const inv3 = [1777, -488, 76, -488, 136, -20, 76, -20, 4].map((v) => v / 36);

// A 4 × 4 symmetric positive-definite matrix with no zero entries below the diagonal, against
// /usr/bin/python3 numpy 1.x (numpy.linalg.cholesky, numpy.linalg.inv, numpy.linalg.solve).
const a4 = Float64Array.from([6, 2, 1, 0.5, 2, 5, 2, 1, 1, 2, 4, 1.5, 0.5, 1, 1.5, 3]);
const l4 = [
  2.449489742783178, 0, 0, 0,
  0.8164965809277261, 2.0816659994661326, 0, 0,
  0.4082482904638631, 0.8006407690254357, 1.7867030229749128, 0,
  0.20412414523193154, 0.40032038451271784, 0.6135064596962051, 1.556176965189998,
];
const inv4 = [
  0.19278606965174128, -0.07213930348258707, -0.011194029850746263, -0.0024875621890547255,
  -0.07213930348258706, 0.27860696517412936, -0.1119402985074627, -0.024875621890547272,
  -0.011194029850746266, -0.11194029850746268, 0.3619402985074627, -0.1417910447761194,
  -0.0024875621890547268, -0.024875621890547265, -0.1417910447761194, 0.4129353233830846,
];
const solve4 = [0.30223880597014935, -0.9776119402985077, 1.2276119402985075, -0.17164179104477614];

const close = (actual: ArrayLike<number>, expected: number[], tolerance: number) => {
  expect(actual.length).toBe(expected.length);
  expected.forEach((v, i) => expect(actual[i]).toBeCloseTo(v, tolerance));
};

describe('choleskyFactor', () => {
  it('gives the hand-worked factor of the textbook 3 × 3 matrix (to 1e-12), zeros above the diagonal', () => {
    close(choleskyFactor(a3, 3)!, l3, 12);
  });

  it('agrees with numpy.linalg.cholesky on a full 4 × 4 matrix (to 1e-12)', () => {
    close(choleskyFactor(a4, 4)!, l4, 12);
  });

  it('refuses an indefinite matrix and a singular one (a zero pivot), by definition of positive definite', () => {
    // [[1, 2], [2, 1]] has eigenvalues 3 and −1; [[1, 1], [1, 1]] has 2 and 0 (second pivot exactly 0).
    expect(choleskyFactor(Float64Array.from([1, 2, 2, 1]), 2)).toBeUndefined();
    expect(choleskyFactor(Float64Array.from([1, 1, 1, 1]), 2)).toBeUndefined();
    expect(choleskyFactor(Float64Array.from([-1]), 1)).toBeUndefined();
  });
});

describe('choleskySolve', () => {
  it('solves A x = b for the 3 × 3 example: b = A·(1, 2, 3) = (−20, −43, 192) gives back (1, 2, 3) (to 1e-12)', () => {
    close(choleskySolve(Float64Array.from(l3), 3, Float64Array.from([-20, -43, 192])), [1, 2, 3], 12);
  });

  it('agrees with numpy.linalg.solve on the 4 × 4 matrix (to 1e-12)', () => {
    close(choleskySolve(choleskyFactor(a4, 4)!, 4, Float64Array.from([1, -2, 3, 0.5])), solve4, 12);
  });
});

describe('choleskyInverse', () => {
  it('gives adj(A) / det A of the 3 × 3 example (to 1e-10), symmetric', () => {
    close(choleskyInverse(Float64Array.from(l3), 3), inv3, 10);
  });

  it('agrees with numpy.linalg.inv on the 4 × 4 matrix (to 1e-12)', () => {
    close(choleskyInverse(choleskyFactor(a4, 4)!, 4), inv4, 12);
  });
});
