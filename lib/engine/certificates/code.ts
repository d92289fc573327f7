import { randomInt } from "node:crypto";
import { EngineError } from "../engine-error";

/** Crockford base32: no I, L, O or U, so a code read aloud or typed from paper survives. */
export const CROCKFORD_ALPHABET = "0123456789ABCDEFGHJKMNPQRSTVWXYZ";
export const CODE_LENGTH = 28;
export const CODE_GROUP = 4;
/** 28 symbols × 5 bits = 140 bits of randomness. */
export const CODE_BITS = CODE_LENGTH * 5;

export function generateCertificateCode(): string {
  let raw = "";
  for (let i = 0; i < CODE_LENGTH; i++) raw += CROCKFORD_ALPHABET[randomInt(32)];
  return formatCertificateCode(raw);
}

export function formatCertificateCode(raw: string): string {
  const groups: string[] = [];
  for (let i = 0; i < raw.length; i += CODE_GROUP) groups.push(raw.slice(i, i + CODE_GROUP));
  return groups.join("-");
}

/**
 * Accepts what people type: any case, spaces or hyphens, and the look-alikes O→0, I/L→1.
 * Returns the canonical grouped form, or throws when it cannot be a certificate code.
 */
export function normaliseCertificateCode(input: string): string {
  const raw = input.toUpperCase().replace(/[\s-]/g, "").replace(/O/g, "0").replace(/[IL]/g, "1");
  if (raw.length !== CODE_LENGTH || [...raw].some((c) => !CROCKFORD_ALPHABET.includes(c))) {
    throw new EngineError("code-invalid", "That is not a certificate code.", "code");
  }
  return formatCertificateCode(raw);
}

export function isCertificateCode(input: string): boolean {
  try {
    return normaliseCertificateCode(input) === input;
  } catch (e) {
    if (e instanceof EngineError) return false;
    throw e;
  }
}
