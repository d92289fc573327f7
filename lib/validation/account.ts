import { z } from "@/lib/engine/zod";

export const emailSchema = z.string().trim().toLowerCase().email("Enter a valid e-mail address.").max(254);
// Verified exactly as typed: no trimming or case folding of passwords.
export const passwordSchema = z.string().min(8, "Use at least 8 characters.").max(128, "Use at most 128 characters.");

export const signUpSchema = z.object({
  name: z.string().trim().min(1, "Tell us your name.").max(120),
  email: emailSchema,
  password: passwordSchema,
});
export type SignUpInput = z.infer<typeof signUpSchema>;

export const resetRequestSchema = z.object({ email: emailSchema });
export const resetSchema = z
  .object({ password: passwordSchema, confirm: z.string() })
  .refine((v) => v.password === v.confirm, { path: ["confirm"], message: "The two passwords differ." });

export const staffInviteSchema = z.object({
  name: z.string().trim().min(1, "Enter the person's name.").max(120),
  email: emailSchema,
  role: z.enum(["technician", "owner"]),
  // Converting a set owner's account: only with this flag and the holdings the owner was shown, repeated.
  convertCustomer: z.boolean().optional(),
  holdings: z.string().max(200).optional(),
});
export const staffInvitationAcceptSchema = z.object({
  token: z.string().min(1, "The invitation link is incomplete.").max(200),
  password: passwordSchema,
});
export const staffRoleSchema = z.object({ userId: z.string().min(1), role: z.enum(["customer", "technician", "owner"]) });
export const staffDeactivateSchema = z.object({ userId: z.string().min(1), active: z.boolean() });
