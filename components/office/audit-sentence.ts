import { STATE_LABEL, type JobState } from "@/lib/engine/jobs/states";
import { formatMoney, type Currency } from "./format";

// The audit log read as sentences: what happened, in words, with money formatted and a link to the record.
// The stored action and entity names stay in the data (and in a "details" disclosure), never as the text.

type Row = {
  action: string;
  entity: string;
  entityId: string;
  before: Record<string, unknown> | null;
  after: Record<string, unknown> | null;
};

const ENTITY_WORD: Record<string, string> = {
  job: "job",
  estimate: "estimate",
  estimate_revision: "estimate revision",
  payment: "payment",
  refund: "refund",
  certificate: "certificate",
  claim: "warranty claim",
  radio_set: "set profile",
  shop_settings: "shop settings",
  user: "account",
  message: "message",
};

/** "estimate_revision" → "estimate revision"; unknown names read as words, never as code. */
export function entityWord(entity: string): string {
  return ENTITY_WORD[entity] ?? entity.replace(/[_.-]+/g, " ");
}

function stateWord(value: unknown): string | null {
  return typeof value === "string" && value in STATE_LABEL ? STATE_LABEL[value as JobState].staff.toLowerCase() : null;
}

function amountOf(row: Row, currency: Currency): string | null {
  for (const side of [row.after, row.before]) {
    const v = side?.amountMinor ?? side?.totalMinor;
    if (typeof v === "number" && Number.isSafeInteger(v)) return formatMoney(v, currency);
  }
  return null;
}

const TEXT: Record<string, (row: Row, money: string | null) => string> = {
  "job.create": () => "opened the job",
  "job.transition": (r) => {
    const from = stateWord(r.before?.state);
    const to = stateWord(r.after?.state);
    return from && to ? `moved the job from “${from}” to “${to}”` : to ? `moved the job to “${to}”` : "moved the job on";
  },
  "job.assign": () => "assigned the job to a technician",
  "set.profile.update": () => "updated the set profile",
  "estimate.save": () => "saved the estimate draft",
  "estimate.send": (_r, m) => (m ? `sent an estimate of ${m} to the owner` : "sent the estimate to the owner"),
  "estimate.approve": (_r, m) => (m ? `approved the estimate of ${m}` : "approved the estimate"),
  "estimate.decline": () => "declined the estimate",
  "estimate.approve_recorded": (r, m) =>
    `recorded the owner's approval of the estimate${m ? ` of ${m}` : ""}, given ${mediumWords(r.after?.medium)}`,
  "estimate.decline_recorded": (r) => `recorded the owner's decline of the estimate, given ${mediumWords(r.after?.medium)}`,
  "job.intake": (r) => (r.after?.channel === "phone" ? "took a job in by phone" : "took a set in at the counter"),
  "customer.create_at_intake": (r) =>
    r.after?.contactOnly === true ? "added a customer kept as a contact without sign-in" : "added a customer at intake",
  "customer.invite": () => "invited a customer to set a password",
  "customer.invitation_accepted": () => "set a password with a customer invitation",
  "reading.record": () => "recorded a bench reading",
  "payment.checkout": (_r, m) => (m ? `started a checkout for ${m}` : "started a checkout"),
  "payment.paid": (_r, m) => (m ? `recorded a payment of ${m}` : "recorded a payment"),
  "payment.refunded": (_r, m) => (m ? `recorded ${m} refunded on a payment` : "recorded a refund on a payment"),
  "payment.mismatch": () => "flagged a payment whose amount did not match the checkout",
  "payment.duplicate": (_r, m) => (m ? `flagged a duplicate charge of ${m}` : "flagged a duplicate charge"),
  "refund.request": (_r, m) => (m ? `asked the processor to refund ${m}` : "asked the processor for a refund"),
  "refund.failed": (_r, m) => (m ? `recorded that a refund of ${m} failed; nothing was refunded` : "recorded a failed refund"),
  "refund.mismatch": () => "flagged a refund whose amount did not match the request",
  "settings.update": () => "changed the shop's rates and policy",
  "staff.invite": (r) => (typeof r.after?.email === "string" ? `invited ${r.after.email} to the staff` : "invited someone to the staff"),
  "staff.role": () => "changed a staff member's access",
  "claim.open": () => "opened a warranty claim",
  "certificate.issue": () => "issued a warranty certificate",
  "certificate.reissue": () => "reissued a warranty certificate",
  "certificate.revoke": () => "revoked a warranty certificate",
  "staff.convert_customer": (r) =>
    typeof r.after?.email === "string"
      ? `converted the set owner's account ${r.after.email} to staff`
      : "converted a set owner's account to staff",
  "staff.invitation_accepted": () => "set a password with a staff invitation",
  "staff.deactivate": () => "deactivated a staff member",
  "staff.reactivate": () => "reactivated a staff member",
  "staff.bench-week": () => "set a staff member's bench hours and days off",
  "auth.sign_in": () => "signed in",
  "auth.sign_in_failed": () => "was refused at sign-in (wrong e-mail or password)",
  "auth.sign_out": () => "signed out",
  "auth.password_reset_requested": () => "asked for a password-reset link",
  "auth.password_reset": () => "set a new password with a reset link",
  "auth.admin.create-user": () => "created an account through the sign-in service",
  "auth.admin.update-user": () => "changed an account through the sign-in service",
  "auth.admin.set-role": (r) => (typeof r.after?.role === "string" ? `set an account's role to ${r.after.role}` : "set an account's role"),
  "auth.admin.ban-user": () => "banned an account",
  "auth.admin.unban-user": () => "lifted an account's ban",
  "auth.admin.remove-user": () => "removed an account",
  "auth.admin.set-user-password": () => "set an account's password",
  "auth.admin.revoke-user-session": () => "ended one of an account's sessions",
  "auth.admin.revoke-user-sessions": () => "ended all of an account's sessions",
  "auth.admin.impersonate-user": () => "started acting as another account",
  "auth.admin.stop-impersonating": () => "stopped acting as another account",
};

