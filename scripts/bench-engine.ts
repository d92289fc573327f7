/**
 * Engine timings: median time per priced estimate (checklist + pricing + one tracking solve), per
 * tracking solve and per dial fit. Prints figures only; the goals (≤ 1 ms, ≤ 0.2 ms and ≤ 2 ms) are for
 * reading, not asserting.
 */
import { performance } from "node:perf_hooks";
import { fitDial } from "@/lib/engine/alignment/dial-fit";
import { checkTrackingBasis } from "@/lib/engine/alignment/inputs";
import { solveTracking } from "@/lib/engine/alignment/solve-tracking";
import { computeChecklist } from "@/lib/engine/checklist/compute-checklist";
import { setProfileSchema } from "@/lib/engine/checklist/profile";
import { priceEstimate } from "@/lib/engine/pricing/price-estimate";
import { defaultPartsCatalogue } from "@/lib/engine/pricing/parts";
import { defaultShopPolicy } from "@/lib/engine/shop-policy";

// The Haldane console from the demo scenario: the largest checklist the shop meets.
const profile = setProfileSchema.parse({
  kind: "tube-transformer",
  bands: [
    { kind: "MW", lowKHz: 540, highKHz: 1600, ifKHz: 455 },
    { kind: "SW", lowKHz: 2300, highKHz: 7300, ifKHz: 455 },
    { kind: "SW", lowKHz: 7000, highKHz: 22000, ifKHz: 455 },
    { kind: "FM", lowKHz: 88000, highKHz: 108000, ifKHz: 10700 },
  ],
  electrolytics: 4,
  paperCapacitors: 22,
  tubes: 10,
  ifTransformers: 2,
  ifTransformersFm: 3,
  seleniumRectifier: true,
  lineCordWorn: true,
  dialCordBroken: true,
});

const trackingInput = checkTrackingBasis({ band: { lowKHz: 540, highKHz: 1600 }, ifKHz: 455, gang: { minPF: 10, maxPF: 365 } });

function median(xs: number[]): number {
  const s = [...xs].sort((a, b) => a - b);
  const m = Math.floor(s.length / 2);
  return s.length % 2 ? s[m] : (s[m - 1] + s[m]) / 2;
}

/** Runs fn in batches so the timer's resolution does not dominate, and reports per-call figures. */
function measure(fn: () => unknown, batches = 200, perBatch = 50) {
  let sink = 0;
  for (let i = 0; i < 500; i++) sink += fn() ? 1 : 0;
  const times: number[] = [];
  for (let b = 0; b < batches; b++) {
    const t0 = performance.now();
    for (let i = 0; i < perBatch; i++) sink += fn() ? 1 : 0;
    times.push((performance.now() - t0) / perBatch);
  }
  if (sink < 0) console.log(sink);
  const sorted = [...times].sort((a, b) => a - b);
  return { median: median(times), p90: sorted[Math.floor(sorted.length * 0.9)] };
}

const estimate = measure(() => {
  const lines = computeChecklist(profile, defaultShopPolicy);
  const priced = priceEstimate(lines, defaultShopPolicy, defaultPartsCatalogue);
  const tracking = solveTracking(trackingInput);
  return priced.totals.totalMinor + tracking.maxAbsErrorKHz;
});
const tracking = measure(() => solveTracking(trackingInput).maxAbsErrorKHz);
// A bench's "as received" MW readings: seven marks read by eye, the coil a few per cent high, the trimmer low.
const dialReadings = [
  { dialKHz: 550, receivedKHz: 541.5 },
  { dialKHz: 600, receivedKHz: 588 },
  { dialKHz: 800, receivedKHz: 786.5 },
  { dialKHz: 1000, receivedKHz: 996.5 },
  { dialKHz: 1200, receivedKHz: 1209 },
  { dialKHz: 1400, loKHz: 1874.5 },
  { dialKHz: 1600, loKHz: 2080.5 },
];
const dialInput = { band: { lowKHz: 540, highKHz: 1600 }, ifKHz: 455, gang: { minPF: 10, maxPF: 365 } };
const dialFit = measure(() => fitDial({ ...dialInput, trackingPointsKHz: [600, 1000, 1400], readings: dialReadings }).fit.residualKHz);

const rows = [
  ["priced estimate (checklist + pricing + tracking solve)", estimate, 1],
  ["tracking solve (three-point, error curve of 101 points)", tracking, 0.2],
  ["dial fit (design, 7 readings, advice, two curves)", dialFit, 2],
] as const;

const fmt = (ms: number) => `${(ms * 1000).toFixed(1)} µs`;
console.log(`${"measure".padEnd(58)}${"median".padStart(12)}${"p90".padStart(12)}${"goal".padStart(12)}`);
for (const [name, r, goal] of rows) {
  console.log(`${name.padEnd(58)}${fmt(r.median).padStart(12)}${fmt(r.p90).padStart(12)}${`≤ ${goal} ms`.padStart(12)}`);
}
