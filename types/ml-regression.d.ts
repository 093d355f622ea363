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
