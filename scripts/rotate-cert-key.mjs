#!/usr/bin/env node
// npm run cert:rotate: a new certificate signing key. The current key's public half joins the retired keys
// (CERT_RETIRED_KEYS), so every certificate it signed still verifies by the key id stored with it; new
// certificates are signed with the new key (CERT_SIGNING_KEY, named CERT_KEY_ID). Restart the app after.
//   --env-file PATH  the env file to update (default: the local secrets npm start made, .bandedge/local.env)
//   --print          read the current values from the environment and print the new ones instead of writing
// Node built-ins only; the private key is never printed unless --print is given.
import { createHash, createPrivateKey, createPublicKey, generateKeyPairSync } from "node:crypto";
import { existsSync } from "node:fs";
import { join } from "node:path";
import { readEnvFile, ROOT, writeEnvFile } from "./lib/stack.mjs";

function argValue(flag) {
  const i = process.argv.indexOf(flag);
  return i >= 0 ? process.argv[i + 1] : undefined;
}

const print = process.argv.includes("--print");
const envFile = argValue("--env-file") ?? join(process.env.BANDEDGE_STATE_DIR ?? join(ROOT, ".bandedge"), "local.env");

function pemOf(raw) {
  const text = raw.trim();
  return text.startsWith("-----BEGIN") ? text : Buffer.from(text, "base64").toString("utf8");
}

// The same fingerprint the app uses for keys (lib/engine/certificates/sign.ts, keyIdOf).
function fingerprint(publicKey) {
  const der = publicKey.export({ type: "spki", format: "der" });
  return createHash("sha256").update(der).digest("base64url").slice(0, 16);
}

function rotate(values) {
  if (!values.CERT_SIGNING_KEY) throw new Error("CERT_SIGNING_KEY is not set: there is no current key to retire.");
  const oldId = values.CERT_KEY_ID || "k1";
  const oldPublicPem = createPublicKey(createPrivateKey(pemOf(values.CERT_SIGNING_KEY)))
    .export({ type: "spki", format: "pem" })
    .toString();
  const retired = (values.CERT_RETIRED_KEYS ?? "").split(/[\s,]+/).filter(Boolean);
  const ids = new Set(retired.map((e) => e.slice(0, e.indexOf(":"))));
  if (!ids.has(oldId)) retired.push(`${oldId}:${Buffer.from(oldPublicPem).toString("base64")}`);
  ids.add(oldId);
  const { privateKey, publicKey } = generateKeyPairSync("ed25519");
  const newId = `k-${fingerprint(publicKey)}`;
  if (ids.has(newId)) throw new Error("The new key id is already in use; run the command again.");
  return {
    CERT_SIGNING_KEY: Buffer.from(privateKey.export({ type: "pkcs8", format: "pem" }).toString()).toString("base64"),
    CERT_KEY_ID: newId,
    CERT_RETIRED_KEYS: retired.join(","),
    retiredId: oldId,
  };
}

function main() {
  if (print) {
    const next = rotate(process.env);
    process.stdout.write(
      `CERT_SIGNING_KEY=${next.CERT_SIGNING_KEY}\nCERT_KEY_ID=${next.CERT_KEY_ID}\nCERT_RETIRED_KEYS=${next.CERT_RETIRED_KEYS}\n`,
    );
    return;
  }
  if (!existsSync(envFile)) throw new Error(`${envFile} does not exist: run npm start once, or pass --env-file or --print.`);
  const values = readEnvFile(envFile);
  const { retiredId, ...next } = rotate(values);
  writeEnvFile(envFile, { ...values, ...next });
  process.stdout.write(
    `Certificates are now signed with key ${next.CERT_KEY_ID}; key ${retiredId} is retired and still verifies what it signed.\n` +
      `Updated ${envFile}. Restart the app to use the new key.\n`,
  );
}

try {
  main();
} catch (e) {
  console.error(e instanceof Error ? e.message : e);
  process.exit(1);
}
