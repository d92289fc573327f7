/**
 * Independent oracles: general-purpose numeric packages solving the reference equations directly,
 * without any of the engine's closed forms.
 */
import * as fminModule from "fmin";
import { evaluate } from "mathjs";
import numeric from "numeric";

type Fmin = { nelderMead: typeof fminModule.nelderMead };

// The package ships a UMD bundle: under ESM it registers itself on globalThis instead of exporting.
function loadFmin(): Fmin {
  if (typeof fminModule.nelderMead === "function") return fminModule;
  const g = (globalThis as unknown as { fmin?: Fmin }).fmin;
  if (!g || typeof g.nelderMead !== "function") throw new Error("fmin did not load");
  return g;
}
export const fmin = loadFmin();

/** mathjs with units: the signal circuit from the band and gang. */
export function oracleSignalCircuit(lowKHz: number, highKHz: number, minPF: number, maxPF: number) {
  const scope = { f1: lowKHz, f2: highKHz, G: maxPF - minPF };
  const Ts = evaluate("G / ((f2 / f1)^2 - 1)", scope) as number;
  const Ls = evaluate(`1 / ((2 pi ${highKHz} kHz)^2 * ${Ts} pF)`).toNumber("uH") as number;
  return { Ts, Ls };
}

const TWO_PI = 2 * Math.PI;

/** f in kHz from L in µH and C in pF, in SI throughout. */
function fKHz(uH: number, pF: number): number {
  return 1 / (TWO_PI * Math.sqrt(uH * 1e-6 * pF * 1e-12)) / 1e3;
}

/** Signal-section gang setting (pF above minimum) for a frequency. */
function gangAt(Ls: number, Ts: number, kHz: number): number {
  return 1 / ((TWO_PI * kHz * 1e3) ** 2 * Ls * 1e-6) / 1e-12 - Ts;
}

function oscKHz(P: number, To: number, Lo: number, g: number): number {
  const c = (P * (g + To)) / (P + g + To);
  return fKHz(Lo, c);
}

/**
 * Newton's method (numeric.solve for each step, finite-difference Jacobian) on the three raw tracking
 * equations f_o(g_k) = f_k + f_IF in the unknowns P, T_o, L_o.
 */
export function oracleThreePoint(
  band: { lowKHz: number; highKHz: number },
  ifKHz: number,
  gang: { minPF: number; maxPF: number },
  points: number[],
  start: [number, number, number] = [450, 55, 115],
) {
  const { Ts, Ls } = oracleSignalCircuit(band.lowKHz, band.highKHz, gang.minPF, gang.maxPF);
  const g = points.map((f) => gangAt(Ls, Ts, f));
  const residual = (x: number[]) => points.map((f, k) => oscKHz(x[0], x[1], x[2], g[k]) - (f + ifKHz));
  let x = [...start];
  for (let iter = 0; iter < 100; iter++) {
    const r = residual(x);
    if (numeric.norm2(r) < 1e-10) break;
    const J = r.map(() => [0, 0, 0]);
    for (let j = 0; j < 3; j++) {
      const h = Math.abs(x[j]) * 1e-7;
      const xp = [...x];
      xp[j] += h;
      const rp = residual(xp);
      for (let i = 0; i < 3; i++) J[i][j] = (rp[i] - r[i]) / h;
    }
    const dx = numeric.solve(
      J,
      r.map((v) => -v),
    );
    x = x.map((v, i) => v + dx[i]);
  }
  const [P, To, Lo] = x;
  const errorAt = (kHz: number) => oscKHz(P, To, Lo, gangAt(Ls, Ts, kHz)) - (kHz + ifKHz);
  return { Ts, Ls, P, To, Lo, errorAt, residual: residual(x) };
}

/**
 * Loss of a single tuned circuit of loaded Q at f to a signal at f + e, on a dense grid: the textbook
 * universal resonance curve |H| = 1/√(1 + Q²(f_r/f − f/f_r)²), evaluated by mathjs-free plain arithmetic
 * on the oracle's own error function.
 */
export function oracleWorstLossDb(errorAt: (kHz: number) => number, band: { lowKHz: number; highKHz: number }, loadedQ: number, n = 4001) {
  let worst = { dB: 0, kHz: band.lowKHz };
  for (let i = 0; i < n; i++) {
    const f = band.lowKHz + ((band.highKHz - band.lowKHz) * i) / (n - 1);
    const fr = f + errorAt(f);
    const x = loadedQ * (fr / f - f / fr);
    const dB = 20 * Math.log10(Math.sqrt(1 + x * x));
    if (dB > worst.dB) worst = { dB, kHz: f };
  }
  return worst;
}

/** fmin's Nelder–Mead over the three points, worst error in kHz on a dense grid, each design by Newton. */
export function oracleMinimax(
  band: { lowKHz: number; highKHz: number },
  ifKHz: number,
  gang: { minPF: number; maxPF: number },
  start: number[],
) {
  const grid = Array.from({ length: 801 }, (_, i) => band.lowKHz + ((band.highKHz - band.lowKHz) * i) / 800);
  let warm: [number, number, number] = [450, 55, 115];
  const objective = (p: number[]) => {
    if (!(band.lowKHz <= p[0] && p[0] < p[1] && p[1] < p[2] && p[2] <= band.highKHz)) return 1e9;
    const d = oracleThreePoint(band, ifKHz, gang, p, warm);
    if (![d.P, d.To, d.Lo].every(Number.isFinite)) return 1e9;
    warm = [d.P, d.To, d.Lo];
    return Math.max(...grid.map((f) => Math.abs(d.errorAt(f))));
  };
  const result = fmin.nelderMead(objective, start, { maxIterations: 3000, minErrorDelta: 1e-9 });
  return { points: result.x, maxAbsErrorKHz: result.fx };
}

/**
 * Two-point oscillator with no padder (FM front ends): Newton on f_o(g_k) = f_k + f_IF for T_o and L_o,
 * numeric.solve for each step.
 */
export function oracleTrimmerOnly(
  band: { lowKHz: number; highKHz: number },
  ifKHz: number,
  gang: { minPF: number; maxPF: number },
  points: [number, number],
  start: [number, number],
) {
  const { Ts, Ls } = oracleSignalCircuit(band.lowKHz, band.highKHz, gang.minPF, gang.maxPF);
  const g = points.map((f) => gangAt(Ls, Ts, f));
  const osc = (To: number, Lo: number, gk: number) => fKHz(Lo, gk + To);
  const residual = (x: number[]) => points.map((f, k) => osc(x[0], x[1], g[k]) - (f + ifKHz));
  let x = [...start];
  for (let iter = 0; iter < 100; iter++) {
    const r = residual(x);
    if (numeric.norm2(r) < 1e-10) break;
    const J = [
      [0, 0],
      [0, 0],
    ];
    for (let j = 0; j < 2; j++) {
      const h = Math.abs(x[j]) * 1e-7;
      const xp = [...x];
      xp[j] += h;
      const rp = residual(xp);
      for (let i = 0; i < 2; i++) J[i][j] = (rp[i] - r[i]) / h;
    }
    const dx = numeric.solve(
      J,
      r.map((v) => -v),
    );
    x = x.map((v, i) => v + dx[i]);
  }
  const [To, Lo] = x;
  const errorAt = (kHz: number) => osc(To, Lo, gangAt(Ls, Ts, kHz)) - (kHz + ifKHz);
  return { Ts, Ls, To, Lo, errorAt, residual: residual(x) };
}

export { evaluate };
