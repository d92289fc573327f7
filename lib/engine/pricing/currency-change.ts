type Currency = { code: string; exponent: number };

/**
 * Whether the shop's currency may change, and if not, why. Amounts are stored as bare minor units, so a
 * change of code or of decimal places would silently reprice everything already priced (a 4.50 part, 450
 * minor units, would read 450 yen). Bandedge does not convert: while a parts catalogue or an open estimate
 * is priced in the old currency, the change is refused with the reason; with nothing priced it may go ahead.
 */
export function currencyChangeRefusal(
  from: Currency,
  to: Currency,
  priced: { catalogueParts: number; openEstimates: number },
): string | null {
  if (from.code === to.code && from.exponent === to.exponent) return null;
  if (priced.catalogueParts === 0 && priced.openEstimates === 0) return null;
  const what = [
    priced.catalogueParts > 0 ? `the parts catalogue (${priced.catalogueParts} part${priced.catalogueParts === 1 ? "" : "s"})` : null,
    priced.openEstimates > 0 ? `${priced.openEstimates} open estimate${priced.openEstimates === 1 ? "" : "s"}` : null,
  ]
    .filter(Boolean)
    .join(" and ");
  const change = from.code === to.code ? `${from.code} with ${to.exponent} decimal place${to.exponent === 1 ? "" : "s"}` : `${to.code}`;
  return `The currency stays ${from.code}: ${what} ${priced.catalogueParts > 0 && priced.openEstimates > 0 ? "are" : priced.openEstimates > 1 ? "are" : "is"} priced in ${from.code}, and switching to ${change} would reprice them without converting. Nothing was saved.`;
}
