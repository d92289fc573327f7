import { checkAmount } from "./money";

// One account of what is owed on a job, read by every page, e-mail, checkout, report and export.
// Money the processor has taken counts once it is paid; money going back counts as soon as a refund is
// asked for (pending) so that nothing is offered back twice, and is only "refunded" once the processor
// confirms it. A remainder below the processor's smallest charge cannot be collected online: the shop waives
// it explicitly (recorded on the job with who and when), and the waiver counts like a payment that never
// has to be given back.
//
// A refund is of one of two kinds. A return gives back money held beyond the total (a duplicate charge, an
// over-payment, a cancelled job): it lowers what the shop holds and nothing else, so a return on a job paid
// exactly shows as owed again. A reduction is the shop lowering the price and giving that amount back (goodwill
// after the work is paid): it lowers what is due as much as what is held, so it never makes anything owed.
// Both count under the same rule (settled or on its way; a failed one took nothing). A reduction beyond what is
// left of the price lowers it to zero and the rest counts as money given back.

export type AccountPayment = {
  amountMinor: number;
  /**
   * "paid" counts, and so does "duplicate" (a second charge for something already paid: the money is held
   * and owed back until refunded); open, failed and expired sessions took nothing.
   */
  status: string;
};

export type AccountRefund = {
  amountMinor: number;
  /** "succeeded" came back from the processor; "requested"/"pending" is on its way; "failed" took nothing. */
  status: string;
  /** "return" (the default) gives back money held beyond the total; "reduction" lowers the price by the amount. */
  kind?: string | null;
};

export type RefundKind = "return" | "reduction";
export const REFUND_KINDS: readonly RefundKind[] = ["return", "reduction"];

export type Account = {
  /** The approved revision's total (zero before any approval). */
  totalMinor: number;
  /** Sum of paid payments, duplicate charges included. */
  paidMinor: number;
  /** Refunds the processor confirmed, of either kind (money that went back). */
  refundedMinor: number;
  /** Refunds asked for and not yet settled either way, of either kind. */
  refundPendingMinor: number;
  /**
   * How much the price was lowered by reductions, settled or on their way (never more than the total less
   * what was waived). Included in refundedMinor / refundPendingMinor, since that money goes back too.
   */
  reducedMinor: number;
  /** What the shop holds: paid − refunded − pending refunds. */
  heldMinor: number;
  /** A remainder the shop waived because it was below the processor's smallest charge. */
  waivedMinor: number;
  /** What the owner still has to pay (never negative). */
  owedMinor: number;
  /** What the shop has to give back (never negative): held beyond the total less waivers and reductions. */
  owedBackMinor: number;
};

export { WAIVED_WORDING } from "./wording";

const PENDING = new Set(["requested", "pending"]);
const HELD = new Set(["paid", "duplicate"]);

export function accountOf({
  totalMinor,
  payments,
  refunds,
  waivedMinor = 0,
}: {
  totalMinor: number;
  payments: readonly AccountPayment[];
  refunds: readonly AccountRefund[];
  waivedMinor?: number;
}): Account {
  const total = checkAmount(totalMinor, "totalMinor");
  const waived = Math.min(checkAmount(waivedMinor, "waivedMinor"), total);
  let paid = 0;
  for (const p of payments) if (HELD.has(p.status)) paid += checkAmount(p.amountMinor, "payments.amountMinor");
  let refunded = 0;
  let pending = 0;
  let reductions = 0;
  for (const r of refunds) {
    const counts = r.status === "succeeded" || PENDING.has(r.status);
    if (!counts) continue;
    const amount = checkAmount(r.amountMinor, "refunds.amountMinor");
    if (r.status === "succeeded") refunded += amount;
    else pending += amount;
    if (r.kind === "reduction") reductions += amount;
  }
  const held = paid - refunded - pending;
  // The price lowered by reductions, never below zero; what a reduction gives back beyond that counts as a return.
  const reduced = Math.min(reductions, total - waived);
  // What the owner has to cover: the total less what the shop let go and less the reductions.
  const due = total - waived - reduced;
  return {
    totalMinor: total,
    paidMinor: paid,
    refundedMinor: refunded,
    refundPendingMinor: pending,
    reducedMinor: reduced,
    heldMinor: held,
    waivedMinor: waived,
    owedMinor: Math.max(0, due - held),
    owedBackMinor: Math.max(0, held - due),
  };
}

/**
 * What is still owed when it is a positive amount below the processor's smallest charge: the owner cannot pay
 * it online, so the shop settles it by waiving it (zero otherwise, including when nothing is owed).
 */
export function remainderBelowMinimum(account: Pick<Account, "owedMinor">, processorMinimumMinor: number): number {
  const minimum = checkAmount(processorMinimumMinor, "processorMinimumMinor");
  return account.owedMinor > 0 && account.owedMinor < minimum ? account.owedMinor : 0;
}
