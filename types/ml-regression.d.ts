// ml-regression ships no type declarations; these cover the parts hammerline uses.
declare module 'ml-regression' {
  export class SimpleLinearRegression {
    constructor(x: ArrayLike<number>, y: ArrayLike<number>);
    slope: number;
    intercept: number;
    predict(x: number): number;
  }
  export class PolynomialRegression {
    constructor(x: ArrayLike<number>, y: ArrayLike<number>, degree: number | number[], options?: { interceptAtZero?: boolean });
    coefficients: number[];
    powers: number[];
    predict(x: number): number;
  }
}

declare module 'ml-regression' {
  export class MultivariateLinearRegression {
    constructor(x: number[][], y: number[][], options?: { intercept?: boolean; statistics?: boolean });
    /** Coefficients, one row per input (the intercept last when fitted), one column per output. */
    weights: number[][];
    /** Residual standard deviation with n − p degrees of freedom. */
    stdError: number;
    /** Covariance matrix of the coefficients, in the order of `weights`. */
    stdErrorMatrix: { get(row: number, column: number): number };
  }
}
