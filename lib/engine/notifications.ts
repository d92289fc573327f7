// Staff notifications: the events that make one, who receives it, and what each person gets by default.

export const NOTIFICATION_KINDS = [
  "quote_requested",
  "owner_message",
  "estimate_decided",
  "payment_received",
  "refund_settled",
  "claim_opened",
] as const;
export type NotificationKind = (typeof NOTIFICATION_KINDS)[number];

export const NOTIFICATION_CHANNELS = ["inApp", "email"] as const;
export type NotificationChannel = (typeof NOTIFICATION_CHANNELS)[number];

export const NOTIFICATION_KIND_LABEL: Record<NotificationKind, string> = {
  quote_requested: "New quote request",
  owner_message: "Message from a set owner",
  estimate_decided: "Estimate approved or declined",
  payment_received: "Payment received",
  refund_settled: "Refund settled",
  claim_opened: "Warranty claim opened",
};

export type ChannelChoice = { inApp: boolean; email: boolean };
export type NotificationPreferences = Record<NotificationKind, ChannelChoice>;

/**
 * Until a person chooses: everything in the app; by e-mail only what waits on the shop to start (a new
 * request, a warranty claim), so an inbox is not filled with what the list already shows.
 */
export const DEFAULT_NOTIFICATION_PREFERENCES: NotificationPreferences = {
  quote_requested: { inApp: true, email: true },
  owner_message: { inApp: true, email: false },
  estimate_decided: { inApp: true, email: false },
  payment_received: { inApp: true, email: false },
  refund_settled: { inApp: true, email: false },
  claim_opened: { inApp: true, email: true },
};

export function isNotificationKind(value: unknown): value is NotificationKind {
  return typeof value === "string" && (NOTIFICATION_KINDS as readonly string[]).includes(value);
}

/** Stored choices over the defaults; a kind without a stored row keeps its default. */
export function resolvePreferences(rows: readonly ({ kind: string } & ChannelChoice)[]): NotificationPreferences {
  const out = Object.fromEntries(NOTIFICATION_KINDS.map((k) => [k, { ...DEFAULT_NOTIFICATION_PREFERENCES[k] }])) as NotificationPreferences;
  for (const row of rows) if (isNotificationKind(row.kind)) out[row.kind] = { inApp: row.inApp, email: row.email };
  return out;
}

export type StaffCandidate = { id: string; role: string; active: boolean };

/**
 * Who hears of an event on a job or claim: the technician the job is assigned to, while that account is an
 * active staff account; otherwise the shop, meaning every active shop owner (the owner runs the office: new
 * requests, money and claims are theirs to hand out). The person who caused the event is never told of it.
 * Money settling back to an owner (`shopOnly`) goes to the shop whoever holds the job at the bench.
 */
export function chooseRecipients({
  technicianId,
  staff,
  actorId,
  shopOnly = false,
}: {
  technicianId: string | null;
  staff: readonly StaffCandidate[];
  actorId: string | null;
  shopOnly?: boolean;
}): string[] {
  const isStaff = (s: StaffCandidate) => s.active && (s.role === "technician" || s.role === "owner");
  const assigned = !shopOnly && technicianId ? staff.find((s) => s.id === technicianId && isStaff(s)) : undefined;
  const chosen = assigned ? [assigned] : staff.filter((s) => s.active && s.role === "owner");
  return [...new Set(chosen.map((s) => s.id))].filter((id) => id !== actorId);
}
