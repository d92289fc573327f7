import { spawnSync } from "node:child_process";
import { createHash } from "node:crypto";
import { existsSync, readFileSync, rmSync, writeFileSync } from "node:fs";
import { join } from "node:path";
import pg from "pg";
import { afterAll, describe, expect, it } from "vitest";
import { newCustomer } from "../support/accounts";
import { sql } from "../support/db";
import { testEnv } from "../support/env";
import { jpeg } from "../fixtures/images";
import { quoteBody, ticketFor } from "../fixtures/uploads";

const dump = join(process.env.TEST_SCRATCH ?? "/tmp", `backup-${Date.now()}.dump`);
const target = `bandedge_restore_${Date.now()}`;
const photoDump = join(process.env.TEST_SCRATCH ?? "/tmp", `backup-photos-${Date.now()}.dump`);
const photoTarget = `${target}_photos`;
const brokenTarget = `${target}_broken`;
const sha256 = (b: Buffer) => createHash("sha256").update(b).digest("hex");
const standInPath = (key: string) => join(process.env.UPLOAD_DIR!, "ingest", key.replace("/", "-"));

// Removes files from the upload store through its API (what losing the store's contents looks like to us).
async function wipeFromStore(keys: string[]) {
  const token = JSON.parse(Buffer.from(process.env.UPLOADTHING_TOKEN!, "base64").toString("utf8")) as { apiKey: string };
  const res = await fetch(`${process.env.UPLOADTHING_API_URL}/v6/deleteFiles`, {
    method: "POST",
    headers: { "content-type": "application/json", "x-uploadthing-api-key": token.apiKey },
    body: JSON.stringify({ customIds: keys.map((k) => k.replace("/", "-")) }),
  });
  expect(res.status).toBe(200);
}

async function fingerprint(url: string) {
  const client = new pg.Client({ connectionString: url });
  await client.connect();
  const tables = (
    await client.query<{ t: string }>(
      "select table_name as t from information_schema.tables where table_schema = 'public' and table_type = 'BASE TABLE' order by 1",
    )
  ).rows.map((r) => r.t);
  const out: Record<string, { rows: number; md5: string }> = {};
  for (const t of tables) {
    // Row count and a checksum over every row's text, in a stable order.
    const r = await client.query<{ n: number; md5: string }>(
      `select count(*)::int as n, coalesce(md5(string_agg(x::text, '|' order by x::text)), '') as md5 from "${t}" x`,
    );
    out[t] = { rows: r.rows[0]!.n, md5: r.rows[0]!.md5 };
  }
  await client.end();
  return out;
}

// Backups and restores are the owner role's work (the app role may not read every schema or create a database).
afterAll(async () => {
  const admin = new URL(testEnv.ownerDatabaseUrl);
  admin.pathname = "/postgres";
  const client = new pg.Client({ connectionString: admin.toString() });
  await client.connect();
  for (const name of [target, photoTarget, brokenTarget])
    await client.query(`drop database if exists "${name}" with (force)`).catch(() => undefined);
  await client.end();
});

