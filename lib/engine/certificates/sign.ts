import { createHash, createPrivateKey, createPublicKey, generateKeyPairSync, sign, verify, type KeyObject } from "node:crypto";
import { EngineError } from "../engine-error";
import { canonicalJson } from "./canonical-json";

export const SIGNATURE_ALGORITHM = "Ed25519" as const;

export type CertificateSignature = { alg: typeof SIGNATURE_ALGORITHM; signature: string; keyId: string };

function privateKey(pem: string): KeyObject {
  let key: KeyObject;
  try {
    key = createPrivateKey(pem);
  } catch {
    throw new EngineError("key-invalid", "The signing key is not a readable PEM private key.", "privateKeyPem");
  }
  if (key.asymmetricKeyType !== "ed25519") throw new EngineError("key-invalid", "The signing key must be Ed25519.", "privateKeyPem");
  return key;
}

// Parsed verification keys by PEM text: the public check page verifies on every view. A shop has a handful.
const publicKeys = new Map<string, KeyObject>();

function publicKey(pem: string): KeyObject {
  const known = publicKeys.get(pem);
  if (known) return known;
  const key = parsePublicKey(pem);
  if (publicKeys.size >= 16) publicKeys.clear();
  publicKeys.set(pem, key);
  return key;
}

function parsePublicKey(pem: string): KeyObject {
  let key: KeyObject;
  try {
    key = createPublicKey(pem);
  } catch {
    throw new EngineError("key-invalid", "The verification key is not a readable PEM public key.", "publicKeyPem");
  }
  if (key.asymmetricKeyType !== "ed25519") throw new EngineError("key-invalid", "The verification key must be Ed25519.", "publicKeyPem");
  return key;
}

/** For the start script: a fresh key pair, both halves as PEM text. */
export function generateKeyPairPem(): { privateKeyPem: string; publicKeyPem: string } {
  const { privateKey: priv, publicKey: pub } = generateKeyPairSync("ed25519");
  return {
    privateKeyPem: priv.export({ type: "pkcs8", format: "pem" }).toString(),
    publicKeyPem: pub.export({ type: "spki", format: "pem" }).toString(),
  };
}

export function publicKeyPemFromPrivate(privateKeyPem: string): string {
  return createPublicKey(privateKey(privateKeyPem)).export({ type: "spki", format: "pem" }).toString();
}

/** Short fingerprint of the public key, so a certificate names the key that signed it across rotations. */
export function keyIdOf(publicKeyPem: string): string {
  const der = publicKey(publicKeyPem).export({ type: "spki", format: "der" });
  return createHash("sha256").update(der).digest("base64url").slice(0, 16);
}

export function contentDigest(content: unknown): string {
  return createHash("sha256").update(canonicalJson(content), "utf8").digest("hex");
}

export function signCertificate(content: unknown, privateKeyPem: string): CertificateSignature {
  const key = privateKey(privateKeyPem);
  const bytes = Buffer.from(canonicalJson(content), "utf8");
  const signature = sign(null, bytes, key).toString("base64url");
  return { alg: SIGNATURE_ALGORITHM, signature, keyId: keyIdOf(publicKeyPemFromPrivate(privateKeyPem)) };
}

/**
 * True only for an intact certificate. A malformed signature or content that cannot be serialised is
 * simply not valid; a bad public key is a configuration fault and throws.
 */
export function verifyCertificate(content: unknown, signature: string, publicKeyPem: string): boolean {
  const key = publicKey(publicKeyPem);
  if (typeof signature !== "string" || !/^[A-Za-z0-9_-]{86}$/.test(signature)) return false;
  let bytes: Buffer;
  try {
    bytes = Buffer.from(canonicalJson(content), "utf8");
  } catch (e) {
    if (e instanceof EngineError) return false;
    throw e;
  }
  return verify(null, bytes, key, Buffer.from(signature, "base64url"));
}

/** Verification keys by key id: the current key and every retired one. */
export type Keyring = ReadonlyMap<string, string>;

const KEY_ID = /^[A-Za-z0-9._-]{1,64}$/;

/**
 * Reads retired verification keys written as "id:base64-of-SPKI-PEM", separated by commas or white space
 * (one line of an env file). A malformed entry is a configuration fault and throws, naming the entry.
 */
export function parseKeyring(text: string): Map<string, string> {
  const ring = new Map<string, string>();
  for (const entry of text.split(/[\s,]+/).filter(Boolean)) {
    const at = entry.indexOf(":");
    const id = at > 0 ? entry.slice(0, at) : "";
    if (!KEY_ID.test(id))
      throw new EngineError(
        "key-invalid",
        `A retired key entry must start with a key id and a colon: "${entry.slice(0, 24)}…".`,
        "keyring",
      );
    const pem = Buffer.from(entry.slice(at + 1), "base64").toString("utf8");
    parsePublicKey(pem);
    if (ring.has(id) && ring.get(id) !== pem) throw new EngineError("key-invalid", `The key id ${id} names two different keys.`, "keyring");
    ring.set(id, pem);
  }
  return ring;
}

/** One keyring entry, as parseKeyring reads it. */
export function keyringEntry(keyId: string, publicKeyPem: string): string {
  if (!KEY_ID.test(keyId))
    throw new EngineError("key-invalid", "A key id is 1 to 64 letters, digits, dots, dashes or underscores.", "keyId");
  return `${keyId}:${Buffer.from(publicKeyPem, "utf8").toString("base64")}`;
}

/**
 * True only for an intact certificate signed by the key its row names: the key id selects the public key,
 * so a retired key still verifies what it signed, and a certificate claiming an unknown key does not verify.
 */
export function verifyWithKeyring(content: unknown, signature: string, keyId: string, keyring: Keyring): boolean {
  const pem = keyring.get(keyId);
  if (!pem) return false;
  return verifyCertificate(content, signature, pem);
}
