import { defaultShopPolicy, type ShopPolicy } from "../shop-policy";
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

/**
 * The deposit to ask for now on an approved revision: its deposit less the deposits already paid, never more
 * than is owed. A difference that is a positive amount below the processor's minimum could not be charged: it
 * is not asked for now and is settled with the balance instead (zero is returned).
 */
export function depositToCollect(
  amounts: { depositMinor: number; paidDepositsMinor: number; owedMinor: number },
  processorMinimumMinor: number,
): number {
  const deposit = checkAmount(amounts.depositMinor, "depositMinor");
  const paid = checkAmount(amounts.paidDepositsMinor, "paidDepositsMinor");
  const owed = checkAmount(amounts.owedMinor, "owedMinor");
  const due = Math.min(deposit - paid, owed);
  if (due <= 0 || due < checkAmount(processorMinimumMinor, "processorMinimumMinor")) return 0;
  return due;
}

/**
 * The processor minimum a revision was priced with (stored with its pricing, in its currency); the default
 * policy's figure for a revision that did not record one.
 */
export function recordedProcessorMinimum(pricing: Record<string, unknown> | null | undefined): number {
  const recorded = (pricing?.deposit as { processorMinimumMinor?: unknown } | undefined)?.processorMinimumMinor;
  return typeof recorded === "number" && Number.isSafeInteger(recorded) && recorded >= 0
    ? recorded
    : defaultShopPolicy.deposit.processorMinimumMinor;
}
