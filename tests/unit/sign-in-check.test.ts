import { describe, expect, it } from "vitest";
import { emailSchema } from "@/lib/validation/account";
import { checkSignIn } from "@/lib/validation/sign-in";

// The sign-in page checks its two fields without a schema library; the account schema (Zod) is the
// reference it must agree with on ordinary addresses.
describe("the sign-in field check", () => {
  it("trims and lower-cases the e-mail and keeps the password exactly as typed", () => {
    const { values, errors } = checkSignIn({ email: "  Mira.Holloway@Example.COM ", password: "  spaces kept  " });
    expect(errors).toEqual({});
    expect(values).toEqual({ email: "mira.holloway@example.com", password: "  spaces kept  " });
  });

  it("names the field that needs attention", () => {
    expect(checkSignIn({ email: "", password: "" }).errors).toEqual({
      email: "Enter a valid e-mail address.",
      password: "Enter your password.",
    });
    expect(checkSignIn({ email: "a@b.co", password: "x".repeat(129) }).errors).toEqual({ password: "Use at most 128 characters." });
    expect(checkSignIn({ email: `${"a".repeat(250)}@b.co`, password: "x" }).errors).toEqual({ email: "Use at most 254 characters." });
  });

  it("agrees with the account schema on ordinary good and bad addresses", () => {
    const samples = [
      "mira.holloway@example.com",
      "jonah+radios@example.net",
      "o.d@kestrel-lane.example",
      "UPPER@EXAMPLE.ORG",
      "plainaddress",
      "@example.com",
      "no-at-sign.example.com",
      "two@@example.com",
      "spaces in@example.com",
      "trailing@example",
      "",
    ];
    for (const s of samples) {
      const ours = !checkSignIn({ email: s, password: "x" }).errors.email;
      const reference = emailSchema.safeParse(s).success;
      expect(ours, s).toBe(reference);
    }
  });
});
