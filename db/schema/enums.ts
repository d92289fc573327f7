import { pgEnum } from "drizzle-orm/pg-core";
import { JOB_STATES } from "@/lib/engine/jobs/states";

export { JOB_STATES, type JobState } from "@/lib/engine/jobs/states";
export { ROLES, type Role } from "@/lib/engine/permissions";

export const jobState = pgEnum("job_state", JOB_STATES);
export const setKind = pgEnum("set_kind", ["tube-acdc", "tube-transformer", "transistor-battery", "transistor-mains"]);
export const deliveryMethod = pgEnum("delivery_method", ["drop-off", "mail-in"]);
export const revisionStatus = pgEnum("revision_status", ["sent", "approved", "declined", "superseded"]);
export const lineCategory = pgEnum("line_category", ["inspection", "safety", "recap", "alignment", "mechanical", "test", "parts"]);
export const paymentPurpose = pgEnum("payment_purpose", ["deposit", "balance"]);
export const paymentStatus = pgEnum("payment_status", ["open", "processing", "paid", "failed", "expired", "duplicate", "voided"]);
// How money reached the shop: through the card processor's checkout, or handed over at the counter.
export const paymentMethod = pgEnum("payment_method", ["card", "cash", "cheque"]);
// The documents the shop issues about money, each numbered in its own gapless series.
export const moneyDocumentKind = pgEnum("money_document_kind", ["receipt", "refund", "invoice"]);
export const refundStatus = pgEnum("refund_status", ["requested", "pending", "succeeded", "failed"]);
/**
 * return: money held beyond the total goes back (a duplicate charge, an over-payment, a cancelled job).
 * reduction: the shop lowers the price by the amount and gives it back (goodwill after the job is paid).
 */
export const refundKind = pgEnum("refund_kind", ["return", "reduction"]);
export const verdict = pgEnum("verdict", ["pass", "fail", "missing", "recorded"]);
export const claimStatus = pgEnum("claim_status", ["open", "inspecting", "accepted", "rejected", "withdrawn"]);
export const emailStatus = pgEnum("email_status", ["queued", "sent", "failed"]);
export const returnMethod = pgEnum("return_method", ["pick-up", "shipped"]);
export const intakeChannel = pgEnum("intake_channel", ["online", "counter", "phone"]);
export const decisionMedium = pgEnum("decision_medium", ["in-person", "phone", "letter"]);
