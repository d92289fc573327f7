export const ROLES = ["customer", "technician", "owner"] as const;
export type Role = (typeof ROLES)[number];

// Who may do what. The UI reads it to hide controls; the server reads it to refuse.
// Ownership (a customer's own job, photo, certificate) is checked beside the data, in db/queries.
export const PERMISSIONS = {
  "portal.use": ["customer"],
  "quote.request": ["customer"],
  "estimate.approve": ["customer"],
  "payment.start": ["customer"],
  "message.post": ["customer", "technician", "owner"],
  // Seeing a photo also needs ownership (its uploader, its job's owner) or a workshop role; see db/queries/photos.
  "photo.view": ["customer", "technician", "owner"],
  "claim.open": ["customer"],
  // The set owner's own account page: name and contact, the address book, a job's return address, closing.
  "account.manage": ["customer"],
  "bench.use": ["technician", "owner"],
  // Taking a set in at the counter or on the phone: find or add the customer, open the job for them.
  "job.intake": ["technician", "owner"],
  // Recording a decision the set owner gave in person or by phone (approval or decline of an estimate).
  "decision.record": ["technician", "owner"],
  "job.triage": ["technician", "owner"],
  "job.assign": ["technician", "owner"],
  "estimate.edit": ["technician", "owner"],
  "estimate.send": ["technician", "owner"],
  "reading.record": ["technician", "owner"],
  "job.complete": ["technician", "owner"],
  "job.return": ["technician", "owner"],
  "tools.use": ["technician", "owner"],
  "claim.review": ["technician", "owner"],
  "claim.decide": ["technician", "owner"],
  // Every staff account has its own profile: notification choices and the list of what happened.
  "notifications.use": ["technician", "owner"],
  "office.use": ["owner"],
  "settings.edit": ["owner"],
  // The instrument register is shop settings: whoever may edit those keeps it. The bench reads it on the sheet.
  "instrument.manage": ["owner"],
  // The parts catalogue is the shop's prices: the owner keeps it; the bench searches it from the estimate.
  "parts.manage": ["owner"],
  "staff.manage": ["owner"],
  "payment.refund": ["owner"],
  "email.resend": ["owner"],
  // Before the bench: the set owner withdraws a quote request, the shop owner cancels a job (money goes back).
  "quote.withdraw": ["customer"],
  "job.cancel": ["owner"],
  "audit.read": ["owner"],
  "reports.read": ["owner"],
  // CSV files for the accountant: payments and refunds, jobs, tax by month, the audit log.
  "exports.download": ["owner"],
  "certificate.revoke": ["owner"],
  "certificate.reissue": ["owner"],
  // The holder downloads their own certificate; staff any (ownership is checked beside the data).
  "certificate.download": ["customer", "technician", "owner"],
  "certificate.list": ["owner"],
  // Receipts, refund notes, invoices and the printable estimate: the set owner their own jobs', the office any.
  "document.download": ["customer", "owner"],
  // Cash and cheques taken at the counter (and voiding an entry made by mistake).
  "payment.record": ["owner"],
} as const satisfies Record<string, readonly Role[]>;

export type Permission = keyof typeof PERMISSIONS;

export function isRole(value: unknown): value is Role {
  return value === "customer" || value === "technician" || value === "owner";
}

export function can(role: string | null | undefined, permission: Permission): boolean {
  if (!isRole(role)) return false;
  return (PERMISSIONS[permission] as readonly Role[]).includes(role);
}

/**
 * What an account on the staff list may still do with the jobs, certificates and claims it holds as a set
 * owner (an owner's account converted to staff on purpose keeps them): see and answer its own jobs in the
 * portal. Each of these is checked against ownership beside the data, so it reaches only its own records.
 * New quote requests stay with set owners' accounts: staff and customer accounts are kept apart.
 */
export const HOLDER_PERMISSIONS = [
  "portal.use",
  "estimate.approve",
  "payment.start",
  "message.post",
  "photo.view",
  "claim.open",
  "quote.withdraw",
  "certificate.download",
  "document.download",
] as const satisfies readonly Permission[];

/** Who is asking: their role, and whether a staff account also holds a set owner's records. */
export type Access = { role: string | null | undefined; holdsSets?: boolean };

/** The role's permissions, plus the holder's permissions for a staff account that holds its own sets. */
export function canAccess(who: Access, permission: Permission): boolean {
  if (can(who.role, permission)) return true;
  return who.holdsSets === true && isRole(who.role) && (HOLDER_PERMISSIONS as readonly Permission[]).includes(permission);
}

export function homeFor(role: string | null | undefined): string {
  if (role === "owner") return "/office";
  if (role === "technician") return "/bench";
  return "/portal";
}

export const ROLE_LABEL: Record<Role, string> = {
  customer: "Set owner",
  technician: "Technician",
  owner: "Shop owner",
};
