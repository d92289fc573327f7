// Customers taken in at the counter or on the phone. Every account row needs an e-mail (the sign-in service
// keys on it), so a phone-only contact gets an address under the reserved `.invalid` top-level domain
// (RFC 2606: it can never resolve). Nothing is ever sent there and no screen shows it.

export const NO_EMAIL_DOMAIN = "no-email.invalid";

export function placeholderEmail(id: string): string {
  return `contact-${id.toLowerCase()}@${NO_EMAIL_DOMAIN}`;
}

/** Whether mail to this address can reach a person (false for a phone-only contact's placeholder). */
export function isReachableEmail(email: string | null | undefined): email is string {
  return typeof email === "string" && email.includes("@") && !email.toLowerCase().endsWith(".invalid");
}

/** The e-mail as staff read it: the address, or nothing for a phone-only contact. */
export function shownEmail(email: string | null | undefined): string | null {
  return isReachableEmail(email) ? email : null;
}

export const INTAKE_CHANNELS = ["counter", "phone"] as const;
export type IntakeChannel = (typeof INTAKE_CHANNELS)[number];
export const CHANNEL_LABEL: Record<"online" | IntakeChannel, string> = {
  online: "Requested online",
  counter: "Taken in at the counter",
  phone: "Taken in by phone",
};

export const DECISION_MEDIA = ["in-person", "phone", "letter"] as const;
export type DecisionMedium = (typeof DECISION_MEDIA)[number];
export const DECISION_MEDIUM_LABEL: Record<DecisionMedium, string> = {
  "in-person": "in person at the counter",
  phone: "by phone",
  letter: "in writing (letter or note)",
};

/** How a customer reaches their job: an account they sign in to, an invitation not yet used, or none. */
export type CustomerAccess = "account" | "invited" | "contact";
export const CUSTOMER_ACCESS_LABEL: Record<CustomerAccess, string> = {
  account: "Signs in to the portal",
  invited: "Invited to set a password",
  contact: "Contact only, no sign-in",
};
