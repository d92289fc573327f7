import type { ShopPolicy } from "../shop-policy";
import { applyBasisPoints, checkAmount } from "./money";

/**
 * Deposit: the policy percentage of the total, raised to the parts price when the shop asks for that,
 * raised to the processor's minimum charge, and never above the total. Neither the deposit nor the balance
 * may be a positive amount below the processor's minimum (it could not be charged): a balance that would be
 * is folded into the deposit.
 */
export function computeDeposit(amounts: { totalMinor: number; partsMinor: number }, deposit: ShopPolicy["deposit"]): number {
  const total = checkAmount(amounts.totalMinor, "totalMinor");
  const parts = checkAmount(amounts.partsMinor, "partsMinor");
  if (total === 0) return 0;
  let due = applyBasisPoints(total, deposit.percentBp);
  if (deposit.atLeastParts) due = Math.max(due, parts);
  due = Math.min(Math.max(due, deposit.processorMinimumMinor), total);
  const balance = total - due;
  if (balance > 0 && balance < deposit.processorMinimumMinor) due = total;
  return due;
}

/** What is left to pay: total plus approved additions, less what has been paid. */
export function computeBalance(amounts: { totalMinor: number; paidMinor: number; additionsMinor?: number }): number {
  const owed = checkAmount(amounts.totalMinor, "totalMinor") + checkAmount(amounts.additionsMinor ?? 0, "additionsMinor");
  return Math.max(0, owed - checkAmount(amounts.paidMinor, "paidMinor"));
}
