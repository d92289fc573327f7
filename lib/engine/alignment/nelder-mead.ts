/** A small downhill-simplex minimiser; the engine keeps its own so that it has no numeric dependency. */
export function minimiseNelderMead(
  f: (x: number[]) => number,
  start: number[],
  step: number[],
  options: { maxIterations?: number; tolerance?: number } = {},
): { x: number[]; fx: number; iterations: number } {
  const n = start.length;
  const maxIterations = options.maxIterations ?? 400 * n;
  const tolerance = options.tolerance ?? 1e-10;
  let simplex = [start.slice()];
  for (let i = 0; i < n; i++) {
    const p = start.slice();
    p[i] += step[i];
    simplex.push(p);
  }
  let values = simplex.map(f);
  let iterations = 0;
  const combine = (a: number[], b: number[], t: number) => a.map((ai, i) => ai + t * (b[i] - ai));
  for (; iterations < maxIterations; iterations++) {
    const order = values.map((_, i) => i).sort((a, b) => values[a] - values[b]);
    simplex = order.map((i) => simplex[i]);
    values = order.map((i) => values[i]);
    const spread = Math.max(...simplex.slice(1).map((p) => Math.max(...p.map((pi, i) => Math.abs(pi - simplex[0][i])))));
    if (spread < tolerance) break;
    const centroid = new Array<number>(n).fill(0);
    for (let k = 0; k < n; k++) for (let i = 0; i < n; i++) centroid[i] += simplex[k][i] / n;
    const worst = simplex[n];
    const reflected = combine(centroid, worst, -1);
    const fr = f(reflected);
    if (fr < values[0]) {
      const expanded = combine(centroid, worst, -2);
      const fe = f(expanded);
      if (fe < fr) {
        simplex[n] = expanded;
        values[n] = fe;
      } else {
        simplex[n] = reflected;
        values[n] = fr;
      }
    } else if (fr < values[n - 1]) {
      simplex[n] = reflected;
      values[n] = fr;
    } else {
      const outside = fr < values[n];
      const contracted = combine(centroid, worst, outside ? -0.5 : 0.5);
      const fc = f(contracted);
      if (fc < (outside ? fr : values[n])) {
        simplex[n] = contracted;
        values[n] = fc;
      } else {
        for (let k = 1; k <= n; k++) {
          simplex[k] = combine(simplex[0], simplex[k], 0.5);
          values[k] = f(simplex[k]);
        }
      }
    }
  }
  let best = 0;
  for (let k = 1; k <= n; k++) if (values[k] < values[best]) best = k;
  return { x: simplex[best], fx: values[best], iterations };
}
