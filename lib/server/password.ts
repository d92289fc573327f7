import "server-only";
import { hash, verify } from "@node-rs/argon2";

// argon2id at OWASP ASVS 5.0 Appendix C strength: m = 19 MiB, t = 2, p = 1.
const ARGON2_OPTIONS = { memoryCost: 19456, timeCost: 2, parallelism: 1, algorithm: 2 } as const;

export async function hashPassword(password: string): Promise<string> {
  return hash(password, ARGON2_OPTIONS);
}

export async function verifyPassword({ hash: stored, password }: { hash: string; password: string }): Promise<boolean> {
  try {
    return await verify(stored, password);
  } catch {
    return false;
  }
}
