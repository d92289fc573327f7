#!/usr/bin/env node
// npm run db:backup [-- --out FILE] [--photos DIR] [--no-photos]: a pg_dump (custom format) of the Bandedge
// database, then every photo file the database refers to, copied out of the upload store through its API
// into DIR (default FILE.photos) with a manifest of SHA-256 sums. Uses DATABASE_URL when set, otherwise
// the local database of npm start; the store's settings as the app's (UPLOADTHING_TOKEN), otherwise the
// local demo's stand-in.
import { mkdirSync, writeFileSync } from "node:fs";
import { dirname, join } from "node:path";
import { ensurePostgres, log, run, ROOT } from "./lib/stack.mjs";
import { databaseUrl, argValue } from "./lib/db-url.mjs";
import { hostedIdOf, photoStore, referencedKeys, sha256 } from "./lib/photo-store.mjs";

const url = databaseUrl();
const out = argValue("--out") ?? join(ROOT, ".bandedge", "backups", `bandedge-${new Date().toISOString().replace(/[:.]/g, "-")}.dump`);
mkdirSync(dirname(out), { recursive: true });
const bin = ensurePostgres();
run(join(bin, "pg_dump"), ["--format=custom", "--no-owner", "--no-privileges", `--file=${out}`, `--dbname=${url}`]);
log(`Backup written to ${out}`);

if (!process.argv.includes("--no-photos")) {
  // Listed after the dump, so every photo row in the dump is listed (photos are never deleted while their
  // row lives). An abandoned upload swept in between is not copied; the restore forgets its row.
  const dir = argValue("--photos") ?? `${out}.photos`;
  mkdirSync(dir, { recursive: true });
  const store = photoStore();
  const keys = await referencedKeys(url);
  const files = [];
  const missing = [];
  for (const key of keys) {
    const bytes = await store.read(key);
    if (!bytes) {
      missing.push(key);
      continue;
    }
    writeFileSync(join(dir, hostedIdOf(key)), bytes, { mode: 0o600 });
    files.push({ key, bytes: bytes.length, sha256: sha256(bytes) });
  }
  writeFileSync(join(dir, "manifest.json"), JSON.stringify({ dump: out, at: new Date().toISOString(), files, missing }, null, 2));
  log(`Photos: ${files.length} copied to ${dir}`);
  if (missing.length) {
    console.error(`The database refers to ${missing.length} file(s) the store does not have:\n  ${missing.join("\n  ")}`);
    process.exit(1);
  }
}
