import type { ShopPolicy } from "../shop-policy";
import { applyBasisPoints, checkAmount } from "./money";

/**
 * Deposit: the policy percentage of the total, raised to the parts price when the shop asks for that,
 * raised to the processor's minimum charge, and never above the total.
 */
export function computeDeposit(amounts: { totalMinor: number; partsMinor: number }, deposit: ShopPolicy["deposit"]): number {
  const total = checkAmount(amounts.totalMinor, "totalMinor");
  const parts = checkAmount(amounts.partsMinor, "partsMinor");
  if (total === 0) return 0;
  let due = applyBasisPoints(total, deposit.percentBp);
  if (deposit.atLeastParts) due = Math.max(due, parts);
  due = Math.max(due, deposit.processorMinimumMinor);
  return Math.min(due, total);
}

/** What is left to pay: total plus approved additions, less what has been paid. */
export function computeBalance(amounts: { totalMinor: number; paidMinor: number; additionsMinor?: number }): number {
  const owed = checkAmount(amounts.totalMinor, "totalMinor") + checkAmount(amounts.additionsMinor ?? 0, "additionsMinor");
  return Math.max(0, owed - checkAmount(amounts.paidMinor, "paidMinor"));
}
