/** How labour minutes are rounded up to the billing increment: once on the job's total, or on each line. */
export const billingRoundings = ["job", "line"] as const;
export type BillingRounding = (typeof billingRoundings)[number];
