declare module "fmin" {
  export type NelderMeadResult = { x: number[]; fx: number };
  export function nelderMead(
    f: (x: number[]) => number,
    x0: number[],
    parameters?: { maxIterations?: number; minErrorDelta?: number; minTolerance?: number; zeroDelta?: number; nonZeroDelta?: number },
  ): NelderMeadResult;
}

declare module "numeric" {
  const numeric: {
    solve(a: number[][], b: number[]): number[];
    norm2(x: number[]): number;
  };
  export default numeric;
}
