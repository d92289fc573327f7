#!/usr/bin/env node
// npm run db:restore -- FILE [--target NAME] [--replace] [--photos DIR] [--no-photos]: restores a backup into
// database NAME (created if missing; default "bandedge_restore", so the live database is never overwritten
// by accident). Pass --target bandedge with --replace to restore over the live database. Then the photos:
// every file the restored database refers to that the upload store lacks is put back from DIR (default
// FILE.photos, written by db:backup) after its SHA-256 is checked, and every referenced file is checked to
// be in the store; a missing one fails the restore (exit 1) with its key.
import { spawnSync } from "node:child_process";
import { existsSync, readFileSync } from "node:fs";
import { join } from "node:path";
import pg from "pg";
import { ensurePostgres, log, run } from "./lib/stack.mjs";
import { argValue, databaseUrl } from "./lib/db-url.mjs";
import { hostedIdOf, photoStore, referencedKeys, sha256 } from "./lib/photo-store.mjs";

const valued = new Set(["--target", "--photos"].map((f) => argValue(f)).filter(Boolean));
const file = process.argv.slice(2).find((a) => !a.startsWith("--") && !valued.has(a));
if (!file) {
  console.error("usage: npm run db:restore -- FILE [--target NAME] [--replace] [--photos DIR] [--no-photos]");
  process.exit(2);
}
const target = argValue("--target") ?? "bandedge_restore";
const replace = process.argv.includes("--replace");
const withPhotos = !process.argv.includes("--no-photos");
const photosDir = argValue("--photos") ?? `${file}.photos`;
if (withPhotos && !existsSync(join(photosDir, "manifest.json"))) {
  console.error(`no photo backup at ${photosDir} (pass --photos DIR, or --no-photos to restore the database alone)`);
  process.exit(2);
}
const base = new URL(databaseUrl());
const admin = new URL(base);
admin.pathname = "/postgres";
const dest = new URL(base);
dest.pathname = `/${target}`;
const bin = ensurePostgres();

const exists = spawnSync(
  join(bin, "psql"),
  [admin.toString(), "-tAc", `select 1 from pg_database where datname = '${target.replace(/'/g, "''")}'`],
  { encoding: "utf8" },
);
if (exists.status !== 0) throw new Error(exists.stderr);
if (exists.stdout.trim() === "1") {
  if (!replace) {
    console.error(`database ${target} exists; pass --replace to restore over it`);
    process.exit(2);
  }
  run(join(bin, "psql"), [admin.toString(), "-c", `drop database "${target}" with (force)`]);
}
run(join(bin, "psql"), [admin.toString(), "-c", `create database "${target}"`]);
run(join(bin, "pg_restore"), ["--no-owner", "--no-privileges", "--exit-on-error", `--dbname=${dest.toString()}`, file]);
log(`Restored ${file} into ${target}`);

if (withPhotos) {
  const manifest = JSON.parse(readFileSync(join(photosDir, "manifest.json"), "utf8"));
  const sums = new Map(manifest.files.map((f) => [f.key, f.sha256]));
  const store = photoStore();
  const keys = await referencedKeys(dest.toString());
  let putBack = 0;
  const missing = [];
  for (const key of keys) {
    if (await store.read(key)) continue;
    const copy = join(photosDir, hostedIdOf(key));
    if (!existsSync(copy)) {
      missing.push(key);
      continue;
    }
    const bytes = readFileSync(copy);
    if (sha256(bytes) !== sums.get(key)) throw new Error(`the backup copy of ${key} does not match its manifest`);
    await store.write(key, bytes);
    putBack++;
  }
  // An upload abandoned and swept between the dump and the photo copy was never attached: forget its row.
  const client = new pg.Client({ connectionString: dest.toString() });
  await client.connect();
  const forgottenRows = missing.length
    ? (
        await client.query(
          `delete from stored_upload su where (su.key = any($1) or su.thumb_key = any($1))
             and not exists (select 1 from photo p where p.storage_key = su.key) returning su.key, su.thumb_key`,
          [missing],
        )
      ).rows
    : [];
  const forgotten = forgottenRows.flatMap((r) => [r.key, r.thumb_key]);
  await client.end();
  const lost = missing.filter((k) => !forgotten.includes(k));
  // The check: every file the restored database refers to is in the store now.
  const absent = [];
  for (const key of await referencedKeys(dest.toString())) if (!(await store.read(key))) absent.push(key);
  log(`Photos: ${putBack} put back into the store, ${keys.length - putBack - missing.length} already there`);
  if (forgottenRows.length) log(`Forgot ${forgottenRows.length} abandoned upload(s) missing from the backup`);
  if (lost.length || absent.length) {
    console.error(`Files the restored database refers to are not in the store:\n  ${[...new Set([...lost, ...absent])].join("\n  ")}`);
    process.exit(1);
  }
  log("Every photo the database refers to is in the store.");
}