/** Where the record lives for the office, when it has a page of its own. */
export function auditRecordHref(row: Pick<Row, "entity" | "entityId" | "after">): string | null {
  switch (row.entity) {
    case "job":
      return `/bench/jobs/${row.entityId}`;
    case "payment":
      return `/office/payments/${row.entityId}`;
    case "claim":
      return `/bench/claims/${row.entityId}`;
    case "certificate":
      return "/office/certificates";
    case "shop_settings":
      return "/office/settings";
    case "user":
      return "/office/staff";
    default: {
      const jobId = row.after?.jobId;
      return typeof jobId === "string" ? `/bench/jobs/${jobId}` : null;
    }
  }
}

/** "recorded a payment of USD 513.44" — the verb phrase that follows the actor's name. */
export function auditSentence(row: Row, currency: Currency): string {
  const money = amountOf(row, currency);
  const text = TEXT[row.action];
  if (text) return text(row, money);
  const words = row.action.replace(/[_.-]+/g, " ");
  return `${words} (${entityWord(row.entity)})`;
}

/** "amountMinor" → "Amount", "policy.labourRateMinorPerHour" → "Policy labour rate per hour". */
export function fieldWord(key: string): string {
  const base = key.replace(/Minor(?=[A-Z]|$)/, "").replace(/Id$/, "");
  const words = base
    .replace(/([a-z0-9])([A-Z])/g, "$1 $2")
    .replace(/[_.-]+/g, " ")
    .toLowerCase();
  return words.charAt(0).toUpperCase() + words.slice(1);
}

/** A stored value as a person reads it: money in the shop currency, job states in words. */
export function fieldValue(key: string, value: unknown, currency: Currency): string {
  if (value === undefined || value === null) return "—";
  if (/Minor(?=[A-Z]|$)/.test(key) && typeof value === "number" && Number.isSafeInteger(value)) return formatMoney(value, currency);
  if (key === "state") return stateWord(value) ?? String(value);
  if (typeof value === "string") return value;
  if (typeof value === "boolean") return value ? "yes" : "no";
  if (typeof value === "number") return String(value);
  return JSON.stringify(value, null, 1);
}

function mediumWords(medium: unknown): string {
  return medium === "phone" ? "by phone" : medium === "letter" ? "in writing" : "in person";
}