describe("backup and restore", () => {
  it("restores a pg_dump into a scratch database with equal counts and checksums", async () => {
    // Let queued e-mail from earlier tests finish sending so the outbox is still while we compare.
    for (let i = 0; i < 40; i++) {
      const [q] = await sql<{ n: number }>("select count(*)::int as n from email_outbox where status = 'queued'");
      if (q!.n === 0) break;
      await new Promise((r) => setTimeout(r, 250));
    }
    const b = spawnSync("node", ["scripts/db-backup.mjs", "--out", dump], { encoding: "utf8", env: process.env });
    expect(b.status, b.stderr).toBe(0);
    const before = await fingerprint(testEnv.ownerDatabaseUrl);
    const r = spawnSync("node", ["scripts/db-restore.mjs", dump, "--target", target], { encoding: "utf8", env: process.env });
    expect(r.status, r.stderr).toBe(0);
    const url = new URL(testEnv.ownerDatabaseUrl);
    url.pathname = `/${target}`;
    const after = await fingerprint(url.toString());
    expect(Object.keys(before).length).toBeGreaterThan(15);
    expect(before.user!.rows).toBeGreaterThan(0);
    // Tables the running app writes to in the background (queue, sessions) may move between the two reads.
    for (const volatile of ["session", "rate_limit", "verification"]) {
      delete before[volatile];
      delete after[volatile];
    }
    expect(after).toEqual(before);
  }, 120_000);

  it("refuses to restore over an existing database without --replace", () => {
    const r = spawnSync("node", ["scripts/db-restore.mjs", dump, "--target", target], { encoding: "utf8", env: process.env });
    expect(r.status).toBe(2);
    expect(r.stderr).toContain("--replace");
  });

  it("backs up the photos with the database; after the store is wiped, a restore puts them back and the route serves the same bytes", async () => {
    const owner = await newCustomer("backup-photos");
    const ticket = await ticketFor(owner.client, { name: "dial.jpg", type: "image/jpeg", bytes: await jpeg({ width: 640, height: 480 }) });
    expect((await owner.client.post("/api/portal/jobs", quoteBody([ticket]))).status).toBe(201);
    const [photo] = await sql<{ id: string; storage_key: string; thumb_key: string }>(
      `select p.id, p.storage_key, p.thumb_key from photo p join "user" u on u.id = p.uploader_id where u.email = $1`,
      [owner.email],
    );
    const served = async (size = "") => {
      const res = await owner.client.get(`/api/photos/${photo!.id}${size}`);
      return { status: res.status, sha: sha256(Buffer.from(await res.arrayBuffer())) };
    };
    const before = [await served(), await served("?size=thumb")];
    expect(before.map((b) => b.status)).toEqual([200, 200]);

    const b = spawnSync("node", ["scripts/db-backup.mjs", "--out", photoDump], { encoding: "utf8", env: process.env });
    expect(b.status, b.stderr).toBe(0);
    expect(existsSync(join(`${photoDump}.photos`, photo!.storage_key.replace("/", "-")))).toBe(true);

    // Lose every stored file the database refers to.
    const keys = (
      await sql<{ k: string }>(
        `select k from (select storage_key as k from photo union select thumb_key from photo
           union select key from stored_upload union select thumb_key from stored_upload) x where k is not null`,
      )
    ).map((r) => r.k);
    await wipeFromStore(keys);
    expect(existsSync(standInPath(photo!.storage_key))).toBe(false);
    expect((await served()).status).toBe(404);

    // Restore into a fresh database: the files it refers to go back into the store, each checked.
    const r = spawnSync("node", ["scripts/db-restore.mjs", photoDump, "--target", photoTarget], { encoding: "utf8", env: process.env });
    expect(r.status, r.stderr).toBe(0);
    expect(r.stdout + r.stderr).toMatch(/Every photo the database refers to is in the store/);
    const url = new URL(testEnv.ownerDatabaseUrl);
    url.pathname = `/${photoTarget}`;
    const restored = new pg.Client({ connectionString: url.toString() });
    await restored.connect();
    const row = await restored.query<{ storage_key: string }>("select storage_key from photo where id = $1", [photo!.id]);
    await restored.end();
    expect(row.rows[0]?.storage_key).toBe(photo!.storage_key);
    // spawnSync blocked this process: let the HTTP client notice connections the app closed meanwhile.
    await new Promise((r) => setTimeout(r, 200));
    // The same bytes as before the loss (SHA-256), original and thumbnail.
    expect([await served(), await served("?size=thumb")]).toEqual(before);
  }, 180_000);

  it("fails a restore, naming the file, when a photo the database refers to is neither in the store nor in the backup", async () => {
    const [photo] = await sql<{ storage_key: string }>("select storage_key from photo order by created_at desc limit 1");
    const key = photo!.storage_key;
    const copy = join(`${photoDump}.photos`, key.replace("/", "-"));
    const kept = readFileSync(copy);
    await wipeFromStore([key]);
    rmSync(copy);
    const r = spawnSync("node", ["scripts/db-restore.mjs", photoDump, "--target", brokenTarget], { encoding: "utf8", env: process.env });
    expect(r.status).toBe(1);
    expect(r.stderr).toContain(key);
    // Put the file back for the tests that follow.
    writeFileSync(copy, kept);
    const again = spawnSync("node", ["scripts/db-restore.mjs", photoDump, "--target", brokenTarget, "--replace"], {
      encoding: "utf8",
      env: process.env,
    });
    expect(again.status, again.stderr).toBe(0);
  }, 120_000);
});
