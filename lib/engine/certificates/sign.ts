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
