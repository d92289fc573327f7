import * as z from "zod/mini";

// The sign-in page is the lightest one a visitor loads, so its form checks use Zod's tree-shakable build.
// The same rules as the account schemas: the e-mail trimmed and lower-cased, the password exactly as typed.
export const signInSchema = z.object({
  email: z.string().check(
    z.trim(),
    z.toLowerCase(),
    z.email("Enter a valid e-mail address."),
    z.maxLength(254, "Use at most 254 characters."),
  ),
  password: z.string().check(z.minLength(1, "Enter your password."), z.maxLength(128, "Use at most 128 characters.")),
});
export type SignInInput = z.infer<typeof signInSchema>;
