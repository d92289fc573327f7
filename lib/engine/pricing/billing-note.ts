import type { EstimateTotals } from "./price-estimate";

const minutesText = (n: number) => `${n} minute${n === 1 ? "" : "s"}`;

/**
 * The one sentence that explains how labour minutes became billed minutes, shown once under the totals
 * ("billed as N minutes"), never per line.
 */
export function billingNote(
  t: Pick<EstimateTotals, "billingRounding" | "billingIncrementMinutes" | "workedMinutes" | "billedMinutes">,
): string {
  if (t.billedMinutes === 0) return "No labour is charged.";
  const inc = minutesText(t.billingIncrementMinutes);
  if (t.billingRounding === "line") {
    return t.billedMinutes === t.workedMinutes
      ? `Labour is billed as ${minutesText(t.billedMinutes)}, the time listed; each line is rounded up to the next ${inc}.`
      : `Labour is billed as ${minutesText(t.billedMinutes)}: each line is rounded up to the next ${inc} (${minutesText(t.workedMinutes)} of work listed).`;
  }
  return t.billedMinutes === t.workedMinutes
    ? `Labour is billed as ${minutesText(t.billedMinutes)}, the time listed.`
    : `Labour is billed as ${minutesText(t.billedMinutes)}: the ${minutesText(t.workedMinutes)} of work listed, rounded up once to the next ${inc}.`;
}
