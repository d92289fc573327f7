// The certificate key ring across a rotation (npm run cert:rotate). The signatures are checked a second
// way, independent of the service: Ed25519 (RFC 8032) through node:crypto's own verify with the public half
// of each private key.
import { spawnSync } from "node:child_process";
import { createPrivateKey, createPublicKey, verify } from "node:crypto";
import { mkdtempSync, readFileSync, rmSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { afterAll, describe, expect, it } from "vitest";
import { canonicalJson } from "@/lib/engine/certificates";
import { env } from "@/lib/server/env";
import { certificateStatus, verifyStoredCertificate } from "@/lib/server/services/certificates";
import { sql } from "../support/db";
import { createCertificate, stopQueue } from "./certificates-fixtures";

type Row = {
  id: string;
  content: Record<string, unknown>;
  signature: string;
  keyId: string;
  revokedAt: Date | null;
  supersededById: string | null;
};

async function loadRow(id: string): Promise<Row> {
  const [row] = await sql<Row>(
    `select id, content, signature, key_id as "keyId", revoked_at as "revokedAt", superseded_by_id as "supersededById" from certificate where id = $1`,
    [id],
  );
  return row!;
}

function readEnv(file: string): Record<string, string> {
  return Object.fromEntries(
    readFileSync(file, "utf8")
      .split("\n")
      .map((l) => /^([A-Z0-9_]+)=(.*)$/.exec(l))
      .filter((m): m is RegExpExecArray => !!m)
      .map((m) => [m[1]!, m[2]!]),
  );
}

function rotate(file: string): Record<string, string> {
  const r = spawnSync("node", ["scripts/rotate-cert-key.mjs", "--env-file", file], { encoding: "utf8" });
  expect(r.status, r.stderr).toBe(0);
  return readEnv(file);
}

// Independent check: the signature over the canonical content verifies with this private key's public half.
function signedBy(row: Row, privateKeyBase64: string): boolean {
  const pub = createPublicKey(createPrivateKey(Buffer.from(privateKeyBase64, "base64").toString("utf8")));
  return verify(null, Buffer.from(canonicalJson(row.content), "utf8"), pub, Buffer.from(row.signature, "base64url"));
}

const settings = env();
const original = {
  CERT_SIGNING_KEY: settings.CERT_SIGNING_KEY,
  CERT_KEY_ID: settings.CERT_KEY_ID,
  CERT_RETIRED_KEYS: settings.CERT_RETIRED_KEYS,
};
const dir = mkdtempSync(join(tmpdir(), "bandedge-keys-"));

afterAll(async () => {
  Object.assign(settings, original);
  rmSync(dir, { recursive: true, force: true });
  await stopQueue();
});

describe("rotating the certificate signing key", () => {
  it("keeps earlier certificates valid by their stored key id and signs new ones with the new key", async () => {
    const first = await loadRow((await createCertificate()).certificateId);
    expect(first.keyId).toBe(original.CERT_KEY_ID);
    expect(signedBy(first, original.CERT_SIGNING_KEY)).toBe(true);

    const file = join(dir, "local.env");
    writeFileSync(file, `CERT_SIGNING_KEY=${original.CERT_SIGNING_KEY}\nCERT_KEY_ID=${original.CERT_KEY_ID}\nMAIL_FROM=kept\n`);
    const once = rotate(file);
    expect(once.MAIL_FROM).toBe("kept");
    expect(once.CERT_SIGNING_KEY).not.toBe(original.CERT_SIGNING_KEY);
    expect(once.CERT_KEY_ID).not.toBe(original.CERT_KEY_ID);
    expect(once.CERT_RETIRED_KEYS!.startsWith(`${original.CERT_KEY_ID}:`)).toBe(true);
    // The retired entry holds only a public key: no private key leaves the env file's signing line.
    expect(Buffer.from(once.CERT_RETIRED_KEYS!.split(":")[1]!, "base64").toString("utf8")).toContain("BEGIN PUBLIC KEY");

    // The app restarted with the rotated file.
    Object.assign(settings, {
      CERT_SIGNING_KEY: once.CERT_SIGNING_KEY,
      CERT_KEY_ID: once.CERT_KEY_ID,
      CERT_RETIRED_KEYS: once.CERT_RETIRED_KEYS,
    });
    const second = await loadRow((await createCertificate()).certificateId);
    expect(second.keyId).toBe(once.CERT_KEY_ID);
    expect(signedBy(second, once.CERT_SIGNING_KEY!)).toBe(true);
    expect(signedBy(second, original.CERT_SIGNING_KEY)).toBe(false);

    expect(verifyStoredCertificate(first)).toBe(true);
    expect(verifyStoredCertificate(second)).toBe(true);
    expect(certificateStatus(first).status).toBe("valid");
    expect(certificateStatus(second).status).toBe("valid");

    // The key id selects the key: the old certificate claiming the new key, or an unknown one, does not verify.
    expect(verifyStoredCertificate({ ...first, keyId: once.CERT_KEY_ID! })).toBe(false);
    expect(certificateStatus({ ...first, keyId: "k-unknown" }).status).toBe("unverifiable");

    // A second rotation keeps both earlier keys.
    const twice = rotate(file);
    Object.assign(settings, {
      CERT_SIGNING_KEY: twice.CERT_SIGNING_KEY,
      CERT_KEY_ID: twice.CERT_KEY_ID,
      CERT_RETIRED_KEYS: twice.CERT_RETIRED_KEYS,
    });
    const third = await loadRow((await createCertificate()).certificateId);
    expect(third.keyId).toBe(twice.CERT_KEY_ID);
    for (const row of [first, second, third]) expect(certificateStatus(row).status, row.keyId).toBe("valid");
  });

  it("refuses to run without a current key", () => {
    const file = join(dir, "empty.env");
    writeFileSync(file, "MAIL_FROM=x\n");
    const r = spawnSync("node", ["scripts/rotate-cert-key.mjs", "--env-file", file], { encoding: "utf8" });
    expect(r.status).toBe(1);
    expect(r.stderr).toContain("CERT_SIGNING_KEY");
  });
});
