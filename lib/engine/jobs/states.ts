// The life of a job: its states and the moves between them.
export const JOB_STATES = [
  "requested",
  "in_triage",
  "awaiting_owner",
  "estimate_sent",
  "approved",
  "deposit_paid",
  "on_bench",
  "bench_revision",
  "final_checks",
  "balance_due",
  "paid_in_full",
  "returned",
  "declined_by_owner",
  "declined_by_shop",
  "cancelled",
] as const;
export type JobState = (typeof JOB_STATES)[number];

export type Actor = "customer" | "staff" | "system";

// Every legal move of a job. The server refuses anything not listed here (409) and leaves the job as it was.
export const TRANSITIONS: Record<JobState, Partial<Record<JobState, Actor>>> = {
  requested: { in_triage: "staff", cancelled: "customer" },
  // Until the set is on the bench the shop may call the job off (cancelled); money held goes back.
  in_triage: { awaiting_owner: "staff", estimate_sent: "staff", declined_by_shop: "staff", cancelled: "staff" },
  awaiting_owner: { in_triage: "customer", cancelled: "staff" },
  estimate_sent: { approved: "customer", declined_by_owner: "customer", estimate_sent: "staff", cancelled: "staff" },
  approved: { deposit_paid: "system", estimate_sent: "staff", cancelled: "staff" },
  deposit_paid: { on_bench: "staff", cancelled: "staff" },
  // A scope change while the set is on the bench keeps it there: the owner approves the revision (back to the
  // bench), declines it and keeps the approved scope (back to the bench), or declines it and has the set
  // returned as is (the work stops and what was paid settles it).
  on_bench: { bench_revision: "staff", final_checks: "staff" },
  bench_revision: { bench_revision: "staff", on_bench: "customer", balance_due: "customer" },
  final_checks: { balance_due: "staff", on_bench: "staff" },
  // "system" also covers a job with nothing left to pay, which moves on by itself at completion.
  balance_due: { paid_in_full: "system" },
  paid_in_full: { returned: "staff" },
  returned: {},
  declined_by_owner: {},
  declined_by_shop: {},
  cancelled: {},
};

export function canTransition(from: JobState, to: JobState, actor: Actor): boolean {
  return TRANSITIONS[from]?.[to] === actor;
}

/** The states from which the shop may still call a job off (the set is not on the bench yet). */
export const SHOP_CANCELLABLE: readonly JobState[] = JOB_STATES.filter((s) => TRANSITIONS[s].cancelled === "staff");

export function isTerminal(state: JobState): boolean {
  return Object.keys(TRANSITIONS[state]).length === 0;
}

// Words of our own, for the set owner and for the bench. Shown with an icon, never colour alone.
export const STATE_LABEL: Record<JobState, { owner: string; staff: string; icon: string }> = {
  requested: { owner: "Quote requested", staff: "New request", icon: "✉" },
  in_triage: { owner: "Being reviewed", staff: "In triage", icon: "◔" },
  awaiting_owner: { owner: "The shop has a question", staff: "Waiting on owner", icon: "?" },
  estimate_sent: { owner: "Estimate ready for you", staff: "Estimate out", icon: "✎" },
  approved: { owner: "Approved — deposit due", staff: "Approved, no deposit yet", icon: "✓" },
  deposit_paid: { owner: "Deposit received — send the set", staff: "Deposit in, awaiting set", icon: "⛁" },
  on_bench: { owner: "On the bench", staff: "On the bench", icon: "⚒" },
  bench_revision: {
    owner: "A change to the work needs your answer — the set stays on the bench",
    staff: "Revision out, set on the bench",
    icon: "✎",
  },
  final_checks: { owner: "Final checks", staff: "Final checks", icon: "⌁" },
  balance_due: { owner: "Ready — balance due", staff: "Balance due", icon: "⛀" },
  // Paid in full: the shop still has the set and is getting it ready; nothing has left the shop yet.
  paid_in_full: { owner: "Paid in full — being made ready to return", staff: "Paid, to return", icon: "⛁" },
  // Returned: the shop handed the set over or shipped it; ownerStateLabel says which.
  returned: { owner: "Returned", staff: "Returned", icon: "⌂" },
  declined_by_owner: { owner: "You declined the estimate", staff: "Declined by owner", icon: "✕" },
  declined_by_shop: { owner: "The shop cannot take this job", staff: "Declined by shop", icon: "✕" },
  cancelled: { owner: "Cancelled", staff: "Cancelled", icon: "✕" },
};

export function jobNumber(n: number): string {
  return `KL-${String(n).padStart(4, "0")}`;
}

export type ReturnMethod = "pick-up" | "shipped";

/**
 * The state as the owner reads it. A returned set was either collected at the shop (it is with the owner) or
 * handed to a carrier (it is on its way, not yet with them), so the words depend on how it went back; a set
 * already at the shop is not asked for after the deposit.
 */
/** The state as the workshop reads it: a set handed over at the counter is not awaited once the deposit is in. */
export function staffStateLabel(state: JobState, setAtShop = false): string {
  if (state === "deposit_paid" && setAtShop) return "Deposit in, set at the shop";
  return STATE_LABEL[state].staff;
}

export function ownerStateLabel(state: JobState, returnMethod?: ReturnMethod | null, setAtShop = false): string {
  if (state === "returned" && returnMethod === "shipped") return "Shipped — on its way to you";
  // A set handed over at the counter is already here: nothing to send once the deposit is in.
  if (state === "deposit_paid" && setAtShop) return "Deposit received — your set is with us, waiting for the bench";
  if (state === "returned" && returnMethod === "pick-up") return "Collected — back with you";
  return STATE_LABEL[state].owner;
}
