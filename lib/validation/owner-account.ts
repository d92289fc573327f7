import { z } from "@/lib/engine/zod";
import "./field-words";
import { checkPostalAddress, COUNTRY_CODES, type CountryCode } from "@/lib/engine/addresses";
import { passwordSchema } from "./account";
import { CONTACT, PHONE_NEEDED_MESSAGE, PHONE_PATTERN } from "./quote";

// The set owner's account page: name and how to reach them, the address book, closing the account.

export const profileSchema = z
  .object({
    name: z.string().trim().min(1, "Name: tell us your name.").max(120, "Name: keep it under 120 characters."),
    phone: z.string().trim().max(40, "Phone number: keep it under 40 characters.").optional().default(""),
    contactPreference: z.enum(CONTACT, { error: "Reaching you: choose e-mail or phone." }),
  })
  .superRefine((v, ctx) => {
    // The same rule as the quote request: a phone number is needed only to be reached by phone.
    if (v.contactPreference === "phone" && !PHONE_PATTERN.test(v.phone)) {
      ctx.addIssue({ code: "custom", path: ["phone"], message: PHONE_NEEDED_MESSAGE });
    } else if (v.phone && !PHONE_PATTERN.test(v.phone)) {
      ctx.addIssue({ code: "custom", path: ["phone"], message: "Phone number: digits, spaces and + ( ) . - only, or leave it empty." });
    }
  });
export type ProfileInput = z.input<typeof profileSchema>;
export type ProfileValues = z.output<typeof profileSchema>;

const line = (label: string, max: number) =>
  z.string().trim().min(1, `${label}: fill this in.`).max(max, `${label}: keep it under ${max} characters.`);
// An empty optional line may come back as null (the checked address the form sends stores it so).
const optionalLine = (label: string, max: number) =>
  z.preprocess((v) => v ?? "", z.string().trim().max(max, `${label}: keep it under ${max} characters.`));

export const addressSchema = z
  .object({
    recipient: line("Name on the parcel", 120),
    line1: line("Street and number", 200),
    line2: optionalLine("Flat, floor, building", 200),
    city: line("City or town", 120),
    region: optionalLine("Region", 80),
    postalCode: optionalLine("Postal code", 20),
    country: z.enum(COUNTRY_CODES as [CountryCode, ...CountryCode[]], { error: "Country: choose one from the list." }),
    isDefault: z.boolean().optional().default(false),
  })
  .transform((v, ctx) => {
    // The country decides the region list and the postal code's form (lib/engine/addresses).
    const checked = checkPostalAddress(v);
    if (!checked.ok) {
      for (const [field, message] of Object.entries(checked.errors)) ctx.addIssue({ code: "custom", path: [field], message });
      return z.NEVER;
    }
    return { ...checked.address, isDefault: v.isDefault };
  });
export type AddressInput = z.input<typeof addressSchema>;
export type AddressValues = z.output<typeof addressSchema>;

export const chooseReturnAddressSchema = z.object({ addressId: z.uuid({ error: "Return address: choose one of your addresses." }) });

export const closeAccountSchema = z.object({
  password: z.string().min(1, "Password: enter your current password to confirm.").max(128, "Password: at most 128 characters."),
  confirm: z.literal(true, { error: "Confirmation: tick the box to say you understand what is kept and what is removed." }),
});

/** Same rules as sign-up for the new password; the current one is only checked by the sign-in service. */
export const changePasswordSchema = z
  .object({
    currentPassword: z.string().min(1, "Current password: enter it to confirm the change.").max(128),
    newPassword: passwordSchema,
    confirm: z.string(),
  })
  .refine((v) => v.newPassword === v.confirm, { path: ["confirm"], message: "Repeat the new password: the two passwords differ." });

export const changeEmailSchema = z.object({
  newEmail: z.string().trim().toLowerCase().email("New e-mail address: enter a valid e-mail address.").max(254),
});
