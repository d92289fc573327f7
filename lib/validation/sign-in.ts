// The sign-in page is the lightest page a visitor loads, so its two fields are checked here without a
// schema library in the browser. The rules match the account schemas (lib/validation/account.ts): the
// e-mail trimmed and lower-cased, the password exactly as typed. The sign-in service checks them again.
export type SignInInput = { email: string; password: string };
export type SignInErrors = Partial<Record<keyof SignInInput, string>>;

// The same shape of address the account schemas accept: something@something.tld, no spaces.
const EMAIL = /^[^\s@]+@[^\s@]+\.[^\s@]+$/;

export function checkSignIn(raw: SignInInput): { values: SignInInput; errors: SignInErrors } {
  const email = raw.email.trim().toLowerCase();
  const errors: SignInErrors = {};
  if (!EMAIL.test(email)) errors.email = "Enter a valid e-mail address.";
  else if (email.length > 254) errors.email = "Use at most 254 characters.";
  if (raw.password.length === 0) errors.password = "Enter your password.";
  else if (raw.password.length > 128) errors.password = "Use at most 128 characters.";
  return { values: { email, password: raw.password }, errors };
}
