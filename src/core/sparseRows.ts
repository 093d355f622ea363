import type { LinearOperator } from './lsqr.js';
import type { CompressedRows } from './sparseLeastSquares.js';

/**
 * A sparse matrix built row by row and stored in compressed rows (typed arrays): each pick of a
 * travel-time model touches three or four unknowns of several hundred.
 */
export class SparseRows {
  private readonly starts: number[] = [0];
  private readonly columns: number[] = [];
  private readonly values: number[] = [];
  readonly rhs: number[] = [];

  constructor(readonly cols: number) {}

  get rows(): number {
    return this.rhs.length;
  }

  /** Appends the row Σ value·x[column] = target (entries with equal columns add up). */
  add(entries: [number, number][], target: number, weight = 1): void {
    for (const [column, value] of entries) {
      if (!(column >= 0 && column < this.cols)) throw new Error(`SparseRows.add needs a column in 0..${this.cols - 1}; got ${column}`);
      this.columns.push(column);
      this.values.push(value * weight);
    }
    this.starts.push(this.columns.length);
    this.rhs.push(target * weight);
  }

  /**
   * The matrix frozen as an operator whose columns are scaled to unit Euclidean norm (a diagonal
   * preconditioner: the solution of the scaled system is D⁻¹ x), with the scale factors D, and the
   * same scaled matrix as compressed rows.
   */
  freeze(): { operator: LinearOperator & { row(i: number, x: Float64Array): number }; matrix: CompressedRows; scales: Float64Array; b: Float64Array } {
    const starts = Int32Array.from(this.starts);
    const columns = Int32Array.from(this.columns);
    const values = Float64Array.from(this.values);
    const squares = new Float64Array(this.cols);
    for (let k = 0; k < values.length; k++) squares[columns[k]] += values[k] * values[k];
    const scales = squares.map((s) => (s > 0 ? 1 / Math.sqrt(s) : 0));
    for (let k = 0; k < values.length; k++) values[k] *= scales[columns[k]];
    const rows = this.rows;
    const operator = {
      rows,
      cols: this.cols,
      multiply(x: Float64Array, y: Float64Array) {
        for (let i = 0; i < rows; i++) {
          let sum = 0;
          for (let k = starts[i]; k < starts[i + 1]; k++) sum += values[k] * x[columns[k]];
          y[i] += sum;
        }
      },
      multiplyTranspose(y: Float64Array, x: Float64Array) {
        for (let i = 0; i < rows; i++) {
          const yi = y[i];
          if (yi === 0) continue;
          for (let k = starts[i]; k < starts[i + 1]; k++) x[columns[k]] += values[k] * yi;
        }
      },
      /** Row i of the scaled matrix times a scaled solution. */
      row(i: number, x: Float64Array) {
        let sum = 0;
        for (let k = starts[i]; k < starts[i + 1]; k++) sum += values[k] * x[columns[k]];
        return sum;
      },
    };
    return { operator, matrix: { rows, cols: this.cols, starts, columns, values }, scales, b: Float64Array.from(this.rhs) };
  }
}
