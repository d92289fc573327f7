import { spawnSync } from "node:child_process";
import { join } from "node:path";
import pg from "pg";
import { afterAll, describe, expect, it } from "vitest";
import { sql } from "../support/db";
import { testEnv } from "../support/env";

const dump = join(process.env.TEST_SCRATCH ?? "/tmp", `backup-${Date.now()}.dump`);
const target = `bandedge_restore_${Date.now()}`;

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
  await client.query(`drop database if exists "${target}" with (force)`).catch(() => undefined);
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
});
